// Live checks as the page runs them: the document is read into one item per claim (its claim and
// flow, hashed), and the check client runs only the claims without a result yet, stops checks an
// edit superseded, and restarts a worker that dies. The worker here is a stand-in that runs the
// real check code (editor/worker/checkLogic.ts, flow/) in this process and can be told to die or
// hang. The flow is the O(n) two-loop flow (REFERENCES.md: Kleinert and Schulte-Frohlinde 2001,
// from memory): fixed point 3 eps/(n+8) + 9(3n+14)/(n+8)^3 eps^2, nu = 1/2 + (n+2)/(4(n+8)) eps.
import { afterEach, describe, expect, test } from 'vitest';
import { claimBlockNode, flowBlockNode, type DocNode } from '@/flow/document';
import { CheckClient } from '@/editor/worker/checkClient';
import { runItem } from '@/editor/worker/checkLogic';
import { importClaimFile, readBlocks, tightItem } from '@/editor/worker/reading';
import type { CheckAnswer, CheckItem, CheckRequest, WorkerLike } from '@/editor/worker/protocol';

interface Behaviour {
  /** The worker dies on this item (as a worker that runs out of memory would). */
  dies?: (item: CheckItem) => boolean;
  /** The worker never answers for this item. */
  hangs?: (item: CheckItem) => boolean;
}

class StandInWorker implements WorkerLike {
  onmessage: ((event: { data: unknown }) => void) | null = null;
  onerror: ((event: unknown) => void) | null = null;
  onmessageerror: ((event: unknown) => void) | null = null;
  terminated = false;
  private queue: CheckItem[] = [];
  private busy = false;

  constructor(
    private readonly behaviour: Behaviour,
    private readonly ran: string[],
  ) {}

  postMessage(message: unknown): void {
    if (this.terminated) return;
    this.queue = [...(message as CheckRequest).items];
    setTimeout(() => this.pump(), 0);
  }

  terminate(): void {
    this.terminated = true;
  }

  private emit(answer: CheckAnswer): void {
    if (!this.terminated) this.onmessage?.({ data: answer });
  }

  private pump(): void {
    if (this.busy || this.terminated) return;
    const item = this.queue.shift();
    if (!item) return;
    this.emit({ type: 'started', ticket: item.ticket });
    if (this.behaviour.hangs?.(item)) {
      this.busy = true;
      return;
    }
    if (this.behaviour.dies?.(item)) {
      this.busy = true;
      setTimeout(() => !this.terminated && this.onerror?.({ message: 'out of memory' }), 0);
      return;
    }
    this.ran.push(`${item.stepId}${item.tight ? ' (tight)' : ''}`);
    this.emit({ type: 'result', ticket: item.ticket, result: runItem(item) });
    setTimeout(() => this.pump(), 0);
  }
}

const clients: CheckClient[] = [];
afterEach(() => clients.splice(0).forEach((c) => c.destroy()));

function setUp(behaviour: Behaviour = {}, options: { graceMs?: number; watchdogExtraMs?: number } = {}) {
  const ran: string[] = [];
  const workers: StandInWorker[] = [];
  const client = new CheckClient({
    createWorker: () => {
      const worker = new StandInWorker(behaviour, ran);
      workers.push(worker);
      return worker;
    },
    onChange: () => undefined,
    graceMs: options.graceMs ?? 20,
    watchdogExtraMs: options.watchdogExtraMs ?? 100,
  });
  clients.push(client);
  return { client, ran, workers };
}

async function until(condition: () => boolean, what: string, timeoutMs = 20_000): Promise<void> {
  const end = Date.now() + timeoutMs;
  while (!condition()) {
    if (Date.now() > end) throw new Error(`timed out waiting for ${what}`);
    await new Promise((resolve) => setTimeout(resolve, 5));
  }
}

const flow = (beta: string, eps = 0.1) =>
  flowBlockNode(
    { couplings: ['g'], parameters: { n: 0, eps }, convention: 'uv', beta: { g: beta }, rates: { t: '2 - ((n+2)/3*g - 5*(n+2)/18*g^2)' } },
    { stepId: 'flow-1' },
  );
const twoLoop = '-eps*g + (n+8)/3*g^2 - (3*n+14)/3*g^3';
const fixedPoint = claimBlockNode({ kind: 'fixed-point', id: 'wf', near: { g: '3*eps/(n+8)' }, value: { g: '3*eps/(n+8) + 9*(3*n+14)/(n+8)^3*eps^2' }, order: 2 }, { stepId: 'claim-fp' });
const nuFirst = claimBlockNode({ kind: 'epsilon-coefficient', id: 'nu1', quantity: '1/t', near: { g: '3*eps/(n+8)' }, power: 1, value: '(n+2)/(4*(n+8))' }, { stepId: 'claim-nu' });
const algebra = claimBlockNode({ kind: 'identity', id: 'square', lhs: '(1+x)^2', rhs: '1 + 2*x + x^2' }, { stepId: 'claim-id', flow: 'none' });

function itemsOf(blocks: DocNode[]) {
  return readBlocks(1, blocks).items;
}

describe('only the claims whose inputs changed are checked again', () => {
  test('an edit to the flow re-checks the claims bound to it and not the one standing alone; an undo finds its verdicts again', async () => {
    const { client, ran } = setUp();
    const first = itemsOf([flow(twoLoop), fixedPoint, nuFirst, algebra]);
    client.want(first);
    await until(() => !client.busy, 'the first run');
    expect(ran.sort()).toEqual(['claim-fp', 'claim-id', 'claim-nu']);
    expect(first.map((item) => client.status(item.ticket).result?.status)).toEqual(['holds', 'holds', 'holds']);

    // A wrong sign of the two-loop term: the fixed point's eps^2 term no longer matches.
    ran.length = 0;
    const edited = itemsOf([flow('-eps*g + (n+8)/3*g^2 + (3*n+14)/3*g^3'), fixedPoint, nuFirst, algebra]);
    client.want(edited);
    await until(() => !client.busy, 'the run after the edit');
    expect(ran.sort()).toEqual(['claim-fp', 'claim-nu']);
    expect(client.status(edited[0]!.ticket).result?.status).toBe('fails');
    // The eps coefficient of nu comes from one loop and still holds.
    expect(client.status(edited[1]!.ticket).result?.status).toBe('holds');

    ran.length = 0;
    client.want(first);
    expect(client.busy).toBe(false);
    expect(client.status(first[0]!.ticket).result?.status).toBe('holds');
    expect(ran).toEqual([]);
  }, 30_000);

  test('the same claim and flow typed in another document give the same ticket', () => {
    const one = itemsOf([flow(twoLoop), fixedPoint]);
    const other = itemsOf([{ type: 'paragraph', attrs: { stepId: 'p' }, content: [{ type: 'text', text: 'prose' }] }, flow(twoLoop), fixedPoint]);
    expect(other[0]!.ticket).toBe(one[0]!.ticket);
    expect(itemsOf([flow(twoLoop, 0.2), fixedPoint])[0]!.ticket).not.toBe(one[0]!.ticket);
  });

  test('a claim that cannot be checked as written is not sent at all and says why', () => {
    const broken = claimBlockNode({ kind: 'fixed-point', id: 'lost' }, { stepId: 'claim-broken', flow: 'none' });
    const reading = readBlocks(1, [broken]);
    expect(reading.items).toEqual([]);
    expect(reading.claims[0]!.invalid?.status).toBe('invalid');
    expect(reading.claims[0]!.invalid?.message).toContain('Near: missing (required)');
    expect(reading.claims[0]!.invalid?.message).toContain('needs a flow block');
  });
});

describe('a running check is stopped when it is no longer wanted, runs too long or is cancelled', () => {
  test('an edit supersedes a check that hangs: the worker is ended and the new claims run on a fresh one', async () => {
    const hanging = itemsOf([flow(twoLoop), fixedPoint])[0]!;
    const { client, ran, workers } = setUp({ hangs: (item) => item.ticket === hanging.ticket }, { watchdogExtraMs: 60_000 });
    client.want([hanging]);
    await until(() => client.status(hanging.ticket).state === 'running', 'the hanging check to start');
    const next = itemsOf([flow('-eps*g + (n+8)/3*g^2'), fixedPoint])[0]!;
    client.want([next]);
    await until(() => client.status(next.ticket).state === 'done', 'the superseding check');
    expect(workers[0]!.terminated).toBe(true);
    expect(workers).toHaveLength(2);
    expect(ran).toEqual(['claim-fp']);
    // One loop only: the claimed eps^2 term is not there.
    expect(client.status(next.ticket).result?.status).toBe('fails');
  }, 30_000);

  test('a check that never answers is stopped past its time bound and says so', async () => {
    const item = { ...itemsOf([flow(twoLoop), fixedPoint])[0]!, timeLimitMs: 50 };
    const { client, workers } = setUp({ hangs: () => workers.length === 1 });
    client.want([item]);
    await until(() => client.status(item.ticket).state === 'done', 'the watchdog');
    const status = client.status(item.ticket);
    expect(status.result?.status).toBe('inconclusive');
    expect(status.result?.message).toBe('stopped: no verdict within the time bound of 50 ms');
    expect(status.note).toContain('restarted');
    expect(workers[0]!.terminated).toBe(true);
  });

  test('cancel stops a running check and it stays stopped until asked again', async () => {
    const item = itemsOf([flow(twoLoop), fixedPoint])[0]!;
    let hang = true;
    const { client, ran } = setUp({ hangs: () => hang }, { watchdogExtraMs: 60_000 });
    client.want([item]);
    await until(() => client.status(item.ticket).state === 'running', 'the check to start');
    client.cancel(item.ticket);
    expect(client.status(item.ticket).state).toBe('cancelled');
    await new Promise((resolve) => setTimeout(resolve, 30));
    expect(client.status(item.ticket).state).toBe('cancelled');
    hang = false;
    client.checkAgain(item.ticket);
    await until(() => client.status(item.ticket).state === 'done', 'the check asked for again');
    expect(client.status(item.ticket).result?.status).toBe('holds');
    expect(ran).toEqual(['claim-fp']);
  }, 30_000);
});

describe('a worker that dies is restarted and the claim says so', () => {
  test('once: the claim is checked again on a fresh worker and its verdict says it is from the second run', async () => {
    const item = itemsOf([flow(twoLoop), fixedPoint])[0]!;
    let deaths = 0;
    const { client, workers } = setUp({ dies: () => deaths++ === 0 });
    client.want([item]);
    await until(() => client.status(item.ticket).state === 'done', 'the second run');
    expect(workers).toHaveLength(2);
    expect(client.status(item.ticket).result?.status).toBe('holds');
    expect(client.status(item.ticket).note).toContain('stopped once while checking this claim');
  }, 30_000);

  test('twice on the same claim: it is given up until it changes, and the other claims still run', async () => {
    const [killer, other] = itemsOf([flow(twoLoop), fixedPoint, nuFirst]);
    const { client } = setUp({ dies: (item) => item.ticket === killer!.ticket });
    client.want([killer!, other!]);
    await until(() => !client.busy, 'both claims');
    expect(client.status(killer!.ticket).result?.status).toBe('inconclusive');
    expect(client.status(killer!.ticket).result?.message).toMatch(/^this claim stopped the check worker twice \(out of memory\)/);
    expect(client.status(other!.ticket).result?.status).toBe('holds');
  }, 30_000);
});

test('a tighter run is kept apart from the ordinary result', async () => {
  const item = itemsOf([flow(twoLoop), nuFirst])[0]!;
  const { client, ran } = setUp();
  client.want([item]);
  await until(() => !client.busy, 'the ordinary run');
  const tight = tightItem(item);
  client.runTight(tight);
  await until(() => client.status(tight.ticket).state === 'done', 'the tighter run');
  expect(ran).toEqual(['claim-nu', 'claim-nu (tight)']);
  const ordinary = client.status(item.ticket).result!;
  const tighter = client.status(tight.ticket).result!;
  expect(tighter.status).toBe('holds');
  // 1/16 for walks (n = 0).
  expect(Math.abs((tighter.measured as number) - 1 / 16)).toBeLessThan(1e-8);
  expect(JSON.stringify(tighter.settings)).not.toBe(JSON.stringify(ordinary.settings));
}, 30_000);

describe('importing a claim file', () => {
  test('a file that is not JSON says so and gives nothing to insert', () => {
    const answer = importClaimFile('{ "flow": ');
    expect(answer.ok).toBe(false);
    if (!answer.ok) expect(answer.errors[0]!.message).toMatch(/^the file is not JSON: /);
  });

  test('a claim with a misspelt field is refused naming the field', () => {
    const answer = importClaimFile(JSON.stringify({ flow: { couplings: [], parameters: {}, beta: {} }, claims: [{ id: 'a', kind: 'identity', lhs: 'x', rhs: 'x', tolerence: 1 }] }));
    expect(answer.ok).toBe(false);
    if (!answer.ok) expect(answer.errors.map((e) => e.field)).toContain('claims[0].tolerence');
  });
});

test('where no check worker can start, every claim says the checks cannot run here, and nothing throws', () => {
  const client = new CheckClient({
    createWorker: () => {
      throw new Error('Worker is not defined');
    },
    onChange: () => undefined,
  });
  clients.push(client);
  const item = itemsOf([flow(twoLoop), fixedPoint])[0]!;
  client.warm();
  client.want([item]);
  const status = client.status(item.ticket);
  expect(status.result?.status).toBe('inconclusive');
  expect(status.result?.message).toBe('the checks cannot run here: the check worker could not start (Worker is not defined)');
});

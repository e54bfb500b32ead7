// A view that supplies the verdicts itself (a locked version shows the server's stored check
// report): its claim blocks show the supplied verdict, the check worker does not run those claims,
// and "check again here" runs one in the browser and shows its result beside the supplied one.
// The worker is a stand-in running the real check code (editor/worker/checkLogic.ts, flow/) in
// this process. The flow is the O(n) two-loop flow (REFERENCES.md: Kleinert and Schulte-Frohlinde
// 2001, from memory): fixed point 3 eps/(n+8) + 9(3n+14)/(n+8)^3 eps^2, nu = 1/2 + (n+2)/(4(n+8)) eps.
import { afterEach, describe, expect, test } from 'vitest';
import { claimBlockNode, flowBlockNode, type DocNode } from '@/flow/document';
import type { ClaimResult } from '@/flow/types';
import { LiveChecks } from '@/editor/blocks/live';
import { runItem } from '@/editor/worker/checkLogic';
import { readBlocks } from '@/editor/worker/reading';
import type { CheckAnswer, CheckRequest, WorkerLike } from '@/editor/worker/protocol';

class StandInCheckWorker implements WorkerLike {
  onmessage: ((event: { data: unknown }) => void) | null = null;
  onerror: ((event: unknown) => void) | null = null;
  onmessageerror: ((event: unknown) => void) | null = null;
  constructor(private readonly ran: string[]) {}
  postMessage(message: unknown): void {
    const items = [...(message as CheckRequest).items];
    const next = () => {
      const item = items.shift();
      if (!item) return;
      this.emit({ type: 'started', ticket: item.ticket });
      this.ran.push(item.stepId);
      this.emit({ type: 'result', ticket: item.ticket, result: runItem(item) });
      setTimeout(next, 0);
    };
    setTimeout(next, 0);
  }
  terminate(): void {
    this.onmessage = null;
  }
  private emit(answer: CheckAnswer): void {
    this.onmessage?.({ data: answer });
  }
}

/** The field worker only makes previews; these tests do not look at them. */
class SilentFieldWorker implements WorkerLike {
  onmessage: ((event: { data: unknown }) => void) | null = null;
  onerror: ((event: unknown) => void) | null = null;
  onmessageerror: ((event: unknown) => void) | null = null;
  postMessage(): void {}
  terminate(): void {}
}

const lives: LiveChecks[] = [];
afterEach(() => lives.splice(0).forEach((live) => live.destroy()));

async function until(condition: () => boolean, what: string, timeoutMs = 20_000): Promise<void> {
  const end = Date.now() + timeoutMs;
  while (!condition()) {
    if (Date.now() > end) throw new Error(`timed out waiting for ${what}`);
    await new Promise((resolve) => setTimeout(resolve, 5));
  }
}

const flow = (beta: string) =>
  flowBlockNode(
    { couplings: ['g'], parameters: { n: 0, eps: 0.1 }, convention: 'uv', beta: { g: beta }, rates: { t: '2 - ((n+2)/3*g - 5*(n+2)/18*g^2)' } },
    { stepId: 'flow-1' },
  );
const twoLoop = '-eps*g + (n+8)/3*g^2 - (3*n+14)/3*g^3';
const fixedPoint = claimBlockNode({ kind: 'fixed-point', id: 'wf', near: { g: '3*eps/(n+8)' }, value: { g: '3*eps/(n+8) + 9*(3*n+14)/(n+8)^3*eps^2' }, order: 2 }, { stepId: 'claim-fp' });
const nuFirst = claimBlockNode({ kind: 'epsilon-coefficient', id: 'nu1', quantity: '1/t', near: { g: '3*eps/(n+8)' }, power: 1, value: '(n+2)/(4*(n+8))' }, { stepId: 'claim-nu' });

/** A real verdict that differs from what this document gives: the fixed point checked against a flow with the two-loop sign flipped. */
function storedFailure(): ClaimResult {
  const other = readBlocks(1, [flow('-eps*g + (n+8)/3*g^2 + (3*n+14)/3*g^3'), fixedPoint]).items[0]!;
  const result = runItem(other);
  expect(result.status).toBe('fails');
  return result;
}

function setUp(blocks: DocNode[]) {
  const ran: string[] = [];
  const live = new LiveChecks({ createCheckWorker: () => new StandInCheckWorker(ran), createFieldWorker: () => new SilentFieldWorker(), debounceMs: 0 });
  lives.push(live);
  return { live, ran, read: () => live.documentChanged(() => blocks, true) };
}

describe('a view that supplies its verdicts', () => {
  test('the claim block shows the supplied verdict and the worker does not check that claim; the others are checked here', async () => {
    const stored = storedFailure();
    const { live, ran, read } = setUp([flow(twoLoop), fixedPoint, nuFirst]);
    live.supplyVerdicts(new Map([['claim-fp', stored]]));
    read();
    await until(() => live.snapshot().ready && !live.snapshot().busy && live.claim('claim-nu')?.state === 'done', 'the first reading and checks');
    const fp = live.claim('claim-fp')!;
    expect(fp.state).toBe('done');
    expect(fp.supplied).toBe(true);
    expect(fp.result).toBe(stored);
    expect(fp.here ?? null).toBeNull();
    expect(live.claim('claim-nu')!.result?.status).toBe('holds');
    expect(live.claim('claim-nu')!.supplied ?? false).toBe(false);
    expect(ran).toEqual(['claim-nu']);
  });

  test('"check again here" runs the claim in the browser and shows its result beside the supplied one, which stays', async () => {
    const stored = storedFailure();
    const { live, ran, read } = setUp([flow(twoLoop), fixedPoint, nuFirst]);
    live.supplyVerdicts(new Map([['claim-fp', stored], ['claim-nu', { ...stored, id: 'nu1', kind: 'epsilon-coefficient' }]]));
    read();
    await until(() => live.snapshot().ready, 'the first reading');
    await new Promise((resolve) => setTimeout(resolve, 50));
    expect(ran).toEqual([]);

    let notified = 0;
    live.subscribeStep('claim-fp', () => notified++);
    live.checkHere('claim-fp');
    await until(() => live.claim('claim-fp')?.here?.state === 'done', 'the check here');
    const fp = live.claim('claim-fp')!;
    expect(fp.here!.result!.status).toBe('holds');
    expect(fp.result).toBe(stored);
    expect(fp.state).toBe('done');
    expect(ran).toEqual(['claim-fp']);
    await until(() => notified > 0, 'the block told to redraw');
    // Asking again finds the result already there: nothing runs twice.
    live.checkHere('claim-fp');
    await new Promise((resolve) => setTimeout(resolve, 50));
    expect(ran).toEqual(['claim-fp']);
  });

  test('taking the supplied verdicts away gives every claim back to the worker', async () => {
    const stored = storedFailure();
    const { live, ran, read } = setUp([flow(twoLoop), fixedPoint, nuFirst]);
    live.supplyVerdicts(new Map([['claim-fp', stored]]));
    read();
    await until(() => live.claim('claim-nu')?.state === 'done', 'the first checks');
    live.supplyVerdicts(null);
    await until(() => live.claim('claim-fp')?.state === 'done' && live.claim('claim-fp')?.supplied !== true, 'the worker to check the fixed point');
    expect(live.claim('claim-fp')!.result?.status).toBe('holds');
    expect(ran.sort()).toEqual(['claim-fp', 'claim-nu']);
  });
});

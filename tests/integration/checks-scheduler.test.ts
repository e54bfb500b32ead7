// The background re-check inside one process, with a real check thread and a real (in-memory)
// PGlite, the working copy supplied by a stand-in for the collaboration service: listeners hear
// when a claim that held now fails (with the authors whose edits caused it), unchanged claims are
// not checked again, and a stuck check thread is ended and replaced.
//
// The flow is the O(n) model's two-loop beta function with g* = 3 eps/(n+8) + O(eps^2) (Kleinert
// and Schulte-Frohlinde, Critical Properties of phi^4-Theories, 2001; REFERENCES.md, from memory).
import { randomUUID } from 'node:crypto';
import { eq } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import { getDb, schema } from '../../db/client';
import { openDatabase, type OpenedDatabase } from '../../db/open';
import { claimBlockNode, flowBlockNode, type DocNode } from '../../flow/document';
import type { CollabAccess, DocumentChange, ProseMirrorJson } from '../../server/collab/access';
import type { VerdictsChanged } from '../../server/checks/access';
import { CheckThread } from '../../server/checks/checkThread';
import { storedChecks } from '../../server/checks/results';
import { CheckScheduler } from '../../server/checks/scheduler';

let database: OpenedDatabase;
let derivationId: string;
let authorId: string;

/** The working copy is whatever the test last set; changes are announced by the test. */
class StandInCollab implements CollabAccess {
  body: ProseMirrorJson = { type: 'doc', content: [] };
  constructor(private readonly derivationId: string) {}
  reads = 0;
  private listener: ((change: DocumentChange) => void) | null = null;
  async readWorkingCopy(): Promise<ProseMirrorJson> {
    this.reads++;
    return structuredClone(this.body);
  }
  async encodeState(): Promise<Uint8Array> {
    return new Uint8Array();
  }
  async applyUpdate(): Promise<void> {}
  onDocumentChanged(listener: (change: DocumentChange) => void): () => void {
    this.listener = listener;
    return () => (this.listener = null);
  }
  edit(content: DocNode[], userId: string): void {
    this.body = { type: 'doc', content: content as ProseMirrorJson[] };
    this.listener?.({ derivationId: this.derivationId, userIds: [userId], stepIds: ['flow-step'], edits: [{ userId, stepIds: ['flow-step'] }], update: new Uint8Array() });
  }
}

const flow = (beta: string) =>
  flowBlockNode({ couplings: ['g'], parameters: { n: 0, eps: 0.1 }, convention: 'uv', beta: { g: beta } }, { stepId: 'flow-step' });
const twoLoop = '-eps*g + (n+8)/3*g^2 - (3*n+14)/3*g^3';
const fixedPoint = claimBlockNode({ id: 'wilson-fisher', kind: 'fixed-point', near: { g: '3*eps/(n+8)' }, value: { g: '3*eps/(n+8)' }, order: 1 }, { stepId: 'claim-step' });
// ln(1 + x) = x - x^2/2 + x^3/3 - ... (any handbook).
const logSeries = claimBlockNode({ id: 'log-series', kind: 'coefficient', of: 'log(1 + x)', variable: 'x', power: 3, value: '1/3' }, { stepId: 'series-step', flow: 'none' });

beforeAll(async () => {
  database = await openDatabase({ dataDir: 'memory://' });
  const db = getDb();
  const [user] = await db.insert(schema.users).values({ email: `${randomUUID()}@example.org`, name: 'Ada Quill' }).returning();
  const [group] = await db.insert(schema.groups).values({ name: 'Chains' }).returning();
  const [derivation] = await db.insert(schema.derivations).values({ groupId: group!.id, title: 'Chains in four dimensions' }).returning();
  authorId = user!.id;
  derivationId = derivation!.id;
}, 60_000);

afterAll(async () => {
  await database?.close();
});

describe('verdicts changed', () => {
  let collab: StandInCollab;
  const thread = new CheckThread({ timeLimitMs: 2_000 });
  let scheduler: CheckScheduler;
  const events: VerdictsChanged[] = [];
  beforeAll(() => {
    collab = new StandInCollab(derivationId);
    scheduler = new CheckScheduler(collab, thread, { delayMs: 50, maxDelayMs: 500, timeLimitMs: 2_000 });
    scheduler.start();
    scheduler.onVerdictsChanged((event) => events.push(event));
  });
  afterAll(() => scheduler.stop());

  test('claims checked for the first time are announced with no verdict before', async () => {
    collab.edit([flow(twoLoop), fixedPoint, logSeries], authorId);
    expect(scheduler.isPending(derivationId)).toBe(true);
    await scheduler.whenSettled(derivationId);
    expect(events).toHaveLength(1);
    expect(events[0]!.userIds).toEqual([authorId]);
    expect(events[0]!.changes.map((c) => [c.claimId, c.before, c.after])).toEqual([
      ['wilson-fisher', null, 'holds'],
      ['log-series', null, 'holds'],
    ]);
  });

  test('a claim that held and now fails is announced, with the author whose edit caused it', async () => {
    const before = await storedChecks(derivationId);
    // The one-loop coefficient of the flow typed wrongly: (n+9)/3 instead of (n+8)/3.
    collab.edit([flow(twoLoop.replace('(n+8)/3', '(n+9)/3')), fixedPoint, logSeries], authorId);
    await scheduler.whenSettled(derivationId);
    expect(events).toHaveLength(2);
    const change = events[1]!.changes;
    expect(change).toHaveLength(1);
    expect(change[0]).toMatchObject({ claimId: 'wilson-fisher', before: 'holds', after: 'fails' });
    expect(change[0]!.message).not.toBe('');
    expect(events[1]!.edits).toEqual([{ userId: authorId, stepIds: ['flow-step'] }]);
    const after = await storedChecks(derivationId);
    // The claim without a flow did not change: its stored result was kept as it was.
    expect(after.get('series-step')!.checkedAt.getTime()).toBe(before.get('series-step')!.checkedAt.getTime());
    expect(after.get('claim-step')!.previousStatus).toBe('holds');
  });

  test('edits that change no verdict are not announced', async () => {
    collab.edit([{ type: 'paragraph', attrs: { stepId: 'prose' }, content: [{ type: 'text', text: 'A remark in prose.' }] }, flow(twoLoop.replace('(n+8)/3', '(n+9)/3')), fixedPoint, logSeries], authorId);
    await scheduler.whenSettled(derivationId);
    expect(events).toHaveLength(2);
  });

  test('a removed claim is announced with its last verdict', async () => {
    collab.edit([flow(twoLoop), fixedPoint], authorId);
    await scheduler.whenSettled(derivationId);
    expect(events).toHaveLength(3);
    expect(events[2]!.removed).toEqual([{ stepId: 'series-step', claimId: 'log-series', before: 'holds' }]);
    expect(events[2]!.changes.map((c) => [c.claimId, c.before, c.after])).toEqual([['wilson-fisher', 'fails', 'holds']]);
    const [row] = await getDb().select().from(schema.derivations).where(eq(schema.derivations.id, derivationId));
    expect([row!.claimsHolding, row!.claimsFailing]).toEqual([1, 0]);
  });

  test('typing on and on is still checked after the longest wait', async () => {
    const reads = collab.reads;
    const started = Date.now();
    while (Date.now() - started < 900) {
      collab.edit([flow(twoLoop), fixedPoint], authorId);
      await new Promise((resolve) => setTimeout(resolve, 20));
    }
    expect(collab.reads).toBeGreaterThan(reads);
    await scheduler.whenSettled(derivationId);
  });
});

describe('a stuck check thread', () => {
  test('is ended at its bound, its claims come back inconclusive, and the next check gets a fresh thread', async () => {
    const stuck = new CheckThread({ timeLimitMs: 50, slackMs: 200, entry: new URL('./checksStuckThread.ts', import.meta.url) });
    const outcomes = await stuck.run([{ file: { flow: { couplings: [], parameters: {}, convention: 'ir', beta: {} }, claims: [] }, only: [] }]);
    expect(outcomes).toHaveLength(1);
    expect('error' in outcomes[0]! && outcomes[0].error).toMatch(/did not finish within/);
    expect(stuck.restarts).toBe(1);
    await stuck.stop();

    const [group] = await getDb().select().from(schema.groups);
    const [other] = await getDb().insert(schema.derivations).values({ groupId: group!.id, title: 'A second derivation' }).returning();
    const otherId = other!.id;
    const collab = new StandInCollab(otherId);
    const thread = new CheckThread({ timeLimitMs: 50, slackMs: 200, entry: new URL('./checksStuckThread.ts', import.meta.url) });
    const scheduler = new CheckScheduler(collab, thread, { delayMs: 0, maxDelayMs: 0, timeLimitMs: 50 });
    scheduler.start();
    collab.edit([flow(twoLoop), fixedPoint], authorId);
    await scheduler.whenSettled(otherId);
    const stored = await storedChecks(otherId);
    expect(stored.get('claim-step')!.status).toBe('inconclusive');
    expect(stored.get('claim-step')!.result.message).toMatch(/did not finish within/);
    await scheduler.stop();
  });
});

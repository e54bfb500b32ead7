// What the derivation page shows of review: every step with its standing sign-offs and remark
// counts, every remark thread (threads on removed steps too), and one step's history.
import { and, asc, desc, eq, isNull } from 'drizzle-orm';
import { getDb, schema } from '../../db/client';
import { may, type Role } from '../permissions';
import { peopleById, personOf, type PersonRef } from './people';
import { threadViews, type RemarkThreadView } from './remarks';
import { readWorkingSteps, signOffViews, type SignOffView } from './signOffs';

export interface StepReview {
  stepId: string;
  position: number;
  type: string;
  excerpt: string;
  /** What a sign-off now would record (sent back with it, so a step changed meanwhile is noticed). */
  contentHash: string;
  dependencyStepId: string | null;
  /** Standing sign-offs, oldest first. */
  signOffs: SignOffView[];
  /** The latest cleared sign-off, when no sign-off stands since (to say why it went). */
  lastCleared: SignOffView | null;
  openThreads: number;
  resolvedThreads: number;
}

export interface ReviewView {
  derivationId: string;
  steps: StepReview[];
  threads: RemarkThreadView[];
  you: { mayRemark: boolean; mayResolve: boolean; maySignOff: boolean };
}

export async function reviewView(derivationId: string, role: Role): Promise<ReviewView> {
  const steps = await readWorkingSteps(derivationId);
  const rows = await getDb().select().from(schema.signOffs).where(eq(schema.signOffs.derivationId, derivationId)).orderBy(asc(schema.signOffs.signedAt));
  const people = await peopleById(rows.flatMap((row) => [row.userId, row.clearedBy]));
  const signOffs = signOffViews(rows, people);
  const threads = await threadViews(derivationId, steps);
  const view: StepReview[] = [...steps.values()]
    .sort((a, b) => a.position - b.position)
    .map((step) => {
      const own = signOffs.filter((s) => s.stepId === step.stepId);
      const standing = own.filter((s) => !s.cleared);
      const cleared = own.filter((s) => s.cleared).sort((a, b) => b.cleared!.at.getTime() - a.cleared!.at.getTime());
      const onStep = threads.filter((t) => t.stepId === step.stepId);
      return {
        stepId: step.stepId,
        position: step.position,
        type: step.type,
        excerpt: step.excerpt,
        contentHash: step.contentHash,
        dependencyStepId: step.dependencyStepId,
        signOffs: standing,
        lastCleared: standing.length === 0 ? (cleared[0] ?? null) : null,
        openThreads: onStep.filter((t) => !t.resolved).length,
        resolvedThreads: onStep.filter((t) => t.resolved).length,
      };
    });
  return {
    derivationId,
    steps: view,
    threads,
    you: { mayRemark: may(role, 'remark'), mayResolve: may(role, 'resolveRemark'), maySignOff: may(role, 'signOff') },
  };
}

export type HistoryEventKind = 'signed-off' | 'sign-off-cleared' | 'sign-off-withdrawn' | 'remark' | 'reply' | 'resolved' | 'reopened';

export interface HistoryEvent {
  at: Date;
  kind: HistoryEventKind;
  /** Who did it; null for a clearing no one person's edit caused. */
  by: PersonRef | null;
  /** In words: why a sign-off was cleared, or the remark's text. */
  detail: string;
  threadId?: string;
}

export interface StepHistory {
  stepId: string;
  present: boolean;
  excerpt: string;
  events: HistoryEvent[];
}

/** A step's review history, newest first: sign-offs and their clearing (with why), remarks, resolutions. */
export async function stepHistory(derivationId: string, stepId: string): Promise<StepHistory> {
  const db = getDb();
  const steps = await readWorkingSteps(derivationId);
  const signOffs = await db
    .select()
    .from(schema.signOffs)
    .where(and(eq(schema.signOffs.derivationId, derivationId), eq(schema.signOffs.stepId, stepId)));
  const threads = (await threadViews(derivationId, steps)).filter((t) => t.stepId === stepId);
  const people = await peopleById(signOffs.flatMap((row) => [row.userId, row.clearedBy]));
  const events: HistoryEvent[] = [];
  for (const row of signOffs) {
    events.push({ at: row.signedAt, kind: 'signed-off', by: personOf(people, row.userId), detail: 'checked' });
    if (row.clearedAt) {
      const withdrawn = row.clearedReason === 'withdrawn by the signer';
      events.push({
        at: row.clearedAt,
        kind: withdrawn ? 'sign-off-withdrawn' : 'sign-off-cleared',
        by: row.clearedBy ? personOf(people, row.clearedBy) : null,
        detail: withdrawn
          ? `${personOf(people, row.userId).name} withdrew the sign-off`
          : `the sign-off by ${personOf(people, row.userId).name} was cleared: ${row.clearedReason ?? 'the step changed'}`,
      });
    }
  }
  for (const thread of threads) {
    thread.entries.forEach((entry, i) => {
      const kind: HistoryEventKind = entry.kind === 'remark' ? (i === 0 ? 'remark' : 'reply') : entry.kind;
      events.push({ at: entry.at, kind, by: entry.by, detail: entry.body, threadId: thread.id });
    });
  }
  events.sort((a, b) => b.at.getTime() - a.at.getTime());
  const step = steps.get(stepId);
  const [firstThread] = await db
    .select({ excerpt: schema.remarkThreads.stepExcerpt })
    .from(schema.remarkThreads)
    .where(and(eq(schema.remarkThreads.derivationId, derivationId), eq(schema.remarkThreads.stepId, stepId)))
    .orderBy(desc(schema.remarkThreads.createdAt))
    .limit(1);
  return { stepId, present: step !== undefined, excerpt: step?.excerpt ?? firstThread?.excerpt ?? '', events };
}

/** Standing sign-offs of a derivation (e.g. for a version's summary). */
export async function standingSignOffs(derivationId: string): Promise<SignOffView[]> {
  const rows = await getDb()
    .select()
    .from(schema.signOffs)
    .where(and(eq(schema.signOffs.derivationId, derivationId), isNull(schema.signOffs.clearedAt)))
    .orderBy(asc(schema.signOffs.signedAt));
  return signOffViews(rows, await peopleById(rows.map((row) => row.userId)));
}

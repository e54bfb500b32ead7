// Who wrote each step: every user whose accepted edits touched it, from the collaboration
// service's document-changed events, written every few seconds rather than on every keystroke.
// "A remark on your step" goes to these people.
import { and, eq, inArray, sql } from 'drizzle-orm';
import { getDb, schema } from '../../db/client';
import type { DocumentChange } from '../collab/access';

export class StepAuthorLog {
  /** derivationId → stepId → users who edited it since the last write. */
  private pending = new Map<string, Map<string, Set<string>>>();
  private timer: NodeJS.Timeout | null = null;
  private writing: Promise<void> = Promise.resolve();

  constructor(private readonly intervalMs: number) {}

  start(): void {
    this.timer ??= setInterval(() => void this.flush(), this.intervalMs);
    this.timer.unref();
  }

  note(change: Pick<DocumentChange, 'derivationId' | 'edits'>): void {
    for (const edit of change.edits) {
      if (edit.stepIds.length === 0) continue;
      let steps = this.pending.get(change.derivationId);
      if (!steps) this.pending.set(change.derivationId, (steps = new Map()));
      for (const stepId of edit.stepIds) {
        let users = steps.get(stepId);
        if (!users) steps.set(stepId, (users = new Set()));
        users.add(edit.userId);
      }
    }
  }

  /** Writes what was noted; calls are serialised. */
  flush(): Promise<void> {
    this.writing = this.writing.then(async () => {
      const batch = this.pending;
      this.pending = new Map();
      const rows = [...batch].flatMap(([derivationId, steps]) =>
        [...steps].flatMap(([stepId, users]) => [...users].map((userId) => ({ derivationId, stepId, userId }))),
      );
      if (rows.length === 0) return;
      try {
        await getDb()
          .insert(schema.stepAuthors)
          .values(rows)
          .onConflictDoUpdate({
            target: [schema.stepAuthors.derivationId, schema.stepAuthors.stepId, schema.stepAuthors.userId],
            set: { lastEditAt: sql`now()` },
          });
      } catch (error) {
        console.error('review: recording who wrote which step failed:', error);
      }
    });
    return this.writing;
  }

  async stop(): Promise<void> {
    if (this.timer) clearInterval(this.timer);
    this.timer = null;
    await this.flush();
  }
}

/**
 * The people who wrote a step and are still members of the derivation's group. A step written
 * before its authors were recorded falls back to the derivation's authors.
 */
export async function stepAuthorIds(derivationId: string, stepId: string): Promise<string[]> {
  const db = getDb();
  const [derivation] = await db.select({ groupId: schema.derivations.groupId }).from(schema.derivations).where(eq(schema.derivations.id, derivationId));
  if (!derivation) return [];
  const members = db
    .select({ userId: schema.memberships.userId })
    .from(schema.memberships)
    .where(eq(schema.memberships.groupId, derivation.groupId));
  const writers = await db
    .select({ userId: schema.stepAuthors.userId })
    .from(schema.stepAuthors)
    .where(and(eq(schema.stepAuthors.derivationId, derivationId), eq(schema.stepAuthors.stepId, stepId), inArray(schema.stepAuthors.userId, members)));
  if (writers.length > 0) return writers.map((row) => row.userId);
  const authors = await db
    .select({ userId: schema.derivationAuthors.userId })
    .from(schema.derivationAuthors)
    .where(and(eq(schema.derivationAuthors.derivationId, derivationId), inArray(schema.derivationAuthors.userId, members)));
  return authors.map((row) => row.userId);
}

// Sign-offs of steps: a reviewer (or lead) says "checked". The server records a hash of the step
// and of the flow block it depends on, taken from the working copy as stored; when either differs
// after an edit, the sign-off is cleared, with why and whose edit, and the row stays as history.
import { and, asc, eq, isNull } from 'drizzle-orm';
import { getDb, schema } from '../../db/client';
import { badRequest, conflict, forbidden, notFound } from '../api/errors';
import { collab } from '../collab/access';
import type { SessionUser } from '../session';
import { peopleById, personOf, type PersonRef } from './people';
import { readSteps, type StepInfo } from './steps';

type SignOffRow = typeof schema.signOffs.$inferSelect;

export interface SignOffView {
  id: string;
  stepId: string;
  by: PersonRef;
  signedAt: Date;
  cleared: { at: Date; reason: string; by: PersonRef | null } | null;
}

export function signOffViews(rows: readonly SignOffRow[], people: ReadonlyMap<string, PersonRef>): SignOffView[] {
  return rows.map((row) => ({
    id: row.id,
    stepId: row.stepId,
    by: personOf(people, row.userId),
    signedAt: row.signedAt,
    cleared: row.clearedAt
      ? { at: row.clearedAt, reason: row.clearedReason ?? 'cleared', by: row.clearedBy ? personOf(people, row.clearedBy) : null }
      : null,
  }));
}

export async function readWorkingSteps(derivationId: string): Promise<Map<string, StepInfo>> {
  return readSteps(await collab().readWorkingCopy(derivationId));
}

export const notInDocument = 'This step is not in the derivation (it may have been removed).';

/** Signs off a step of the working copy as it is stored now. */
export async function signOffStep(input: {
  derivationId: string;
  user: SessionUser;
  stepId: string;
  /** The step's content hash as the signer read it; a different one now means it changed meanwhile. */
  contentHash?: string;
}): Promise<SignOffView> {
  const steps = await readWorkingSteps(input.derivationId);
  const step = steps.get(input.stepId);
  if (!step) throw badRequest(notInDocument, 'stepId');
  if (input.contentHash && input.contentHash !== step.contentHash) {
    throw conflict('The step changed since you read it. Read it again, then sign it off.', 'contentHash');
  }
  const db = getDb();
  const standing = await db
    .select({ id: schema.signOffs.id })
    .from(schema.signOffs)
    .where(
      and(
        eq(schema.signOffs.derivationId, input.derivationId),
        eq(schema.signOffs.stepId, input.stepId),
        eq(schema.signOffs.userId, input.user.id),
        isNull(schema.signOffs.clearedAt),
      ),
    );
  if (standing.length > 0) throw conflict('You have already signed off this step.', 'stepId');
  const [row] = await db
    .insert(schema.signOffs)
    .values({
      derivationId: input.derivationId,
      stepId: input.stepId,
      userId: input.user.id,
      contentHash: step.contentHash,
      dependencyStepId: step.dependencyStepId,
      dependencyHash: step.dependencyHash,
    })
    .returning();
  // An edit committed between reading the step and storing the sign-off clears it at once.
  await verifySignOffs(input.derivationId);
  const [stored] = await db.select().from(schema.signOffs).where(eq(schema.signOffs.id, row!.id));
  const people = await peopleById([stored!.userId, stored!.clearedBy]);
  return signOffViews([stored!], people)[0]!;
}

/** The signer takes their own standing sign-off back. */
export async function withdrawSignOff(derivationId: string, signOffId: string, user: SessionUser): Promise<void> {
  const db = getDb();
  const [row] = await db
    .select()
    .from(schema.signOffs)
    .where(and(eq(schema.signOffs.id, signOffId), eq(schema.signOffs.derivationId, derivationId)));
  if (!row) throw notFound('No such sign-off in this derivation.');
  if (row.userId !== user.id) throw forbidden('Only the person who signed off a step may withdraw the sign-off.');
  if (row.clearedAt) throw conflict(`This sign-off no longer stands: ${row.clearedReason ?? 'it was cleared'}.`);
  await db
    .update(schema.signOffs)
    .set({ clearedAt: new Date(), clearedReason: 'withdrawn by the signer', clearedBy: user.id })
    .where(and(eq(schema.signOffs.id, signOffId), isNull(schema.signOffs.clearedAt)));
}

/** Why a standing sign-off no longer matches the step, or null while it does. */
export function clearingReason(row: Pick<SignOffRow, 'contentHash' | 'dependencyStepId' | 'dependencyHash'>, step: StepInfo | undefined): string | null {
  if (!step) return 'the step was removed from the derivation';
  if (step.contentHash !== row.contentHash) return 'the step was edited after the sign-off';
  if (step.dependencyStepId !== row.dependencyStepId) {
    if (!step.dependencyStepId) return 'the step is no longer bound to a flow block';
    return row.dependencyStepId ? 'the step is now bound to another flow block' : 'the step is now bound to a flow block';
  }
  if (step.dependencyHash !== row.dependencyHash) {
    return step.dependencyHash ? 'the flow block it depends on was edited after the sign-off' : 'the flow block it depends on was removed';
  }
  return null;
}

/** Who made the edit that touched these steps, when the change says so unambiguously. */
export interface ChangeAuthors {
  userIds: readonly string[];
  edits: readonly { userId: string; stepIds: readonly string[] }[];
}

function editorOf(change: ChangeAuthors | undefined, stepIds: readonly (string | null)[]): string | null {
  if (!change) return null;
  const touched = change.edits.filter((edit) => stepIds.some((id) => id !== null && edit.stepIds.includes(id)));
  if (touched.length === 1) return touched[0]!.userId;
  if (touched.length === 0 && change.userIds.length === 1) return change.userIds[0]!;
  return null;
}

/**
 * Compares every standing sign-off of a derivation with its working copy and clears those whose
 * step or flow block changed. Returns how many were cleared.
 */
export async function verifySignOffs(derivationId: string, change?: ChangeAuthors): Promise<number> {
  const db = getDb();
  const standing = await db
    .select()
    .from(schema.signOffs)
    .where(and(eq(schema.signOffs.derivationId, derivationId), isNull(schema.signOffs.clearedAt)))
    .orderBy(asc(schema.signOffs.signedAt));
  if (standing.length === 0) return 0;
  const steps = await readWorkingSteps(derivationId);
  let cleared = 0;
  for (const row of standing) {
    const step = steps.get(row.stepId);
    const reason = clearingReason(row, step);
    if (!reason) continue;
    const by = editorOf(change, [row.stepId, row.dependencyStepId, step?.dependencyStepId ?? null]);
    const done = await db
      .update(schema.signOffs)
      .set({ clearedAt: new Date(), clearedReason: reason, clearedBy: by })
      .where(and(eq(schema.signOffs.id, row.id), isNull(schema.signOffs.clearedAt)))
      .returning({ id: schema.signOffs.id });
    cleared += done.length;
  }
  return cleared;
}

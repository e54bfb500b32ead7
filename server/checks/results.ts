// The stored outcome of the server's checks: each claim block's latest result and the
// derivation's holds / fails counts (shown in the group's derivations table), written together.
import { and, asc, eq, inArray, isNull } from 'drizzle-orm';
import { getDb, schema } from '../../db/client';
import type { ClaimResult, Status } from '../../flow/types';
import type { StoredCheck } from './plan';

/** Where a claim stands: its block, its id in the claim file, its place and its flow block. */
export interface ClaimPlace {
  stepId: string;
  claimId: string;
  position: number;
  kind: string;
  flowStepId: string | null;
}

export interface ClaimCheckRow extends ClaimPlace {
  status: Status;
  previousStatus: Status | null;
  statusSince: Date;
  inputHash: string;
  result: ClaimResult;
  checkedAt: Date;
}

export interface CheckCounts {
  holds: number;
  fails: number;
  inconclusive: number;
  invalid: number;
}

export async function storedChecks(derivationId: string): Promise<Map<string, StoredCheck & ClaimCheckRow>> {
  const rows = await getDb().select().from(schema.claimChecks).where(eq(schema.claimChecks.derivationId, derivationId));
  return new Map(rows.map((row) => [row.stepId, { ...row, result: row.result as ClaimResult }]));
}

export interface ClaimToStore extends ClaimPlace {
  inputHash: string;
  result: ClaimResult;
}

export function countsOf(statuses: Iterable<Status>): CheckCounts {
  const counts: CheckCounts = { holds: 0, fails: 0, inconclusive: 0, invalid: 0 };
  for (const status of statuses) counts[status]++;
  return counts;
}

/**
 * Stores one run: every claim of the document (rows whose input and verdict did not change are
 * left as they are), removes the claims no longer in it, and writes the derivation's counts.
 * Returns false when the derivation is gone (deleted meanwhile): nothing is written then.
 */
export async function storeCheckRun(
  derivationId: string,
  claims: readonly ClaimToStore[],
  before: ReadonlyMap<string, ClaimCheckRow>,
  checkedAt: Date,
): Promise<boolean> {
  const db = getDb();
  return db.transaction(async (tx) => {
    const [derivation] = await tx
      .select({ id: schema.derivations.id })
      .from(schema.derivations)
      .where(and(eq(schema.derivations.id, derivationId), isNull(schema.derivations.deletedAt)))
      .for('update');
    if (!derivation) return false;
    const present = new Set(claims.map((c) => c.stepId));
    const gone = [...before.keys()].filter((stepId) => !present.has(stepId));
    if (gone.length > 0) {
      await tx.delete(schema.claimChecks).where(and(eq(schema.claimChecks.derivationId, derivationId), inArray(schema.claimChecks.stepId, gone)));
    }
    for (const claim of claims) {
      const old = before.get(claim.stepId);
      const status = claim.result.status;
      // Reused as stored, in the same place: nothing to write.
      if (old && old.result === claim.result && old.position === claim.position && old.claimId === claim.claimId) continue;
      const changed = !old || old.status !== status;
      const values = {
        derivationId,
        stepId: claim.stepId,
        claimId: claim.claimId,
        position: claim.position,
        kind: claim.kind,
        flowStepId: claim.flowStepId,
        status,
        previousStatus: changed ? (old?.status ?? null) : (old?.previousStatus ?? null),
        statusSince: changed ? checkedAt : (old?.statusSince ?? checkedAt),
        inputHash: claim.inputHash,
        result: claim.result,
        checkedAt,
      };
      await tx
        .insert(schema.claimChecks)
        .values(values)
        .onConflictDoUpdate({ target: [schema.claimChecks.derivationId, schema.claimChecks.stepId], set: values });
    }
    const counts = countsOf(claims.map((c) => c.result.status));
    await tx
      .update(schema.derivations)
      .set({ claimsHolding: counts.holds, claimsFailing: counts.fails, claimsCheckedAt: checkedAt })
      .where(eq(schema.derivations.id, derivationId));
    return true;
  });
}

export interface ChecksView {
  derivationId: string;
  checkedAt: Date | null;
  summary: CheckCounts;
  /** Claims in document order of the last run. */
  claims: (ClaimPlace & {
    status: Status;
    previousStatus: Status | null;
    statusSince: Date;
    checkedAt: Date;
    result: ClaimResult;
  })[];
}

/** The latest server-side verdicts of a derivation, for the API. */
export async function checksView(derivationId: string): Promise<ChecksView> {
  const db = getDb();
  const [derivation] = await db
    .select({ checkedAt: schema.derivations.claimsCheckedAt })
    .from(schema.derivations)
    .where(eq(schema.derivations.id, derivationId));
  const rows = await db
    .select()
    .from(schema.claimChecks)
    .where(eq(schema.claimChecks.derivationId, derivationId))
    .orderBy(asc(schema.claimChecks.position));
  const claims = rows.map(({ derivationId: _d, inputHash: _h, result, ...row }) => ({ ...row, result: result as ClaimResult }));
  return { derivationId, checkedAt: derivation?.checkedAt ?? null, summary: countsOf(claims.map((c) => c.status)), claims };
}

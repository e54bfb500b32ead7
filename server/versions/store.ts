// Named versions of a derivation: saving the working copy as a snapshot with who, when and the
// verdict on each claim; listing, reading, renaming and removing them. A locked version refuses
// every change (here with a 409, and in the database by a trigger).
import { and, desc, eq, sql } from 'drizzle-orm';
import { alias } from 'drizzle-orm/pg-core';
import { getDb, schema, type Tx } from '../../db/client';
import type { DocNode } from '../../flow/document';
import { ApiError, conflict, notFound } from '../api/errors';
import { checksService, type DocumentCheck } from '../checks/access';
import { countsOf } from '../checks/results';
import { collab } from '../collab/access';
import { LOCK_HASH_FORMAT, LOCK_HASH_RECIPE } from './hash';
import { bodyOfState, contentHash } from './snapshot';
import type { VersionChecks, VersionClaim, VersionDetail, VersionSummary } from './types';

type VersionRow = typeof schema.derivationVersions.$inferSelect;

export function checksOf(check: DocumentCheck): VersionChecks {
  const claims: VersionClaim[] = check.claims.map((c) => ({
    stepId: c.stepId,
    claimId: c.claimId,
    position: c.position,
    kind: c.kind,
    flowStepId: c.flowStepId,
    status: c.result.status,
    result: c.result,
  }));
  return { checkedAt: new Date().toISOString(), summary: countsOf(claims.map((c) => c.status)), claims };
}

export function requireChecks() {
  const service = checksService();
  if (!service) throw new ApiError(503, 'The server cannot check claims right now (its check service is not running); nothing was saved.');
  return service;
}

/** One save or lock at a time per derivation (numbers and "already locked" stay exact). */
const QUEUE_KEY = Symbol.for('marginalia.versions.queue');
type GlobalWithQueue = typeof globalThis & { [QUEUE_KEY]?: Map<string, Promise<unknown>> };

export function oneAtATime<T>(derivationId: string, work: () => Promise<T>): Promise<T> {
  const g = globalThis as GlobalWithQueue;
  const queue = (g[QUEUE_KEY] ??= new Map());
  const before = queue.get(derivationId) ?? Promise.resolve();
  const run = before.then(work, work);
  const tail = run.catch(() => undefined);
  queue.set(derivationId, tail);
  void tail.then(() => {
    if (queue.get(derivationId) === tail) queue.delete(derivationId);
  });
  return run;
}

/** The next version number, with the derivation's row held until the transaction ends. */
export async function nextNumber(tx: Tx, derivationId: string): Promise<number> {
  await tx.select({ id: schema.derivations.id }).from(schema.derivations).where(eq(schema.derivations.id, derivationId)).for('update');
  const [row] = await tx
    .select({ max: sql<number>`coalesce(max(${schema.derivationVersions.number}), 0)::int` })
    .from(schema.derivationVersions)
    .where(eq(schema.derivationVersions.derivationId, derivationId));
  return (row?.max ?? 0) + 1;
}

const creator = alias(schema.users, 'creator');
const locker = alias(schema.users, 'locker');

const summaryColumns = {
  id: schema.derivationVersions.id,
  derivationId: schema.derivationVersions.derivationId,
  number: schema.derivationVersions.number,
  name: schema.derivationVersions.name,
  createdAt: schema.derivationVersions.createdAt,
  creatorId: creator.id,
  creatorName: creator.name,
  lockedAt: schema.derivationVersions.lockedAt,
  lockerId: locker.id,
  lockerName: locker.name,
  lockSha256: schema.derivationVersions.lockSha256,
  checks: schema.derivationVersions.checks,
};

type SummaryRow = { [K in keyof typeof summaryColumns]: unknown } & {
  id: string;
  derivationId: string;
  number: number;
  name: string;
  createdAt: Date;
  creatorId: string | null;
  creatorName: string | null;
  lockedAt: Date | null;
  lockerId: string | null;
  lockerName: string | null;
  lockSha256: string | null;
  checks: unknown;
};

function summaryOf(row: SummaryRow): VersionSummary {
  const checks = row.checks as VersionChecks;
  return {
    id: row.id,
    derivationId: row.derivationId,
    number: row.number,
    name: row.name,
    createdAt: row.createdAt,
    createdBy: row.creatorId ? { id: row.creatorId, name: row.creatorName ?? '' } : null,
    summary: { ...checks.summary, claims: checks.claims.length },
    locked:
      row.lockedAt && row.lockSha256
        ? { lockedAt: row.lockedAt, lockedBy: row.lockerId ? { id: row.lockerId, name: row.lockerName ?? '' } : null, sha256: row.lockSha256 }
        : null,
  };
}

function selectSummaries() {
  return getDb()
    .select(summaryColumns)
    .from(schema.derivationVersions)
    .leftJoin(creator, eq(creator.id, schema.derivationVersions.createdBy))
    .leftJoin(locker, eq(locker.id, schema.derivationVersions.lockedBy));
}

/** The derivation's versions, newest first. */
export async function listVersions(derivationId: string): Promise<VersionSummary[]> {
  const rows = await selectSummaries()
    .where(eq(schema.derivationVersions.derivationId, derivationId))
    .orderBy(desc(schema.derivationVersions.number));
  return rows.map((row) => summaryOf(row as SummaryRow));
}

/** A version of this derivation (404 for another derivation's, so ids cannot be probed across). */
export async function versionRow(derivationId: string, versionId: string): Promise<VersionRow> {
  const [row] = await getDb()
    .select()
    .from(schema.derivationVersions)
    .where(and(eq(schema.derivationVersions.id, versionId), eq(schema.derivationVersions.derivationId, derivationId)));
  if (!row) throw notFound('No such version of this derivation.');
  return row;
}

export async function versionDetail(versionId: string): Promise<VersionDetail> {
  const db = getDb();
  const [row] = await selectSummaries().where(eq(schema.derivationVersions.id, versionId));
  if (!row) throw notFound('No such version.');
  const [extra] = await db
    .select({
      contentSha256: schema.derivationVersions.contentSha256,
      snapshotBytes: sql<number>`octet_length(${schema.derivationVersions.state})::int`,
      title: schema.derivations.title,
      groupId: schema.derivations.groupId,
      groupName: schema.groups.name,
    })
    .from(schema.derivationVersions)
    .innerJoin(schema.derivations, eq(schema.derivations.id, schema.derivationVersions.derivationId))
    .innerJoin(schema.groups, eq(schema.groups.id, schema.derivations.groupId))
    .where(eq(schema.derivationVersions.id, versionId));
  const summary = summaryOf(row as SummaryRow);
  return {
    ...summary,
    derivation: { id: summary.derivationId, title: extra!.title, groupId: extra!.groupId, groupName: extra!.groupName },
    contentSha256: extra!.contentSha256,
    snapshotBytes: extra!.snapshotBytes,
    checks: row.checks as VersionChecks,
    hash: summary.locked ? { format: LOCK_HASH_FORMAT, recipe: LOCK_HASH_RECIPE } : null,
  };
}

function lockedRefusal(row: Pick<VersionRow, 'number' | 'lockedAt'>): ApiError {
  return conflict(`Version ${row.number} is locked and kept as it is: it cannot be changed. Work goes on in the working copy.`);
}

/** The working copy's state and what it holds, read once (every accepted edit committed). */
export async function readWorkingState(derivationId: string): Promise<{ state: Uint8Array; body: DocNode; contentSha256: string }> {
  const state = await collab().encodeState(derivationId);
  const body = bodyOfState(state);
  return { state, body, contentSha256: contentHash(body) };
}

/** Stores a snapshot as a named version (the demo data builds one); the verdicts are checked now. */
export async function saveState(derivationId: string, userId: string, name: string, state: Uint8Array): Promise<VersionDetail> {
  const checks = requireChecks();
  return oneAtATime(derivationId, async () => {
    const body = bodyOfState(state);
    const check = await checks.checkDocument(body, { reuseFrom: derivationId });
    const id = await getDb().transaction(async (tx) => {
      const number = await nextNumber(tx, derivationId);
      const [row] = await tx
        .insert(schema.derivationVersions)
        .values({ derivationId, number, name, createdBy: userId, state, contentSha256: contentHash(body), body, checks: checksOf(check) })
        .returning({ id: schema.derivationVersions.id });
      return row!.id;
    });
    return versionDetail(id);
  });
}

/** Saves the working copy as a named version, with the verdict on each of its claims. */
export async function saveVersion(derivationId: string, userId: string, name: string): Promise<VersionDetail> {
  const checks = requireChecks();
  return oneAtATime(derivationId, async () => {
    const { state, body, contentSha256 } = await readWorkingState(derivationId);
    // Claims unchanged since the background run keep its result; the others are checked now.
    const check = await checks.checkDocument(body, { reuseFrom: derivationId });
    const id = await getDb().transaction(async (tx) => {
      const number = await nextNumber(tx, derivationId);
      const [row] = await tx
        .insert(schema.derivationVersions)
        .values({ derivationId, number, name: name.trim() || `Version ${number}`, createdBy: userId, state, contentSha256, body, checks: checksOf(check) })
        .returning({ id: schema.derivationVersions.id });
      return row!.id;
    });
    return versionDetail(id);
  });
}

export async function renameVersion(derivationId: string, versionId: string, name: string): Promise<VersionDetail> {
  const row = await versionRow(derivationId, versionId);
  if (row.lockedAt) throw lockedRefusal(row);
  await getDb()
    .update(schema.derivationVersions)
    .set({ name: name.trim() })
    .where(and(eq(schema.derivationVersions.id, versionId), sql`${schema.derivationVersions.lockedAt} is null`));
  return versionDetail(versionId);
}

export async function deleteVersion(derivationId: string, versionId: string): Promise<void> {
  const row = await versionRow(derivationId, versionId);
  if (row.lockedAt) throw lockedRefusal(row);
  await getDb()
    .delete(schema.derivationVersions)
    .where(and(eq(schema.derivationVersions.id, versionId), sql`${schema.derivationVersions.lockedAt} is null`));
}

export { lockedRefusal };

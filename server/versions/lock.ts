// The lead's lock. The server checks every claim of the content afresh with flow/ (in the check
// thread, never trusting a browser's or an earlier run's verdict); the lock succeeds only when
// every claim holds, and then stores the snapshot, the check report and the SHA-256 over both in
// one transaction with the derivation's locked-version count. Otherwise it lists the claims that
// do not hold and stores nothing. The same content is locked once.
import { randomUUID } from 'node:crypto';
import { and, eq, isNotNull, isNull, sql } from 'drizzle-orm';
import { getDb, schema, type Tx } from '../../db/client';
import type { DocNode } from '../../flow/document';
import { conflict, notFound } from '../api/errors';
import type { DocumentCheck } from '../checks/access';
import { lockHash } from './hash';
import { announceLock } from './lockMail';
import { buildReport, reportText } from './report';
import { sha256Hex } from './snapshot';
import { checksOf, lockedRefusal, nextNumber, oneAtATime, readWorkingState, requireChecks, versionDetail, versionRow } from './store';
import type { LockOutcome, RefusedClaim } from './types';

interface Locker {
  id: string;
  name: string;
}

const when = (date: Date) => date.toISOString().slice(0, 16).replace('T', ' ') + ' UTC';

/** 409 when this content is already locked as a version of the derivation. */
async function refuseSameContent(db: Pick<Tx, 'select'>, derivationId: string, contentSha256: string): Promise<void> {
  const [twin] = await db
    .select({ number: schema.derivationVersions.number, lockedAt: schema.derivationVersions.lockedAt })
    .from(schema.derivationVersions)
    .where(
      and(
        eq(schema.derivationVersions.derivationId, derivationId),
        eq(schema.derivationVersions.contentSha256, contentSha256),
        isNotNull(schema.derivationVersions.lockedAt),
      ),
    );
  if (twin) {
    throw conflict(`This content is already locked as version ${twin.number} (locked ${when(twin.lockedAt!)}); there is nothing new to lock. Change the working copy first.`);
  }
}

async function derivationFacts(derivationId: string) {
  const [row] = await getDb()
    .select({ id: schema.derivations.id, title: schema.derivations.title, group: schema.groups.name, groupId: schema.groups.id })
    .from(schema.derivations)
    .innerJoin(schema.groups, eq(schema.groups.id, schema.derivations.groupId))
    .where(and(eq(schema.derivations.id, derivationId), isNull(schema.derivations.deletedAt)));
  if (!row) throw notFound('No such derivation.');
  return row;
}

/** Claims that do not hold, in document order, and the refusal in words. */
function refusalOf(check: DocumentCheck): { error: string; claims: RefusedClaim[] } | null {
  const claims = check.claims
    .filter((c) => c.result.status !== 'holds')
    .map((c) => ({ stepId: c.stepId, claimId: c.claimId, kind: c.kind, status: c.result.status, message: c.result.message }));
  if (claims.length === 0) return null;
  const n = claims.length;
  return {
    error: `The lock was refused: ${n} of ${check.claims.length} claim${check.claims.length === 1 ? '' : 's'} ${n === 1 ? 'does' : 'do'} not hold on the server's check. Nothing was stored.`,
    claims,
  };
}

interface LockInput {
  derivationId: string;
  user: Locker;
  /** Lock this saved version; without it, the working copy is saved as a new version and locked. */
  versionId?: string;
  name?: string;
  origin: string;
}

export function lockVersion(input: LockInput): Promise<LockOutcome> {
  const checks = requireChecks();
  return oneAtATime(input.derivationId, async () => {
    const facts = await derivationFacts(input.derivationId);
    const db = getDb();

    let state: Uint8Array;
    let body: DocNode;
    let contentSha256: string;
    let existing: { id: string; number: number; name: string } | null = null;
    if (input.versionId) {
      const row = await versionRow(input.derivationId, input.versionId);
      if (row.lockedAt) {
        throw conflict(`Version ${row.number} is already locked (locked ${when(row.lockedAt)}); a locked version is locked once.`);
      }
      state = row.state;
      body = row.body as DocNode;
      contentSha256 = row.contentSha256;
      existing = { id: row.id, number: row.number, name: row.name };
    } else {
      ({ state, body, contentSha256 } = await readWorkingState(input.derivationId));
    }
    await refuseSameContent(db, input.derivationId, contentSha256);

    const check = await checks.checkDocument(body);
    const refused = refusalOf(check);
    if (refused) return { locked: false, ...refused };

    const lockedAt = new Date();
    const versionId = await db.transaction(async (tx) => {
      await refuseSameContent(tx, input.derivationId, contentSha256);
      const number = existing?.number ?? (await nextNumber(tx, input.derivationId));
      const id = existing?.id ?? randomUUID();
      const name = existing?.name ?? (input.name?.trim() || `Locked version ${number}`);
      const report = reportText(
        buildReport({
          derivation: { id: facts.id, title: facts.title, group: facts.group },
          version: { id, number, name },
          lockedAt,
          lockedBy: input.user,
          snapshotSha256: sha256Hex(state),
          contentSha256,
          check,
        }),
      );
      const locked = { lockedAt, lockedBy: input.user.id, report, lockSha256: lockHash(state, report), checks: checksOf(check) };
      if (existing) {
        const updated = await tx
          .update(schema.derivationVersions)
          .set(locked)
          .where(and(eq(schema.derivationVersions.id, id), isNull(schema.derivationVersions.lockedAt)))
          .returning({ id: schema.derivationVersions.id });
        if (updated.length === 0) throw lockedRefusal({ number, lockedAt });
      } else {
        await tx.insert(schema.derivationVersions).values({ id, derivationId: input.derivationId, number, name, createdBy: input.user.id, state, contentSha256, body, ...locked });
      }
      await tx
        .update(schema.derivations)
        .set({ lockedVersionCount: sql`${schema.derivations.lockedVersionCount} + 1` })
        .where(eq(schema.derivations.id, input.derivationId));
      return id;
    });

    const version = await versionDetail(versionId);
    // Mail goes out after the commit, never inside the transaction; a mail failure is logged only.
    void announceLock({ groupId: facts.groupId, version, lockedBy: input.user, origin: input.origin }).catch((error: unknown) =>
      console.error(`versions: mailing the lock of version ${version.number} of derivation ${facts.id} failed:`, error),
    );
    return { locked: true, version };
  });
}

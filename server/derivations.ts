// Derivations of a group: the list behind the group's table, creation, renaming and deletion.
// Deleting marks the row only (nothing written is lost); a derivation with locked versions cannot
// be deleted, since locked versions are kept for good.
import { and, desc, eq, isNull, ne, sql } from 'drizzle-orm';
import { getDb, schema } from '../db/client';
import { conflict, notFound } from './api/errors';
import { allowedActions, type Action, type Role } from './permissions';

export interface DerivationRow {
  id: string;
  title: string;
  authors: { id: string; name: string }[];
  claimsHolding: number;
  claimsFailing: number;
  claimsCheckedAt: Date | null;
  updatedAt: Date;
  updatedBy: string | null;
  lockedVersions: number;
}

export async function listDerivations(groupId: string): Promise<DerivationRow[]> {
  const db = getDb();
  const editor = db.select({ id: schema.users.id, name: schema.users.name }).from(schema.users).as('editor');
  const rows = await db
    .select({
      id: schema.derivations.id,
      title: schema.derivations.title,
      claimsHolding: schema.derivations.claimsHolding,
      claimsFailing: schema.derivations.claimsFailing,
      claimsCheckedAt: schema.derivations.claimsCheckedAt,
      updatedAt: schema.derivations.updatedAt,
      updatedBy: editor.name,
      lockedVersions: schema.derivations.lockedVersionCount,
      authors: sql<{ id: string; name: string }[]>`coalesce((
        select json_agg(json_build_object('id', u.id, 'name', u.name) order by a.added_at, u.name)
        from ${schema.derivationAuthors} a join ${schema.users} u on u.id = a.user_id
        where a.derivation_id = ${schema.derivations.id}
      ), '[]'::json)`,
    })
    .from(schema.derivations)
    .leftJoin(editor, eq(editor.id, schema.derivations.updatedBy))
    .where(and(eq(schema.derivations.groupId, groupId), isNull(schema.derivations.deletedAt)))
    .orderBy(desc(schema.derivations.updatedAt));
  return rows;
}

async function ensureTitleFree(groupId: string, title: string, exceptId?: string): Promise<void> {
  const conditions = [
    eq(schema.derivations.groupId, groupId),
    isNull(schema.derivations.deletedAt),
    sql`lower(${schema.derivations.title}) = lower(${title})`,
  ];
  if (exceptId) conditions.push(ne(schema.derivations.id, exceptId));
  const [clash] = await getDb().select({ id: schema.derivations.id }).from(schema.derivations).where(and(...conditions));
  if (clash) throw conflict('A derivation with this title already exists in the group.', 'title');
}

export async function createDerivation(groupId: string, userId: string, title: string): Promise<{ id: string; title: string }> {
  const clean = title.trim();
  await ensureTitleFree(groupId, clean);
  return getDb().transaction(async (tx) => {
    const [row] = await tx
      .insert(schema.derivations)
      .values({ groupId, title: clean, createdBy: userId, updatedBy: userId })
      .returning({ id: schema.derivations.id, title: schema.derivations.title });
    await tx.insert(schema.derivationAuthors).values({ derivationId: row!.id, userId });
    return row!;
  });
}

export interface DerivationView {
  id: string;
  title: string;
  groupId: string;
  groupName: string;
  authors: { id: string; name: string }[];
  createdAt: Date;
  updatedAt: Date;
  claimsHolding: number;
  claimsFailing: number;
  lockedVersions: number;
  role: Role;
  actions: Action[];
}

export async function derivationView(derivationId: string, role: Role): Promise<DerivationView> {
  const db = getDb();
  const [row] = await db
    .select({
      id: schema.derivations.id,
      title: schema.derivations.title,
      groupId: schema.derivations.groupId,
      groupName: schema.groups.name,
      createdAt: schema.derivations.createdAt,
      updatedAt: schema.derivations.updatedAt,
      claimsHolding: schema.derivations.claimsHolding,
      claimsFailing: schema.derivations.claimsFailing,
      lockedVersions: schema.derivations.lockedVersionCount,
    })
    .from(schema.derivations)
    .innerJoin(schema.groups, eq(schema.groups.id, schema.derivations.groupId))
    .where(and(eq(schema.derivations.id, derivationId), isNull(schema.derivations.deletedAt)));
  if (!row) throw notFound('No such derivation.');
  const authors = await db
    .select({ id: schema.users.id, name: schema.users.name })
    .from(schema.derivationAuthors)
    .innerJoin(schema.users, eq(schema.users.id, schema.derivationAuthors.userId))
    .where(eq(schema.derivationAuthors.derivationId, derivationId))
    .orderBy(schema.derivationAuthors.addedAt);
  return { ...row, authors, role, actions: allowedActions(role) };
}

/** Records that a user changed the derivation: last edit time, and the user among its authors. */
export async function touchDerivation(derivationId: string, userId: string): Promise<void> {
  const db = getDb();
  await db.transaction(async (tx) => {
    await tx
      .update(schema.derivations)
      .set({ updatedAt: new Date(), updatedBy: userId })
      .where(eq(schema.derivations.id, derivationId));
    await tx.insert(schema.derivationAuthors).values({ derivationId, userId }).onConflictDoNothing();
  });
}

export async function renameDerivation(derivationId: string, groupId: string, userId: string, title: string): Promise<void> {
  const clean = title.trim();
  await ensureTitleFree(groupId, clean, derivationId);
  await getDb()
    .update(schema.derivations)
    .set({ title: clean, updatedAt: new Date(), updatedBy: userId })
    .where(eq(schema.derivations.id, derivationId));
}

export async function deleteDerivation(derivationId: string): Promise<void> {
  const [row] = await getDb()
    .select({ locked: schema.derivations.lockedVersionCount })
    .from(schema.derivations)
    .where(eq(schema.derivations.id, derivationId));
  if (!row) throw notFound('No such derivation.');
  if (row.locked > 0) throw conflict('This derivation has locked versions, which are kept for good; it cannot be deleted.');
  await getDb().update(schema.derivations).set({ deletedAt: new Date() }).where(eq(schema.derivations.id, derivationId));
}

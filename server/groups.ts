// Research groups and their members. Whoever creates a group is its first lead; a group always
// keeps at least one lead (the last one can be neither demoted nor removed).
import { and, asc, count, eq, sql } from 'drizzle-orm';
import { getDb, schema, type Tx } from '../db/client';
import type { MemberRole } from '../db/schema';
import { conflict, notFound } from './api/errors';
import { allowedActions, type Action } from './permissions';

export interface GroupSummary {
  id: string;
  name: string;
  description: string;
  role: MemberRole;
  members: number;
  derivations: number;
}

export async function listGroupsOf(userId: string): Promise<GroupSummary[]> {
  const rows = await getDb()
    .select({
      id: schema.groups.id,
      name: schema.groups.name,
      description: schema.groups.description,
      role: schema.memberships.role,
      members: sql<number>`(select count(*)::int from ${schema.memberships} m where m.group_id = ${schema.groups.id})`,
      derivations: sql<number>`(select count(*)::int from ${schema.derivations} d
        where d.group_id = ${schema.groups.id} and d.deleted_at is null)`,
    })
    .from(schema.memberships)
    .innerJoin(schema.groups, eq(schema.groups.id, schema.memberships.groupId))
    .where(eq(schema.memberships.userId, userId))
    .orderBy(asc(schema.groups.name));
  return rows;
}

export async function createGroup(userId: string, input: { name: string; description: string }): Promise<GroupSummary> {
  return getDb().transaction(async (tx) => {
    const [group] = await tx
      .insert(schema.groups)
      .values({ name: input.name.trim(), description: input.description.trim(), createdBy: userId })
      .returning();
    await tx.insert(schema.memberships).values({ groupId: group!.id, userId, role: 'lead' });
    return { id: group!.id, name: group!.name, description: group!.description, role: 'lead', members: 1, derivations: 0 };
  });
}

export interface GroupView {
  id: string;
  name: string;
  description: string;
  role: MemberRole;
  /** What the viewer may do here, from the permissions table. */
  actions: Action[];
}

export async function groupView(groupId: string, role: MemberRole): Promise<GroupView> {
  const [group] = await getDb().select().from(schema.groups).where(eq(schema.groups.id, groupId));
  if (!group) throw notFound('No such group.');
  return { id: group.id, name: group.name, description: group.description, role, actions: allowedActions(role) };
}

export async function updateGroup(groupId: string, changes: { name?: string; description?: string }): Promise<void> {
  const set: Partial<typeof schema.groups.$inferInsert> = {};
  if (changes.name !== undefined) set.name = changes.name.trim();
  if (changes.description !== undefined) set.description = changes.description.trim();
  if (Object.keys(set).length === 0) return;
  await getDb().update(schema.groups).set(set).where(eq(schema.groups.id, groupId));
}

export interface MemberView {
  userId: string;
  name: string;
  email: string;
  role: MemberRole;
  joinedAt: Date;
}

export async function listMembers(groupId: string): Promise<MemberView[]> {
  return getDb()
    .select({
      userId: schema.users.id,
      name: schema.users.name,
      email: schema.users.email,
      role: schema.memberships.role,
      joinedAt: schema.memberships.joinedAt,
    })
    .from(schema.memberships)
    .innerJoin(schema.users, eq(schema.users.id, schema.memberships.userId))
    .where(eq(schema.memberships.groupId, groupId))
    .orderBy(asc(schema.users.name));
}

async function membership(tx: Tx, groupId: string, userId: string) {
  const [row] = await tx
    .select()
    .from(schema.memberships)
    .where(and(eq(schema.memberships.groupId, groupId), eq(schema.memberships.userId, userId)));
  if (!row) throw notFound('This person is not a member of the group.');
  return row;
}

async function leadCount(tx: Tx, groupId: string): Promise<number> {
  const [row] = await tx
    .select({ n: count() })
    .from(schema.memberships)
    .where(and(eq(schema.memberships.groupId, groupId), eq(schema.memberships.role, 'lead')));
  return row?.n ?? 0;
}

const LAST_LEAD = 'A group needs at least one lead: make another member lead first.';

export async function changeRole(groupId: string, userId: string, role: MemberRole): Promise<void> {
  await getDb().transaction(async (tx) => {
    const current = await membership(tx, groupId, userId);
    if (current.role === role) return;
    if (current.role === 'lead' && (await leadCount(tx, groupId)) <= 1) throw conflict(LAST_LEAD, 'role');
    await tx
      .update(schema.memberships)
      .set({ role })
      .where(and(eq(schema.memberships.groupId, groupId), eq(schema.memberships.userId, userId)));
  });
}

export async function removeMember(groupId: string, userId: string): Promise<void> {
  await getDb().transaction(async (tx) => {
    const current = await membership(tx, groupId, userId);
    if (current.role === 'lead' && (await leadCount(tx, groupId)) <= 1) throw conflict(LAST_LEAD);
    await tx
      .delete(schema.memberships)
      .where(and(eq(schema.memberships.groupId, groupId), eq(schema.memberships.userId, userId)));
  });
}

// The ONE rule table of who may do what in a research group, and the checks built on it. Every
// route handler (through server/api/route.ts), the collaboration socket and the lock ask here.
import { and, eq, isNull } from 'drizzle-orm';
import { getDb, schema } from '../db/client';
import { memberRoles, type MemberRole } from '../db/schema';

export const roles = memberRoles;
export type Role = MemberRole;

export const actions = [
  'read', // open the group, its members and derivations, follow plots
  'runChecks', // run a claim's check in the browser; nothing is stored
  'recordChecks', // store a check run's results (the holds / fails counts)
  'createDerivation',
  'renameDerivation',
  'deleteDerivation',
  'editText', // change a derivation's working copy (text, flow blocks, claims)
  'saveVersion', // save a named version
  'uploadDataset',
  'remark', // leave a remark or reply
  'resolveRemark', // resolve or reopen a remark thread
  'signOff', // sign off a step as checked
  'lock', // lock a version
  'shareLink', // make or revoke a share link to a locked version
  'invite', // invite members, see and revoke pending invitations
  'removeMember',
  'changeRole',
  'manageGroup', // rename the group, edit its description
] as const;
export type Action = (typeof actions)[number];

const everyone: readonly Role[] = ['lead', 'author', 'reviewer', 'reader'];
const writers: readonly Role[] = ['lead', 'author'];
const discussants: readonly Role[] = ['lead', 'author', 'reviewer'];
const leadOnly: readonly Role[] = ['lead'];

/**
 * Which roles may take each action. lead: everything an author may, plus managing members, locks
 * and share links; author: derivations, versions, data; reviewer: read, run checks, remarks,
 * sign-offs, no text edits; reader: read and run checks locally, nothing is written.
 * A lead may also sign off (a lead reviews); an author may not sign off their own group's steps.
 */
export const ruleTable: Readonly<Record<Action, readonly Role[]>> = {
  read: everyone,
  runChecks: everyone,
  recordChecks: discussants,
  createDerivation: writers,
  renameDerivation: writers,
  deleteDerivation: writers,
  editText: writers,
  saveVersion: writers,
  uploadDataset: writers,
  remark: discussants,
  resolveRemark: discussants,
  signOff: ['lead', 'reviewer'],
  lock: leadOnly,
  shareLink: leadOnly,
  invite: leadOnly,
  removeMember: leadOnly,
  changeRole: leadOnly,
  manageGroup: leadOnly,
};

export function isRole(value: unknown): value is Role {
  return typeof value === 'string' && (roles as readonly string[]).includes(value);
}

/** May a member with this role (or a non-member: null) take this action? */
export function may(role: Role | null | undefined, action: Action): boolean {
  return role != null && ruleTable[action].includes(role);
}

/** Every action a role may take, e.g. for the interface to hide what it cannot do. */
export function allowedActions(role: Role | null | undefined): Action[] {
  return actions.filter((action) => may(role, action));
}

// ---- checks against the database -------------------------------------------------------------

export class AccessError extends Error {
  constructor(
    readonly status: 403 | 404,
    message: string,
  ) {
    super(message);
    this.name = 'AccessError';
  }
}

export interface GroupAccess {
  groupId: string;
  role: Role;
  actions: Action[];
}

export interface DerivationAccess extends GroupAccess {
  derivationId: string;
}

export async function roleInGroup(userId: string, groupId: string): Promise<Role | null> {
  const [row] = await getDb()
    .select({ role: schema.memberships.role })
    .from(schema.memberships)
    .where(and(eq(schema.memberships.groupId, groupId), eq(schema.memberships.userId, userId)));
  return row?.role ?? null;
}

function grant(role: Role | null, action: Action, what: string): Role {
  if (role === null) throw new AccessError(403, `You are not a member of the group this ${what} belongs to.`);
  if (!may(role, action)) throw new AccessError(403, `As ${role} you may not ${describe(action)}.`);
  return role;
}

/** Resolves the user's role in a group and checks the action; 404 unknown group, 403 refused. */
export async function authorizeGroup(userId: string, groupId: string, action: Action): Promise<GroupAccess> {
  const [group] = await getDb().select({ id: schema.groups.id }).from(schema.groups).where(eq(schema.groups.id, groupId));
  if (!group) throw new AccessError(404, 'No such group.');
  const role = grant(await roleInGroup(userId, groupId), action, 'page');
  return { groupId, role, actions: allowedActions(role) };
}

/**
 * Resolves the user's role for a derivation through its group's membership and checks the action.
 * Used by route handlers, the collaboration socket (read / editText) and the lock.
 */
export async function authorizeDerivation(userId: string, derivationId: string, action: Action): Promise<DerivationAccess> {
  const [row] = await getDb()
    .select({ groupId: schema.derivations.groupId, role: schema.memberships.role })
    .from(schema.derivations)
    .leftJoin(
      schema.memberships,
      and(eq(schema.memberships.groupId, schema.derivations.groupId), eq(schema.memberships.userId, userId)),
    )
    .where(and(eq(schema.derivations.id, derivationId), isNull(schema.derivations.deletedAt)));
  if (!row) throw new AccessError(404, 'No such derivation.');
  const role = grant(row.role, action, 'derivation');
  return { groupId: row.groupId, derivationId, role, actions: allowedActions(role) };
}

const actionWords: Record<Action, string> = {
  read: 'read this',
  runChecks: 'run checks',
  recordChecks: 'record check results',
  createDerivation: 'create derivations',
  renameDerivation: 'rename derivations',
  deleteDerivation: 'delete derivations',
  editText: 'edit the text',
  saveVersion: 'save versions',
  uploadDataset: 'upload datasets',
  remark: 'leave remarks',
  resolveRemark: 'resolve remarks',
  signOff: 'sign off steps',
  lock: 'lock versions',
  shareLink: 'make share links',
  invite: 'invite members',
  removeMember: 'remove members',
  changeRole: 'change roles',
  manageGroup: 'change the group',
};

export function describe(action: Action): string {
  return actionWords[action];
}

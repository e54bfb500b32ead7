// Invitations by e-mail: the lead names an address and a role; the link in the message carries a
// random token (only its SHA-256 is stored); following it, the invited person joins the group,
// registering first if they have no account. A link works once and expires.
import { createHash, randomBytes } from 'node:crypto';
import { and, desc, eq, gt, isNull } from 'drizzle-orm';
import { getDb, schema, type Tx } from '../db/client';
import type { MemberRole } from '../db/schema';
import { ApiError, conflict, forbidden, notFound } from './api/errors';
import { sendMail } from './mail';
import { invitationMail } from './mailTemplates';

type InvitationRow = typeof schema.invitations.$inferSelect;

export type InvitationState = 'pending' | 'accepted' | 'revoked' | 'expired';

/** Lifetime of an invitation link in seconds (MARGINALIA_INVITATION_TTL overrides; default 7 days). */
export function invitationSeconds(): number {
  const configured = Number(process.env.MARGINALIA_INVITATION_TTL);
  return Number.isFinite(configured) && configured > 0 ? configured : 7 * 24 * 60 * 60;
}

export function hashToken(token: string): string {
  return createHash('sha256').update(token).digest('hex');
}

export function stateOf(row: Pick<InvitationRow, 'acceptedAt' | 'revokedAt' | 'expiresAt'>, now = new Date()): InvitationState {
  if (row.acceptedAt) return 'accepted';
  if (row.revokedAt) return 'revoked';
  if (row.expiresAt <= now) return 'expired';
  return 'pending';
}

const refusal: Record<Exclude<InvitationState, 'pending'>, string> = {
  accepted: 'This invitation has already been used.',
  revoked: 'This invitation was withdrawn by the group lead.',
  expired: 'This invitation has expired. Ask the group lead for a new one.',
};

export interface PendingInvitationView {
  id: string;
  email: string;
  role: MemberRole;
  invitedBy: string | null;
  createdAt: Date;
  expiresAt: Date;
}

export async function listPendingInvitations(groupId: string): Promise<PendingInvitationView[]> {
  const rows = await getDb()
    .select({
      id: schema.invitations.id,
      email: schema.invitations.email,
      role: schema.invitations.role,
      invitedBy: schema.users.name,
      createdAt: schema.invitations.createdAt,
      expiresAt: schema.invitations.expiresAt,
    })
    .from(schema.invitations)
    .leftJoin(schema.users, eq(schema.users.id, schema.invitations.invitedBy))
    .where(
      and(
        eq(schema.invitations.groupId, groupId),
        isNull(schema.invitations.acceptedAt),
        isNull(schema.invitations.revokedAt),
        gt(schema.invitations.expiresAt, new Date()),
      ),
    )
    .orderBy(desc(schema.invitations.createdAt));
  return rows;
}

export interface NewInvitation {
  groupId: string;
  email: string;
  role: MemberRole;
  invitedBy: { id: string; name: string };
  origin: string;
}

/** Creates the invitation and mails its link; if the mail cannot be sent, nothing is kept. */
export async function inviteMember(input: NewInvitation): Promise<PendingInvitationView> {
  const db = getDb();
  const email = input.email.trim().toLowerCase();

  const [member] = await db
    .select({ userId: schema.memberships.userId })
    .from(schema.memberships)
    .innerJoin(schema.users, eq(schema.users.id, schema.memberships.userId))
    .where(and(eq(schema.memberships.groupId, input.groupId), eq(schema.users.email, email)));
  if (member) throw conflict(`${email} is already a member of this group.`, 'email');
  const pending = await listPendingInvitations(input.groupId);
  if (pending.some((p) => p.email === email)) {
    throw conflict(`${email} already has a pending invitation. Withdraw it first to send a new one.`, 'email');
  }

  const [group] = await db.select({ name: schema.groups.name }).from(schema.groups).where(eq(schema.groups.id, input.groupId));
  if (!group) throw notFound('No such group.');

  const token = randomBytes(32).toString('base64url');
  const expiresAt = new Date(Date.now() + invitationSeconds() * 1000);
  const [row] = await db
    .insert(schema.invitations)
    .values({ groupId: input.groupId, email, role: input.role, tokenHash: hashToken(token), invitedBy: input.invitedBy.id, expiresAt })
    .returning();

  const link = `${input.origin}/invitations/${token}`;
  const days = Math.max(1, Math.round(invitationSeconds() / 86400));
  try {
    await sendMail({ to: email, ...invitationMail({ inviter: input.invitedBy.name, groupName: group.name, role: input.role, link, days }) });
  } catch (error) {
    await db.delete(schema.invitations).where(eq(schema.invitations.id, row!.id));
    console.error(`Mailing an invitation failed: ${(error as Error).message}`);
    throw new ApiError(503, 'The invitation could not be mailed, so it was not kept. Check the mail settings and try again.');
  }
  return { id: row!.id, email, role: row!.role, invitedBy: input.invitedBy.name, createdAt: row!.createdAt, expiresAt };
}

export async function revokeInvitation(groupId: string, invitationId: string): Promise<void> {
  const [row] = await getDb()
    .select()
    .from(schema.invitations)
    .where(and(eq(schema.invitations.id, invitationId), eq(schema.invitations.groupId, groupId)));
  if (!row) throw notFound('No such invitation in this group.');
  const state = stateOf(row);
  if (state !== 'pending') throw conflict(refusal[state]);
  await getDb().update(schema.invitations).set({ revokedAt: new Date() }).where(eq(schema.invitations.id, invitationId));
}

export interface InvitationView {
  groupId: string;
  groupName: string;
  email: string;
  role: MemberRole;
  invitedBy: string | null;
  expiresAt: Date;
  state: InvitationState;
  /** Whether the invited address already has an account (then: sign in; otherwise: register). */
  hasAccount: boolean;
}

async function rowByToken(token: string): Promise<InvitationRow | undefined> {
  const [row] = await getDb().select().from(schema.invitations).where(eq(schema.invitations.tokenHash, hashToken(token)));
  return row;
}

/** What the invitation page shows; anyone holding the link may see it. */
export async function invitationByToken(token: string): Promise<InvitationView> {
  const row = await rowByToken(token);
  if (!row) throw notFound('This invitation link is not valid. Check that you copied all of it.');
  const db = getDb();
  const [group] = await db.select({ name: schema.groups.name }).from(schema.groups).where(eq(schema.groups.id, row.groupId));
  const [inviter] = row.invitedBy
    ? await db.select({ name: schema.users.name }).from(schema.users).where(eq(schema.users.id, row.invitedBy))
    : [];
  const [account] = await db.select({ id: schema.users.id }).from(schema.users).where(eq(schema.users.email, row.email));
  return {
    groupId: row.groupId,
    groupName: group?.name ?? '',
    email: row.email,
    role: row.role,
    invitedBy: inviter?.name ?? null,
    expiresAt: row.expiresAt,
    state: stateOf(row),
    hasAccount: Boolean(account),
  };
}

/** The invitation behind a token if it can still be accepted; otherwise a clear refusal. */
export async function pendingInvitationByToken(token: string): Promise<InvitationRow> {
  const row = await rowByToken(token);
  if (!row) throw notFound('This invitation link is not valid. Check that you copied all of it.');
  const state = stateOf(row);
  if (state !== 'pending') throw conflict(refusal[state]);
  return row;
}

/** Joins the group inside a transaction; the row is claimed first so a link works only once. */
export async function acceptInvitationInTx(tx: Tx, invitation: InvitationRow, userId: string): Promise<string> {
  const claimed = await tx
    .update(schema.invitations)
    .set({ acceptedAt: new Date(), acceptedBy: userId })
    .where(and(eq(schema.invitations.id, invitation.id), isNull(schema.invitations.acceptedAt), isNull(schema.invitations.revokedAt)))
    .returning({ id: schema.invitations.id });
  if (claimed.length === 0) throw conflict(refusal.accepted);
  await tx
    .insert(schema.memberships)
    .values({ groupId: invitation.groupId, userId, role: invitation.role })
    .onConflictDoNothing();
  return invitation.groupId;
}

export async function acceptInvitation(token: string, user: { id: string; email: string }): Promise<{ groupId: string }> {
  const invitation = await pendingInvitationByToken(token);
  if (invitation.email !== user.email.toLowerCase()) {
    throw forbidden(`This invitation was sent to ${invitation.email}. Sign in with that address to accept it.`);
  }
  const groupId = await getDb().transaction((tx) => acceptInvitationInTx(tx, invitation, user.id));
  return { groupId };
}

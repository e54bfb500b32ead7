// Accounts: registration with a bcrypt-hashed password, optionally accepting an invitation in the
// same transaction (a new member registers on the way in).
import { eq } from 'drizzle-orm';
import { getDb, schema } from '../db/client';
import { conflict } from './api/errors';
import { acceptInvitationInTx, pendingInvitationByToken } from './invitations';
import { hashPassword } from './passwords';

export interface Registration {
  name: string;
  email: string;
  password: string;
  /** An invitation link's token: its address is then known to be the user's. */
  invitation?: string;
}

export interface RegisteredUser {
  id: string;
  email: string;
  name: string;
  joinedGroupId: string | null;
}

export async function registerUser(input: Registration): Promise<RegisteredUser> {
  const email = input.email.trim().toLowerCase();
  const db = getDb();
  const [taken] = await db.select({ id: schema.users.id }).from(schema.users).where(eq(schema.users.email, email));
  if (taken) throw conflict('An account with this e-mail already exists. Sign in instead.', 'email');

  const invitation = input.invitation ? await pendingInvitationByToken(input.invitation) : null;
  if (invitation && invitation.email !== email) {
    throw conflict(`This invitation is for ${invitation.email}; register with that address.`, 'email');
  }
  const passwordHash = await hashPassword(input.password);

  try {
    return await db.transaction(async (tx) => {
      const [user] = await tx
        .insert(schema.users)
        .values({ email, name: input.name.trim(), passwordHash, emailVerified: invitation ? new Date() : null })
        .returning({ id: schema.users.id, email: schema.users.email, name: schema.users.name });
      let joinedGroupId: string | null = null;
      if (invitation) joinedGroupId = await acceptInvitationInTx(tx, invitation, user!.id);
      return { ...user!, joinedGroupId };
    });
  } catch (error) {
    // Two registrations for one address raced; the database kept the first.
    if ((error as { code?: unknown }).code === '23505') {
      throw conflict('An account with this e-mail already exists. Sign in instead.', 'email');
    }
    throw error;
  }
}

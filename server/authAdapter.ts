// The small database adapter next-auth's e-mail sign-in link needs: users by id and e-mail, and
// one-time tokens. Sessions are JWTs, so no session table. No third-party accounts are linked.
import { and, eq } from 'drizzle-orm';
import type { Adapter, AdapterUser } from 'next-auth/adapters';
import { getDb, schema } from '../db/client';

type UserRow = typeof schema.users.$inferSelect;

function toAdapterUser(row: UserRow): AdapterUser {
  return { id: row.id, email: row.email, name: row.name, emailVerified: row.emailVerified };
}

async function userWhere(condition: ReturnType<typeof eq>): Promise<AdapterUser | null> {
  const [row] = await getDb().select().from(schema.users).where(condition);
  return row ? toAdapterUser(row) : null;
}

export function marginaliaAdapter(): Adapter {
  return {
    async createUser(user: Omit<AdapterUser, 'id'>) {
      const email = user.email.toLowerCase();
      const [row] = await getDb()
        .insert(schema.users)
        .values({ email, name: user.name || email.split('@')[0]!, emailVerified: user.emailVerified })
        .returning();
      return toAdapterUser(row!);
    },
    getUser: (id) => userWhere(eq(schema.users.id, id)),
    getUserByEmail: (email) => userWhere(eq(schema.users.email, email.toLowerCase())),
    getUserByAccount: async () => null,
    async updateUser(user) {
      const changes: Partial<typeof schema.users.$inferInsert> = {};
      if (user.emailVerified !== undefined) changes.emailVerified = user.emailVerified;
      if (user.name) changes.name = user.name;
      const [row] =
        Object.keys(changes).length > 0
          ? await getDb().update(schema.users).set(changes).where(eq(schema.users.id, user.id)).returning()
          : await getDb().select().from(schema.users).where(eq(schema.users.id, user.id));
      if (!row) throw new Error('No such user.');
      return toAdapterUser(row);
    },
    async createVerificationToken(token) {
      await getDb().insert(schema.signInTokens).values({ identifier: token.identifier, tokenHash: token.token, expires: token.expires });
      return token;
    },
    // One use only: the row is deleted as it is read, so a second click on the link fails.
    async useVerificationToken({ identifier, token }) {
      const [row] = await getDb()
        .delete(schema.signInTokens)
        .where(and(eq(schema.signInTokens.identifier, identifier), eq(schema.signInTokens.tokenHash, token)))
        .returning();
      return row ? { identifier: row.identifier, token: row.tokenHash, expires: row.expires } : null;
    },
  };
}

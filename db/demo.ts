// The demo data: an invented research group, its four members holding the four roles, and one
// derivation. Everything here is made up; later parts add the derivation's content, claims,
// versions, remarks and dataset. Loaded only into an empty database.
import { sql } from 'drizzle-orm';
import type { Db } from './client';
import { insertDemoDataset } from './demoDataset';
import * as schema from './schema';
import type { MemberRole } from './schema';

export { demoBody, type DemoStep } from './demoBody';

export interface DemoAccount {
  role: MemberRole;
  name: string;
  email: string;
  password: string;
}

export const demoAccounts: readonly DemoAccount[] = [
  { role: 'lead', name: 'Maren Quist', email: 'maren@chains.example', password: 'quist-lead-demo' },
  { role: 'author', name: 'Teodor Ashby', email: 'teodor@chains.example', password: 'ashby-author-demo' },
  { role: 'reviewer', name: 'Ilse Brandvold', email: 'ilse@chains.example', password: 'brandvold-review-demo' },
  { role: 'reader', name: 'Noor Kestrel', email: 'noor@chains.example', password: 'kestrel-reader-demo' },
];

export const demoGroup = {
  name: 'Chain Growth Group',
  description:
    'How does the size of a long self-avoiding chain on a lattice grow in four dimensions, ' +
    'where the mean-square end-to-end distance picks up a logarithmic correction?',
};

export const demoDerivationTitle = 'Four-dimensional chains: the logarithmic correction to the mean-square size';

/** Adds the demo data if the database has no users yet; returns whether it did. */
export async function loadDemoData(db: Db, hashPassword: (password: string) => Promise<string>): Promise<boolean> {
  const [{ count } = { count: 0 }] = await db.select({ count: sql<number>`count(*)::int` }).from(schema.users);
  if (count > 0) return false;

  const hashes: string[] = [];
  for (const account of demoAccounts) hashes.push(await hashPassword(account.password));

  await db.transaction(async (tx) => {
    const users = await tx
      .insert(schema.users)
      .values(
        demoAccounts.map((account, i) => ({
          email: account.email,
          name: account.name,
          passwordHash: hashes[i]!,
          emailVerified: new Date(),
        })),
      )
      .returning({ id: schema.users.id, email: schema.users.email });
    const idOf = (role: MemberRole): string => {
      const email = demoAccounts.find((a) => a.role === role)!.email;
      return users.find((u) => u.email === email)!.id;
    };

    const [group] = await tx
      .insert(schema.groups)
      .values({ ...demoGroup, createdBy: idOf('lead') })
      .returning({ id: schema.groups.id });
    await tx.insert(schema.memberships).values(
      demoAccounts.map((account) => ({ groupId: group!.id, userId: idOf(account.role), role: account.role })),
    );

    const [derivation] = await tx
      .insert(schema.derivations)
      .values({ groupId: group!.id, title: demoDerivationTitle, createdBy: idOf('lead'), updatedBy: idOf('author') })
      .returning({ id: schema.derivations.id });
    await tx.insert(schema.derivationAuthors).values([
      { derivationId: derivation!.id, userId: idOf('lead') },
      { derivationId: derivation!.id, userId: idOf('author') },
    ]);
    await insertDemoDataset(tx, group!.id, idOf('author'));
  });
  return true;
}

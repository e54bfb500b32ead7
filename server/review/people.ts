// Names of the people review shows (signers, remark writers), looked up together.
import { inArray } from 'drizzle-orm';
import { getDb, schema } from '../../db/client';

export interface PersonRef {
  id: string | null;
  name: string;
}

/** A user no longer in the database (their rows keep a null id). */
export const formerMember: PersonRef = { id: null, name: 'a former member' };

export async function peopleById(ids: Iterable<string | null | undefined>): Promise<Map<string, PersonRef>> {
  const wanted = [...new Set([...ids].filter((id): id is string => typeof id === 'string'))];
  if (wanted.length === 0) return new Map();
  const rows = await getDb().select({ id: schema.users.id, name: schema.users.name }).from(schema.users).where(inArray(schema.users.id, wanted));
  return new Map(rows.map((row) => [row.id, row]));
}

export function personOf(people: ReadonlyMap<string, PersonRef>, id: string | null | undefined): PersonRef {
  return (id && people.get(id)) || formerMember;
}

// The one database of this process. The custom server opens it (db/open.ts) and registers the
// PGlite instance on globalThis, so that route handlers, which Next.js bundles as separate module
// copies, reach the same instance. Each module copy wraps it in its own Drizzle object.
import type { PGlite } from '@electric-sql/pglite';
import { drizzle, type PgliteDatabase } from 'drizzle-orm/pglite';
import * as schema from './schema';

export type Db = PgliteDatabase<typeof schema>;
/** The type of a transaction handle, for functions that run inside `db.transaction`. */
export type Tx = Parameters<Parameters<Db['transaction']>[0]>[0];

interface Registered {
  client: PGlite;
  /** Absolute data folder, or null for an in-memory database. */
  dataDir: string | null;
}

const KEY = Symbol.for('marginalia.database');
type GlobalWithDb = typeof globalThis & { [KEY]?: Registered };

let wrapped: { client: PGlite; db: Db } | undefined;

export function registerDatabase(entry: Registered | undefined): void {
  (globalThis as GlobalWithDb)[KEY] = entry;
}

export function registeredDatabase(): Registered | undefined {
  return (globalThis as GlobalWithDb)[KEY];
}

/** The process's database; throws if the server has not opened it. */
export function getDb(): Db {
  const entry = registeredDatabase();
  if (!entry) {
    throw new Error('The database is not open: Marginalia must be started through server/index.ts.');
  }
  if (!wrapped || wrapped.client !== entry.client) {
    wrapped = { client: entry.client, db: drizzle({ client: entry.client, schema }) };
  }
  return wrapped.db;
}

export { schema };

// Opens the process's database: takes the data-folder lock, starts PGlite, applies the migrations
// in db/migrations and registers the instance for getDb(). Node-only (the server and scripts).
import { mkdir } from 'node:fs/promises';
import path from 'node:path';
import { PGlite } from '@electric-sql/pglite';
import { drizzle } from 'drizzle-orm/pglite';
import { migrate } from 'drizzle-orm/pglite/migrator';
import { registerDatabase, registeredDatabase, type Db } from './client';
import { lockDataFolder, type HeldLock } from './lock';
import * as schema from './schema';

export const IN_MEMORY = 'memory://';

export interface OpenDatabaseOptions {
  /** A folder path, or `memory://` for a database that lives only as long as the process. */
  dataDir: string;
  migrationsFolder?: string;
  /** Called if the folder's lock is lost while running (the server then shuts down). */
  onLockLost?: (error: Error) => void;
}

export interface OpenedDatabase {
  db: Db;
  client: PGlite;
  /** Absolute data folder, or null in memory. */
  dataDir: string | null;
  close(): Promise<void>;
}

export const defaultMigrationsFolder = (): string => path.join(process.cwd(), 'db', 'migrations');

export async function openDatabase(options: OpenDatabaseOptions): Promise<OpenedDatabase> {
  if (registeredDatabase()) throw new Error('The database of this process is already open.');
  const inMemory = options.dataDir === IN_MEMORY;
  const dataDir = inMemory ? null : path.resolve(options.dataDir);

  let lock: HeldLock | null = null;
  if (dataDir) {
    await mkdir(dataDir, { recursive: true });
    lock = await lockDataFolder(dataDir, options.onLockLost ?? ((error) => { throw error; }));
  }

  let client: PGlite | undefined;
  try {
    client = inMemory ? new PGlite() : new PGlite(path.join(dataDir!, 'pg'));
    await client.waitReady;
    const db = drizzle({ client, schema });
    await migrate(db, { migrationsFolder: options.migrationsFolder ?? defaultMigrationsFolder() });
    registerDatabase({ client, dataDir });
    const opened = client;
    return {
      db,
      client: opened,
      dataDir,
      async close() {
        registerDatabase(undefined);
        if (!opened.closed) await opened.close();
        await lock?.release();
      },
    };
  } catch (error) {
    if (client && !client.closed) await client.close().catch(() => undefined);
    await lock?.release();
    throw error;
  }
}

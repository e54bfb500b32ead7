// Opens the process's database: takes the data-folder lock, starts PGlite, applies the migrations
// in db/migrations and registers the instance for getDb(). Node-only (the server and scripts).
import { createHash } from 'node:crypto';
import { mkdir, readdir, readFile, rename, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
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

/**
 * A fresh in-memory database. Initialising PostgreSQL takes seconds; an empty, migrated database
 * is therefore kept once as a template in the temp folder (keyed by the migrations and the PGlite
 * version) and later in-memory databases start from a copy of it.
 */
async function templateFile(migrationsFolder: string): Promise<string> {
  const hash = createHash('sha256');
  const pglitePackage = path.join(process.cwd(), 'node_modules', '@electric-sql', 'pglite', 'package.json');
  hash.update(await readFile(pglitePackage).catch(() => Buffer.from('unknown')));
  for (const name of (await readdir(migrationsFolder, { recursive: true })).sort()) {
    const file = path.join(migrationsFolder, name);
    hash.update(name).update(await readFile(file).catch(() => Buffer.alloc(0)));
  }
  return path.join(tmpdir(), `marginalia-empty-db-${hash.digest('hex').slice(0, 16)}.tar`);
}

async function openInMemory(migrationsFolder: string): Promise<PGlite> {
  const template = await templateFile(migrationsFolder);
  const saved = await readFile(template).catch(() => null);
  if (saved) {
    try {
      const client = new PGlite({ loadDataDir: new Blob([saved]) });
      await client.waitReady;
      await migrate(drizzle({ client, schema }), { migrationsFolder });
      return client;
    } catch {
      await rm(template, { force: true }); // unreadable: start afresh below
    }
  }
  const client = new PGlite();
  await client.waitReady;
  await migrate(drizzle({ client, schema }), { migrationsFolder });
  const dump = Buffer.from(await (await client.dumpDataDir('none')).arrayBuffer());
  const partial = `${template}.${process.pid}.part`;
  await writeFile(partial, dump);
  await rename(partial, template);
  return client;
}

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
    const migrationsFolder = options.migrationsFolder ?? defaultMigrationsFolder();
    if (inMemory) {
      client = await openInMemory(migrationsFolder);
    } else {
      client = new PGlite(path.join(dataDir!, 'pg'));
      await client.waitReady;
      await migrate(drizzle({ client, schema }), { migrationsFolder });
    }
    const db = drizzle({ client, schema });
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

// One process per data folder: two PGlite writers on one folder corrupt it. The lock is a
// proper-lockfile lock on the folder, with a note beside it naming the process that holds it so a
// refusal can say who, and so a lock left by a killed process can be recognised and taken over.
import { readFile, rm, writeFile } from 'node:fs/promises';
import { readFileSync } from 'node:fs';
import { hostname } from 'node:os';
import path from 'node:path';
import lockfile from 'proper-lockfile';

export interface LockHolder {
  pid: number;
  command: string;
  hostname: string;
  since: string;
}

export class DataFolderInUseError extends Error {
  constructor(
    readonly folder: string,
    readonly holder: LockHolder | null,
  ) {
    const who = holder
      ? `process ${holder.pid} (${holder.command}) on ${holder.hostname}, since ${holder.since}`
      : 'another process (its details could not be read)';
    super(
      `The data folder ${folder} is in use by ${who}. ` +
        'Stop that process first, or point MARGINALIA_DATA_DIR at another folder.',
    );
    this.name = 'DataFolderInUseError';
  }
}

const LOCK_NAME = 'marginalia.lock';
const HOLDER_NAME = 'marginalia.lock.holder.json';

/** The running command, with paths shortened so the refusal message stays readable. */
function currentCommand(): string {
  const [executable = 'node', ...args] = process.argv;
  const shorten = (arg: string): string => {
    if (!path.isAbsolute(arg)) return arg;
    const relative = path.relative(process.cwd(), arg);
    return relative && !relative.startsWith('..') ? relative : arg;
  };
  const shortened = args.map(shorten);
  return [path.basename(executable), ...shortened].join(' ');
}

async function readHolder(folder: string): Promise<LockHolder | null> {
  try {
    return JSON.parse(await readFile(path.join(folder, HOLDER_NAME), 'utf8')) as LockHolder;
  } catch {
    return null;
  }
}

function isAlive(pid: number): boolean {
  try {
    process.kill(pid, 0);
    return true;
  } catch (error) {
    return (error as NodeJS.ErrnoException).code === 'EPERM';
  }
}

/** A recorded holder still running: same host, pid alive and (where /proc tells) still a node process. */
function holderStillRunning(holder: LockHolder): boolean {
  if (holder.hostname !== hostname()) return true; // cannot tell for another machine: assume yes
  if (holder.pid === process.pid || !isAlive(holder.pid)) return false;
  try {
    const cmdline = readFileSync(`/proc/${holder.pid}/cmdline`, 'utf8');
    return /node|tsx/.test(cmdline);
  } catch {
    return true;
  }
}

export interface HeldLock {
  release(): Promise<void>;
}

/**
 * Takes the folder's lock or throws DataFolderInUseError. A lock whose recorded holder is no longer
 * running (a kill -9, a power cut) is taken over at once rather than after the stale period.
 */
export async function lockDataFolder(folder: string, onLost: (error: Error) => void): Promise<HeldLock> {
  const lockfilePath = path.join(folder, LOCK_NAME);
  const options = { realpath: false, lockfilePath, stale: 30_000, update: 5_000, retries: 0 } as const;

  if (await lockfile.check(folder, options)) {
    const holder = await readHolder(folder);
    if (holder && !holderStillRunning(holder)) {
      await rm(lockfilePath, { recursive: true, force: true });
    } else {
      throw new DataFolderInUseError(folder, holder);
    }
  }

  let release: () => Promise<void>;
  try {
    release = await lockfile.lock(folder, { ...options, onCompromised: onLost });
  } catch (error) {
    if ((error as NodeJS.ErrnoException).code === 'ELOCKED') {
      throw new DataFolderInUseError(folder, await readHolder(folder));
    }
    throw error;
  }
  const holder: LockHolder = {
    pid: process.pid,
    command: currentCommand(),
    hostname: hostname(),
    since: new Date().toISOString(),
  };
  await writeFile(path.join(folder, HOLDER_NAME), JSON.stringify(holder, null, 2));

  return {
    async release() {
      await rm(path.join(folder, HOLDER_NAME), { force: true });
      await release();
    },
  };
}

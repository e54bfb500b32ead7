// Starts the REAL Marginalia server (node --import tsx server/index.ts, production mode against
// the build) on a free port, by default with an in-memory database, and stops it again.
import { spawn, type ChildProcess } from 'node:child_process';
import { randomBytes } from 'node:crypto';
import { existsSync } from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';

export const repoRoot = fileURLToPath(new URL('../..', import.meta.url));

export interface StartServerOptions {
  /** A data folder (so a test can kill -9 and restart on it); default: in memory. */
  dataDir?: string;
  /** Extra environment, e.g. { MARGINALIA_SIGNIN_LINK_TTL: '2' }. */
  env?: Record<string, string | undefined>;
  /** Load the demo data (group, four members, one derivation). */
  demo?: boolean;
  /** How long to wait for "Marginalia listening on ..." (default 120 s). */
  startTimeoutMs?: number;
}

export interface StartedServer {
  url: string;
  port: number;
  process: ChildProcess;
  /** Everything the server printed so far (stdout and stderr). */
  output(): string;
  /** SIGTERM and wait for a clean exit; resolves with the exit code. */
  stop(): Promise<number | null>;
  /** Send a signal (default SIGKILL) and wait for the process to end. */
  kill(signal?: NodeJS.Signals): Promise<number | null>;
}

export function buildFolder(): string {
  return path.join(repoRoot, process.env.MARGINALIA_DIST_DIR || '.next');
}

function exited(child: ChildProcess): Promise<number | null> {
  if (child.exitCode !== null || child.signalCode !== null) return Promise.resolve(child.exitCode);
  return new Promise((resolve) => child.once('exit', (code) => resolve(code)));
}

export async function startServer(options: StartServerOptions = {}): Promise<StartedServer> {
  if (!existsSync(path.join(buildFolder(), 'BUILD_ID'))) {
    throw new Error(`No production build in ${buildFolder()}: run \`next build\` first (npm test does).`);
  }
  const env: NodeJS.ProcessEnv = {
    ...process.env,
    NODE_ENV: 'production',
    PORT: '0',
    MARGINALIA_DATA_DIR: options.dataDir ?? 'memory://',
    NEXTAUTH_SECRET: randomBytes(32).toString('base64url'),
    NEXTAUTH_URL: undefined,
    SMTP_URL: undefined,
    ...options.env,
  };
  for (const key of Object.keys(env)) if (env[key] === undefined) delete env[key];

  const args = ['--import', 'tsx', 'server/index.ts', ...(options.demo ? ['--demo'] : [])];
  const child = spawn(process.execPath, args, { cwd: repoRoot, env, stdio: ['ignore', 'pipe', 'pipe'] });
  let output = '';
  const collect = (chunk: Buffer) => {
    output += chunk.toString();
  };
  child.stdout!.on('data', collect);
  child.stderr!.on('data', collect);

  const url = await new Promise<string>((resolve, reject) => {
    const timer = setTimeout(() => {
      child.kill('SIGKILL');
      reject(new Error(`The server did not start within ${options.startTimeoutMs ?? 120_000} ms. Output:\n${output}`));
    }, options.startTimeoutMs ?? 120_000);
    const onData = () => {
      const match = /Marginalia listening on (http:\/\/\S+)/.exec(output);
      if (match) {
        clearTimeout(timer);
        child.stdout!.off('data', onData);
        resolve(match[1]!);
      }
    };
    child.stdout!.on('data', onData);
    child.once('exit', (code, signal) => {
      clearTimeout(timer);
      reject(new Error(`The server exited (code ${code}, signal ${signal}) before it was ready. Output:\n${output}`));
    });
  });

  return {
    url,
    port: Number(new URL(url).port),
    process: child,
    output: () => output,
    async stop() {
      if (child.exitCode === null && child.signalCode === null) child.kill('SIGTERM');
      return exited(child);
    },
    async kill(signal: NodeJS.Signals = 'SIGKILL') {
      if (child.exitCode === null && child.signalCode === null) child.kill(signal);
      return exited(child);
    },
  };
}

/** Runs the server to its end (e.g. a start that must be refused); resolves with code and output. */
export async function runServerToExit(options: StartServerOptions & { timeoutMs?: number } = {}): Promise<{ code: number | null; output: string }> {
  const env: NodeJS.ProcessEnv = {
    ...process.env,
    NODE_ENV: 'production',
    PORT: '0',
    MARGINALIA_DATA_DIR: options.dataDir ?? 'memory://',
    NEXTAUTH_SECRET: randomBytes(32).toString('base64url'),
    ...options.env,
  };
  for (const key of Object.keys(env)) if (env[key] === undefined) delete env[key];
  const child = spawn(process.execPath, ['--import', 'tsx', 'server/index.ts', ...(options.demo ? ['--demo'] : [])], {
    cwd: repoRoot,
    env,
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  let output = '';
  child.stdout!.on('data', (c: Buffer) => (output += c.toString()));
  child.stderr!.on('data', (c: Buffer) => (output += c.toString()));
  const timer = setTimeout(() => child.kill('SIGKILL'), options.timeoutMs ?? 60_000);
  const code = await exited(child);
  clearTimeout(timer);
  return { code, output };
}

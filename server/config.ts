// Configuration from the environment, read once by the server at start-up. Route handlers run
// in the same process and read the values the server settled on through process.env.
import { randomBytes } from 'node:crypto';
import { readFile, writeFile } from 'node:fs/promises';
import path from 'node:path';
import { IN_MEMORY } from '../db/open';

export interface ServerConfig {
  dev: boolean;
  demo: boolean;
  host: string;
  /** 0 = any free port. */
  port: number;
  dataDir: string;
  /** The public origin (NEXTAUTH_URL), or null to follow the Host header of loopback requests. */
  publicOrigin: string | null;
  /** Production mail; null starts the local mail sink. */
  smtpUrl: string | null;
  sinkPort: number;
  mailFrom: string;
}

export class ConfigError extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'ConfigError';
  }
}

const LOOPBACK_HOSTS = new Set(['127.0.0.1', 'localhost', '::1']);

function parsePort(name: string, raw: string | undefined, fallback: number): number {
  if (raw === undefined || raw === '') return fallback;
  const port = Number(raw);
  if (!Number.isInteger(port) || port < 0 || port > 65535) {
    throw new ConfigError(`${name} must be a port number from 0 to 65535 (0 = any free port), not "${raw}".`);
  }
  return port;
}

export function readConfig(argv: string[], env: NodeJS.ProcessEnv): ServerConfig {
  const dev = argv.includes('--dev');
  const demo = argv.includes('--demo');
  const host = env.HOST || '127.0.0.1';
  let publicOrigin: string | null = null;
  if (env.NEXTAUTH_URL) {
    try {
      publicOrigin = new URL(env.NEXTAUTH_URL).origin;
    } catch {
      throw new ConfigError(`NEXTAUTH_URL must be an absolute URL such as https://marginalia.example.org, not "${env.NEXTAUTH_URL}".`);
    }
  } else if (!LOOPBACK_HOSTS.has(host)) {
    // Links in mail are built from the origin; trusting any Host header would let a forged request
    // mail someone a sign-in link pointing elsewhere.
    throw new ConfigError(`HOST is ${host}, which serves beyond this machine: set NEXTAUTH_URL to the public origin too.`);
  }
  return {
    dev,
    demo,
    host,
    port: parsePort('PORT', env.PORT, 3000),
    dataDir: env.MARGINALIA_DATA_DIR || './.data',
    publicOrigin,
    smtpUrl: env.SMTP_URL || null,
    sinkPort: parsePort('MARGINALIA_SMTP_SINK_PORT', env.MARGINALIA_SMTP_SINK_PORT, 0),
    mailFrom: env.MAIL_FROM || 'Marginalia <no-reply@marginalia.localhost>',
  };
}

/**
 * The session secret: NEXTAUTH_SECRET, or for the demo and development a generated one kept in
 * the data folder (so sessions survive a restart). Production without it refuses to start.
 */
export async function resolveSecret(config: ServerConfig, env: NodeJS.ProcessEnv): Promise<string> {
  if (env.NEXTAUTH_SECRET) return env.NEXTAUTH_SECRET;
  if (!config.demo && !config.dev) {
    throw new ConfigError('NEXTAUTH_SECRET is not set. Set it to a long random string (e.g. `openssl rand -base64 32`).');
  }
  if (config.dataDir === IN_MEMORY) return randomBytes(32).toString('base64url');
  const file = path.join(path.resolve(config.dataDir), 'session-secret');
  try {
    const kept = (await readFile(file, 'utf8')).trim();
    if (kept) return kept;
  } catch {
    // not there yet
  }
  const secret = randomBytes(32).toString('base64url');
  await writeFile(file, secret, { mode: 0o600 });
  return secret;
}

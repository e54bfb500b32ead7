// Per-address limits on sign-in attempts (wrong passwords, link requests), kept in this process's
// memory on globalThis so the sign-in route and the rest of the server count together.
const KEY = Symbol.for('marginalia.rateLimits');

interface Window {
  hits: number[];
}

type GlobalWithLimits = typeof globalThis & { [KEY]?: Map<string, Window> };

function store(): Map<string, Window> {
  const g = globalThis as GlobalWithLimits;
  g[KEY] ??= new Map();
  return g[KEY];
}

export interface Limit {
  /** What is counted, e.g. 'password' or 'link'. */
  name: string;
  max: number;
  windowMs: number;
}

export const passwordFailures: Limit = { name: 'password', max: 5, windowMs: 15 * 60_000 };
export const linkRequests: Limit = { name: 'link', max: 5, windowMs: 15 * 60_000 };

function recent(limit: Limit, key: string, now: number): Window {
  const id = `${limit.name}:${key.toLowerCase()}`;
  const window = store().get(id) ?? { hits: [] };
  window.hits = window.hits.filter((t) => now - t < limit.windowMs);
  store().set(id, window);
  return window;
}

/** Minutes until another attempt is allowed, or 0 if one is allowed now. */
export function minutesUntilAllowed(limit: Limit, key: string, now = Date.now()): number {
  const window = recent(limit, key, now);
  if (window.hits.length < limit.max) return 0;
  const oldest = window.hits[0]!;
  return Math.max(1, Math.ceil((oldest + limit.windowMs - now) / 60_000));
}

export function recordAttempt(limit: Limit, key: string, now = Date.now()): void {
  recent(limit, key, now).hits.push(now);
}

export function clearAttempts(limit: Limit, key: string): void {
  store().delete(`${limit.name}:${key.toLowerCase()}`);
}

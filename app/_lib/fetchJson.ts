// The browser's way to the routes: JSON in and out, errors as ApiFailure with the field they name.
export class ApiFailure extends Error {
  constructor(
    readonly status: number,
    message: string,
    readonly field?: string,
  ) {
    super(message);
    this.name = 'ApiFailure';
  }
}

export async function fetchJson<T>(path: string, init: { method?: string; body?: unknown } = {}): Promise<T> {
  const response = await fetch(path, {
    method: init.method ?? 'GET',
    headers: init.body === undefined ? undefined : { 'content-type': 'application/json' },
    body: init.body === undefined ? undefined : JSON.stringify(init.body),
    credentials: 'same-origin',
  });
  if (response.status === 204) return undefined as T;
  const payload = (await response.json().catch(() => null)) as (T & { error?: string; field?: string }) | null;
  if (!response.ok) {
    throw new ApiFailure(response.status, payload?.error ?? `The server answered ${response.status}.`, payload?.field);
  }
  return payload as T;
}

/** A same-site path to return to after signing in; anything else falls back to /groups. */
export function safeReturnPath(raw: string | null | undefined): string {
  if (!raw) return '/groups';
  const base = 'http://local.invalid';
  const ours = new Set([base, ...(typeof window === 'undefined' ? [] : [window.location.origin])]);
  try {
    const url = new URL(raw, base);
    if (!ours.has(url.origin)) return '/groups';
    return `${url.pathname}${url.search}${url.hash}`;
  } catch {
    return '/groups';
  }
}

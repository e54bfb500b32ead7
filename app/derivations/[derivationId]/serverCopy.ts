// The working copy as the server holds it, fetched once as the derivation page opens (alongside its
// code and facts) so the whiteboard can show the text before its live connection has synced. A
// copy is taken at most once: a whiteboard mounted later (another visit, a new role) waits for
// the connection instead of showing a copy fetched earlier.
import { mark } from '@/components/performanceMark';

const requests = new Map<string, Promise<Uint8Array | null>>();

async function fetchCopy(derivationId: string): Promise<Uint8Array | null> {
  try {
    const response = await fetch(`/api/derivations/${encodeURIComponent(derivationId)}/state`, { credentials: 'same-origin' });
    if (!response.ok) return null; // no access, or gone: the connection says why
    const copy = new Uint8Array(await response.arrayBuffer());
    mark('marginalia:copy-arrived');
    return copy;
  } catch {
    return null; // offline: this device's copy and the connection take over
  }
}

/** Starts fetching the server's copy of a derivation (in the browser; once per opening of its page). */
export function requestServerCopy(derivationId: string): void {
  if (typeof window === 'undefined') return;
  requests.set(derivationId, fetchCopy(derivationId));
}

/** The copy requested for this derivation, handed out once; null when none was requested. */
export function takeServerCopy(derivationId: string): Promise<Uint8Array | null> | null {
  const request = requests.get(derivationId) ?? null;
  requests.delete(derivationId);
  return request;
}

'use client';
// The lock's refusal in words: the claims that do not hold, each with its verdict and message.
import { StatusWord } from '@/components/StatusWord';
import { Notice } from '@/components/ui';
import type { RefusedClaim } from '@/server/versions/types';

export function LockRefusal({ error, claims }: { error: string; claims: RefusedClaim[] }) {
  return (
    <div className="mt-3" data-lock-refused>
      <Notice kind="error">
        {error}
        <ul className="mt-1 list-none space-y-1">
          {claims.map((claim) => (
            <li key={claim.stepId} className="flex flex-wrap gap-x-2">
              <StatusWord status={claim.status} />
              <button
                type="button"
                className="font-mono underline"
                onClick={() => document.querySelector(`[data-step-id="${claim.stepId}"]`)?.scrollIntoView({ behavior: 'smooth', block: 'center' })}
              >
                {claim.claimId}
              </button>
              <span className="text-ink-soft">{claim.message}</span>
            </li>
          ))}
        </ul>
      </Notice>
    </div>
  );
}

export type LockResult<V> = { kind: 'locked'; version: V } | { kind: 'refused'; error: string; claims: RefusedClaim[] } | { kind: 'error'; error: string };

/** POSTs a lock request; a refusal with its claims is an answer, not an error. */
export async function requestLock<V>(path: string, body: unknown): Promise<LockResult<V>> {
  const response = await fetch(path, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify(body), credentials: 'same-origin' });
  const payload = (await response.json().catch(() => null)) as (V & { error?: string; claims?: RefusedClaim[] }) | null;
  if (response.ok && payload) return { kind: 'locked', version: payload };
  if (response.status === 409 && payload?.claims) return { kind: 'refused', error: payload.error ?? 'The lock was refused.', claims: payload.claims };
  return { kind: 'error', error: payload?.error ?? `The server answered ${response.status}.` };
}

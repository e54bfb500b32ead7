'use client';
// Sign-out clears the copies of derivations kept on this device, but only once nothing would be
// lost: every copy is compared with the server's document first. Edits the server has not
// confirmed are named; the user can wait while they are sent (sign-out then goes on by itself),
// or sign out anyway after confirming that those edits will be discarded.
import { signOut } from 'next-auth/react';
import { useEffect, useRef, useState } from 'react';
import { checkCopy, clearDeviceCopies, listDeviceCopies, sendCopy, type CopyState, type DeviceCopy } from './_lib/deviceCopies';

interface Unsent {
  copy: DeviceCopy;
  title: string;
  state: Exclude<CopyState, { state: 'confirmed' }>;
}

type Phase =
  | { step: 'idle' }
  | { step: 'checking' }
  | { step: 'unsent'; unsent: Unsent[]; waiting: boolean }
  | { step: 'discard'; unsent: Unsent[] }
  | { step: 'leaving' }
  | { step: 'failed'; message: string };

/** How often the copies are compared with the server again while the user waits (ms). */
const RECHECK_MS = 1_500;

/** The derivation's title in quotes, or null when the server cannot say (it is asked again next round). */
async function titleOf(derivationId: string): Promise<string | null> {
  // On the derivation's own page the title is at hand even when the server is not.
  const heading = window.location.pathname.startsWith(`/derivations/${derivationId}`) ? document.querySelector('#main h1')?.textContent?.trim() : null;
  if (heading) return `“${heading}”`;
  try {
    const controller = new AbortController();
    const timer = setTimeout(() => controller.abort(), 3_000);
    const response = await fetch(`/api/derivations/${encodeURIComponent(derivationId)}`, { credentials: 'same-origin', signal: controller.signal });
    clearTimeout(timer);
    const body = (await response.json()) as { derivation?: { title?: unknown }; title?: unknown };
    const title = body.derivation?.title ?? body.title;
    return typeof title === 'string' && title ? `“${title}”` : null;
  } catch {
    return null;
  }
}

/** The copies whose edits the server has not confirmed (all copies are checked at once). */
async function unsentCopies(userId: string, titles: Map<string, string>): Promise<Unsent[]> {
  const copies = await listDeviceCopies(userId);
  const states = await Promise.all(copies.map((copy) => checkCopy(copy)));
  const unsent: Unsent[] = [];
  for (const [i, state] of states.entries()) {
    if (state.state === 'confirmed') continue;
    const copy = copies[i]!;
    if (!titles.has(copy.derivationId)) {
      const title = await titleOf(copy.derivationId);
      if (title) titles.set(copy.derivationId, title);
    }
    unsent.push({ copy, title: titles.get(copy.derivationId) ?? 'a derivation', state });
  }
  return unsent;
}

function describe(unsent: Unsent[]): string {
  const names = unsent.map((u) => u.title);
  const list = names.length === 1 ? names[0]! : `${names.slice(0, -1).join(', ')} and ${names.at(-1)!}`;
  const unknown = unsent.find((u) => u.state.state === 'unknown');
  return `Edits to ${list} on this device have not been confirmed by the server yet${unknown && unknown.state.state === 'unknown' ? ` (${unknown.state.reason})` : ''}.`;
}

export function SignOutButton({ userId }: { userId: string }) {
  const [phase, setPhase] = useState<Phase>({ step: 'idle' });
  const titles = useRef(new Map<string, string>());
  const senders = useRef(new Map<string, () => Promise<void>>());
  const cancelled = useRef(false);

  const stopSending = async () => {
    const stops = [...senders.current.values()];
    senders.current.clear();
    await Promise.all(stops.map((stop) => stop().catch(() => undefined)));
  };

  const leave = async () => {
    setPhase({ step: 'leaving' });
    await stopSending();
    await clearDeviceCopies(userId);
    try {
      await signOut({ callbackUrl: '/' });
    } catch (error) {
      setPhase({ step: 'failed', message: `The copies on this device are cleared, but the server could not be reached to end the session (${error instanceof Error ? error.message : String(error)}). Try again.` });
    }
  };

  const start = async () => {
    cancelled.current = false;
    setPhase({ step: 'checking' });
    try {
      const unsent = await unsentCopies(userId, titles.current);
      if (cancelled.current) return;
      if (unsent.length === 0) await leave();
      else setPhase({ step: 'unsent', unsent, waiting: false });
    } catch (error) {
      setPhase({ step: 'failed', message: `The copies on this device could not be checked (${error instanceof Error ? error.message : String(error)}). Nothing was cleared.` });
    }
  };

  // While the user waits: send each unsent copy and compare again until the server has them all.
  const waiting = phase.step === 'unsent' && phase.waiting;
  useEffect(() => {
    if (!waiting) return;
    let stopped = false;
    let timer: ReturnType<typeof setTimeout> | null = null;
    const round = async () => {
      try {
        const unsent = await unsentCopies(userId, titles.current);
        if (stopped) return;
        if (unsent.length === 0) {
          await leave();
          return;
        }
        for (const u of unsent) {
          if (!senders.current.has(u.copy.name)) senders.current.set(u.copy.name, await sendCopy(u.copy));
        }
        setPhase({ step: 'unsent', unsent, waiting: true });
      } catch {
        // try again at the next round
      }
      if (!stopped) timer = setTimeout(() => void round(), RECHECK_MS);
    };
    void round();
    return () => {
      stopped = true;
      if (timer) clearTimeout(timer);
    };
    // leave and the refs are stable for this purpose; only waiting starts or stops the rounds.
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [waiting, userId]);

  const stay = () => {
    cancelled.current = true;
    void stopSending();
    setPhase({ step: 'idle' });
  };

  const button = 'rounded border border-rule px-2 py-0.5 text-sm hover:border-ink-faint';
  return (
    <span className="relative">
      <button type="button" onClick={() => void start()} disabled={phase.step === 'checking' || phase.step === 'leaving'} className="rounded text-ink-soft hover:text-ink disabled:opacity-60">
        Sign out
      </button>
      {phase.step !== 'idle' && (
        <div role="dialog" aria-label="Signing out" className="absolute right-0 top-8 z-50 w-80 rounded border border-rule bg-paper p-3 text-sm shadow-md" data-sign-out={phase.step}>
          {phase.step === 'checking' && <p role="status">Making sure every edit on this device has reached the server…</p>}
          {phase.step === 'leaving' && <p role="status">Clearing the copies on this device and signing out…</p>}
          {phase.step === 'failed' && (
            <>
              <p role="alert">{phase.message}</p>
              <div className="mt-2 flex gap-2">
                <button type="button" className={button} onClick={() => void start()}>
                  Try again
                </button>
                <button type="button" className={button} onClick={stay}>
                  Stay signed in
                </button>
              </div>
            </>
          )}
          {phase.step === 'unsent' && (
            <>
              <p role="alert">{describe(phase.unsent)}</p>
              <p className="mt-1 text-ink-soft">
                {phase.waiting ? 'Sending them; you will be signed out as soon as the server has them all.' : 'Signing out now clears this device’s copies, and these edits with them.'}
              </p>
              <div className="mt-2 flex flex-wrap gap-2">
                {!phase.waiting && (
                  <button type="button" className={button} onClick={() => setPhase({ step: 'unsent', unsent: phase.unsent, waiting: true })}>
                    Wait for them
                  </button>
                )}
                <button type="button" className={button} onClick={() => setPhase({ step: 'discard', unsent: phase.unsent })}>
                  Sign out anyway
                </button>
                <button type="button" className={button} onClick={stay}>
                  Stay signed in
                </button>
              </div>
            </>
          )}
          {phase.step === 'discard' && (
            <>
              <p role="alert">Sign out and discard the unconfirmed edits to {phase.unsent.map((u) => u.title).join(', ')}? They cannot be recovered once this device’s copies are cleared.</p>
              <div className="mt-2 flex flex-wrap gap-2">
                <button type="button" className="rounded border border-verdict-fails px-2 py-0.5 text-sm text-verdict-fails hover:bg-verdict-fails/10" onClick={() => void leave()}>
                  Discard them and sign out
                </button>
                <button type="button" className={button} onClick={() => setPhase({ step: 'unsent', unsent: phase.unsent, waiting: false })}>
                  Back
                </button>
              </div>
            </>
          )}
        </div>
      )}
    </span>
  );
}

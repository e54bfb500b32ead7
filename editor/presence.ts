// Who is in the derivation, from Yjs awareness: each person once (however many tabs), with the
// colour of their caret and their initials. The server writes the name and role of every state
// from the signed-in session, so nobody can appear under another's name.
import { useSyncExternalStore } from 'react';
import type { Awareness } from 'y-protocols/awareness';

export interface PresenceUser {
  id: string;
  name: string;
  color: string;
  role?: string;
}

export interface PresentPerson extends PresenceUser {
  initials: string;
  isSelf: boolean;
}

// Caret colours: distinct from each other, from the accent and from the check-status colours,
// and dark enough for white initials.
const palette = ['#a34a2f', '#2f5fa3', '#7b3fa0', '#1f7a63', '#9a6a12', '#a03a6c', '#4d7a22', '#4f55b8'];

export function presenceColour(userId: string): string {
  let hash = 0;
  for (let i = 0; i < userId.length; i++) hash = (hash * 31 + userId.charCodeAt(i)) >>> 0;
  return palette[hash % palette.length]!;
}

export function initialsOf(name: string): string {
  const words = name.trim().split(/\s+/).filter(Boolean);
  if (words.length === 0) return '?';
  const first = words[0]!.charAt(0);
  const last = words.length > 1 ? words[words.length - 1]!.charAt(0) : '';
  return (first + last).toUpperCase();
}

function readUser(state: Record<string, unknown> | undefined): PresenceUser | null {
  const user = state?.user;
  if (!user || typeof user !== 'object') return null;
  const { id, name, color, role } = user as Record<string, unknown>;
  if (typeof id !== 'string' || typeof name !== 'string') return null;
  return { id, name, color: typeof color === 'string' ? color : '#6b6b6b', role: typeof role === 'string' ? role : undefined };
}

export function presentPeople(awareness: Awareness, selfId: string): PresentPerson[] {
  const people = new Map<string, PresentPerson>();
  for (const [clientId, state] of awareness.getStates()) {
    const user = readUser(state);
    if (!user) continue;
    const isSelf = clientId === awareness.clientID || user.id === selfId;
    if (!people.has(user.id)) people.set(user.id, { ...user, initials: initialsOf(user.name), isSelf });
  }
  return [...people.values()].sort((a, b) => Number(b.isSelf) - Number(a.isSelf) || a.name.localeCompare(b.name));
}

/** The people present, re-read whenever awareness changes. */
export function usePresence(awareness: Awareness | null, selfId: string): PresentPerson[] {
  return useSyncExternalStore(
    (onChange) => {
      if (!awareness) return () => undefined;
      awareness.on('change', onChange);
      return () => awareness.off('change', onChange);
    },
    () => snapshot(awareness, selfId),
    () => empty,
  );
}

const empty: PresentPerson[] = [];
const cache = new WeakMap<Awareness, { key: string; value: PresentPerson[] }>();

// useSyncExternalStore needs the same object while nothing changed.
function snapshot(awareness: Awareness | null, selfId: string): PresentPerson[] {
  if (!awareness) return empty;
  const value = presentPeople(awareness, selfId);
  const key = JSON.stringify(value);
  const cached = cache.get(awareness);
  if (cached && cached.key === key) return cached.value;
  cache.set(awareness, { key, value });
  return value;
}

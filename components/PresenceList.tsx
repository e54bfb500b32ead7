// Who is in the derivation right now: a swatch in each person's caret colour with their initials,
// and their name (the name carries the meaning; the colour only matches their caret).
export interface PresenceEntry {
  id: string;
  name: string;
  initials: string;
  color: string;
  role?: string;
  isSelf: boolean;
}

export function PresenceList({ people }: { people: readonly PresenceEntry[] }) {
  return (
    <section aria-label="Who is here" className="flex items-center gap-2">
      <h2 className="text-sm text-ink-faint">Here now</h2>
      <ul className="flex flex-wrap items-center gap-x-3 gap-y-1">
        {people.map((person) => (
          <li key={person.id} className="flex items-center gap-1.5 text-sm" data-presence-name={person.name}>
            <span
              aria-hidden="true"
              className="inline-flex h-6 w-6 items-center justify-center rounded-full text-[0.7rem] font-semibold tracking-wide text-white"
              style={{ backgroundColor: person.color }}
            >
              {person.initials}
            </span>
            <span>
              {person.name}
              {person.isSelf && <span className="text-ink-faint"> (you)</span>}
              {person.role && <span className="sr-only">, {person.role}</span>}
            </span>
          </li>
        ))}
      </ul>
    </section>
  );
}

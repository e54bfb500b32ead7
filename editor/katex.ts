// KaTeX, fetched as its own piece of code as soon as a page with the text starts (a third of the
// editor's code): it arrives and is evaluated while the page waits for the editor and the
// derivation's facts, instead of on the way to the first render of the text.
import type Katex from 'katex';

type KatexModule = typeof Katex;

let loaded: KatexModule | null = null;
let loading: Promise<KatexModule | null> | null = null;
const waiting = new Set<() => void>();

/** Starts fetching KaTeX (once per page; again after a failed fetch). Null if the fetch failed:
 * formulas then keep showing their source until a later fetch succeeds. */
export function fetchKatex(): Promise<KatexModule | null> {
  loading ??= import('katex').then(
    (module) => {
      loaded = module.default;
      for (const run of waiting) run();
      waiting.clear();
      return loaded;
    },
    () => {
      loading = null; // the next formula asks again
      return null;
    },
  );
  return loading;
}

/** KaTeX if it has arrived, else null (and it is on its way). */
export function katexNow(): KatexModule | null {
  if (!loaded) void fetchKatex();
  return loaded;
}

/** Runs `run` once KaTeX is there (at once if it is). */
export function whenKatex(run: () => void): void {
  if (katexNow()) run();
  else waiting.add(run);
}

// Performance marks for the benchmark and the profiling tool (tests/bench): nothing when the
// platform has none. The page's marks are listed in DEVELOPERS.md ("Benchmark").
export function mark(name: string): void {
  if (typeof performance !== 'undefined' && typeof performance.mark === 'function') performance.mark(name);
}

/** A mark set only the first time on this page. */
export function markOnce(name: string): void {
  if (typeof performance !== 'undefined' && typeof performance.getEntriesByName === 'function' && performance.getEntriesByName(name, 'mark').length > 0) return;
  mark(name);
}

// Which drawn point the readout follows: the nearest one to the pointer (in screen pixels, so
// both axes count alike whatever their scales), or the one reached with the keyboard.

/** A point of group `group` (a series, or the markers after the last series) at `index`. */
export interface ActivePoint {
  group: number;
  index: number;
}

/** Screen positions of every drawn point, group by group (NaN where a point is not drawn). */
export type PixelGroups = readonly (readonly { px: number; py: number }[])[];

export function nearestPoint(groups: PixelGroups, px: number, py: number, within = Infinity): ActivePoint | null {
  let best: ActivePoint | null = null;
  let bestDistance = within * within;
  groups.forEach((points, group) => {
    points.forEach((p, index) => {
      const d = (p.px - px) ** 2 + (p.py - py) ** 2;
      if (d < bestDistance || (best === null && d <= bestDistance)) {
        bestDistance = d;
        best = { group, index };
      }
    });
  });
  return best;
}

export type NavigationKey = 'ArrowLeft' | 'ArrowRight' | 'ArrowUp' | 'ArrowDown' | 'Home' | 'End' | 'PageUp' | 'PageDown';

const KEYS = new Set<string>(['ArrowLeft', 'ArrowRight', 'ArrowUp', 'ArrowDown', 'Home', 'End', 'PageUp', 'PageDown']);

export function isNavigationKey(key: string): key is NavigationKey {
  return KEYS.has(key);
}

/**
 * The point a key leads to: left/right step along the group (ten at a time with Shift or
 * PageUp/PageDown), Home/End jump to its ends, up/down go to the next group that has points,
 * at the same share of the way along. `sizes` is the number of points per group.
 */
export function stepPoint(sizes: readonly number[], from: ActivePoint | null, key: NavigationKey, shift = false): ActivePoint | null {
  const groups = sizes.map((n, g) => ({ n, g })).filter((s) => s.n > 0);
  if (groups.length === 0) return null;
  if (!from || !(sizes[from.group]! > 0)) return { group: groups[0]!.g, index: 0 };
  const n = sizes[from.group]!;
  const clamp = (i: number) => Math.max(0, Math.min(n - 1, i));
  const stride = shift ? 10 : 1;
  switch (key) {
    case 'ArrowRight':
      return { group: from.group, index: clamp(from.index + stride) };
    case 'ArrowLeft':
      return { group: from.group, index: clamp(from.index - stride) };
    case 'PageDown':
      return { group: from.group, index: clamp(from.index + 10) };
    case 'PageUp':
      return { group: from.group, index: clamp(from.index - 10) };
    case 'Home':
      return { group: from.group, index: 0 };
    case 'End':
      return { group: from.group, index: n - 1 };
    case 'ArrowUp':
    case 'ArrowDown': {
      const at = groups.findIndex((s) => s.g === from.group);
      const next = groups[(at + (key === 'ArrowDown' ? 1 : groups.length - 1)) % groups.length]!;
      const share = n > 1 ? from.index / (n - 1) : 0;
      return { group: next.g, index: Math.round(share * (next.n - 1)) };
    }
  }
}

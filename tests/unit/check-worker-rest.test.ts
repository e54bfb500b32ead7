// The check worker's pace: a whole derivation's first checks leave the page part of the machine;
// an edit's few re-checks run back to back.
import { expect, test } from 'vitest';
import { LONGEST_REST_MS, REST_FROM_WAITING, restAfterClaim } from '@/editor/worker/checkLogic';

test('while a whole derivation waits to be checked, the worker rests after each claim as long as it took, at most a few frames', () => {
  expect(restAfterClaim(4, 39)).toBe(4);
  expect(restAfterClaim(0.3, REST_FROM_WAITING)).toBe(0.3);
  expect(restAfterClaim(1800, 30)).toBe(LONGEST_REST_MS);
  expect(LONGEST_REST_MS).toBeLessThanOrEqual(50);
});

test("an edit's re-checks (fewer claims waiting than a flow block with ten claims leaves) run without rest", () => {
  expect(restAfterClaim(4, REST_FROM_WAITING - 1)).toBe(0);
  expect(restAfterClaim(9, 0)).toBe(0);
  // Editing a flow with ten claims queues ten; after the first, nine wait: no rest for any of them.
  expect(REST_FROM_WAITING).toBeGreaterThanOrEqual(10);
});

test('a clock that steps back gives no negative rest', () => {
  expect(restAfterClaim(-2, 40)).toBe(0);
});

// Sign-in attempt limits per address and the return path after signing in (no open redirect).
import { describe, expect, test } from 'vitest';
import { safeReturnPath } from '@/app/_lib/fetchJson';
import { clearAttempts, minutesUntilAllowed, recordAttempt, type Limit } from '@/server/rateLimit';

describe('attempt limits per address', () => {
  const limit: Limit = { name: 'unit-test', max: 3, windowMs: 10 * 60_000 };
  const t0 = Date.UTC(2030, 0, 1);

  test('an address is held back after the allowed attempts, for the rest of the window, and others are not', () => {
    for (let i = 0; i < 3; i++) {
      expect(minutesUntilAllowed(limit, 'A@Example.org', t0 + i * 1000)).toBe(0);
      recordAttempt(limit, 'a@example.org', t0 + i * 1000);
    }
    expect(minutesUntilAllowed(limit, 'a@example.org', t0 + 5000)).toBe(10);
    expect(minutesUntilAllowed(limit, 'a@example.org', t0 + 9 * 60_000)).toBe(1);
    expect(minutesUntilAllowed(limit, 'b@example.org', t0 + 5000)).toBe(0);
    // The first attempt leaves the window after ten minutes.
    expect(minutesUntilAllowed(limit, 'a@example.org', t0 + 10 * 60_000 + 1)).toBe(0);
  });

  test('a success clears the count', () => {
    for (let i = 0; i < 3; i++) recordAttempt(limit, 'c@example.org', t0);
    expect(minutesUntilAllowed(limit, 'c@example.org', t0)).toBeGreaterThan(0);
    clearAttempts(limit, 'c@example.org');
    expect(minutesUntilAllowed(limit, 'c@example.org', t0)).toBe(0);
  });
});

describe('where the sign-in page returns to', () => {
  test('a path on this site is kept, with its query', () => {
    expect(safeReturnPath('/groups/abc?x=1')).toBe('/groups/abc?x=1');
    expect(safeReturnPath('/invitations/tok%20en')).toBe('/invitations/tok%20en');
  });

  test('another site, a protocol-relative address or nothing falls back to the groups page', () => {
    expect(safeReturnPath('https://elsewhere.example/steal')).toBe('/groups');
    expect(safeReturnPath('//elsewhere.example/steal')).toBe('/groups');
    expect(safeReturnPath('javascript:alert(1)')).toBe('/groups');
    expect(safeReturnPath(null)).toBe('/groups');
  });
});

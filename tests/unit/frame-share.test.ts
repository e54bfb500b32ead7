// The page's drawing work (typesetting, redrawing blocks) shares each animation frame's time.
import { describe, expect, test, vi } from 'vitest';
import { FRAME_SHARE_MS, frameShareLeft, spendFrameShare, workWithinShare } from '@/editor/blocks/frameShare';

describe('drawing work shares each frame', () => {
  test('what one piece of work spends in a frame the next one in that frame cannot; the next frame starts afresh', () => {
    expect(frameShareLeft(1000)).toBe(FRAME_SHARE_MS);
    spendFrameShare(1000, 5);
    expect(frameShareLeft(1000)).toBe(FRAME_SHARE_MS - 5);
    spendFrameShare(1000, 7);
    expect(frameShareLeft(1000)).toBe(0);
    expect(frameShareLeft(1016.7)).toBe(FRAME_SHARE_MS);
  });

  test('work run outside a frame (a hidden page has none) gets a whole share and leaves the frame alone', () => {
    spendFrameShare(2000, 6);
    expect(frameShareLeft(undefined)).toBe(FRAME_SHARE_MS);
    spendFrameShare(undefined, 50);
    expect(frameShareLeft(2000)).toBe(FRAME_SHARE_MS - 6);
  });

  test('work goes on until the share is used, at least one piece even in a frame already spent, and says what is left', () => {
    // A clock of our own: each piece of work takes 3 ms of it.
    let clock = 0;
    const timer = vi.spyOn(performance, 'now').mockImplementation(() => clock);
    let done = 0;
    const slowPiece = () => {
      clock += 3;
      done++;
      return done < 100;
    };
    expect(workWithinShare(3000, slowPiece)).toBe(true);
    expect(done).toBe(3); // 3, 6, then 9 ms: past the 8 ms share
    const before = done;
    expect(workWithinShare(3000, slowPiece)).toBe(true);
    expect(done).toBe(before + 1);
    expect(workWithinShare(undefined, () => false)).toBe(false);
    timer.mockRestore();
  });
});

// The page's drawing work (typesetting, redrawing blocks) shares each animation frame's time.
import { describe, expect, test } from 'vitest';
import { FRAME_SHARE_MS, frameShareLeft, spendFrameShare } from '@/editor/blocks/frameShare';

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
});

// Typesetting and redrawing blocks share each animation frame: together they take about
// FRAME_SHARE_MS of script a frame (at least one piece of work each, so both move on), and leave
// the rest of the frame to the browser's style, layout and paint of what they changed. Opening a
// long derivation changes hundreds of formulas and every claim's verdict within a second or two:
// drawn this way, no frame holds the page for long.

export const FRAME_SHARE_MS = 8;

let frameTime: number | null = null;
let spent = 0;

const now = () => performance.now();

/** Counts afresh from a new frame's time. */
function enterFrame(time: number): void {
  if (time === frameTime) return;
  frameTime = time;
  spent = 0;
}

/** Milliseconds of the frame's share still free; a call without the frame's time gets a whole share. */
export function frameShareLeft(time: number | undefined): number {
  if (time === undefined) return FRAME_SHARE_MS;
  enterFrame(time);
  return Math.max(0, FRAME_SHARE_MS - spent);
}

/** Counts work done in the frame at `time` against its share. */
export function spendFrameShare(time: number | undefined, ms: number): void {
  if (time === undefined) return;
  enterFrame(time);
  spent += ms;
}

/**
 * Does pieces of work (`next` does one and says whether more is left) until `budget` is used, at
 * least one, and counts the time against the frame at `time`. Returns whether work is left.
 */
export function workWithinShare(time: number | undefined, next: () => boolean, budget = frameShareLeft(time)): boolean {
  const start = now();
  let more = next();
  while (more && now() - start <= budget) more = next();
  spendFrameShare(time, now() - start);
  return more;
}

// Typesetting and redrawing blocks share each animation frame: together they take about
// FRAME_SHARE_MS of script a frame (at least one piece of work each, so both move on), and leave
// the rest of the frame to the browser's style, layout and paint of what they changed. Opening a
// long derivation changes hundreds of formulas and every claim's verdict within a second or two:
// drawn this way, no frame holds the page for long.

export const FRAME_SHARE_MS = 8;

let frameTime: number | null = null;
let spent = 0;

/** Milliseconds of the frame's share still free; a call without the frame's time gets a whole share. */
export function frameShareLeft(time: number | undefined): number {
  if (time === undefined) return FRAME_SHARE_MS;
  if (time !== frameTime) {
    frameTime = time;
    spent = 0;
  }
  return Math.max(0, FRAME_SHARE_MS - spent);
}

/** Counts work done in the frame at `time` against its share. */
export function spendFrameShare(time: number | undefined, ms: number): void {
  if (time === undefined) return;
  if (time !== frameTime) {
    frameTime = time;
    spent = 0;
  }
  spent += ms;
}

// The y-axis label, written up the side of the plot: a label longer than the plot is tall is
// wrapped at spaces into lines that fit, and the axis is widened by a line for each, rather than
// cutting the label off at the frame's edge.

/** Px between the baselines of a wrapped label's lines. */
export const LABEL_LINE = 17;

/**
 * Splits `label` at spaces into lines each at most `room` pixels long as `measure` says, at most
 * `maxLines` of them (the last then takes the rest). A single word longer than `room` stays whole.
 */
export function wrapLabel(label: string, room: number, measure: (text: string) => number, maxLines = 3): string[] {
  const words = label.trim().split(/\s+/).filter(Boolean);
  if (words.length === 0) return [];
  const lines: string[] = [];
  let line = words[0]!;
  for (const word of words.slice(1)) {
    const longer = `${line} ${word}`;
    if (measure(longer) <= room || lines.length === maxLines - 1) line = longer;
    else {
      lines.push(line);
      line = word;
    }
  }
  lines.push(line);
  return lines;
}

let canvas: CanvasRenderingContext2D | null | undefined;

/** A text measurer for a CSS font (the plot's own), by a canvas; without one, about half an em a character. */
export function textMeasurer(font: string | null, fontSize = 16): (text: string) => number {
  if (canvas === undefined) canvas = typeof document === 'undefined' ? null : document.createElement('canvas').getContext('2d');
  const context = canvas;
  if (!context || !font) return (text) => text.length * fontSize * 0.5;
  return (text) => {
    context.font = font;
    return context.measureText(text).width;
  };
}

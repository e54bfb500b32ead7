// The faces a derivation's text is drawn in, asked for as soon as a page with the text starts, so
// that they have arrived when the text is first shown. A browser fetches a face only once some
// text on screen uses it: fetched then, each face arriving meant laying the whole text out again
// (~50-90 ms on a long derivation) and the formulas changing shape once drawn.
const TEXT_FACES = [
  'italic 400 1em "EB Garamond"',
  '600 1em "EB Garamond"',
  '400 1em "JetBrains Mono"',
  '400 1em KaTeX_Main',
  'italic 400 1em KaTeX_Main',
  'italic 400 1em KaTeX_Math',
  '400 1em KaTeX_Size1',
  '400 1em KaTeX_Size2',
  '400 1em KaTeX_AMS',
];

let asked = false;

/** Starts fetching the text's font faces (once per page; a face already loaded costs nothing). */
export function fetchTextFonts(): void {
  if (asked || typeof document === 'undefined' || !document.fonts) return;
  asked = true;
  for (const face of TEXT_FACES) void document.fonts.load(face).catch(() => undefined);
}

// What a page showing a derivation's text fetches as soon as its code runs in the browser: the
// text's font faces and KaTeX, so both have arrived when the text is first shown.
import { fetchTextFonts } from './fonts';
import { fetchKatex } from './katex';

export function fetchTextAhead(): void {
  if (typeof window === 'undefined') return;
  void fetchKatex();
  fetchTextFonts();
}

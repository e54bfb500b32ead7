/**
 * Numbers and exponents as a physicist writes them, for verdict messages and the evidence panel.
 * A measured value is quoted to the digit its uncertainty reaches: the uncertainty to two
 * significant digits (as CODATA quotes its constants; common practice) and the value rounded at
 * the same decimal place, so 0.0624999999999 with 2.8e-11 reads "0.062500000000 ± 2.8e-11" or,
 * in the concise form, "0.062500000000(28)". Full precision stays in the JSON fields.
 */

/** A short human form of a number with no uncertainty attached (trailing zeros dropped). */
export function formatNumber(value: number, digits = 10): string {
  if (!Number.isFinite(value)) return String(value);
  if (value === 0) return '0';
  if (Number.isInteger(value) && Math.abs(value) < 1e15) return String(value);
  const text = value.toPrecision(digits);
  return text.includes('e') ? text.replace(/\.?0+e/, 'e') : text.replace(/(\.\d*?)0+$/, '$1').replace(/\.$/, '');
}

/** An uncertainty to two significant digits: 2.8e-11, 1.0e-3. */
export function formatUncertainty(uncertainty: number): string {
  if (!Number.isFinite(uncertainty)) return String(uncertainty);
  return Math.abs(uncertainty).toExponential(1);
}

/** Significant digits a double carries reliably: past them a quoted digit would be noise. */
const DOUBLE_DIGITS = 15;

interface Rounded {
  /** The value, rounded at the uncertainty's last quoted digit. */
  value: string;
  /** The uncertainty, two significant digits. */
  uncertainty: string;
  /** The uncertainty's two digits, for the concise form; null when the value cannot carry them. */
  digits: string | null;
  /** The decimal place (power of ten) of the last quoted digit. */
  place: number;
}

function decimalExponent(value: number): number {
  return Number(Math.abs(value).toExponential(0).split('e')[1]);
}

function withoutNegativeZero(text: string): string {
  return /^-[0.]+$/.test(text) ? text.slice(1) : text;
}

function roundAt(value: number, uncertainty: number): Rounded | null {
  if (!Number.isFinite(value) || !Number.isFinite(uncertainty) || uncertainty <= 0) return null;
  const quoted = formatUncertainty(uncertainty); // "2.8e-11"; a rounded 9.96 becomes "1.0e+1"
  const [mantissa, exponent] = quoted.split('e') as [string, string];
  const place = Number(exponent) - 1;
  const digits = mantissa.replace('.', '');
  if (value === 0) return { value: '0', uncertainty: quoted, digits: null, place };
  const magnitude = decimalExponent(value);
  const significant = magnitude - place + 1;
  if (significant > DOUBLE_DIGITS) {
    // The uncertainty lies below what a double holds: quote the value as far as it is known.
    return { value: formatNumber(value, DOUBLE_DIGITS), uncertainty: quoted, digits: null, place };
  }
  let text: string;
  if (significant <= 0) {
    // The uncertainty exceeds the value: it rounds to zero at the uncertainty's place.
    text = place < 0 ? (0).toFixed(-place) : '0';
  } else if (Math.abs(value) < 1e-4 || Math.abs(value) >= 1e15) {
    text = value.toExponential(significant - 1).replace('e+', 'e');
  } else if (place < 0) {
    text = value.toFixed(-place);
  } else {
    text = String(Math.round(value / 10 ** place) * 10 ** place);
  }
  return { value: withoutNegativeZero(text), uncertainty: quoted, digits, place };
}

/**
 * A measured value with its uncertainty: "0.062500000000 ± 2.8e-11". Without a usable
 * uncertainty (zero, missing, not finite) the value is quoted to `digits` significant digits.
 */
export function formatMeasurement(value: number, uncertainty: number | null | undefined, digits = 12): string {
  const rounded = uncertainty === null || uncertainty === undefined ? null : roundAt(value, uncertainty);
  if (!rounded) return uncertainty === null || uncertainty === undefined ? formatNumber(value, digits) : `${formatNumber(value, digits)} ± ${formatUncertainty(uncertainty)}`;
  return `${rounded.value} ± ${rounded.uncertainty}`;
}

/** A value alone, quoted to the digit its uncertainty reaches (the evidence panel's "Measured"). */
export function formatValueAt(value: number, uncertainty: number | null | undefined, digits = 12): string {
  const rounded = uncertainty === null || uncertainty === undefined ? null : roundAt(value, uncertainty);
  return rounded ? rounded.value : formatNumber(value, digits);
}

/**
 * The concise form: "0.062500000000(28)", the uncertainty in units of the value's last digits
 * ("1.23457(21)e-8" in exponent form). Falls back to the ± form where the digits cannot be
 * written that way (a zero value, an uncertainty below a double's precision).
 */
export function formatConcise(value: number, uncertainty: number): string {
  const rounded = roundAt(value, uncertainty);
  if (!rounded || !rounded.digits) return formatMeasurement(value, uncertainty);
  const [mantissa, exponent] = rounded.value.split('e') as [string, string | undefined];
  return `${mantissa}(${rounded.digits})${exponent === undefined ? '' : `e${exponent}`}`;
}

// ----- exponents in messages ---------------------------------------------------------------------

/** A piece of a message: plain text, or the exponent of what precedes it. */
export interface MessagePart {
  text: string;
  exponent: boolean;
  /** For an exponent, what the message writes around it ("^", "^(" and ")"): a view keeps these unseen, so the text stays exact. */
  around?: [string, string];
}

// After a caret: a signed decimal number (3, -1, 3.01, 1.5e-3), a name (k, eps), or a group in
// parentheses or braces. A full stop that ends the sentence is not part of the number.
const EXPONENT = /\^(?:\(([^()]*)\)|\{([^{}]*)\}|([-+−]?\d+(?:\.\d+)?(?:e[-+]?\d+)?|[-−]?[A-Za-z][A-Za-z0-9_]*))/g;

/**
 * A message with its exponents marked, so "the residual scales as eps^3.01" shows 3.01 raised
 * as a whole. The parts keep every character but the caret, so a view can keep the text exact.
 */
export function messageParts(message: string): MessagePart[] {
  const parts: MessagePart[] = [];
  let last = 0;
  for (const match of message.matchAll(EXPONENT)) {
    const exponent = (match[1] ?? match[2] ?? match[3] ?? '').trim();
    if (exponent === '') continue;
    if (match.index > last) parts.push({ text: message.slice(last, match.index), exponent: false });
    const opened = match[1] !== undefined ? '(' : match[2] !== undefined ? '{' : '';
    const raw = match[1] ?? match[2] ?? match[3] ?? '';
    const lead = raw.slice(0, raw.length - raw.trimStart().length);
    const trail = raw.slice(raw.trimEnd().length);
    parts.push({ text: exponent, exponent: true, around: [`^${opened}${lead}`, `${trail}${opened === '(' ? ')' : opened === '{' ? '}' : ''}`] });
    last = match.index + match[0].length;
  }
  if (last < message.length) parts.push({ text: message.slice(last), exponent: false });
  return parts;
}

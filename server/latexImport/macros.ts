// The author's own macros (\newcommand, \renewcommand, \def), expanded in imported formulas so that
// KaTeX, which knows none of them, typesets what the author meant. Works on LaTeX source text.

export interface MacroDefinition {
  /** Without the backslash. */
  name: string;
  argumentCount: number;
  /** The first argument's default when it is optional ([default]), else null. */
  optionalDefault: string | null;
  body: string;
}

const MAX_PASSES = 12;
const MAX_LENGTH = 200_000;

/** The balanced {...} group starting at `at` (which must be '{'); returns its inside and the index after it. */
function braceGroup(text: string, at: number): { inside: string; end: number } | null {
  if (text[at] !== '{') return null;
  let depth = 0;
  for (let i = at; i < text.length; i++) {
    const c = text[i];
    if (c === '\\') {
      i++;
      continue;
    }
    if (c === '{') depth++;
    else if (c === '}') {
      depth--;
      if (depth === 0) return { inside: text.slice(at + 1, i), end: i + 1 };
    }
  }
  return null;
}

function skipSpaces(text: string, at: number): number {
  while (at < text.length && /\s/.test(text[at]!)) at++;
  return at;
}

/** One argument: a brace group, or a single token (a character, or a control sequence). */
function argumentAt(text: string, at: number): { value: string; end: number } | null {
  const i = skipSpaces(text, at);
  if (i >= text.length) return null;
  if (text[i] === '{') {
    const group = braceGroup(text, i);
    return group ? { value: group.inside, end: group.end } : null;
  }
  if (text[i] === '\\') {
    const match = /^\\([a-zA-Z]+|.)/.exec(text.slice(i));
    return match ? { value: match[0], end: i + match[0].length } : null;
  }
  return { value: text[i]!, end: i + 1 };
}

function optionalAt(text: string, at: number): { value: string; end: number } | null {
  const i = skipSpaces(text, at);
  if (text[i] !== '[') return null;
  let depth = 0;
  for (let k = i; k < text.length; k++) {
    if (text[k] === '{') depth++;
    else if (text[k] === '}') depth--;
    else if (text[k] === ']' && depth === 0) return { value: text.slice(i + 1, k), end: k + 1 };
  }
  return null;
}

/** Expands every use of the given macros (repeatedly, for macros that use macros), bounded in passes and length. */
export function expandMacros(source: string, macros: ReadonlyMap<string, MacroDefinition>): string {
  if (macros.size === 0) return source;
  let text = source;
  for (let pass = 0; pass < MAX_PASSES; pass++) {
    let changed = false;
    let out = '';
    let i = 0;
    while (i < text.length) {
      const match = text[i] === '\\' ? /^\\([a-zA-Z]+)/.exec(text.slice(i, i + 64)) : null;
      const definition = match ? macros.get(match[1]!) : undefined;
      if (!match || !definition) {
        // Keep an escaped character (e.g. \\ or \{) whole.
        out += text[i] === '\\' && i + 1 < text.length && !/[a-zA-Z]/.test(text[i + 1]!) ? text.slice(i, i + 2) : text[i];
        i += text[i] === '\\' && i + 1 < text.length && !/[a-zA-Z]/.test(text[i + 1]!) ? 2 : 1;
        continue;
      }
      let at = i + match[0].length;
      const values: string[] = [];
      let complete = true;
      for (let k = 0; k < definition.argumentCount; k++) {
        if (k === 0 && definition.optionalDefault !== null) {
          const optional = optionalAt(text, at);
          values.push(optional ? optional.value : definition.optionalDefault);
          if (optional) at = optional.end;
          continue;
        }
        const argument = argumentAt(text, at);
        if (!argument) {
          complete = false;
          break;
        }
        values.push(argument.value);
        at = argument.end;
      }
      if (!complete) {
        out += match[0];
        i += match[0].length;
        continue;
      }
      let body = definition.body.replace(/#([1-9])/g, (_, n: string) => values[Number(n) - 1] ?? '');
      // A control word followed directly by a letter would merge with it.
      if (/\\[a-zA-Z]+$/.test(body) && /^[a-zA-Z]/.test(text.slice(at))) body += ' ';
      out += body;
      i = at;
      changed = true;
      if (out.length > MAX_LENGTH) return source;
    }
    text = out;
    if (!changed) break;
  }
  return text;
}

// The small field syntaxes of our own around the solver's expressions: lists of names, points
// ("g = 0.1, u = 0"), intervals, settings, observables. Each has a reader and a writer.
import type { Convention, ValueInput } from '../types';
import type { FieldSyntax } from './layout';


export const NAME = /^[A-Za-z_\u0370-\u03FF][A-Za-z0-9_\u0370-\u03FF]*$/;
const NUMBER = /^[-+]?(?:\d+\.?\d*|\.\d+)(?:[eE][-+]?\d+)?$/;

export class FieldSyntaxError extends Error {}

/** Splits at commas and semicolons that are not inside brackets: "atan2(a, b), c" -> two parts. */
export function splitTopLevel(text: string): string[] {
  const parts: string[] = [];
  let depth = 0;
  let start = 0;
  for (let i = 0; i < text.length; i++) {
    const c = text[i]!;
    if (c === '(' || c === '[' || c === '{') depth++;
    else if (c === ')' || c === ']' || c === '}') depth = Math.max(0, depth - 1);
    else if ((c === ',' || c === ';') && depth === 0) {
      parts.push(text.slice(start, i));
      start = i + 1;
    }
  }
  parts.push(text.slice(start));
  return parts.map((part) => part.trim()).filter((part) => part !== '');
}

/** A number when the text is a plain number literal, otherwise the expression as written. */
export function valueFromText(text: string): ValueInput {
  const trimmed = text.trim();
  if (NUMBER.test(trimmed)) {
    const value = Number(trimmed);
    if (Number.isFinite(value)) return value;
  }
  return trimmed;
}

export function textFromValue(value: ValueInput): string {
  return typeof value === 'number' ? String(value) : value;
}

function requireName(text: string, what: string): string {
  const name = text.trim();
  if (!NAME.test(name)) throw new FieldSyntaxError(`"${name}" is not a valid ${what} (letters, digits and _, starting with a letter)`);
  return name;
}

/** "name = value" (or "name: value"); the value may contain anything but a top-level separator. */
function splitAssignment(entry: string): [string, string] | null {
  const match = /^([^=:]+?)\s*[=:]\s*([\s\S]+)$/.exec(entry);
  if (!match) return null;
  return [match[1]!.trim(), match[2]!.trim()];
}

export function parseNames(text: string): string[] {
  return splitTopLevel(text.replace(/\s+/g, ' ').replace(/ /g, ',')).map((name) => requireName(name, 'coupling name'));
}

function parsePoint(text: string, couplings: readonly string[] | null): Record<string, ValueInput> {
  const entries = splitTopLevel(text);
  if (entries.length === 0) throw new FieldSyntaxError('empty');
  const point: Record<string, ValueInput> = {};
  for (const entry of entries) {
    const assignment = splitAssignment(entry);
    if (!assignment) {
      if (entries.length === 1 && couplings && couplings.length === 1) {
        point[couplings[0]!] = valueFromText(entry);
        continue;
      }
      throw new FieldSyntaxError(`write a value per coupling as "coupling = value", e.g. ${couplings?.[0] ?? 'g'} = 0.1`);
    }
    const [name, value] = assignment;
    const coupling = requireName(name, 'coupling name');
    if (coupling in point) throw new FieldSyntaxError(`${coupling} is given twice`);
    point[coupling] = valueFromText(value);
  }
  return point;
}

function formatPoint(point: Record<string, ValueInput>): string {
  return Object.entries(point)
    .map(([name, value]) => `${name} = ${textFromValue(value)}`)
    .join(', ');
}

type Eigenvalue = ValueInput | { re: ValueInput; im: ValueInput };

function parseEigenvalues(text: string): Eigenvalue[] {
  return splitTopLevel(text).map((entry) => {
    const complex = /^complex\s*\(([\s\S]*)\)$/.exec(entry);
    if (!complex) return valueFromText(entry);
    const parts = splitTopLevel(complex[1]!);
    if (parts.length !== 2) throw new FieldSyntaxError(`write a complex eigenvalue as complex(re, im), not ${entry}`);
    return { re: valueFromText(parts[0]!), im: valueFromText(parts[1]!) };
  });
}

function formatEigenvalues(list: readonly Eigenvalue[]): string {
  return list.map((e) => (typeof e === 'object' ? `complex(${textFromValue(e.re)}, ${textFromValue(e.im)})` : textFromValue(e))).join(', ');
}

function parseDomain(text: string): Record<string, [ValueInput, ValueInput]> {
  const domain: Record<string, [ValueInput, ValueInput]> = {};
  for (const entry of splitTopLevel(text)) {
    const match = /^(\S+?)\s*(?:\bin\b|=|:)\s*\[([\s\S]*)\]$/.exec(entry);
    if (!match) throw new FieldSyntaxError(`write an interval as "x in [a, b]", not ${entry}`);
    const variable = requireName(match[1]!, 'variable name');
    const ends = splitTopLevel(match[2]!);
    if (ends.length !== 2) throw new FieldSyntaxError(`an interval has two ends: "${variable} in [a, b]"`);
    domain[variable] = [valueFromText(ends[0]!), valueFromText(ends[1]!)];
  }
  return domain;
}

function formatDomain(domain: Record<string, readonly [ValueInput, ValueInput]>): string {
  return Object.entries(domain)
    .map(([name, [a, b]]) => `${name} in [${textFromValue(a)}, ${textFromValue(b)}]`)
    .join(', ');
}

function parseNumber(text: string): number {
  const trimmed = text.trim();
  const value = Number(trimmed);
  if (!NUMBER.test(trimmed) || !Number.isFinite(value)) throw new FieldSyntaxError(`"${trimmed}" is not a number (write e.g. 3 or 1e-6)`);
  return value;
}

function parseInteger(text: string): number {
  const trimmed = text.trim();
  if (!/^[-+]?\d+$/.test(trimmed)) throw new FieldSyntaxError(`"${trimmed}" is not a whole number`);
  return Number(trimmed);
}

function parseSettings(text: string): Record<string, number> {
  const settings: Record<string, number> = {};
  for (const entry of splitTopLevel(text)) {
    const assignment = splitAssignment(entry);
    if (!assignment) throw new FieldSyntaxError(`write a setting as "name = number", not ${entry}`);
    settings[requireName(assignment[0], 'setting name')] = parseNumber(assignment[1]);
  }
  return settings;
}

function formatSettings(settings: Record<string, number>): string {
  return Object.entries(settings)
    .map(([name, value]) => `${name} = ${value}`)
    .join(', ');
}

type Observable = string | { integral: Record<string, ValueInput> };

function parseObservable(text: string): Observable {
  const trimmed = text.trim();
  const integral = /^integral\s*\(([\s\S]*)\)$/.exec(trimmed);
  if (!integral) return requireName(trimmed, 'rate name (or integral(t = 2))');
  const weights: Record<string, ValueInput> = {};
  for (const entry of splitTopLevel(integral[1]!)) {
    const assignment = splitAssignment(entry);
    if (!assignment) throw new FieldSyntaxError(`write a weight as "rate = weight" inside integral(...), e.g. integral(t = 2)`);
    weights[requireName(assignment[0], 'rate name')] = valueFromText(assignment[1]);
  }
  if (Object.keys(weights).length === 0) throw new FieldSyntaxError('integral(...) needs at least one "rate = weight"');
  return { integral: weights };
}

function formatObservable(observable: Observable): string {
  if (typeof observable === 'string') return observable;
  return `integral(${Object.entries(observable.integral)
    .map(([name, weight]) => `${name} = ${textFromValue(weight)}`)
    .join(', ')})`;
}

export function parseChoice<T extends string>(text: string, choices: readonly T[]): T {
  const trimmed = text.trim();
  if (!(choices as readonly string[]).includes(trimmed)) throw new FieldSyntaxError(`write ${choices.map((c) => `"${c}"`).join(' or ')}, not "${trimmed}"`);
  return trimmed as T;
}

/**
 * The claim-file value of a field's text (for non-empty text), or a FieldSyntaxError with a plain
 * message. `couplings` are those of the bound flow, for a bare value in a point field.
 */
export function fieldValue(syntax: FieldSyntax, text: string, couplings: readonly string[] | null = null): unknown {
  switch (syntax) {
    case 'text':
      return text.trim();
    case 'name':
      return requireName(text, 'name');
    case 'names':
      return parseNames(text);
    case 'convention':
      return parseChoice<Convention>(text, ['uv', 'ir', 'map']);
    case 'expression':
      return valueFromText(text);
    case 'integer':
      return parseInteger(text);
    case 'number':
      return parseNumber(text);
    case 'point':
      return parsePoint(text, couplings);
    case 'eigenvalues':
      return parseEigenvalues(text);
    case 'domain':
      return parseDomain(text);
    case 'settings':
      return parseSettings(text);
    case 'observable':
      return parseObservable(text);
    case 'form':
      return parseChoice(text, ['lambda', 'y'] as const);
  }
}

/** The text a claim-file value is written as in a field (the inverse of fieldValue). */
export function fieldText(syntax: FieldSyntax, value: unknown): string {
  switch (syntax) {
    case 'names':
      return (value as string[]).join(', ');
    case 'point':
      return formatPoint(value as Record<string, ValueInput>);
    case 'eigenvalues':
      return formatEigenvalues(value as Eigenvalue[]);
    case 'domain':
      return formatDomain(value as Record<string, [ValueInput, ValueInput]>);
    case 'settings':
      return formatSettings(value as Record<string, number>);
    case 'observable':
      return formatObservable(value as Observable);
    default:
      return typeof value === 'number' ? String(value) : String(value);
  }
}


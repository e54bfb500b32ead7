// The document's layout: node and attribute names, and the fields of flow and claim blocks.
import { CLAIM_KINDS, type ClaimKind } from '../types';


export const FLOW_BLOCK = 'flowBlock';
export const CLAIM_BLOCK = 'claimBlock';
export const BLOCK_ROW = 'blockRow';
export const BLOCK_FIELD = 'blockField';
export const STEP_ID = 'stepId';
/** claimBlock attribute: null = the nearest flow block above, "none", or a flow block's stepId. */
export const CLAIM_FLOW = 'flow';
export const NO_FLOW = 'none';

/** A node of the document as ProseMirror JSON (what Tiptap's getJSON and the server's reader give). */
export interface DocNode {
  type: string;
  attrs?: Record<string, unknown>;
  content?: DocNode[];
  text?: string;
  marks?: { type: string; attrs?: Record<string, unknown> }[];
}


export type FieldSyntax =
  /** Free text (a block's name, a note). */
  | 'text'
  /** One name: a variable, a rate, a parameter. */
  | 'name'
  /** Names separated by commas: "g, u". */
  | 'names'
  /** uv, ir or map. */
  | 'convention'
  /** A number or a mathjs expression. */
  | 'expression'
  | 'integer'
  | 'number'
  /** One value per coupling: "g = 3*eps/(n+8), u = 0" (a bare value when the flow has one coupling). */
  | 'point'
  /** Values separated by commas; complex(re, im) for a complex one. */
  | 'eigenvalues'
  /** Intervals per variable: "x in [0, 1], y in [0.05, 2]". */
  | 'domain'
  /** Named numbers: "points = 24, starts = 20". */
  | 'settings'
  /** A rate name, or integral(t = 2) for an integral along the flow. */
  | 'observable'
  /** lambda or y. */
  | 'form';

export interface FieldSpec {
  /** The claim-file field (or "name" for the block's name). */
  key: string;
  label: string;
  syntax: FieldSyntax;
  required: boolean;
  /** A short example or explanation shown as the empty field's placeholder. */
  hint: string;
}

export type RowKind = 'parameter' | 'beta' | 'rate';

export interface RowSpec {
  row: RowKind;
  label: string;
  nameHint: string;
  valueHint: string;
}

export const FLOW_FIELDS: readonly FieldSpec[] = [
  { key: 'name', label: 'Name', syntax: 'text', required: false, hint: 'e.g. two-loop O(n) flow' },
  { key: 'couplings', label: 'Couplings', syntax: 'names', required: false, hint: 'names separated by commas, e.g. g, u' },
  { key: 'convention', label: 'Convention', syntax: 'convention', required: false, hint: 'uv (mu dg/dmu), ir (dg/dl) or map (g_{j+1} from g_j)' },
];

export const FLOW_ROWS: readonly RowSpec[] = [
  { row: 'parameter', label: 'Parameter', nameHint: 'name, e.g. eps', valueHint: 'value, e.g. 0.1 or 4 - d' },
  { row: 'beta', label: 'Beta function', nameHint: 'coupling', valueHint: 'e.g. -eps*g + (n+8)/3*g^2' },
  { row: 'rate', label: 'Rate', nameHint: 'name, e.g. t', valueHint: 'd ln X/dl, e.g. 2 - (n+2)/3*g' },
];

const nameField: FieldSpec = { key: 'name', label: 'Name', syntax: 'text', required: false, hint: 'a short name, e.g. nu-eps2 (optional)' };
const toleranceField: FieldSpec = { key: 'tolerance', label: 'Tolerance', syntax: 'number', required: false, hint: 'absolute, e.g. 1e-6 (optional)' };
const settingsField: FieldSpec = { key: 'settings', label: 'Settings', syntax: 'settings', required: false, hint: 'solver settings, e.g. points = 24 (optional)' };
const noteField: FieldSpec = { key: 'note', label: 'Note', syntax: 'text', required: false, hint: 'what this step says, in words (optional)' };

const expr = (key: string, label: string, hint: string, required = true): FieldSpec => ({ key, label, syntax: 'expression', required, hint });
const domainField: FieldSpec = { key: 'domain', label: 'Domain', syntax: 'domain', required: false, hint: 'x in [0, 1] (optional; default [0.05, 2])' };
const variableField: FieldSpec = { key: 'variable', label: 'Variable', syntax: 'name', required: true, hint: 'e.g. x' };
const nearField: FieldSpec = { key: 'near', label: 'Near', syntax: 'point', required: true, hint: 'a guess, e.g. g = 3*eps/(n+8)' };
const parameterField: FieldSpec = { key: 'parameter', label: 'Expansion parameter', syntax: 'name', required: false, hint: 'default eps' };

/** The fields of each claim kind, in the order shown (the block's name first, settings last). */
export const CLAIM_FIELDS: Readonly<Record<ClaimKind, readonly FieldSpec[]>> = {
  identity: [expr('lhs', 'Left side', 'e.g. (1+x)^2'), expr('rhs', 'Right side', 'e.g. 1 + 2*x + x^2'), domainField],
  order: [
    expr('lhs', 'Left side', 'e.g. log(1+x)'),
    expr('rhs', 'Right side', 'e.g. x - x^2/2'),
    variableField,
    { key: 'order', label: 'Order', syntax: 'number', required: true, hint: 'k in O(x^k), e.g. 3' },
    domainField,
  ],
  coefficient: [
    expr('of', 'Of', 'e.g. exp(x)'),
    variableField,
    expr('at', 'At', 'default 0', false),
    { key: 'power', label: 'Power', syntax: 'integer', required: true, hint: 'e.g. 2' },
    expr('value', 'Coefficient', 'e.g. 1/2'),
    domainField,
  ],
  integral: [
    expr('integrand', 'Integrand', 'e.g. x/(exp(x) - 1)'),
    variableField,
    expr('from', 'From', 'e.g. 0'),
    expr('to', 'To', 'e.g. Infinity'),
    expr('value', 'Value', 'e.g. pi^2/6'),
  ],
  'fixed-point': [
    nearField,
    { key: 'value', label: 'Position', syntax: 'point', required: false, hint: 'claimed, e.g. g = 3*eps/(n+8) + ... (optional)' },
    { key: 'order', label: 'Series order', syntax: 'integer', required: false, hint: 'the position is a series through eps^k (optional)' },
    parameterField,
  ],
  stability: [
    nearField,
    { key: 'eigenvalues', label: 'Eigenvalues', syntax: 'eigenvalues', required: false, hint: 'e.g. eps, -2 or complex(1, 0.5) (optional)' },
    { key: 'relevant', label: 'Relevant directions', syntax: 'integer', required: false, hint: 'e.g. 1 (optional)' },
    { key: 'form', label: 'Map eigenvalues as', syntax: 'form', required: false, hint: 'lambda or y = ln|lambda| (maps only)' },
  ],
  'epsilon-coefficient': [
    expr('quantity', 'Quantity', 'at the fixed point, e.g. 1/t'),
    nearField,
    { key: 'power', label: 'Power of eps', syntax: 'integer', required: true, hint: 'e.g. 2' },
    expr('value', 'Coefficient', 'e.g. (n+2)/(4*(n+8))'),
    parameterField,
  ],
  'log-exponent': [
    { key: 'scaling', label: 'Scaling variable', syntax: 'name', required: true, hint: 'a rate name, e.g. t' },
    { key: 'observable', label: 'Observable', syntax: 'observable', required: true, hint: 'a rate name, or integral(t = 2)' },
    { key: 'start', label: 'Start', syntax: 'point', required: true, hint: 'couplings at l = 0, e.g. g = 0.3' },
    expr('value', 'Log exponent p', 'e.g. (n+2)/(n+8)', false),
    expr('power', 'Power x', 'e.g. 1', false),
    parameterField,
  ],
};

const COMMON_AFTER: readonly FieldSpec[] = [toleranceField, settingsField, noteField];

/** Every field of a claim block of this kind, in order. */
export function claimFields(kind: ClaimKind): readonly FieldSpec[] {
  return [nameField, ...CLAIM_FIELDS[kind], ...COMMON_AFTER];
}

export const KIND_LABELS: Readonly<Record<ClaimKind, string>> = {
  identity: 'Identity',
  order: 'Order',
  coefficient: 'Coefficient',
  integral: 'Integral',
  'fixed-point': 'Fixed point',
  stability: 'Stability',
  'epsilon-coefficient': 'Epsilon coefficient',
  'log-exponent': 'Log exponent',
};

/** Kinds that need a flow block; the others may stand alone (their symbols are free variables). */
export const FLOW_KINDS: ReadonlySet<ClaimKind> = new Set<ClaimKind>(['fixed-point', 'stability', 'epsilon-coefficient', 'log-exponent']);

export function isClaimKind(value: unknown): value is ClaimKind {
  return typeof value === 'string' && (CLAIM_KINDS as readonly string[]).includes(value);
}


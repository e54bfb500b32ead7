/**
 * Reading a claim file from unknown JSON. The file's shape (flow, list of claims) is validated as
 * a whole; each claim is validated on its own so that one malformed claim becomes `invalid` and
 * the others are still checked. Every message names the field, e.g. "claims[2].near".
 */
import { z } from 'zod';
import { CLAIM_KINDS, type Claim, type ClaimFile, type ClaimKind, type FieldError, type FlowSpec } from './types';

const valueInput = z.union([z.number(), z.string()], { error: 'expected a number or an expression (a string)' });
const finitePositive = z.number({ error: 'expected a number' }).positive({ error: 'must be a positive number' });
const point = z.record(z.string(), valueInput, { error: 'expected an object with a number or an expression per coupling' });
const domain = z.record(z.string(), z.tuple([valueInput, valueInput], { error: 'expected [from, to]' }), {
  error: 'expected an object with an interval [from, to] per variable',
});
const eigenvalue = z.union([valueInput, z.strictObject({ re: valueInput, im: valueInput })], {
  error: 'expected a number, an expression, or { "re": ..., "im": ... }',
});
const nonNegativeInteger = z.number({ error: 'expected a whole number' }).int({ error: 'must be a whole number' }).min(0, { error: 'must be 0 or more' });

const base = {
  id: z.string({ error: 'expected a string' }).min(1, { error: 'must not be empty' }),
  tolerance: finitePositive.optional(),
  settings: z.record(z.string(), z.number({ error: 'expected a number' }), { error: 'expected an object of named numbers' }).optional(),
  note: z.string().optional(),
};

const claimSchemas: Record<ClaimKind, z.ZodType> = {
  identity: z.strictObject({ ...base, kind: z.literal('identity'), lhs: valueInput, rhs: valueInput, domain: domain.optional() }),
  order: z.strictObject({
    ...base,
    kind: z.literal('order'),
    lhs: valueInput,
    rhs: valueInput,
    variable: z.string({ error: 'expected the name of the variable' }),
    order: z.number({ error: 'expected a number' }),
    domain: domain.optional(),
  }),
  coefficient: z.strictObject({
    ...base,
    kind: z.literal('coefficient'),
    of: valueInput,
    variable: z.string({ error: 'expected the name of the variable' }),
    at: valueInput.optional(),
    power: nonNegativeInteger,
    value: valueInput,
    domain: domain.optional(),
  }),
  integral: z.strictObject({
    ...base,
    kind: z.literal('integral'),
    integrand: valueInput,
    variable: z.string({ error: 'expected the name of the variable' }),
    from: valueInput,
    to: valueInput,
    value: valueInput,
  }),
  'fixed-point': z.strictObject({
    ...base,
    kind: z.literal('fixed-point'),
    near: point,
    value: point.optional(),
    order: nonNegativeInteger.optional(),
    parameter: z.string().optional(),
  }),
  stability: z.strictObject({
    ...base,
    kind: z.literal('stability'),
    near: point,
    eigenvalues: z.array(eigenvalue, { error: 'expected a list of eigenvalues' }).optional(),
    relevant: nonNegativeInteger.optional(),
    form: z.enum(['lambda', 'y'], { error: 'expected "lambda" or "y"' }).optional(),
  }),
  'epsilon-coefficient': z.strictObject({
    ...base,
    kind: z.literal('epsilon-coefficient'),
    quantity: valueInput,
    near: point,
    power: nonNegativeInteger,
    value: valueInput,
    parameter: z.string().optional(),
  }),
  // The log-exponent module validates its further fields itself.
  'log-exponent': z.looseObject({
    ...base,
    kind: z.literal('log-exponent'),
    scaling: z.string({ error: 'expected a rate name' }),
    observable: z.union([z.string(), z.strictObject({ integral: z.record(z.string(), valueInput) })], {
      error: 'expected a rate name or { "integral": { rate: weight, ... } }',
    }),
    start: point,
    value: valueInput.optional(),
    power: valueInput.optional(),
  }),
};

const flowSchema = z.strictObject({
  couplings: z.array(z.string({ error: 'expected a coupling name' }), { error: 'expected a list of coupling names' }).default([]),
  parameters: z.record(z.string(), valueInput, { error: 'expected an object of parameter values' }).default({}),
  convention: z.enum(['uv', 'ir', 'map'], { error: 'expected "uv" (mu dg/dmu), "ir" (dg/dl) or "map" (g_{j+1} from g_j)' }).optional(),
  beta: z.record(z.string(), valueInput, { error: 'expected an object with one expression per coupling' }).default({}),
  rates: z.record(z.string(), valueInput, { error: 'expected an object of rate expressions' }).optional(),
});

const fileSchema = z.looseObject({
  flow: flowSchema.optional(),
  claims: z.array(z.unknown(), { error: 'expected a list of claims' }),
});

function formatPath(prefix: string, path: readonly PropertyKey[]): string {
  let text = prefix;
  for (const part of path) {
    if (typeof part === 'number') text += `[${part}]`;
    else text += text === '' ? String(part) : `.${String(part)}`;
  }
  return text;
}

function valueAt(root: unknown, path: readonly PropertyKey[]): unknown {
  let value = root;
  for (const part of path) {
    if (typeof value !== 'object' || value === null) return undefined;
    value = (value as Record<PropertyKey, unknown>)[part];
  }
  return value;
}

/** Turn zod issues into field errors with plain messages (`root` is the validated input). */
export function fieldErrors(issues: readonly z.core.$ZodIssue[], root: unknown, prefix = ''): FieldError[] {
  return issues.map((issue) => {
    if (issue.code === 'unrecognized_keys') {
      const field = formatPath(prefix, [...issue.path, issue.keys[0] ?? '']);
      return { field, message: `${field}: unknown field${issue.keys.length > 1 ? `s ${issue.keys.map((k) => `"${k}"`).join(', ')}` : ''}` };
    }
    const field = formatPath(prefix, issue.path);
    const missing = valueAt(root, issue.path) === undefined;
    return { field, message: `${field}: ${missing ? 'missing (required)' : issue.message}` };
  });
}

export type FileParse = { ok: true; file: ClaimFile & { flow: FlowSpec } } | { ok: false; errors: FieldError[] };

/** Validate the file's shape. Claims are only required to be a list here (see parseClaim). */
export function parseClaimFile(input: unknown): FileParse {
  if (typeof input !== 'object' || input === null || Array.isArray(input)) {
    return { ok: false, errors: [{ field: '(file)', message: 'the file must hold a JSON object with "flow" and "claims"' }] };
  }
  const parsed = fileSchema.safeParse(input);
  if (!parsed.success) return { ok: false, errors: fieldErrors(parsed.error.issues, input) };
  const flow = parsed.data.flow ?? { couplings: [], parameters: {}, beta: {} };
  if (flow.convention === undefined && flow.couplings.length > 0) {
    return { ok: false, errors: [{ field: 'flow.convention', message: 'flow.convention: missing (required): "uv" (mu dg/dmu), "ir" (dg/dl) or "map"' }] };
  }
  const spec: FlowSpec = { ...flow, convention: flow.convention ?? 'ir' };
  return { ok: true, file: { flow: spec, claims: parsed.data.claims } };
}

export type ClaimParse =
  | { ok: true; claim: Claim }
  | { ok: false; id: string; kind: string; errors: FieldError[] };

/** Validate one claim; `index` names it in messages ("claims[3].value"). */
export function parseClaim(input: unknown, index: number): ClaimParse {
  const prefix = `claims[${index}]`;
  const record = typeof input === 'object' && input !== null && !Array.isArray(input) ? (input as Record<string, unknown>) : null;
  const id = record && typeof record.id === 'string' && record.id !== '' ? record.id : prefix;
  const kind = record && typeof record.kind === 'string' ? record.kind : '';
  if (!record) return { ok: false, id, kind, errors: [{ field: prefix, message: `${prefix}: a claim must be an object` }] };
  if (!(CLAIM_KINDS as readonly string[]).includes(kind)) {
    const what = kind === '' ? 'missing' : `"${kind}" is not a claim kind`;
    return { ok: false, id, kind, errors: [{ field: `${prefix}.kind`, message: `${prefix}.kind: ${what}; kinds: ${CLAIM_KINDS.join(', ')}` }] };
  }
  const parsed = claimSchemas[kind as ClaimKind].safeParse(input);
  if (!parsed.success) return { ok: false, id, kind, errors: fieldErrors(parsed.error.issues, input, prefix) };
  return { ok: true, claim: parsed.data as Claim };
}

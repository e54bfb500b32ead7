// The live preview of a block's fields: each field's text read as the solver reads it, typeset as
// TeX (mathjs toTex), or the solver's own message for a parse error or an unknown symbol. Used by
// the editor's field worker; kept out of flow/document.ts so readers of documents do not load
// mathjs for it.
import type { MathNode } from 'mathjs';
import { ExpressionError, describeError } from '../errors';
import { isReservedName, parseNode, parseTerm, requireKnown } from '../expr';
import { BoundedCache } from '../expr/cache';
import type { ClaimKind, Convention, ValueInput } from '../types';
import { BLOCK_FIELD, BLOCK_ROW, CLAIM_BLOCK, FLOW_BLOCK, FLOW_FIELDS, FLOW_KINDS, STEP_ID, claimFields, isClaimKind, type DocNode, type FieldSyntax, type RowKind } from './layout';
import { readDocument, type DocumentReading, type FlowReading, type FlowSymbols } from './read';
import { FieldSyntaxError, NAME, fieldValue, splitTopLevel } from './syntax';

export interface PreviewRequest {
  syntax: FieldSyntax;
  text: string;
  /** Symbols the expression may use; null or absent: any symbol (a free variable). */
  allowed?: readonly string[] | null;
  /** Where allowed symbols come from, for the message, e.g. "may use the couplings (g) and the parameters (n, eps)". */
  origin?: string;
  /** The bound flow's couplings, for a bare value in a point field (and to check the names of a point). */
  couplings?: readonly string[] | null;
  /** Names an observable or a scaling variable may be (the bound flow's rates); null: not checked. */
  rates?: readonly string[] | null;
  /** What a one-name field names: a rate of the flow is checked against `rates`, a parameter against `parameters`. */
  nameKind?: 'rate' | 'parameter' | 'symbol';
  /** The bound flow's parameters, for a field naming one. */
  parameters?: readonly string[] | null;
  /** TeX put before the field's own, e.g. "\\frac{dg}{dl} = " for a beta function. */
  prefix?: string;
}

export interface Preview {
  /** TeX of what the field says, or null when there is nothing to typeset. */
  tex: string | null;
  /** What is wrong, in the solver's words, or null. */
  message: string | null;
  /** 1-based character of the field's text the message points at, when known. */
  position?: number;
}

const WHERE = '\u0000field';

const GREEK = new Set(
  'alpha beta gamma delta epsilon zeta eta theta iota kappa lambda mu nu xi omicron pi rho sigma tau upsilon phi chi psi omega Gamma Delta Theta Lambda Xi Pi Sigma Upsilon Phi Psi Omega varepsilon vartheta varphi varrho varsigma'.split(' '),
);

/** TeX of a name: Greek letters as letters, eps as epsilon, g_1 with a subscript, words upright. */
export function symbolTex(name: string): string {
  const underscore = name.indexOf('_');
  if (underscore > 0 && underscore < name.length - 1) return `${symbolTex(name.slice(0, underscore))}_{${symbolTex(name.slice(underscore + 1))}}`;
  if (name === 'eps') return '\\varepsilon';
  if (GREEK.has(name)) return `\\${name}`;
  if (name === 'Infinity' || name === 'inf') return '\\infty';
  if (name.length === 1) return name;
  return `\\mathrm{${name.replace(/_/g, '\\_')}}`;
}

function expressionTex(source: string): string {
  const node = parseNode(source, WHERE);
  return node.toTex({
    parenthesis: 'auto',
    implicit: 'hide',
    // A leading space keeps a name apart from a control word before it ("\\cdot g", not "\\cdotg").
    handler: (inner: MathNode) => (inner.type === 'SymbolNode' ? ` ${symbolTex((inner as MathNode & { name: string }).name)}` : undefined),
  });
}

function clean(message: string): string {
  const stripped = message.startsWith(`${WHERE}: `) ? message.slice(WHERE.length + 2) : message;
  return stripped.charAt(0).toUpperCase() + stripped.slice(1);
}

class PreviewProblem extends Error {
  constructor(
    message: string,
    readonly position?: number,
  ) {
    super(message);
  }
}

/** A number as TeX: 1e-6 as 1 \\times 10^{-6}. */
export function numberTex(value: number): string {
  if (!Number.isFinite(value)) return value > 0 ? '\\infty' : value < 0 ? '-\\infty' : '\\mathrm{NaN}';
  const text = String(value);
  const exponent = /^(-?[\d.]+)e([-+]?\d+)$/.exec(text);
  if (!exponent) return text;
  const power = Number(exponent[2]);
  return exponent[1] === '1' ? `10^{${power}}` : `${exponent[1]} \\times 10^{${power}}`;
}

/** Reads one expression through the solver's parser and whitelist; TeX of it. */
function checkedExpression(value: ValueInput, request: PreviewRequest): string {
  if (typeof value === 'number') return numberTex(value);
  const declared = new Set(request.allowed ?? []);
  try {
    const term = parseTerm(value, WHERE, declared);
    if (request.allowed) requireKnown(term, value, WHERE, declared, request.origin ?? `may use ${[...declared].join(', ') || 'no symbols'}`);
    return expressionTex(value);
  } catch (error) {
    if (error instanceof ExpressionError) {
      // Positions are within this piece; they are right for a whole-field expression.
      throw new PreviewProblem(clean(error.message), value === request.text.trim() ? error.position : undefined);
    }
    throw new PreviewProblem(clean(describeError(error)));
  }
}

function checkedName(name: string, what: string): string {
  if (!NAME.test(name)) throw new PreviewProblem(`"${name}" is not a valid ${what} name (letters, digits and _, starting with a letter)`);
  if (isReservedName(name)) throw new PreviewProblem(`"${name}" is the name of a function and cannot name a ${what}`);
  return symbolTex(name);
}

function listOf(names: readonly string[]): string {
  return names.length === 0 ? 'none' : names.join(', ');
}

function checkedRate(name: string, request: PreviewRequest): string {
  const tex = checkedName(name, 'rate');
  if (request.rates && !request.rates.includes(name)) throw new PreviewProblem(`"${name}" is not a rate of the flow (rates: ${listOf(request.rates)})`);
  return tex;
}

function checkedCoupling(name: string, request: PreviewRequest): string {
  if (request.couplings && !request.couplings.includes(name)) throw new PreviewProblem(`"${name}" is not a coupling of the flow (couplings: ${listOf(request.couplings)})`);
  return symbolTex(name);
}

const CONVENTIONS: Record<string, string> = {
  uv: '\\mu\\,\\frac{dg}{d\\mu} = \\beta(g)\\quad\\text{(flow to the infrared: } \\tfrac{dg}{dl} = -\\beta)',
  ir: '\\frac{dg}{dl} = \\beta(g)\\quad\\text{(RG time } l = -\\ln\\mu)',
  map: 'g_{j+1} = F(g_j)\\quad\\text{(one discrete RG step)}',
};

function texOf(request: PreviewRequest): string | null {
  const text = request.text.trim();
  const value = fieldValue(request.syntax, text, request.couplings ?? null);
  switch (request.syntax) {
    case 'text':
    case 'form':
      return null;
    case 'name':
      if (request.nameKind === 'rate') return checkedRate(value as string, request);
      if (request.nameKind === 'parameter') {
        const tex = checkedName(value as string, 'parameter');
        if (request.parameters && !request.parameters.includes(value as string)) throw new PreviewProblem(`"${String(value)}" is not a parameter of the flow (parameters: ${listOf(request.parameters)})`);
        return tex;
      }
      return checkedName(value as string, 'symbol');
    case 'names':
      return (value as string[]).map((n) => checkedName(n, 'coupling')).join(',\\ ');
    case 'convention':
      return CONVENTIONS[value as string] ?? null;
    case 'integer':
    case 'number':
      return numberTex(value as number);
    case 'expression':
      return checkedExpression(value as ValueInput, request);
    case 'point':
      return Object.entries(value as Record<string, ValueInput>)
        .map(([name, v]) => `${checkedCoupling(name, request)} = ${checkedExpression(v, request)}`)
        .join(',\\quad ');
    case 'eigenvalues':
      return (value as Array<ValueInput | { re: ValueInput; im: ValueInput }>)
        .map((e) => (typeof e === 'object' ? `${checkedExpression(e.re, request)} + \\left(${checkedExpression(e.im, request)}\\right) i` : checkedExpression(e, request)))
        .join(',\\ ');
    case 'domain':
      return Object.entries(value as Record<string, [ValueInput, ValueInput]>)
        .map(([name, [a, b]]) => `${symbolTex(name)} \\in [${checkedExpression(a, { ...request, allowed: null })}, ${checkedExpression(b, { ...request, allowed: null })}]`)
        .join(',\\quad ');
    case 'settings':
      return Object.entries(value as Record<string, number>)
        .map(([name, v]) => `\\text{${name}} = ${v}`)
        .join(',\\ ');
    case 'observable': {
      if (typeof value === 'string') return checkedRate(value, request);
      const weights = (value as { integral: Record<string, ValueInput> }).integral;
      const exponent = Object.entries(weights)
        .map(([name, w]) => `${checkedExpression(w, request)}\\int_0^{l} (${checkedRate(name, request)} - ${symbolTex(name)}|_{0})\\,dl'`)
        .join(' + ');
      return `\\int_0^{l^*} \\exp\\Big(${exponent}\\Big)\\,dl`;
    }
  }
}

/** The preview of a field's text; an empty field has neither TeX nor a message. */
export function previewField(request: PreviewRequest): Preview {
  if (request.text.trim() === '') return { tex: null, message: null };
  try {
    const tex = texOf(request);
    return { tex: tex === null ? null : `${request.prefix ?? ''}${tex}`, message: null };
  } catch (error) {
    if (error instanceof PreviewProblem) return error.position === undefined ? { tex: null, message: error.message } : { tex: null, message: error.message, position: error.position };
    if (error instanceof FieldSyntaxError) return { tex: null, message: error.message.charAt(0).toUpperCase() + error.message.slice(1) };
    return { tex: null, message: clean(describeError(error)) };
  }
}

/** Splits a field into its list entries the way the conversion does (for showing them one by one). */
export { splitTopLevel };

// ---------------------------------------------------------------------------------------------
// Every field of a document

/** Previews of one block's fields by field address: a key ("near") or a row field ("beta[0].value"). */
export type BlockPreviews = Record<string, Preview>;

const previewCache = new BoundedCache<string, Preview>(4000);

/** previewField, remembered per request (most fields do not change between two readings). */
export function cachedPreview(request: PreviewRequest): Preview {
  const key = JSON.stringify([request.syntax, request.text, request.allowed ?? null, request.origin ?? '', request.couplings ?? null, request.rates ?? null, request.nameKind ?? '', request.parameters ?? null, request.prefix ?? '']);
  const known = previewCache.get(key);
  if (known) return known;
  const preview = previewField(request);
  previewCache.set(key, preview);
  return preview;
}

function textOf(node: DocNode): string {
  if (typeof node.text === 'string') return node.text;
  return (node.content ?? []).map(textOf).join('');
}

function fieldKey(node: DocNode, fallback: string): string {
  const key = node.attrs?.field;
  return typeof key === 'string' ? key : fallback;
}

/** What a flow expression may use, in the solver's words (flow/model.ts). */
function flowOrigin(symbols: FlowSymbols): string {
  return `a flow expression may use the couplings (${listOf(symbols.couplings)}), the parameters (${listOf(symbols.parameters)}) and the rate names (${listOf(symbols.rates)})`;
}

function valueOrigin(symbols: FlowSymbols): string {
  return `a value may use numbers, constants (pi, e) and the parameters (${listOf(symbols.parameters)})`;
}

function lhsTex(row: RowKind, name: string, convention: Convention | null): string {
  if (!NAME.test(name)) return '';
  const symbol = symbolTex(name);
  if (row === 'parameter') return `${symbol} = `;
  if (row === 'rate') return `\\frac{d\\ln ${symbol}}{dl} = `;
  if (convention === 'uv') return `\\beta_{${symbol}} = \\mu\\frac{d${symbol}}{d\\mu} = `;
  if (convention === 'map') return `${symbol}' = `;
  return `\\frac{d${symbol}}{dl} = `;
}

function conventionOf(node: DocNode): Convention | null {
  for (const child of node.content ?? []) {
    if (child.type === BLOCK_FIELD && child.attrs?.field === 'convention') {
      const text = textOf(child).trim();
      return text === 'uv' || text === 'ir' || text === 'map' ? text : null;
    }
  }
  return null;
}

function flowPreviews(node: DocNode, flow: FlowReading): BlockPreviews {
  const previews: BlockPreviews = {};
  const symbols = flow.symbols;
  const convention = conventionOf(node);
  const counters: Record<RowKind, number> = { parameter: 0, beta: 0, rate: 0 };
  for (const child of node.content ?? []) {
    if (child.type === BLOCK_FIELD) {
      const key = fieldKey(child, '');
      const spec = FLOW_FIELDS.find((f) => f.key === key);
      if (!spec || key in previews) continue;
      previews[key] = cachedPreview({ syntax: spec.syntax, text: textOf(child) });
      continue;
    }
    if (child.type !== BLOCK_ROW) continue;
    const row = child.attrs?.row;
    if (row !== 'parameter' && row !== 'beta' && row !== 'rate') continue;
    const at = `${row}[${counters[row]++}]`;
    const fields = (child.content ?? []).filter((f) => f.type === BLOCK_FIELD);
    const nameNode = fields.find((f) => f.attrs?.field === 'name') ?? fields[0];
    const valueNode = fields.find((f) => f.attrs?.field === 'value') ?? (fields[1] !== nameNode ? fields[1] : undefined);
    const name = nameNode ? textOf(nameNode).trim() : '';
    previews[`${at}.name`] =
      row === 'beta'
        ? cachedPreview({ syntax: 'name', text: name, nameKind: 'symbol' })
        : cachedPreview({ syntax: 'name', text: name });
    if (!valueNode) continue;
    const prefix = lhsTex(row, name, convention);
    previews[`${at}.value`] =
      row === 'parameter'
        ? cachedPreview({
            syntax: 'expression',
            text: textOf(valueNode),
            allowed: symbols.parameters,
            origin: `a parameter value may use numbers, constants (pi, e) and other parameters (${listOf(symbols.parameters)})`,
            prefix,
          })
        : cachedPreview({ syntax: 'expression', text: textOf(valueNode), allowed: [...symbols.couplings, ...symbols.parameters, ...symbols.rates], origin: flowOrigin(symbols), prefix });
  }
  return previews;
}

/** The request for one field of a claim of this kind, bound to a flow with these symbols (or none). */
function claimFieldRequest(kind: ClaimKind, key: string, syntax: FieldSyntax, text: string, symbols: FlowSymbols | null, variable: string | null): PreviewRequest {
  const request: PreviewRequest = { syntax, text };
  const needsFlow = FLOW_KINDS.has(kind);
  // A flow claim without a flow says so at the block; its fields are not judged against nothing.
  if (!symbols && needsFlow) return request;
  symbols ??= { couplings: [], parameters: [], rates: [] };
  const parameters = symbols.parameters;
  request.couplings = symbols.couplings;
  if (needsFlow) {
    if (key === 'quantity') return { ...request, allowed: [...symbols.couplings, ...parameters, ...symbols.rates], origin: flowOrigin(symbols) };
    if (key === 'scaling') return { ...request, nameKind: 'rate', rates: symbols.rates };
    if (key === 'observable') return { ...request, rates: symbols.rates, allowed: parameters, origin: valueOrigin(symbols) };
    if (key === 'parameter') return { ...request, nameKind: 'parameter', parameters };
    if (syntax === 'point' || syntax === 'eigenvalues' || syntax === 'expression') return { ...request, allowed: parameters, origin: valueOrigin(symbols) };
    return request;
  }
  // Identities, orders and coefficients: every symbol that is not a parameter is a free variable.
  if (kind === 'integral') {
    if (key === 'integrand') {
      const allowed = variable ? [variable, ...parameters] : null;
      return allowed ? { ...request, allowed, origin: `the integrand may use the variable ${variable} and the parameters (${listOf(parameters)})` } : request;
    }
    if (key === 'from' || key === 'to' || key === 'value') return { ...request, allowed: parameters, origin: valueOrigin(symbols) };
  }
  return request;
}

function claimPreviews(node: DocNode, kind: ClaimKind, symbols: FlowSymbols | null): BlockPreviews {
  const previews: BlockPreviews = {};
  const specs = claimFields(kind);
  const texts = new Map<string, string>();
  for (const child of node.content ?? []) {
    if (child.type !== BLOCK_FIELD) continue;
    const key = fieldKey(child, '');
    const text = textOf(child);
    if (!texts.has(key) || texts.get(key)!.trim() === '') texts.set(key, text);
  }
  const variable = texts.get('variable')?.trim() || null;
  for (const spec of specs) {
    const text = texts.get(spec.key);
    if (text === undefined) continue;
    previews[spec.key] = cachedPreview(claimFieldRequest(kind, spec.key, spec.syntax, text, symbols, variable && NAME.test(variable) ? variable : null));
  }
  return previews;
}

/**
 * Previews of every field of every flow and claim block of a document, by stepId and field
 * address (the addresses of `BlockProblem.field`). Claim fields are read against the flow block
 * each claim is bound to, as the solver reads them.
 */
export function previewDocument(doc: DocNode | readonly DocNode[], reading: DocumentReading = readDocument(doc)): Record<string, BlockPreviews> {
  const blocks = Array.isArray(doc) ? (doc as readonly DocNode[]) : ((doc as DocNode).content ?? []);
  const result: Record<string, BlockPreviews> = {};
  let flowIndex = 0;
  let claimIndex = 0;
  const flowByStep = new Map(reading.flows.map((f) => [f.stepId, f]));
  for (const block of blocks) {
    const stepId = typeof block.attrs?.[STEP_ID] === 'string' ? (block.attrs[STEP_ID] as string) : '';
    if (block.type === FLOW_BLOCK) {
      const flow = reading.flows[flowIndex++];
      if (flow && stepId) result[stepId] = flowPreviews(block, flow);
    } else if (block.type === CLAIM_BLOCK) {
      const claim = reading.claims[claimIndex++];
      const kind = block.attrs?.kind;
      if (!claim || !stepId || !isClaimKind(kind)) continue;
      const flow = claim.flowStepId ? flowByStep.get(claim.flowStepId) : undefined;
      result[stepId] = claimPreviews(block, kind, flow ? flow.symbols : null);
    }
  }
  return result;
}

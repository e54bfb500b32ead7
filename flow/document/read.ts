// Reading a document: every flow and claim block, with its problems, and the claim files to check.
import { CLAIM_KINDS, type ClaimFile, type ClaimKind, type ClaimResult, type Convention, type FlowSpec, type ValueInput } from '../types';
import { BLOCK_FIELD, BLOCK_ROW, CLAIM_BLOCK, CLAIM_FLOW, FLOW_BLOCK, FLOW_KINDS, KIND_LABELS, NO_FLOW, STEP_ID, claimFields, isClaimKind, type DocNode, type RowKind } from './layout';
import { uncheckedResult } from '../uncheckedResult';
import { FieldSyntaxError, NAME, fieldValue, parseChoice, parseNames, valueFromText } from './syntax';


/** Where in a block something is wrong: a field key, or a row field such as "beta[0].value". */
export interface BlockProblem {
  stepId: string;
  field: string;
  message: string;
}

export interface FlowSymbols {
  couplings: string[];
  parameters: string[];
  rates: string[];
}

export interface FlowReading {
  stepId: string;
  /** 1 for the first flow block of the document, and so on. */
  number: number;
  name: string;
  /** The flow as the solver reads it; null when the block has a problem of its own (see problems). */
  spec: FlowSpec | null;
  /** Names declared by the block, as far as they could be read. */
  symbols: FlowSymbols;
  /** The name written in each row, by kind and position (for pointing at a row). */
  rowNames: Record<RowKind, string[]>;
  problems: BlockProblem[];
}

export interface ClaimReading {
  stepId: string;
  /** 1 for the first claim block of the document, and so on. */
  number: number;
  kind: ClaimKind | null;
  /** The claim's id in the claim file: its name, or one made from its step. */
  id: string;
  name: string;
  /** The flow block it is bound to, or null for none. */
  flowStepId: string | null;
  /** The claim as the solver reads it; null when it cannot be checked (see problems). */
  claim: Record<string, unknown> | null;
  problems: BlockProblem[];
}

export interface CheckGroup {
  /** The flow block's stepId, or "none" for claims without a flow. */
  key: string;
  flowStepId: string | null;
  /** The claim file of this group: the flow and its claims in document order. */
  file: ClaimFile;
  /** The stepId of each claim of file.claims, in the same order. */
  claimStepIds: string[];
}

export interface DocumentReading {
  flows: FlowReading[];
  claims: ClaimReading[];
  /** One claim file per flow block that has checkable claims, and one for claims without a flow. */
  groups: CheckGroup[];
}

const EMPTY_FLOW: FlowSpec = { couplings: [], parameters: {}, convention: 'ir', beta: {} };

function textOf(node: DocNode): string {
  if (typeof node.text === 'string') return node.text;
  return (node.content ?? []).map(textOf).join('');
}

function attr(node: DocNode, name: string): unknown {
  return node.attrs?.[name];
}

function stepIdOf(node: DocNode): string {
  const id = attr(node, STEP_ID);
  return typeof id === 'string' ? id : '';
}

interface FieldText {
  text: string;
  /** Further non-empty copies of the same field (a concurrent insert). */
  duplicates: number;
}

/** Field texts of a block by key: the first copy counts; an empty copy yields to a written one. */
function fieldsOf(nodes: readonly DocNode[]): Map<string, FieldText> {
  const fields = new Map<string, FieldText>();
  for (const node of nodes) {
    if (node.type !== BLOCK_FIELD) continue;
    const key = attr(node, 'field');
    if (typeof key !== 'string') continue;
    const text = textOf(node);
    const seen = fields.get(key);
    if (!seen) fields.set(key, { text, duplicates: 0 });
    else if (seen.text.trim() === '') fields.set(key, { text, duplicates: seen.duplicates });
    else if (text.trim() !== '') seen.duplicates++;
  }
  return fields;
}

interface RowText {
  name: string;
  value: string;
}

function rowsOf(nodes: readonly DocNode[], kind: RowKind): RowText[] {
  const rows: RowText[] = [];
  for (const node of nodes) {
    if (node.type !== BLOCK_ROW || attr(node, 'row') !== kind) continue;
    const fields = (node.content ?? []).filter((child) => child.type === BLOCK_FIELD);
    const byKey = (key: string, position: number) => fields.find((f) => attr(f, 'field') === key) ?? fields[position];
    const name = byKey('name', 0);
    const value = byKey('value', 1);
    rows.push({ name: name ? textOf(name).trim() : '', value: value && value !== name ? textOf(value).trim() : '' });
  }
  return rows;
}

function readFlow(node: DocNode, number: number): FlowReading {
  const stepId = stepIdOf(node);
  const children = node.content ?? [];
  const fields = fieldsOf(children);
  const problems: BlockProblem[] = [];
  const problem = (field: string, message: string) => problems.push({ stepId, field, message });
  for (const [key, field] of fields) {
    if (field.duplicates > 0) problem(key, 'this field appears twice in the block; remove one copy');
  }

  let couplings: string[] = [];
  const couplingText = fields.get('couplings')?.text.trim() ?? '';
  if (couplingText !== '') {
    try {
      couplings = parseNames(couplingText);
    } catch (error) {
      problem('couplings', (error as Error).message);
    }
  }
  const duplicateCoupling = couplings.find((name, i) => couplings.indexOf(name) !== i);
  if (duplicateCoupling) problem('couplings', `${duplicateCoupling} is listed twice`);

  let convention: Convention | undefined;
  const conventionText = fields.get('convention')?.text.trim() ?? '';
  if (conventionText !== '') {
    try {
      convention = parseChoice<Convention>(conventionText, ['uv', 'ir', 'map']);
    } catch (error) {
      problem('convention', (error as Error).message);
    }
  } else if (couplings.length > 0) {
    problem('convention', 'missing: write uv (entries are mu dg/dmu), ir (entries are dg/dl) or map (g_{j+1} from g_j)');
  }

  const named = (kind: RowKind, what: string): Record<string, ValueInput> => {
    const out: Record<string, ValueInput> = {};
    rowsOf(children, kind).forEach((row, i) => {
      if (row.name === '' && row.value === '') return;
      const at = `${kind}[${i}]`;
      if (row.name === '') return problem(`${at}.name`, `the ${what} has no name`);
      if (!NAME.test(row.name)) return problem(`${at}.name`, `"${row.name}" is not a valid ${what} name (letters, digits and _, starting with a letter)`);
      if (row.name in out) return problem(`${at}.name`, `${row.name} has a second ${what} row`);
      if (row.value === '') return problem(`${at}.value`, `the ${what} ${row.name} has no value`);
      out[row.name] = valueFromText(row.value);
    });
    return out;
  };
  const parameters = named('parameter', 'parameter');
  const beta = named('beta', 'beta function');
  const rates = named('rate', 'rate');

  const betaRows = rowsOf(children, 'beta');
  betaRows.forEach((row, i) => {
    if (row.name !== '' && NAME.test(row.name) && !couplings.includes(row.name)) {
      problem(`beta[${i}].name`, `${row.name} is not one of the couplings (${couplings.join(', ') || 'none listed'})`);
    }
  });
  for (const coupling of couplings) {
    if (!betaRows.some((row) => row.name === coupling)) problem('couplings', `the coupling ${coupling} has no beta function: add a beta function row for it`);
  }

  const spec: FlowSpec = { couplings, parameters, convention: convention ?? 'ir', beta };
  if (Object.keys(rates).length > 0) spec.rates = rates;
  return {
    stepId,
    number,
    name: fields.get('name')?.text.trim() ?? '',
    spec: problems.length === 0 ? spec : null,
    symbols: { couplings, parameters: Object.keys(parameters), rates: Object.keys(rates) },
    rowNames: { parameter: rowsOf(children, 'parameter').map((r) => r.name), beta: betaRows.map((r) => r.name), rate: rowsOf(children, 'rate').map((r) => r.name) },
    problems,
  };
}

function readClaim(node: DocNode, number: number, flow: FlowReading | null, couplings: readonly string[] | null): ClaimReading {
  const stepId = stepIdOf(node);
  const rawKind = attr(node, 'kind');
  const kind = isClaimKind(rawKind) ? rawKind : null;
  const fields = fieldsOf(node.content ?? []);
  const name = fields.get('name')?.text.trim() ?? '';
  const id = name !== '' ? name : stepId ? `step-${stepId.slice(0, 8)}` : `claim-${number}`;
  const problems: BlockProblem[] = [];
  const problem = (field: string, message: string) => problems.push({ stepId, field, message });
  const reading: ClaimReading = { stepId, number, kind, id, name, flowStepId: flow?.stepId ?? null, claim: null, problems };
  if (!kind) {
    problem('kind', `"${String(rawKind)}" is not a claim kind; kinds: ${CLAIM_KINDS.join(', ')}`);
    return reading;
  }
  const claim: Record<string, unknown> = { id, kind };
  for (const spec of claimFields(kind)) {
    if (spec.key === 'name') continue;
    const field = fields.get(spec.key);
    if (field && field.duplicates > 0) problem(spec.key, 'this field appears twice in the block; remove one copy');
    const text = field?.text.trim() ?? '';
    if (text === '') {
      if (spec.required) problem(spec.key, `${spec.label}: missing (required), e.g. ${spec.hint.replace(/^e\.g\. /, '')}`);
      continue;
    }
    try {
      claim[spec.key] = fieldValue(spec.syntax, text, couplings);
    } catch (error) {
      if (!(error instanceof FieldSyntaxError)) throw error;
      problem(spec.key, `${spec.label}: ${error.message}`);
    }
  }
  if (FLOW_KINDS.has(kind) && !flow) {
    problem('flow', `a ${KIND_LABELS[kind].toLowerCase()} claim needs a flow block: put one above it or bind it to one`);
  }
  if (flow && !flow.spec) {
    const first = flow.problems[0];
    problem('flow', `the flow block it is bound to (flow ${flow.number}) has a problem${first ? `: ${first.message}` : ''}`);
  }
  if (problems.length === 0) reading.claim = claim;
  return reading;
}

/**
 * Reads every flow and claim block of a document (a `doc` node or any list of top-level blocks)
 * and groups the checkable claims into claim files, one per flow block.
 */
export function readDocument(doc: DocNode | readonly DocNode[]): DocumentReading {
  const blocks = Array.isArray(doc) ? (doc as readonly DocNode[]) : ((doc as DocNode).content ?? []);
  const flows: FlowReading[] = [];
  for (const block of blocks) if (block.type === FLOW_BLOCK) flows.push(readFlow(block, flows.length + 1));
  const flowById = new Map(flows.filter((f) => f.stepId).map((f) => [f.stepId, f]));

  const claims: ClaimReading[] = [];
  let above: FlowReading | null = null;
  let flowIndex = 0;
  for (const block of blocks) {
    if (block.type === FLOW_BLOCK) {
      above = flows[flowIndex++] ?? null;
      continue;
    }
    if (block.type !== CLAIM_BLOCK) continue;
    const binding = attr(block, CLAIM_FLOW);
    let flow: FlowReading | null = above;
    let missingFlow: string | null = null;
    if (binding === NO_FLOW) flow = null;
    else if (typeof binding === 'string' && binding !== '') {
      flow = flowById.get(binding) ?? null;
      if (!flow) missingFlow = binding;
    }
    const couplings = flow ? flow.symbols.couplings : null;
    const reading = readClaim(block, claims.length + 1, flow, couplings);
    if (missingFlow) {
      reading.problems.push({ stepId: reading.stepId, field: 'flow', message: 'the flow block this claim was bound to is no longer in the derivation: bind it to another' });
      reading.claim = null;
    }
    claims.push(reading);
  }

  // Names are claim ids: a second claim with the same name is reported at its name.
  const firstWithId = new Map<string, ClaimReading>();
  for (const reading of claims) {
    const first = firstWithId.get(reading.id);
    if (!first) {
      firstWithId.set(reading.id, reading);
      continue;
    }
    reading.problems.push({ stepId: reading.stepId, field: 'name', message: `claim ${first.number} already has the name "${reading.id}": give this one another` });
    reading.claim = null;
  }

  const groups: CheckGroup[] = [];
  const groupOf = new Map<string, CheckGroup>();
  for (const reading of claims) {
    if (!reading.claim) continue;
    const key = reading.flowStepId ?? NO_FLOW;
    let group = groupOf.get(key);
    if (!group) {
      const spec = reading.flowStepId ? flowById.get(reading.flowStepId)!.spec! : { ...EMPTY_FLOW };
      group = { key, flowStepId: reading.flowStepId, file: { flow: spec, claims: [] }, claimStepIds: [] };
      groupOf.set(key, group);
      groups.push(group);
    }
    (group.file.claims as unknown[]).push(reading.claim);
    group.claimStepIds.push(reading.stepId);
  }
  return { flows, claims, groups };
}

/** The result shown for a claim block that cannot be checked as written (status invalid input). */
export function problemResult(reading: ClaimReading): ClaimResult {
  return uncheckedResult(reading.id, reading.kind ?? '', 'invalid', reading.problems.map((p) => p.message).join('; '));
}

/**
 * The solver's message with the file's places ("claims[2].near", "flow.beta.g") said as the
 * document's fields, for showing in a block.
 */
export function describeInDocument(message: string, reading: DocumentReading, group: CheckGroup): string {
  return message
    .replace(/claims\[(\d+)\]\.?([A-Za-z]*)/g, (whole, index: string, key: string) => {
      const stepId = group.claimStepIds[Number(index)];
      const claim = reading.claims.find((c) => c.stepId === stepId);
      if (!claim) return whole;
      const spec = claim.kind ? claimFields(claim.kind).find((f) => f.key === key) : undefined;
      return spec ? spec.label : key ? key : `claim ${claim.number}`;
    })
    .replace(/flow\.(beta|parameters|rates)\.([A-Za-z0-9_\u0370-\u03FF]+)/g, (_, part: string, name: string) =>
      part === 'beta' ? `the beta function of ${name}` : part === 'parameters' ? `the parameter ${name}` : `the rate ${name}`,
    )
    .replace(/flow\.(couplings|convention)/g, (_, part: string) => `the ${part}`);
}

/** The field a solver message is about, as a field address of the block ("near", "beta[0].value"). */
export function fieldOfMessage(message: string, reading: DocumentReading, group: CheckGroup): { stepId: string; field: string } | null {
  const claim = /claims\[(\d+)\]\.([A-Za-z]+)/.exec(message);
  if (claim) {
    const stepId = group.claimStepIds[Number(claim[1])];
    return stepId ? { stepId, field: claim[2]! } : null;
  }
  const flow = /flow\.(beta|parameters|rates)\.([A-Za-z0-9_\u0370-\u03FF]+)/.exec(message);
  const block = flow && reading.flows.find((f) => f.stepId === group.flowStepId);
  if (flow && block) {
    const row: RowKind = flow[1] === 'beta' ? 'beta' : flow[1] === 'parameters' ? 'parameter' : 'rate';
    const index = block.rowNames[row].indexOf(flow[2]!);
    return index >= 0 ? { stepId: block.stepId, field: `${row}[${index}].value` } : null;
  }
  return null;
}


// Building blocks (imports, the demo derivation, new blocks) and exporting a group as a claim file.
import { parseClaim, parseClaimFile } from '../claimFile';
import type { ClaimFile, ClaimKind, FieldError, FlowSpec } from '../types';
import { BLOCK_FIELD, BLOCK_ROW, CLAIM_BLOCK, CLAIM_FLOW, FLOW_BLOCK, NO_FLOW, STEP_ID, claimFields, type DocNode, type RowKind } from './layout';
import type { DocumentReading } from './read';
import { NAME, fieldText, textFromValue } from './syntax';


function textNode(text: string): DocNode[] | undefined {
  return text === '' ? undefined : [{ type: 'text', text }];
}

function fieldNode(key: string, text: string): DocNode {
  const node: DocNode = { type: BLOCK_FIELD, attrs: { field: key } };
  const content = textNode(text);
  if (content) node.content = content;
  return node;
}

export function rowNode(row: RowKind, name: string, value: string): DocNode {
  return { type: BLOCK_ROW, attrs: { row }, content: [fieldNode('name', name), fieldNode('value', value)] };
}

export interface BlockOptions {
  stepId?: string | null;
}

/** A flow block holding this flow (one beta row per coupling, in order). */
export function flowBlockNode(spec: Partial<FlowSpec>, options: BlockOptions & { name?: string } = {}): DocNode {
  const couplings = spec.couplings ?? [];
  const content: DocNode[] = [
    fieldNode('name', options.name ?? ''),
    fieldNode('couplings', couplings.join(', ')),
    fieldNode('convention', couplings.length > 0 || spec.convention ? (spec.convention ?? '') : ''),
  ];
  for (const [name, value] of Object.entries(spec.parameters ?? {})) content.push(rowNode('parameter', name, textFromValue(value)));
  for (const coupling of couplings) content.push(rowNode('beta', coupling, spec.beta?.[coupling] === undefined ? '' : textFromValue(spec.beta[coupling]!)));
  for (const [name, value] of Object.entries(spec.rates ?? {})) content.push(rowNode('rate', name, textFromValue(value)));
  return { type: FLOW_BLOCK, attrs: { [STEP_ID]: options.stepId ?? null }, content };
}

/** A new, empty flow block: one coupling row to start from. */
export function emptyFlowBlock(options: BlockOptions = {}): DocNode {
  const block = flowBlockNode({ couplings: [] }, options);
  block.content!.push(rowNode('parameter', '', ''), rowNode('beta', '', ''));
  return block;
}

/**
 * A claim block holding this claim (every field of its kind, empty where the claim has none).
 * `flow`: null to bind to the nearest flow block above, "none", or a flow block's stepId.
 */
export function claimBlockNode(claim: { kind: ClaimKind; id?: string } & Record<string, unknown>, options: BlockOptions & { flow?: string | null } = {}): DocNode {
  const content = claimFields(claim.kind).map((spec) => {
    const value = spec.key === 'name' ? (claim.id ?? '') : claim[spec.key];
    return fieldNode(spec.key, value === undefined || value === null ? '' : fieldText(spec.syntax, value));
  });
  return { type: CLAIM_BLOCK, attrs: { [STEP_ID]: options.stepId ?? null, kind: claim.kind, [CLAIM_FLOW]: options.flow ?? null }, content };
}

export function emptyClaimBlock(kind: ClaimKind, options: BlockOptions & { flow?: string | null } = {}): DocNode {
  return claimBlockNode({ kind }, options);
}

// ---------------------------------------------------------------------------------------------
// Export and import of claim files

/** The claim file of one group (a flow block's claims, or those without a flow), ready for JSON. */
export function exportClaimFile(reading: DocumentReading, key: string): ClaimFile | null {
  const group = reading.groups.find((g) => g.key === key);
  const flow = reading.flows.find((f) => f.stepId === key);
  if (!group && !flow?.spec) return null;
  const spec = group ? group.file.flow : flow!.spec!;
  const claims = group ? group.file.claims : [];
  return { flow: spec, claims: [...claims] };
}

export type ImportResult =
  | { ok: true; blocks: DocNode[]; flow: boolean; claimCount: number }
  | { ok: false; errors: FieldError[] };



/**
 * Blocks for a claim file: a flow block (when the file has a flow) followed by one claim block per
 * claim, bound to it. Anything the blocks cannot hold as written is refused, naming the field;
 * then nothing is to be inserted.
 */
export function claimFileToBlocks(input: unknown, options: { stepId?: () => string | null } = {}): ImportResult {
  const parsed = parseClaimFile(input);
  if (!parsed.ok) return parsed;
  const { flow, claims } = parsed.file;
  const errors: FieldError[] = [];
  flow.couplings.forEach((name, i) => {
    if (!NAME.test(name)) errors.push({ field: `flow.couplings[${i}]`, message: `flow.couplings[${i}]: "${name}" is not a valid coupling name (letters, digits and _, starting with a letter)` });
  });
  for (const part of ['parameters', 'beta', 'rates'] as const) {
    for (const name of Object.keys(flow[part] ?? {})) {
      if (!NAME.test(name)) errors.push({ field: `flow.${part}.${name}`, message: `flow.${part}.${name}: "${name}" is not a valid name (letters, digits and _, starting with a letter)` });
      if (part === 'beta' && !flow.couplings.includes(name)) errors.push({ field: `flow.beta.${name}`, message: `flow.beta.${name}: ${name} is not one of the couplings` });
    }
  }
  for (const coupling of flow.couplings) {
    if (!(coupling in flow.beta)) errors.push({ field: `flow.beta.${coupling}`, message: `flow.beta.${coupling}: missing (required): the coupling ${coupling} has no beta function` });
  }
  const hasFlow = flow.couplings.length > 0 || Object.keys(flow.parameters).length > 0 || Object.keys(flow.rates ?? {}).length > 0;

  const claimNodes: DocNode[] = [];
  claims.forEach((raw, index) => {
    const result = parseClaim(raw, index);
    if (!result.ok) {
      errors.push(...result.errors);
      return;
    }
    const claim = result.claim as unknown as Record<string, unknown> & { kind: ClaimKind; id: string };
    const known = new Set(['id', 'kind', ...claimFields(claim.kind).map((f) => f.key)]);
    for (const key of Object.keys(claim)) {
      if (!known.has(key)) errors.push({ field: `claims[${index}].${key}`, message: `claims[${index}].${key}: not a field of a ${claim.kind} claim block` });
    }
    if (claim.id !== claim.id.trim()) {
      errors.push({ field: `claims[${index}].id`, message: `claims[${index}].id: "${claim.id}" begins or ends with a space` });
    }
    claimNodes.push(claimBlockNode(claim, { stepId: options.stepId?.() ?? null, flow: hasFlow ? null : NO_FLOW }));
  });
  if (errors.length > 0) return { ok: false, errors };
  const blocks = hasFlow ? [flowBlockNode(flow, { stepId: options.stepId?.() ?? null }), ...claimNodes] : claimNodes;
  return { ok: true, blocks, flow: hasFlow, claimCount: claimNodes.length };
}

// The steps of a working copy as review sees them: each top-level block by its stepId, a short
// excerpt for lists and mail, a SHA-256 of its content and, for a step bound to a flow block (a
// claim, a plot), that block and its hash. A sign-off records both hashes; a later edit that
// changes either clears it.
import { createHash } from 'node:crypto';
import { CLAIM_BLOCK, CLAIM_FLOW, FLOW_BLOCK, KIND_LABELS, NO_FLOW, STEP_ID, isClaimKind, readDocument, type DocNode } from '../../flow/document';
import { stableJson } from '../../flow/stableJson';

export interface StepInfo {
  stepId: string;
  /** Its place among the top-level blocks (0 for the first). */
  position: number;
  type: string;
  excerpt: string;
  contentHash: string;
  /** The flow block it depends on (a claim's or a plot's flow), or null. */
  dependencyStepId: string | null;
  /** Hash of that flow block; null when there is none or it is no longer in the document. */
  dependencyHash: string | null;
}

const HASH_PREFIX = 'marginalia-step-1\n';
const EXCERPT_LENGTH = 160;


/** SHA-256 (hex) of a block as stored: its type, attributes, text and marks. */
export function hashBlock(node: DocNode): string {
  return createHash('sha256').update(HASH_PREFIX).update(stableJson(node)).digest('hex');
}

function plainText(node: DocNode): string {
  if (typeof node.text === 'string') return node.text;
  const inner = (node.content ?? []).map(plainText).join(node.type === 'bulletList' || node.type === 'orderedList' ? '; ' : '');
  if (node.type === 'mathInline') return `$${inner}$`;
  if (node.type === 'mathDisplay') return `$$${inner}$$`;
  if (node.type === 'hardBreak') return ' ';
  return inner;
}

function fieldText(node: DocNode, field: string): string {
  const found = (node.content ?? []).find((child) => child.attrs?.field === field);
  return found ? plainText(found).trim() : '';
}

function shorten(text: string): string {
  const flat = text.replace(/\s+/g, ' ').trim();
  return flat.length > EXCERPT_LENGTH ? `${flat.slice(0, EXCERPT_LENGTH - 1).trimEnd()}…` : flat;
}

/** A short, plain description of a step: its text, or what kind of block it is and its name. */
export function excerptOf(node: DocNode): string {
  if (node.type === FLOW_BLOCK) {
    const name = fieldText(node, 'name');
    return shorten(`Flow block${name ? ` "${name}"` : ''}`);
  }
  if (node.type === CLAIM_BLOCK) {
    const kind = node.attrs?.kind;
    const label = isClaimKind(kind) ? KIND_LABELS[kind] : 'claim';
    const name = fieldText(node, 'name');
    return shorten(`Claim${name ? ` "${name}"` : ''} (${label.toLowerCase()})`);
  }
  if (node.type === 'trajectoryPlot') {
    const caption = fieldText(node, 'caption');
    return shorten(`Trajectory plot${caption ? ` "${caption}"` : ''}`);
  }
  const text = shorten(plainText(node));
  if (text) return text;
  return node.type === 'paragraph' ? '(an empty paragraph)' : `(${node.type})`;
}

function stepIdOf(node: DocNode): string | null {
  const id = node.attrs?.[STEP_ID];
  return typeof id === 'string' && id !== '' ? id : null;
}

/**
 * Every step of a working copy by stepId. The first block with an id counts when an id appears
 * twice (the editor gives the second one a new id at once).
 */
export function readSteps(doc: DocNode): Map<string, StepInfo> {
  const blocks = doc.content ?? [];
  const claimFlows = new Map(readDocument(blocks).claims.map((claim) => [claim.stepId, claim.flowStepId]));
  const nodeOf = new Map<string, DocNode>();
  const steps = new Map<string, StepInfo>();
  let flowAbove: string | null = null;
  blocks.forEach((node, position) => {
    const stepId = stepIdOf(node);
    if (node.type === FLOW_BLOCK && stepId) flowAbove = stepId;
    if (!stepId || steps.has(stepId)) return;
    nodeOf.set(stepId, node);
    let dependencyStepId: string | null = null;
    if (node.type === CLAIM_BLOCK) {
      dependencyStepId = claimFlows.get(stepId) ?? null;
    } else if (node.type !== FLOW_BLOCK && node.attrs && CLAIM_FLOW in node.attrs) {
      // Other blocks bound to a flow (plots) follow the claims' rule: null means the flow above.
      const binding = node.attrs[CLAIM_FLOW];
      dependencyStepId = binding === NO_FLOW ? null : typeof binding === 'string' && binding !== '' ? binding : flowAbove;
    }
    steps.set(stepId, {
      stepId,
      position,
      type: node.type,
      excerpt: excerptOf(node),
      contentHash: hashBlock(node),
      dependencyStepId,
      dependencyHash: null,
    });
  });
  for (const step of steps.values()) {
    const flow = step.dependencyStepId ? nodeOf.get(step.dependencyStepId) : undefined;
    step.dependencyHash = flow && flow.type === FLOW_BLOCK ? hashBlock(flow) : null;
  }
  return steps;
}

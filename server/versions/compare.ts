// Two versions side by side: their steps aligned by step id (ids stay with a block through
// edits), each marked same, changed (with the words that differ), added, removed or moved; and
// every claim whose verdict differs between the two, called out. The later side may be the
// working copy (its latest server verdicts).
import { diffArrays, diffWordsWithSpace } from 'diff';
import { BLOCK_FIELD, BLOCK_ROW, CLAIM_BLOCK, FLOW_BLOCK, type DocNode } from '../../flow/document';
import type { Status } from '../../flow/types';
import { checksView } from '../checks/results';
import { collab } from '../collab/access';
import { versionRow } from './store';
import type { VersionChecks } from './types';

export type StepChange = 'same' | 'changed' | 'added' | 'removed' | 'moved';

export interface TextPart {
  value: string;
  added?: boolean;
  removed?: boolean;
}

export interface ComparedStep {
  change: StepChange;
  stepId: string;
  /** The block's type, e.g. paragraph, heading, mathDisplay, flowBlock, claimBlock. */
  type: string;
  before: string | null;
  after: string | null;
  /** Word-level differences of a changed step. */
  parts?: TextPart[];
}

export interface ComparedClaim {
  stepId: string;
  claimId: string;
  before: Status | null;
  after: Status | null;
  verdictChanged: boolean;
}

export interface ComparedSide {
  id: string;
  label: string;
  number: number | null;
  locked: boolean;
  createdAt: string | null;
}

export interface VersionComparison {
  from: ComparedSide;
  to: ComparedSide;
  steps: ComparedStep[];
  claims: ComparedClaim[];
  counts: Record<Exclude<StepChange, 'same'>, number> & { verdictsChanged: number };
}

interface Side {
  meta: ComparedSide;
  body: DocNode;
  verdicts: Map<string, { claimId: string; status: Status }>;
}

function text(node: DocNode): string {
  if (typeof node.text === 'string') return node.text;
  const inner = (node.content ?? []).map(text);
  switch (node.type) {
    case 'mathInline':
      return `$${inner.join('')}$`;
    case 'mathDisplay':
      return `$$${inner.join('')}$$`;
    case 'hardBreak':
      return '\n';
    case 'listItem':
      return `• ${inner.join('\n')}`;
    case BLOCK_FIELD:
      return `${String(node.attrs?.field ?? 'field')}: ${inner.join('')}`;
    case BLOCK_ROW: {
      const [name, value] = (node.content ?? []).map((c) => (c.content ?? []).map(text).join(''));
      return `${String(node.attrs?.row ?? 'row')}: ${name ?? ''} = ${value ?? ''}`;
    }
    default:
      break;
  }
  const blockish = ['doc', 'bulletList', 'orderedList', 'blockquote', FLOW_BLOCK, CLAIM_BLOCK, 'listItem'];
  return inner.join(blockish.includes(node.type) ? '\n' : '');
}

/** What a step says, as plain text (math in dollars, block fields as "name: value" lines). */
export function stepText(node: DocNode): string {
  const head = node.type === CLAIM_BLOCK ? `claim (${String(node.attrs?.kind ?? '?')})\n` : node.type === FLOW_BLOCK ? 'flow block\n' : '';
  return head + text(node);
}

function stepsOf(body: DocNode): { id: string; type: string; text: string }[] {
  return (body.content ?? []).map((node, i) => {
    const id = typeof node.attrs?.stepId === 'string' && node.attrs.stepId ? (node.attrs.stepId as string) : `position-${i}`;
    return { id, type: node.type, text: stepText(node) };
  });
}

function verdictsOf(checks: VersionChecks | { claims: { stepId: string; claimId: string; status: Status }[] }) {
  return new Map(checks.claims.map((c) => [c.stepId, { claimId: c.claimId, status: c.status }]));
}

async function versionSide(derivationId: string, versionId: string): Promise<Side> {
  const row = await versionRow(derivationId, versionId);
  return {
    meta: { id: row.id, label: `Version ${row.number}: ${row.name}`, number: row.number, locked: row.lockedAt !== null, createdAt: row.createdAt.toISOString() },
    body: row.body as DocNode,
    verdicts: verdictsOf(row.checks as VersionChecks),
  };
}

async function workingSide(derivationId: string): Promise<Side> {
  const [body, checks] = await Promise.all([collab().readWorkingCopy(derivationId), checksView(derivationId)]);
  return {
    meta: { id: 'working', label: 'Working copy', number: null, locked: false, createdAt: null },
    body: body as DocNode,
    verdicts: verdictsOf(checks),
  };
}

export function compareBodies(from: Side, to: Side): Omit<VersionComparison, 'from' | 'to'> {
  const before = stepsOf(from.body);
  const after = stepsOf(to.body);
  const beforeById = new Map(before.map((s) => [s.id, s]));
  const afterById = new Map(after.map((s) => [s.id, s]));
  const steps: ComparedStep[] = [];
  for (const chunk of diffArrays(before.map((s) => s.id), after.map((s) => s.id))) {
    for (const id of chunk.value) {
      const old = beforeById.get(id);
      const now = afterById.get(id);
      if (!chunk.added && !chunk.removed) {
        if (old!.text === now!.text && old!.type === now!.type) steps.push({ change: 'same', stepId: id, type: now!.type, before: old!.text, after: now!.text });
        else steps.push({ change: 'changed', stepId: id, type: now!.type, before: old!.text, after: now!.text, parts: diffWordsWithSpace(old!.text, now!.text).map(({ value, added, removed }) => ({ value, ...(added ? { added } : {}), ...(removed ? { removed } : {}) })) });
      } else if (chunk.removed) {
        // A block that is in both, elsewhere: listed once, where it now stands.
        if (now) continue;
        steps.push({ change: 'removed', stepId: id, type: old!.type, before: old!.text, after: null });
      } else {
        if (old) steps.push({ change: 'moved', stepId: id, type: now!.type, before: old.text, after: now!.text, ...(old.text !== now!.text ? { parts: diffWordsWithSpace(old.text, now!.text).map(({ value, added, removed }) => ({ value, ...(added ? { added } : {}), ...(removed ? { removed } : {}) })) } : {}) });
        else steps.push({ change: 'added', stepId: id, type: now!.type, before: null, after: now!.text });
      }
    }
  }
  const claimIds = [...new Set([...from.verdicts.keys(), ...to.verdicts.keys()])];
  const order = new Map(steps.map((s, i) => [s.stepId, i]));
  claimIds.sort((a, b) => (order.get(a) ?? 0) - (order.get(b) ?? 0));
  const claims: ComparedClaim[] = claimIds.map((stepId) => {
    const a = from.verdicts.get(stepId);
    const b = to.verdicts.get(stepId);
    return { stepId, claimId: (b ?? a)!.claimId, before: a?.status ?? null, after: b?.status ?? null, verdictChanged: (a?.status ?? null) !== (b?.status ?? null) };
  });
  const count = (change: StepChange) => steps.filter((s) => s.change === change).length;
  return {
    steps,
    claims,
    counts: { changed: count('changed'), added: count('added'), removed: count('removed'), moved: count('moved'), verdictsChanged: claims.filter((c) => c.verdictChanged).length },
  };
}

export async function compareVersions(derivationId: string, fromId: string, toId: string | 'working'): Promise<VersionComparison> {
  const from = await versionSide(derivationId, fromId);
  const to = toId === 'working' ? await workingSide(derivationId) : await versionSide(derivationId, toId);
  return { from: from.meta, to: to.meta, ...compareBodies(from, to) };
}

// Reading the document's blocks for the live checks: each block's problems and one check item per
// claim that can be checked (its claim and flow, hashed). Cheap and free of the solver's numerics
// (no mathjs), so the page does it itself the moment the edits pause; the field previews, which
// need mathjs, come from the field worker.
import { claimFileToBlocks, problemResult, readDocument, type DocNode } from '@/flow/document';
import { fingerprint } from './hash';
import type { CheckItem, ClaimInfo, FlowInfo, ImportAnswer, Reading } from './protocol';

/** Bumped when the solver may judge the same input differently, so cached results are redone. */
const CHECK_REVISION = 'live-1';

/** The time bound of a live check, per claim (ms); a tighter run gets more. */
export const LIVE_TIME_LIMIT_MS = 2000;
export const TIGHT_TIME_LIMIT_MS = 10_000;

/** The same claim once more with tighter settings (and a longer bound), as its own ticket. */
export function tightItem(item: CheckItem): CheckItem {
  return { ...item, ticket: `${item.ticket}:tight`, tight: true, timeLimitMs: TIGHT_TIME_LIMIT_MS };
}

export function readBlocks(seq: number, blocks: DocNode[]): Reading {
  const reading = readDocument(blocks);
  const bindings = new Map<string, string | null>();
  const notes = new Map<string, string>();
  for (const block of blocks) {
    if (block.type !== 'claimBlock') continue;
    const stepId = typeof block.attrs?.stepId === 'string' ? block.attrs.stepId : '';
    const binding = block.attrs?.flow;
    bindings.set(stepId, typeof binding === 'string' && binding !== '' ? binding : null);
    const note = (block.content ?? []).find((child) => child.attrs?.field === 'note');
    if (note) notes.set(stepId, textOf(note).trim());
  }

  const flows: FlowInfo[] = reading.flows.map((flow) => ({
    stepId: flow.stepId,
    number: flow.number,
    name: flow.name,
    symbols: flow.symbols,
    problems: flow.problems,
    usable: flow.spec !== null,
  }));

  const items: Reading['items'] = [];
  const hashes = new Map<string, string>();
  const claimByStep = new Map(reading.claims.map((c) => [c.stepId, c]));
  for (const group of reading.groups) {
    group.claimStepIds.forEach((stepId, index) => {
      const claim = group.file.claims[index] as { kind: ClaimInfo['kind'] & string };
      const file = { flow: group.file.flow, claims: [claim] };
      const ticket = fingerprint([CHECK_REVISION, file]);
      hashes.set(stepId, ticket);
      items.push({ ticket, stepId, number: claimByStep.get(stepId)!.number, kind: claim.kind, file, tight: false, timeLimitMs: LIVE_TIME_LIMIT_MS });
    });
  }

  const claims: ClaimInfo[] = reading.claims.map((claim) => ({
    stepId: claim.stepId,
    number: claim.number,
    kind: claim.kind,
    id: claim.id,
    name: claim.name,
    note: notes.get(claim.stepId) ?? '',
    flowStepId: claim.flowStepId,
    binding: bindings.get(claim.stepId) ?? null,
    problems: claim.problems,
    hash: hashes.get(claim.stepId) ?? null,
    invalid: claim.claim ? null : problemResult(claim),
  }));
  return { seq, flows, claims, groups: reading.groups, items };
}

function textOf(node: DocNode): string {
  if (typeof node.text === 'string') return node.text;
  return (node.content ?? []).map(textOf).join('');
}

/** A claim file's text as new blocks, or what is wrong with it (then nothing is to be inserted). */
export function importClaimFile(text: string): ImportAnswer {
  let json: unknown;
  try {
    json = JSON.parse(text);
  } catch (error) {
    const reason = error instanceof Error ? error.message : String(error);
    return { ok: false, errors: [{ field: 'file', message: `the file is not JSON: ${reason}` }] };
  }
  return claimFileToBlocks(json);
}

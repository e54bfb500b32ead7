// Messages between the page and its two workers. Plain data only (structured clone).
//
// The page reads the document itself (reading.ts: every block's problems, one check item per claim
// with a hash of what it checks). The field worker previews every field (mathjs) and reads claim
// files for an import. The check worker runs check items with flow/ one at a time and posts each
// result as it comes.
import type { BlockProblem, CheckGroup, DocNode, FlowSymbols } from '@/flow/document';
import type { BlockPreviews } from '@/flow/document/preview';
import type { ClaimFile, ClaimKind, ClaimResult, FieldError } from '@/flow/types';

export interface FlowInfo {
  stepId: string;
  number: number;
  name: string;
  symbols: FlowSymbols;
  problems: BlockProblem[];
  /** The flow can be used (no problem of its own). */
  usable: boolean;
}

export interface ClaimInfo {
  stepId: string;
  number: number;
  kind: ClaimKind | null;
  /** The claim's id in the claim file (its name, or one made from its step). */
  id: string;
  name: string;
  note: string;
  flowStepId: string | null;
  /** The block's own "flow" attribute: null (the flow above), "none" or a flow block's stepId. */
  binding: string | null;
  problems: BlockProblem[];
  /** The claim and its flow, hashed; null when it cannot be checked as written. */
  hash: string | null;
  /** The "invalid input" result of a claim that cannot be checked as written. */
  invalid: ClaimResult | null;
}

/** One claim to check: a claim file holding its flow and the claim alone. */
export interface CheckItem {
  /** Which result this is: the hash of the claim and its flow, and ":tight" for a tighter run. */
  ticket: string;
  stepId: string;
  number: number;
  kind: ClaimKind;
  file: ClaimFile;
  tight: boolean;
  timeLimitMs: number;
}

export interface Reading {
  seq: number;
  flows: FlowInfo[];
  claims: ClaimInfo[];
  /** Claim files per flow block (key: its stepId) and for claims without a flow (key "none"). */
  groups: CheckGroup[];
  /** One per claim that can be checked, in document order (ticket = the claim's hash). */
  items: CheckItem[];
}

export type ImportAnswer =
  | { ok: true; blocks: DocNode[]; flow: boolean; claimCount: number }
  | { ok: false; errors: FieldError[] };

export type FieldRequest =
  | { type: 'read'; seq: number; blocks: DocNode[] }
  | { type: 'import'; seq: number; text: string };

export type FieldAnswer =
  | { type: 'previews'; seq: number; previews: Record<string, BlockPreviews> }
  | { type: 'imported'; seq: number; answer: ImportAnswer }
  | { type: 'failed'; seq: number; message: string };

export type CheckRequest =
  /** The items to run after the current one, in order; replaces anything queued before. */
  { type: 'run'; items: CheckItem[] };

export type CheckAnswer =
  | { type: 'ready' }
  | { type: 'started'; ticket: string }
  | { type: 'result'; ticket: string; result: ClaimResult };

/** The part of a Worker the clients use (a real Worker, or a stand-in in tests). */
export interface WorkerLike {
  postMessage(message: unknown): void;
  terminate(): void;
  onmessage: ((event: { data: unknown }) => void) | null;
  onerror: ((event: unknown) => void) | null;
  onmessageerror?: ((event: unknown) => void) | null;
}

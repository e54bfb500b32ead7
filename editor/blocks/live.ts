// The live state of a derivation's checked steps, for the blocks' views and the side panels: the
// latest reading of the document (each block's problems and field previews, from the field
// worker) and each claim's verdict (from the check worker). The editor computes nothing itself:
// it hands the blocks to the workers a moment after the last edit and shows what comes back.
import type { Editor } from '@tiptap/core';
import type { Node as ProseMirrorNode } from '@tiptap/pm/model';
import type { BlockProblem, CheckGroup, DocNode } from '@/flow/document';
import type { BlockPreviews, Preview } from '@/flow/document/preview';
import type { ClaimFile, ClaimResult } from '@/flow/types';
import { mark } from '@/components/performanceMark';
import { CheckClient, type CheckState } from '../worker/checkClient';
import type { CheckItem, ClaimInfo, FieldAnswer, FieldRequest, FlowInfo, ImportAnswer, Reading, WorkerLike } from '../worker/protocol';
import { readBlocks } from '../worker/reading';
import { workWithinShare } from './frameShare';

export type { CheckState };

export interface TightRun {
  state: CheckState;
  result: ClaimResult | null;
  since: number | null;
}

export interface ClaimView {
  info: ClaimInfo;
  /** The number of the flow block it is bound to, or null. */
  flowNumber: number | null;
  /** 'invalid' when it cannot be checked as written. */
  state: CheckState | 'invalid';
  /** The verdict for what is written now (null while it is being checked). */
  result: ClaimResult | null;
  /** The verdict shown faded while the claim is checked again. */
  previous: ClaimResult | null;
  /** When the running check started (performance.now()). */
  since: number | null;
  note: string | null;
  tight: TightRun | null;
  /** The verdict was supplied by the view (`supplyVerdicts`), not checked by this browser. */
  supplied?: boolean;
  /** This browser's own check of a claim whose verdict was supplied (`checkHere`). */
  here?: TightRun | null;
}

export interface LiveSnapshot {
  version: number;
  /** A first reading of the document has arrived. */
  ready: boolean;
  flows: readonly FlowInfo[];
  claims: readonly ClaimView[];
  /** The claim whose evidence is open. */
  evidenceFor: string | null;
  /** Some claim waits for its verdict. */
  busy: boolean;
  /** The field worker could not read the document (shown once, in words). */
  failure: string | null;
}

export interface ExportChoice {
  key: string;
  label: string;
  file: ClaimFile;
  claimCount: number;
  /** Claims bound to this flow (or none) that cannot be checked as written, so are not in the file. */
  leftOut: ClaimInfo[];
}

export interface LiveOptions {
  createFieldWorker?: () => WorkerLike;
  createCheckWorker?: () => WorkerLike;
  /** Wait after the last edit before reading the document (ms). */
  debounceMs?: number;
}

const EMPTY_PREVIEWS: BlockPreviews = {};
/** Least time between two redraws of the blocks while results stream in (ms). */
const NOTIFY_GAP_MS = 90;
/** Least time between two reads of the check client's state while results stream in (ms). */
const REBUILD_GAP_MS = 40;
const now = () => (typeof performance !== 'undefined' ? performance.now() : Date.now());

function defaultFieldWorker(): WorkerLike {
  return new Worker(new URL('../worker/fields.worker.ts', import.meta.url), { type: 'module', name: 'marginalia-fields' }) as unknown as WorkerLike;
}

function newCheckWorker(): WorkerLike {
  return new Worker(new URL('../worker/check.worker.ts', import.meta.url), { type: 'module', name: 'marginalia-checks' }) as unknown as WorkerLike;
}

// The check worker takes a moment to load the solver: the first one starts with this module,
// before any editor exists, and the first editor's checks take it over.
let early: WorkerLike | null = null;
if (typeof window !== 'undefined' && typeof Worker !== 'undefined') {
  try {
    early = newCheckWorker();
  } catch {
    early = null; // the first editor tries again, and says so if it cannot
  }
}

function defaultCheckWorker(): WorkerLike {
  const worker = early ?? newCheckWorker();
  early = null;
  return worker;
}

export class LiveChecks {
  private readonly checks: CheckClient;
  private fieldWorker: WorkerLike | null = null;
  private readonly createFieldWorker: () => WorkerLike;
  private seq = 0;
  private waiting: (() => DocNode[]) | null = null;
  /** Previews: the request at the field worker, the one waiting for it, the latest answer. */
  private previewInFlight: number | null = null;
  private previewWaiting: { seq: number; blocks: DocNode[] } | null = null;
  private previewSeq = 0;
  private previewsByStep: Record<string, BlockPreviews> = {};
  /** previewsByStep per step as text, made once per answer (to tell which blocks changed). */
  private readonly previewKeys = new Map<string, string>();
  private timer: ReturnType<typeof setTimeout> | null = null;
  private readonly debounceMs: number;
  private reading: Reading | null = null;
  private itemByStep = new Map<string, CheckItem>();
  private claimByStep = new Map<string, ClaimView>();
  private readonly previousByStep = new Map<string, ClaimResult>();
  private readonly tightByStep = new Map<string, CheckItem>();
  private readonly imports = new Map<number, (answer: ImportAnswer) => void>();
  private evidenceFor: string | null = null;
  /** Verdicts supplied by the view, by step; null: every claim is checked here. */
  private supplied: ReadonlyMap<string, ClaimResult> | null = null;
  /** Steps with a supplied verdict that the reader asked to check here as well. */
  private readonly hereSteps = new Set<string>();
  private failure: string | null = null;
  private fieldRestarts = 0;
  private current: LiveSnapshot = { version: 0, ready: false, flows: [], claims: [], evidenceFor: null, busy: false, failure: null };
  private readonly listeners = new Set<() => void>();
  private readonly stepListeners = new Map<string, Set<() => void>>();
  private stepKeys = new Map<string, string>();
  private readonly changedSteps = new Set<string>();
  private notifyScheduled = false;
  private rebuildTimer: ReturnType<typeof setTimeout> | null = null;
  private lastNotify = -Infinity;
  private destroyed = false;

  constructor(options: LiveOptions = {}) {
    this.createFieldWorker = options.createFieldWorker ?? defaultFieldWorker;
    this.debounceMs = options.debounceMs ?? 150;
    this.checks = new CheckClient({ createWorker: options.createCheckWorker ?? defaultCheckWorker, onChange: () => this.checksChanged() });
    // Both workers load the solver (a few hundred kB): start them now, while the page opens.
    this.checks.warm();
    this.ensureFieldWorker();
  }

  // ----- the document -----------------------------------------------------------------------

  /** The document changed: read it a moment after the last change (or now). */
  documentChanged(blocks: () => DocNode[], now = false): void {
    if (this.destroyed) return;
    this.waiting = blocks;
    if (this.timer) clearTimeout(this.timer);
    this.timer = null;
    if (now) this.flush();
    else this.timer = setTimeout(() => this.flush(), this.debounceMs);
  }

  private flush(): void {
    this.timer = null;
    if (!this.waiting) return;
    const blocks = this.waiting();
    this.waiting = null;
    const seq = ++this.seq;
    // The reading is cheap and needs no solver: done here, so checks start at once.
    let reading: Reading;
    try {
      reading = readBlocks(seq, blocks);
    } catch (error) {
      this.failure = `The blocks could not be read: ${error instanceof Error ? error.message : String(error)}`;
      this.rebuild();
      return;
    }
    this.failure = null;
    this.accept(reading);
    this.previewWaiting = { seq, blocks };
    this.requestPreviews();
  }

  private requestPreviews(): void {
    if (this.previewInFlight !== null || !this.previewWaiting) return;
    const { seq, blocks } = this.previewWaiting;
    this.previewWaiting = null;
    this.previewInFlight = seq;
    this.postToFields({ type: 'read', seq, blocks });
  }

  private ensureFieldWorker(): WorkerLike | null {
    if (!this.fieldWorker) {
      let worker: WorkerLike;
      try {
        worker = this.createFieldWorker();
      } catch (error) {
        this.failure = `The field previews cannot be shown here: the field worker could not start (${error instanceof Error ? error.message : String(error)}).`;
        return null;
      }
      worker.onmessage = (event) => {
        if (this.fieldWorker === worker) this.receiveFields(event.data as FieldAnswer);
      };
      worker.onerror = (event) => {
        if (this.fieldWorker === worker) this.fieldWorkerDied(event);
      };
      this.fieldWorker = worker;
    }
    return this.fieldWorker;
  }

  private postToFields(request: FieldRequest): void {
    const worker = this.ensureFieldWorker();
    if (worker) {
      worker.postMessage(request);
      return;
    }
    if (request.type === 'import') {
      this.imports.get(request.seq)?.({ ok: false, errors: [{ field: 'file', message: 'the file cannot be read here: the field worker could not start' }] });
      this.imports.delete(request.seq);
    }
    this.previewInFlight = null;
    this.rebuild();
  }

  private fieldWorkerDied(event: unknown): void {
    this.fieldWorker?.terminate();
    this.fieldWorker = null;
    this.previewInFlight = null;
    this.fieldRestarts++;
    const reason = (event as { message?: unknown })?.message;
    for (const resolve of this.imports.values()) resolve({ ok: false, errors: [{ field: 'file', message: 'the file could not be read: the field worker stopped; try again' }] });
    this.imports.clear();
    if (this.fieldRestarts > 3) {
      this.failure = `The field previews cannot be shown here: the field worker stopped ${this.fieldRestarts} times (${typeof reason === 'string' ? reason : 'no reason given'}).`;
      this.rebuild();
      return;
    }
    // Preview the document again on a fresh worker.
    if (this.lastBlocks) {
      this.previewWaiting = { seq: ++this.seq, blocks: this.lastBlocks() };
      this.requestPreviews();
    }
  }

  private lastBlocks: (() => DocNode[]) | null = null;

  private receiveFields(answer: FieldAnswer): void {
    if (answer.type === 'imported') {
      this.imports.get(answer.seq)?.(answer.answer);
      this.imports.delete(answer.seq);
      return;
    }
    if (answer.seq === this.previewInFlight) this.previewInFlight = null;
    if (answer.type === 'failed') {
      const importing = this.imports.get(answer.seq);
      if (importing) {
        importing({ ok: false, errors: [{ field: 'file', message: answer.message }] });
        this.imports.delete(answer.seq);
      }
    } else if (answer.seq > this.previewSeq) {
      this.fieldRestarts = 0;
      this.previewSeq = answer.seq;
      this.previewsByStep = answer.previews;
      this.previewKeys.clear();
      this.rebuild();
    }
    this.requestPreviews();
  }

  private accept(reading: Reading): void {
    mark('marginalia:claims-read');
    this.reading = reading;
    this.itemByStep = new Map(reading.items.map((item) => [item.stepId, item]));
    // A tighter run asked for an earlier version of a claim is dropped once the claim changes.
    for (const [stepId, tight] of this.tightByStep) {
      const item = this.itemByStep.get(stepId);
      if (!item || `${item.ticket}:tight` !== tight.ticket) this.tightByStep.delete(stepId);
    }
    if (this.evidenceFor && !reading.claims.some((c) => c.stepId === this.evidenceFor)) this.evidenceFor = null;
    this.checks.want(this.wantedItems());
    this.rebuild();
  }

  /** The claims the check worker runs: all of them, or those without a supplied verdict and those asked for here. */
  private wantedItems(): CheckItem[] {
    const items = this.reading?.items ?? [];
    const supplied = this.supplied;
    return supplied ? items.filter((item) => !supplied.has(item.stepId) || this.hereSteps.has(item.stepId)) : [...items];
  }

  // ----- verdicts from elsewhere ---------------------------------------------------------------

  /**
   * A view that shows verdicts decided elsewhere (a locked version's stored check report): each
   * claim with a verdict here shows it, and is not sent to the check worker unless `checkHere`
   * asks for it. null gives every claim back to the worker.
   */
  supplyVerdicts(verdicts: ReadonlyMap<string, ClaimResult> | null): void {
    this.supplied = verdicts;
    this.hereSteps.clear();
    if (this.reading) this.checks.want(this.wantedItems());
    this.rebuild();
  }

  /** Checks a claim whose verdict was supplied in this browser too; its result is the view's `here`. */
  checkHere(stepId: string): void {
    if (!this.supplied?.has(stepId)) return;
    const item = this.itemByStep.get(stepId);
    if (this.hereSteps.has(stepId)) {
      if (item && this.checks.status(item.ticket).state === 'cancelled') this.checks.checkAgain(item.ticket);
      return;
    }
    this.hereSteps.add(stepId);
    if (this.reading) this.checks.want(this.wantedItems());
    this.rebuild();
  }

  // ----- what the views read ------------------------------------------------------------------

  snapshot(): LiveSnapshot {
    return this.current;
  }

  /** Called after any change (the panels). */
  subscribe(listener: () => void): () => void {
    this.listeners.add(listener);
    return () => this.listeners.delete(listener);
  }

  /** Called when what the block of this step shows changed: its verdict, problems, previews, number. */
  subscribeStep(stepId: string, listener: () => void): () => void {
    let set = this.stepListeners.get(stepId);
    if (!set) {
      set = new Set();
      this.stepListeners.set(stepId, set);
    }
    set.add(listener);
    return () => {
      set.delete(listener);
      if (set.size === 0) this.stepListeners.delete(stepId);
    };
  }

  previews(stepId: string): BlockPreviews {
    return this.previewsByStep[stepId] ?? EMPTY_PREVIEWS;
  }

  preview(stepId: string, address: string): Preview | undefined {
    return this.previewsByStep[stepId]?.[address];
  }

  problems(stepId: string): BlockProblem[] {
    const flow = this.reading?.flows.find((f) => f.stepId === stepId);
    if (flow) return flow.problems;
    return this.claimByStep.get(stepId)?.info.problems ?? [];
  }

  flow(stepId: string): FlowInfo | undefined {
    return this.current.flows.find((f) => f.stepId === stepId);
  }

  claim(stepId: string): ClaimView | undefined {
    return this.claimByStep.get(stepId);
  }

  /** The flow block a claim at this place would be bound to by default (the nearest above). */
  get flows(): readonly FlowInfo[] {
    return this.current.flows;
  }

  // ----- actions -------------------------------------------------------------------------------

  openEvidence(stepId: string | null): void {
    this.evidenceFor = stepId;
    this.rebuild();
  }

  cancel(stepId: string): void {
    const tight = this.tightByStep.get(stepId);
    if (tight && this.checks.status(tight.ticket).state === 'running') this.checks.cancel(tight.ticket);
    const item = this.itemByStep.get(stepId);
    if (item) this.checks.cancel(item.ticket);
  }

  checkAgain(stepId: string): void {
    const item = this.itemByStep.get(stepId);
    if (item) this.checks.checkAgain(item.ticket);
  }

  /** Runs the claim again with tighter settings (tighter tolerances, longer RG time, more points). */
  runTight(stepId: string, makeTight: (item: CheckItem) => CheckItem): void {
    const item = this.itemByStep.get(stepId);
    if (!item) return;
    const tight = makeTight(item);
    this.tightByStep.set(stepId, tight);
    this.checks.runTight(tight);
  }

  /** Reads a claim file's text into blocks to insert (in the field worker, which holds the solver). */
  importText(text: string): Promise<ImportAnswer> {
    const seq = ++this.seq;
    return new Promise((resolve) => {
      this.imports.set(seq, resolve);
      this.postToFields({ type: 'import', seq, text });
    });
  }

  /** The claim files the derivation can be exported as: one per flow block with claims, and one for claims without a flow. */
  exportChoices(): ExportChoice[] {
    const reading = this.reading;
    if (!reading) return [];
    const choices: ExportChoice[] = [];
    const groupByKey = new Map<string, CheckGroup>(reading.groups.map((g) => [g.key, g]));
    const leftOutOf = (flowStepId: string | null) => reading.claims.filter((c) => c.flowStepId === flowStepId && !c.hash);
    for (const flow of reading.flows) {
      const group = groupByKey.get(flow.stepId);
      if (!group) continue;
      choices.push({
        key: flow.stepId,
        label: `Flow block ${flow.number}${flow.name ? `: ${flow.name}` : ''}`,
        file: { flow: group.file.flow, claims: [...group.file.claims] },
        claimCount: group.file.claims.length,
        leftOut: leftOutOf(flow.stepId),
      });
    }
    const alone = groupByKey.get('none');
    if (alone) {
      choices.push({ key: 'none', label: 'Claims without a flow', file: { flow: alone.file.flow, claims: [...alone.file.claims] }, claimCount: alone.file.claims.length, leftOut: leftOutOf(null) });
    }
    return choices;
  }

  destroy(): void {
    this.destroyed = true;
    if (this.timer) clearTimeout(this.timer);
    if (this.rebuildTimer) clearTimeout(this.rebuildTimer);
    this.fieldWorker?.terminate();
    this.fieldWorker = null;
    this.checks.destroy();
    this.listeners.clear();
    this.stepListeners.clear();
  }

  /** Remembers how to get the blocks again (a restarted field worker reads them afresh). */
  track(blocks: () => DocNode[]): void {
    this.lastBlocks = blocks;
  }

  // ----- building the snapshot -----------------------------------------------------------------

  /**
   * The check client changed (a check started or a result came). While results stream in they are
   * read together at most every REBUILD_GAP_MS (each read looks at every claim, two messages a
   * claim, and the blocks are redrawn at most every NOTIFY_GAP_MS anyway); the last one at once.
   */
  private checksChanged(): void {
    if (!this.checks.busy) {
      this.rebuild();
      return;
    }
    this.rebuildTimer ??= setTimeout(() => {
      this.rebuildTimer = null;
      this.rebuild();
    }, REBUILD_GAP_MS);
  }

  private rebuild(): void {
    if (this.rebuildTimer) {
      clearTimeout(this.rebuildTimer);
      this.rebuildTimer = null;
    }
    if (this.destroyed) return;
    const reading = this.reading;
    const flows = reading?.flows ?? [];
    const flowNumber = new Map(flows.map((f) => [f.stepId, f.number]));
    // The binding choices of every claim block follow the list of flow blocks.
    const flowsKey = JSON.stringify(flows.map((f) => [f.stepId, f.number, f.name]));
    const keys = new Map<string, string>();
    const claims: ClaimView[] = [];
    const byStep = new Map<string, ClaimView>();
    const boundCount = new Map<string, number>();
    for (const info of reading?.claims ?? []) {
      let view = this.claimView(info, info.flowStepId ? (flowNumber.get(info.flowStepId) ?? null) : null);
      const key = claimKey(view, flowsKey, this.previewKey(info.stepId));
      keys.set(info.stepId, key);
      // An unchanged claim keeps its view object, so panels can tell what changed.
      const before = this.claimByStep.get(info.stepId);
      if (before && this.stepKeys.get(info.stepId) === key) view = before;
      claims.push(view);
      byStep.set(info.stepId, view);
      if (info.flowStepId) boundCount.set(info.flowStepId, (boundCount.get(info.flowStepId) ?? 0) + 1);
    }
    for (const flow of flows) {
      keys.set(flow.stepId, JSON.stringify([flow.number, flow.name, flow.problems, boundCount.get(flow.stepId) ?? 0, this.previewKey(flow.stepId)]));
    }
    let changed = false;
    for (const [stepId, key] of keys) {
      if (this.stepKeys.get(stepId) !== key) {
        this.changedSteps.add(stepId);
        changed = true;
      }
    }
    for (const stepId of this.stepKeys.keys()) {
      if (!keys.has(stepId)) {
        this.changedSteps.add(stepId);
        changed = true;
      }
    }
    this.stepKeys = keys;
    this.claimByStep = byStep;
    const busy = this.checks.busy || this.timer !== null;
    if (this.current.busy && !busy && reading) mark('marginalia:verdicts-settled');
    const previous = this.current;
    if (!changed && previous.ready === (reading !== null) && previous.busy === busy && previous.evidenceFor === this.evidenceFor && previous.failure === this.failure && previous.flows === flows) return;
    this.current = {
      version: previous.version + 1,
      ready: reading !== null,
      flows,
      claims,
      evidenceFor: this.evidenceFor,
      busy,
      failure: this.failure,
    };
    this.scheduleNotify();
  }

  private previewKey(stepId: string): string {
    let key = this.previewKeys.get(stepId);
    if (key === undefined) {
      const previews = this.previewsByStep[stepId];
      key = previews ? JSON.stringify(previews) : '';
      this.previewKeys.set(stepId, key);
    }
    return key;
  }

  private claimView(info: ClaimInfo, flowNumber: number | null): ClaimView {
    const tightItem = this.tightByStep.get(info.stepId);
    const tightStatus = tightItem ? this.checks.status(tightItem.ticket) : null;
    const tight: TightRun | null = tightStatus ? { state: tightStatus.state, result: tightStatus.result, since: tightStatus.since } : null;
    const supplied = this.supplied?.get(info.stepId);
    if (supplied) {
      // The view's verdict is the one shown; this browser's own check, if asked for, stands beside it.
      const hereStatus = info.hash && this.hereSteps.has(info.stepId) ? this.checks.status(info.hash) : null;
      const here: TightRun | null = hereStatus ? { state: hereStatus.state, result: hereStatus.result, since: hereStatus.since } : null;
      return { info, flowNumber, state: 'done', result: supplied, previous: null, since: null, note: hereStatus?.note ?? null, tight, supplied: true, here };
    }
    if (!info.hash || info.invalid) {
      return { info, flowNumber, state: 'invalid', result: info.invalid, previous: null, since: null, note: null, tight: null };
    }
    const status = this.checks.status(info.hash);
    if (status.result) this.previousByStep.set(info.stepId, status.result);
    const previous = status.result ? null : (this.previousByStep.get(info.stepId) ?? null);
    return { info, flowNumber, state: status.state, result: status.result, previous, since: status.since, note: status.note, tight };
  }

  /** `continuing`: blocks left over from a redraw that ran out of its frame's time, drawn in the next one. */
  private scheduleNotify(continuing = false): void {
    // Changes arriving within one frame (a reading, results known from the cache, several quick
    // checks) are shown together: one redraw of the page, not one per result.
    if (this.notifyScheduled) return;
    this.notifyScheduled = true;
    let done = false;
    const run = (frameTime?: number) => {
      if (done || this.destroyed) return;
      done = true;
      this.notifyScheduled = false;
      // A page's first verdicts change every block at once: drawn a frame's share at a time
      // (frameShare.ts), so that no frame holds the page for long.
      const redrawFirst = (): boolean => {
        const first = this.changedSteps.values().next();
        if (first.done) return false;
        this.changedSteps.delete(first.value);
        for (const listener of [...(this.stepListeners.get(first.value) ?? [])]) listener();
        return this.changedSteps.size > 0;
      };
      if (workWithinShare(frameTime, redrawFirst)) {
        this.scheduleNotify(true);
        return;
      }
      for (const listener of [...this.listeners]) listener();
    };
    // Results streaming in are shown at most every NOTIFY_GAP_MS, so a burst of checks redraws
    // the page a few times rather than once per claim.
    // The last result of a burst is shown at once.
    const wait = this.current.busy && !continuing ? Math.max(0, this.lastNotify + NOTIFY_GAP_MS - now()) : 0;
    const frame = (frameTime?: number) => {
      this.lastNotify = now();
      run(frameTime);
    };
    setTimeout(() => {
      // A hidden page gets no animation frames: the second timer shows the changes there.
      if (typeof requestAnimationFrame === 'function') requestAnimationFrame(frame);
      setTimeout(() => frame(), 50);
    }, wait);
  }
}

/** What a claim block shows, as one string: equal strings, nothing to redraw. */
function claimKey(view: ClaimView, flowsKey: string, previewKey: string): string {
  const result = (r: ClaimResult | null | undefined) => (r ? [r.status, r.message, r.ms] : null);
  const { info } = view;
  return JSON.stringify([
    info.number,
    info.kind,
    info.id,
    info.name,
    info.note,
    info.binding,
    info.flowStepId,
    info.hash,
    info.problems,
    view.flowNumber,
    view.state,
    result(view.result),
    result(view.previous),
    view.since,
    view.note,
    view.tight ? [view.tight.state, result(view.tight.result), view.tight.since] : null,
    view.supplied ?? false,
    view.here ? [view.here.state, result(view.here.result), view.here.since] : null,
    flowsKey,
    previewKey,
  ]);
}

// ---------------------------------------------------------------------------------------------
// One LiveChecks per editor, reached by the node views and the panels.

const byEditor = new WeakMap<Editor, LiveChecks>();
let optionsForNew: LiveOptions = {};

/** Options for the LiveChecks made from now on (tests, benchmarks). */
export function configureLiveChecks(options: LiveOptions): void {
  optionsForNew = options;
}

export function liveChecksOf(editor: Editor): LiveChecks {
  let live = byEditor.get(editor);
  if (!live) {
    live = new LiveChecks(optionsForNew);
    byEditor.set(editor, live);
  }
  return live;
}

export function dropLiveChecks(editor: Editor): void {
  byEditor.get(editor)?.destroy();
  byEditor.delete(editor);
}

// ---------------------------------------------------------------------------------------------
// The flow and claim blocks of a ProseMirror document as JSON, reusing the JSON of blocks that
// did not change (ProseMirror keeps unchanged nodes as the same objects).

const jsonOf = new WeakMap<ProseMirrorNode, DocNode>();

export function checkedBlocks(doc: ProseMirrorNode): DocNode[] {
  const blocks: DocNode[] = [];
  doc.forEach((node) => {
    if (node.type.name !== 'flowBlock' && node.type.name !== 'claimBlock') return;
    let json = jsonOf.get(node);
    if (!json) {
      json = node.toJSON() as DocNode;
      jsonOf.set(node, json);
    }
    blocks.push(json);
  });
  return blocks;
}

// The background re-check: a few seconds after the last accepted edit of a derivation, its working
// copy is read (server/collab), turned into claim files (flow/document.ts) and checked in the check
// thread; each claim's result and the derivation's counts are stored, and listeners hear about
// changed verdicts. Unchanged claims keep their stored result. One run at a time over all
// derivations (the machine's cores are shared), one run per derivation at a time, edits during a
// run lead to another run.
import { readDocument, type DocumentReading } from '../../flow/document';
import type { ClaimResult } from '../../flow/types';
import { uncheckedResult } from '../../flow/uncheckedResult';
import type { CollabAccess, DocumentChange } from '../collab/access';
import type { DocNode } from '../../flow/document';
import type { ChecksAccess, DocumentCheck, VerdictChange, VerdictsChanged } from './access';
import type { CheckThread, JobOutcome } from './checkThread';
import { inDocumentWords, planChecks, type CheckPlan } from './plan';
import { storeCheckRun, storedChecks, type ClaimToStore } from './results';
import type { CheckSettings } from './settings';

interface Slot {
  timer: NodeJS.Timeout | null;
  /** When the first edit not yet checked arrived (performance.now()), or null. */
  firstEditAt: number | null;
  userIds: Set<string>;
  /** Steps touched per user since the last run. */
  edits: Map<string, Set<string>>;
  queued: boolean;
  running: boolean;
  /** Waiting for the next run to finish (recheckNow). */
  afterNextRun: (() => void)[];
  /** Waiting for nothing to be pending (whenSettled). */
  settled: (() => void)[];
}

/** A claim the thread could not finish: inconclusive, and checked again next time. */
function stoppedResult(id: string, kind: string, reason: string): ClaimResult {
  return uncheckedResult(id, kind, 'inconclusive', reason, 'stopped');
}

export class CheckScheduler implements ChecksAccess {
  private readonly slots = new Map<string, Slot>();
  private readonly queue: string[] = [];
  private readonly listeners = new Set<(event: VerdictsChanged) => void>();
  private working = false;
  private stopping = false;
  private unsubscribe: (() => void) | null = null;
  /** Runs finished (for tests and logs). */
  runs = 0;

  constructor(
    private readonly collab: CollabAccess,
    private readonly thread: CheckThread,
    private readonly settings: CheckSettings,
  ) {}

  start(): void {
    this.unsubscribe = this.collab.onDocumentChanged((change) => this.noteChange(change));
  }

  async stop(): Promise<void> {
    this.stopping = true;
    this.unsubscribe?.();
    for (const slot of this.slots.values()) if (slot.timer) clearTimeout(slot.timer);
    await this.thread.stop();
    for (const [id, slot] of this.slots) {
      for (const resolve of slot.afterNextRun.splice(0)) resolve();
      for (const resolve of slot.settled.splice(0)) resolve();
      this.slots.delete(id);
    }
  }

  // ---- ChecksAccess ----------------------------------------------------------------------------

  recheckNow(derivationId: string): Promise<void> {
    if (this.stopping) return Promise.resolve();
    return new Promise((resolve) => {
      this.slot(derivationId).afterNextRun.push(resolve);
      this.due(derivationId);
    });
  }

  whenSettled(derivationId: string): Promise<void> {
    if (!this.isPending(derivationId)) return Promise.resolve();
    return new Promise((resolve) => this.slot(derivationId).settled.push(resolve));
  }

  isPending(derivationId: string): boolean {
    const slot = this.slots.get(derivationId);
    return Boolean(slot && (slot.timer || slot.queued || slot.running));
  }

  async checkDocument(body: unknown, options: { reuseFrom?: string } = {}): Promise<DocumentCheck> {
    const reading = readDocument(body as DocNode);
    const stored = options.reuseFrom ? await storedChecks(options.reuseFrom) : new Map();
    const plan = planChecks(reading, stored);
    const outcomes = await this.thread.run(plan.jobs.map((job) => ({ file: job.file, only: job.only })));
    return { reading, claims: collect(plan, outcomes, reading), timeLimitMs: this.settings.timeLimitMs };
  }

  onVerdictsChanged(listener: (event: VerdictsChanged) => void): () => void {
    this.listeners.add(listener);
    return () => this.listeners.delete(listener);
  }

  // ---- scheduling ------------------------------------------------------------------------------

  /** An accepted edit: check again once edits pause (or the longest wait is over). */
  noteChange(change: DocumentChange): void {
    if (this.stopping) return;
    const slot = this.slot(change.derivationId);
    for (const id of change.userIds) slot.userIds.add(id);
    for (const edit of change.edits ?? []) {
      let steps = slot.edits.get(edit.userId);
      if (!steps) slot.edits.set(edit.userId, (steps = new Set()));
      for (const stepId of edit.stepIds) steps.add(stepId);
    }
    this.schedule(change.derivationId, slot);
  }

  /** Derivations found needing a check at start-up are checked after the usual pause. */
  scheduleSoon(derivationId: string): void {
    if (this.stopping) return;
    this.schedule(derivationId, this.slot(derivationId));
  }

  private schedule(derivationId: string, slot: Slot): void {
    const now = performance.now();
    slot.firstEditAt ??= now;
    const wait = Math.max(0, Math.min(this.settings.delayMs, slot.firstEditAt + this.settings.maxDelayMs - now));
    if (slot.timer) clearTimeout(slot.timer);
    slot.timer = setTimeout(() => {
      slot.timer = null;
      this.due(derivationId);
    }, wait);
    slot.timer.unref();
  }

  private slot(derivationId: string): Slot {
    let slot = this.slots.get(derivationId);
    if (!slot) {
      slot = { timer: null, firstEditAt: null, userIds: new Set(), edits: new Map(), queued: false, running: false, afterNextRun: [], settled: [] };
      this.slots.set(derivationId, slot);
    }
    return slot;
  }

  private due(derivationId: string): void {
    const slot = this.slot(derivationId);
    if (slot.timer) clearTimeout(slot.timer);
    slot.timer = null;
    if (!slot.queued) {
      slot.queued = true;
      this.queue.push(derivationId);
    }
    void this.work();
  }

  private async work(): Promise<void> {
    if (this.working) return;
    this.working = true;
    try {
      for (let id = this.queue.shift(); id !== undefined && !this.stopping; id = this.queue.shift()) {
        const slot = this.slot(id);
        slot.queued = false;
        slot.running = true;
        const userIds = [...slot.userIds];
        const edits = [...slot.edits].map(([userId, steps]) => ({ userId, stepIds: [...steps] }));
        slot.userIds.clear();
        slot.edits.clear();
        slot.firstEditAt = null;
        const waiting = slot.afterNextRun.splice(0);
        try {
          await this.runOnce(id, userIds, edits);
        } catch (error) {
          console.error(`checks: checking derivation ${id} failed:`, error);
        }
        slot.running = false;
        this.runs++;
        for (const resolve of waiting) resolve();
        if (!this.isPending(id)) {
          for (const resolve of slot.settled.splice(0)) resolve();
          if (slot.afterNextRun.length === 0) this.slots.delete(id);
        }
      }
    } finally {
      this.working = false;
    }
  }

  // ---- one run ---------------------------------------------------------------------------------

  private async runOnce(derivationId: string, userIds: string[], edits: VerdictsChanged['edits']): Promise<void> {
    const body = await this.collab.readWorkingCopy(derivationId);
    const reading = readDocument(body);
    const before = await storedChecks(derivationId);
    const plan = planChecks(reading, before);
    const outcomes = await this.thread.run(plan.jobs.map((job) => ({ file: job.file, only: job.only })));
    const claims = collect(plan, outcomes, reading);
    const checkedAt = new Date();
    if (!(await storeCheckRun(derivationId, claims, before, checkedAt))) return;

    const changes: VerdictChange[] = [];
    for (const claim of claims) {
      const old = before.get(claim.stepId);
      if (old?.status === claim.result.status) continue;
      changes.push({ stepId: claim.stepId, claimId: claim.claimId, kind: claim.kind, before: old?.status ?? null, after: claim.result.status, message: claim.result.message });
    }
    const present = new Set(claims.map((c) => c.stepId));
    const removed = [...before.values()].filter((row) => !present.has(row.stepId)).map((row) => ({ stepId: row.stepId, claimId: row.claimId, before: row.status }));
    if (changes.length === 0 && removed.length === 0) return;
    const event: VerdictsChanged = { derivationId, checkedAt, userIds, edits, changes, removed };
    for (const listener of this.listeners) {
      try {
        listener(event);
      } catch (error) {
        console.error('checks: a verdicts-changed listener failed:', error);
      }
    }
  }
}

/** Every claim of the document with its result: stored, from the thread, or invalid as written. */
function collect(plan: CheckPlan, outcomes: readonly JobOutcome[], reading: DocumentReading): ClaimToStore[] {
  const results = new Map(plan.known);
  plan.jobs.forEach((job, i) => {
    const outcome = outcomes[i];
    if (outcome && 'report' in outcome) {
      for (const result of outcome.report.claims) {
        const stepId = job.stepOfClaim[result.id];
        if (stepId) results.set(stepId, inDocumentWords(result, reading, job.key));
      }
    }
  });
  return plan.claims.map((claim, position) => {
    const job = plan.jobs.find((j) => j.stepOfClaim[claim.claimId] === claim.stepId && j.only.includes(claim.claimId));
    const outcome = job ? outcomes[plan.jobs.indexOf(job)] : undefined;
    const reason = outcome && 'error' in outcome ? outcome.error : 'the check did not run';
    return { ...claim, position, result: results.get(claim.stepId) ?? stoppedResult(claim.claimId, claim.kind, reason) };
  });
}

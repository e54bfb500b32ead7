// The page's side of the check worker. It is told which claims the document holds now (each as
// an item with a ticket: the hash of the claim and its flow) and runs only those without a result
// yet; results are kept by ticket, so an edit re-runs only the claims whose inputs changed and an
// undo finds its old results again. A running claim that is no longer wanted (an edit superseded
// it), that runs past its bound, or that the user cancels is stopped by ending the worker and
// starting a fresh one; a worker that dies is restarted, and the claim it was checking says so.
import { mark } from '@/components/performanceMark';
import { stoppedResult } from './stopped';
import type { CheckAnswer, CheckItem, WorkerLike } from './protocol';
import type { ClaimResult } from '@/flow/types';

export type CheckState = 'done' | 'queued' | 'running' | 'cancelled' | 'idle';

export interface TicketStatus {
  state: CheckState;
  result: ClaimResult | null;
  /** When the running check started (performance.now()). */
  since: number | null;
  /** Something the user should know about this check (a restart, a stop). */
  note: string | null;
}

export interface CheckClientOptions {
  createWorker: () => WorkerLike;
  /** Called after any change of a ticket's status. */
  onChange: () => void;
  /** How long a superseded running check may still finish before the worker is ended (ms). */
  graceMs?: number;
  /** Time past an item's own bound after which the worker is taken to be stuck (ms). */
  watchdogExtraMs?: number;
  /** Results kept (the oldest are forgotten). */
  cacheSize?: number;
  now?: () => number;
}

const RESTART_LIMIT = 5;

export class CheckClient {
  private worker: WorkerLike | null = null;
  private readonly results = new Map<string, ClaimResult>();
  private readonly notes = new Map<string, string>();
  private readonly cancelled = new Set<string>();
  private readonly deaths = new Map<string, number>();
  private wanted = new Map<string, CheckItem>();
  private readonly extra = new Map<string, CheckItem>();
  private running: { ticket: string; since: number; item: CheckItem | undefined } | null = null;
  private graceTimer: ReturnType<typeof setTimeout> | null = null;
  private watchdogTimer: ReturnType<typeof setTimeout> | null = null;
  private restartsWithoutResult = 0;
  private brokenReason: string | null = null;
  private destroyed = false;
  private readonly graceMs: number;
  private readonly watchdogExtraMs: number;
  private readonly cacheSize: number;
  private readonly now: () => number;

  constructor(private readonly options: CheckClientOptions) {
    this.graceMs = options.graceMs ?? 150;
    this.watchdogExtraMs = options.watchdogExtraMs ?? 3000;
    this.cacheSize = options.cacheSize ?? 2000;
    this.now = options.now ?? (() => (typeof performance !== 'undefined' ? performance.now() : Date.now()));
  }

  /** The claims of the document now, in the order to check them. */
  want(items: readonly CheckItem[]): void {
    this.wanted = new Map(items.map((item) => [item.ticket, item]));
    this.sync();
  }

  /** Runs one claim once more, with tighter settings (kept apart from its ordinary result). */
  runTight(item: CheckItem): void {
    this.results.delete(item.ticket);
    this.cancelled.delete(item.ticket);
    this.extra.set(item.ticket, item);
    this.sync();
  }

  /** Stops a queued or running check; it is not run again until it changes or is asked for. */
  cancel(ticket: string): void {
    if (this.running?.ticket === ticket) {
      this.cancelled.add(ticket);
      this.extra.delete(ticket);
      this.restart();
      return;
    }
    if (!this.wanted.has(ticket) && !this.extra.has(ticket)) return;
    this.cancelled.add(ticket);
    this.extra.delete(ticket);
    this.sync();
  }

  /** Checks a claim again although a result is known (e.g. after it reached its time bound). */
  checkAgain(ticket: string): void {
    this.results.delete(ticket);
    this.cancelled.delete(ticket);
    this.deaths.delete(ticket);
    this.notes.delete(ticket);
    this.sync();
  }

  status(ticket: string): TicketStatus {
    const result = this.results.get(ticket) ?? null;
    const note = this.notes.get(ticket) ?? null;
    if (result) return { state: 'done', result, since: null, note };
    if (this.running?.ticket === ticket) return { state: 'running', result: null, since: this.running.since, note };
    if (this.cancelled.has(ticket)) return { state: 'cancelled', result: null, since: null, note };
    if (this.wanted.has(ticket) || this.extra.has(ticket)) return { state: 'queued', result: null, since: null, note };
    return { state: 'idle', result: null, since: null, note };
  }

  /** Starts the worker ahead of the first check (it loads the solver). */
  warm(): void {
    if (!this.destroyed && !this.brokenReason) this.ensureWorker();
  }

  /** True while any wanted claim waits for its result. */
  get busy(): boolean {
    return this.pending().length > 0;
  }

  destroy(): void {
    this.destroyed = true;
    this.clearTimers();
    this.worker?.terminate();
    this.worker = null;
  }

  // -------------------------------------------------------------------------------------------

  private pending(): CheckItem[] {
    const out: CheckItem[] = [];
    for (const item of [...this.extra.values(), ...this.wanted.values()]) {
      if (this.results.has(item.ticket) || this.cancelled.has(item.ticket)) continue;
      out.push(item);
    }
    return out;
  }

  private sync(): void {
    if (this.destroyed) return;
    const pending = this.pending();
    if (this.brokenReason) {
      for (const item of pending) this.store(item.ticket, stoppedResult(this.claimId(item), item.kind, this.brokenReason, 'none'));
      this.options.onChange();
      return;
    }
    const running = this.running;
    if (running && !pending.some((item) => item.ticket === running.ticket)) {
      // Superseded: let it finish if it is quick, else end the worker.
      this.graceTimer ??= setTimeout(() => {
        this.graceTimer = null;
        if (this.running?.ticket === running.ticket) this.restart();
      }, this.graceMs);
    } else if (this.graceTimer && running) {
      clearTimeout(this.graceTimer);
      this.graceTimer = null;
    }
    if (pending.length > 0 || this.worker) {
      const worker = this.ensureWorker();
      if (!worker) return this.sync();
      worker.postMessage({ type: 'run', items: pending.filter((item) => item.ticket !== running?.ticket) });
    }
    this.options.onChange();
  }

  private ensureWorker(): WorkerLike | null {
    if (this.worker) return this.worker;
    let worker: WorkerLike;
    try {
      worker = this.options.createWorker();
    } catch (error) {
      this.brokenReason = `the checks cannot run here: the check worker could not start (${error instanceof Error ? error.message : String(error)})`;
      return null;
    }
    worker.onmessage = (event) => {
      if (this.worker === worker) this.receive(event.data as CheckAnswer);
    };
    const died = (event: unknown) => {
      if (this.worker === worker) this.died(event);
    };
    worker.onerror = died;
    worker.onmessageerror = died;
    this.worker = worker;
    return worker;
  }

  private receive(message: CheckAnswer): void {
    if (message.type === 'ready') {
      mark('marginalia:check-worker-ready');
      return;
    }
    if (message.type === 'started') {
      const item = this.extra.get(message.ticket) ?? this.wanted.get(message.ticket);
      this.running = { ticket: message.ticket, since: this.now(), item };
      if (this.watchdogTimer) clearTimeout(this.watchdogTimer);
      const bound = (item?.timeLimitMs ?? 2000) + this.watchdogExtraMs;
      this.watchdogTimer = setTimeout(() => this.stuck(message.ticket), bound);
      this.options.onChange();
      return;
    }
    if (message.type === 'result') {
      this.restartsWithoutResult = 0;
      if (this.running?.ticket === message.ticket) this.running = null;
      this.clearTimers();
      this.extra.delete(message.ticket);
      if (this.deaths.has(message.ticket) && !this.results.has(message.ticket)) {
        this.notes.set(message.ticket, 'the check worker stopped once while checking this claim and was restarted; this verdict is from the second run');
      }
      this.store(message.ticket, message.result);
      this.options.onChange();
    }
  }

  private stuck(ticket: string): void {
    this.watchdogTimer = null;
    if (this.running?.ticket !== ticket) return;
    const item = this.running.item;
    this.notes.set(ticket, 'the check went past its time bound without answering, so the check worker was restarted');
    this.store(ticket, stoppedResult(item ? this.claimId(item) : ticket, item?.kind ?? '', `stopped: no verdict within the time bound of ${item?.timeLimitMs ?? 2000} ms`));
    this.extra.delete(ticket);
    this.restart();
  }

  private died(event: unknown): void {
    const running = this.running;
    const reason = describeWorkerError(event);
    if (running) {
      const deaths = (this.deaths.get(running.ticket) ?? 0) + 1;
      this.deaths.set(running.ticket, deaths);
      if (deaths >= 2) {
        const item = running.item;
        this.store(running.ticket, stoppedResult(item ? this.claimId(item) : running.ticket, item?.kind ?? '', `this claim stopped the check worker twice (${reason}); it is not checked again until it changes`, 'none'));
        this.notes.set(running.ticket, 'the check worker stopped twice while checking this claim and was restarted');
        this.extra.delete(running.ticket);
      } else {
        this.notes.set(running.ticket, 'the check worker stopped while checking this claim and was restarted; checking it again');
      }
    }
    this.restartsWithoutResult++;
    if (this.restartsWithoutResult >= RESTART_LIMIT) this.brokenReason = `the checks cannot run here: the check worker stopped ${RESTART_LIMIT} times in a row (${reason})`;
    this.restart();
  }

  private restart(): void {
    this.clearTimers();
    this.worker?.terminate();
    this.worker = null;
    this.running = null;
    this.sync();
  }

  private clearTimers(): void {
    if (this.graceTimer) clearTimeout(this.graceTimer);
    if (this.watchdogTimer) clearTimeout(this.watchdogTimer);
    this.graceTimer = null;
    this.watchdogTimer = null;
  }

  private store(ticket: string, result: ClaimResult): void {
    this.results.delete(ticket);
    this.results.set(ticket, result);
    if (this.results.size > this.cacheSize) {
      const oldest = this.results.keys().next();
      if (!oldest.done) this.results.delete(oldest.value);
    }
  }

  private claimId(item: CheckItem): string {
    const claim = item.file.claims[0] as { id?: unknown } | undefined;
    return typeof claim?.id === 'string' ? claim.id : item.stepId;
  }
}

function describeWorkerError(event: unknown): string {
  const message = (event as { message?: unknown } | null)?.message;
  return typeof message === 'string' && message !== '' ? message : 'no reason given';
}

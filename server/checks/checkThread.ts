// The server's one check thread (node worker_threads; the machine's cores are shared, so one is
// enough): requests are served one after another, each bounded in time. A thread that runs past
// its bound, runs out of memory or dies is ended and a fresh one started for the next request;
// the claims it did not finish come back as errors, never as a hang.
import { Worker } from 'node:worker_threads';
import type { Report } from '../../flow/types';
import type { ThreadJob, ThreadReply, ThreadRequest } from './threadProtocol';

export type JobOutcome = { report: Report } | { error: string };

export interface CheckThreadOptions {
  /** Time bound per claim inside the solver (ms). */
  timeLimitMs: number;
  /** Extra time per request before the thread is ended (ms, default 10 000). */
  slackMs?: number;
  /** Memory for the thread's heap (MB, default 512). */
  heapMb?: number;
  /** The thread's code (default ./thread.ts); tests give a misbehaving one. */
  entry?: URL;
}

interface Pending {
  request: ThreadRequest;
  outcomes: (JobOutcome | undefined)[];
  resolve(outcomes: JobOutcome[]): void;
  timer: NodeJS.Timeout | null;
}

// The server runs TypeScript through tsx; a worker thread needs the loader registered in itself.
const BOOTSTRAP = `
const { workerData } = require('node:worker_threads');
import(workerData.loader).then((tsx) => { tsx.register(); return import(workerData.entry); });
`;

export class CheckThread {
  private worker: Worker | null = null;
  private current: Pending | null = null;
  private readonly queue: Pending[] = [];
  private nextId = 1;
  private stopped = false;
  /** How many threads were ended or died (for logs and tests). */
  restarts = 0;

  constructor(private readonly options: CheckThreadOptions) {}

  /** Runs the jobs in the thread; resolves with one outcome per job (a report or what went wrong). */
  run(jobs: ThreadJob[]): Promise<JobOutcome[]> {
    if (jobs.length === 0) return Promise.resolve([]);
    if (this.stopped) return Promise.resolve(jobs.map(() => ({ error: 'the server is stopping' })));
    return new Promise((resolve) => {
      const request: ThreadRequest = { requestId: this.nextId++, jobs, timeLimitMs: this.options.timeLimitMs };
      this.queue.push({ request, outcomes: jobs.map(() => undefined), resolve, timer: null });
      this.pump();
    });
  }

  /** Ends the thread; requests still waiting come back as errors. */
  async stop(): Promise<void> {
    this.stopped = true;
    for (const pending of this.queue.splice(0)) pending.resolve(pending.request.jobs.map(() => ({ error: 'the server is stopping' })));
    if (this.current) this.finish(this.current, 'the server is stopping');
    const worker = this.worker;
    this.worker = null;
    await worker?.terminate();
  }

  private spawn(): Worker {
    const worker = new Worker(BOOTSTRAP, {
      eval: true,
      workerData: { entry: (this.options.entry ?? new URL('./thread.ts', import.meta.url)).href, loader: import.meta.resolve('tsx/esm/api') },
      resourceLimits: { maxOldGenerationSizeMb: this.options.heapMb ?? 512 },
      stdout: false,
      stderr: false,
    });
    worker.on('message', (reply: ThreadReply) => this.received(reply));
    worker.on('error', (error) => this.died(worker, `the check thread failed: ${error.message}`));
    worker.on('exit', (code) => this.died(worker, `the check thread ended unexpectedly (exit ${code})`));
    return worker;
  }

  private pump(): void {
    if (this.current || this.stopped) return;
    const next = this.queue.shift();
    if (!next) return;
    this.current = next;
    this.worker ??= this.spawn();
    const claims = next.request.jobs.reduce((n, job) => n + Math.max(1, job.only.length), 0);
    const bound = claims * (this.options.timeLimitMs + 1_000) + (this.options.slackMs ?? 10_000);
    next.timer = setTimeout(() => {
      this.restart(`stopped: the check did not finish within ${Math.round(bound / 1000)} s, so its thread was ended`);
    }, bound);
    next.timer.unref();
    this.worker.postMessage(next.request);
  }

  private received(reply: ThreadReply): void {
    const pending = this.current;
    if (!pending || reply.requestId !== pending.request.requestId) return;
    pending.outcomes[reply.index] = 'report' in reply ? { report: reply.report } : { error: reply.error };
    if (pending.outcomes.every((o) => o !== undefined)) this.finish(pending, '');
  }

  private finish(pending: Pending, reason: string): void {
    if (pending.timer) clearTimeout(pending.timer);
    if (this.current === pending) this.current = null;
    pending.resolve(pending.outcomes.map((o) => o ?? { error: reason || 'no answer from the check thread' }));
    this.pump();
  }

  /** Ends a thread that overran; the unfinished jobs get `reason`. */
  private restart(reason: string): void {
    const worker = this.worker;
    this.worker = null;
    this.restarts++;
    if (worker) {
      worker.removeAllListeners();
      worker.on('error', () => undefined);
      void worker.terminate();
    }
    if (this.current) this.finish(this.current, reason);
  }

  private died(worker: Worker, reason: string): void {
    if (worker !== this.worker) return;
    this.worker = null;
    this.restarts++;
    worker.removeAllListeners();
    worker.on('error', () => undefined);
    if (!this.stopped) console.error(`checks: ${reason}`);
    if (this.current) this.finish(this.current, reason);
  }
}

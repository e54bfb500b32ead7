// The page's one plot worker and the way trajectory plot blocks ask it for trajectories: the
// newest request of each block supersedes the older ones still waiting; a worker that dies is
// started again and the blocks that were waiting are told so.
import type { FlowSpec, TrajectoryOptions, TrajectoryResult } from '@/flow';
import type { TraceReply, TraceRequest } from './plotProtocol';

export type TraceAnswer = { ok: true; results: TrajectoryResult[] } | { ok: false; error: string };

interface Waiting {
  request: TraceRequest;
  /** null: superseded by a newer request of the same block before it was sent. */
  answer(result: TraceAnswer | null): void;
}

let worker: Worker | null = null;
let nextId = 1;
let running: (Waiting & { owner: string }) | null = null;
/** The newest request per block not yet sent (older ones are dropped unanswered). */
const queued = new Map<string, Waiting>();

function startWorker(): Worker {
  const started = new Worker(new URL('./plotTrajectory.worker.ts', import.meta.url), { type: 'module' });
  started.onmessage = (event: MessageEvent<TraceReply>) => {
    const reply = event.data;
    const current = running;
    if (!current || reply.requestId !== current.request.requestId) return;
    running = null;
    current.answer('results' in reply ? { ok: true, results: reply.results } : { ok: false, error: `the trajectory could not be followed: ${reply.error}` });
    pump();
  };
  started.onerror = (event) => {
    event.preventDefault();
    started.terminate();
    if (worker === started) worker = null;
    const current = running;
    running = null;
    current?.answer({ ok: false, error: 'the plot worker stopped unexpectedly and was started again; change the plot to try again' });
    pump();
  };
  return started;
}

function pump(): void {
  if (running) return;
  const next = queued.entries().next();
  if (next.done) return;
  const [owner, waiting] = next.value;
  queued.delete(owner);
  running = { ...waiting, owner };
  worker ??= startWorker();
  worker.postMessage(waiting.request);
}

/**
 * Follows the flow from each set of options in the plot worker. `owner` identifies the asking
 * block: a newer request from the same block replaces one of its requests still waiting, which
 * then resolves with null.
 */
export function traceInWorker(owner: string, spec: FlowSpec, traces: TrajectoryOptions[]): Promise<TraceAnswer | null> {
  return new Promise((resolve) => {
    queued.get(owner)?.answer(null);
    const request: TraceRequest = { requestId: nextId++, spec, traces };
    queued.set(owner, { request, answer: resolve });
    pump();
  });
}

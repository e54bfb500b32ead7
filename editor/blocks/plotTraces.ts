// The page's one plot worker and the way trajectory plot blocks ask it for trajectories: the
// newest request of each block supersedes the older ones still waiting; a worker that dies is
// started again and the blocks that were waiting are told so.
import type { FlowSpec, TrajectoryOptions, TrajectoryResult } from '@/flow';
import { workerRequests } from '@/components/workerRequests';
import type { TraceReply, TraceRequest } from './plotProtocol';

export type TraceAnswer = { ok: true; results: TrajectoryResult[] } | { ok: false; error: string };

const traces = workerRequests<Omit<TraceRequest, 'requestId'>, TraceReply, TraceAnswer>({
  start: () => new Worker(new URL('./plotTrajectory.worker.ts', import.meta.url), { type: 'module' }),
  send: (worker, job, requestId) => worker.postMessage({ requestId, ...job } satisfies TraceRequest),
  answer: (reply) => ('results' in reply ? { ok: true, results: reply.results } : { ok: false, error: `the trajectory could not be followed: ${reply.error}` }),
  failed: { ok: false, error: 'the plot worker stopped unexpectedly and was started again; change the plot to try again' },
});

/**
 * Follows the flow from each set of options in the plot worker. `owner` identifies the asking
 * block: a newer request from the same block replaces one of its requests still waiting, which
 * then resolves with null.
 */
export function traceInWorker(owner: string, spec: FlowSpec, options: TrajectoryOptions[]): Promise<TraceAnswer | null> {
  return traces.ask(owner, { spec, traces: options });
}

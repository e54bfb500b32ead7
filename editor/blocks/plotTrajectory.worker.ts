// The plot worker: follows flows from starting points with flow/trajectory.ts, off the page's
// main thread. traceTrajectory never throws and is bounded in time; the guard below is for
// anything else, so a message always gets its answer.
import { traceTrajectory } from '@/flow/trajectory';
import type { TraceReply, TraceRequest } from './plotProtocol';

const scope = self as unknown as { onmessage: ((event: MessageEvent<TraceRequest>) => void) | null; postMessage(reply: TraceReply): void };

scope.onmessage = (event) => {
  const { requestId, spec, traces } = event.data;
  try {
    scope.postMessage({ requestId, results: traces.map((options) => traceTrajectory(spec, options)) });
  } catch (error) {
    scope.postMessage({ requestId, error: error instanceof Error ? error.message : String(error) });
  }
};

// The fit worker: fits datasets of up to a million rows off the page's main thread. It keeps the
// columns it was sent until told to forget them; every run request gets exactly one answer.
import type { FitData } from '@/flow/fit';
import { runFitJob } from './fitJobs';
import type { FitReply, FitRequest } from './fitProtocol';

const scope = self as unknown as { onmessage: ((event: MessageEvent<FitRequest>) => void) | null; postMessage(reply: FitReply): void };
const datasets = new Map<number, FitData>();

scope.onmessage = (event) => {
  const request = event.data;
  if (request.type === 'data') {
    datasets.set(request.dataId, { x: request.x, y: request.y, sigma: request.sigma });
    return;
  }
  if (request.type === 'forget') {
    datasets.delete(request.dataId);
    return;
  }
  const data = datasets.get(request.dataId);
  if (!data) {
    scope.postMessage({ requestId: request.requestId, error: 'the fit worker does not hold this dataset' });
    return;
  }
  try {
    scope.postMessage({ requestId: request.requestId, results: request.jobs.map((job) => runFitJob(data, job)) });
  } catch (error) {
    scope.postMessage({ requestId: request.requestId, error: error instanceof Error ? error.message : String(error) });
  }
};

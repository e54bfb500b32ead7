// The check worker: runs claims with flow/, one at a time, posting each result as it comes. A new
// list of items replaces what is queued (an edit supersedes older checks); between two claims it
// yields so that such a list can arrive. A claim that runs long is stopped by the page ending
// this worker and starting a fresh one. While many claims wait it rests between them
// (restAfterClaim): at most LONGEST_REST_MS, so an edit arriving meanwhile waits little.
import { yieldToEventLoop } from '@/flow/runner';
import { restAfterClaim, runItem } from './checkLogic';
import type { CheckAnswer, CheckItem, CheckRequest } from './protocol';

interface Scope {
  postMessage(message: CheckAnswer): void;
  onmessage: ((event: { data: CheckRequest }) => void) | null;
}
const scope = self as unknown as Scope;

let queue: CheckItem[] = [];
let pumping = false;

function rest(ms: number): Promise<void> {
  return ms > 0 ? new Promise((resolve) => setTimeout(resolve, ms)) : Promise.resolve();
}

async function pump(): Promise<void> {
  if (pumping) return;
  pumping = true;
  try {
    for (;;) {
      await yieldToEventLoop();
      const item = queue.shift();
      if (!item) break;
      scope.postMessage({ type: 'started', ticket: item.ticket });
      const started = performance.now();
      const result = runItem(item);
      const tookMs = performance.now() - started;
      scope.postMessage({ type: 'result', ticket: item.ticket, result });
      await rest(restAfterClaim(tookMs, queue.length));
    }
  } finally {
    pumping = false;
  }
}

scope.onmessage = ({ data }) => {
  if (data?.type !== 'run' || !Array.isArray(data.items)) return;
  queue = [...data.items];
  void pump();
};

scope.postMessage({ type: 'ready' });

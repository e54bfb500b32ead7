// One worker for the page and the requests sent to it one at a time: each owner's newest request
// replaces its one still waiting (which then resolves with null, unanswered); a worker that dies
// is started afresh for the next request, and the request it was running gets the failure answer.
// Shared by the plot worker's trajectories and the fit worker's fits.

export interface WorkerRequests<Job, Answer> {
  /** Queues `job` for `owner`, replacing the owner's job still waiting; null when replaced or withdrawn. */
  ask(owner: string, job: Job): Promise<Answer | null>;
  /** Drops the owner's job still waiting (one already running finishes unseen). */
  withdraw(owner: string): void;
  /** The worker now running, if any (for messages outside the queue). */
  current(): Worker | null;
}

export interface WorkerRequestOptions<Job, Reply, Answer> {
  start(): Worker;
  /** Posts the job to the worker under `requestId`; its reply must carry the same `requestId`. */
  send(worker: Worker, job: Job, requestId: number): void;
  answer(reply: Reply): Answer;
  /** The answer for a job whose worker died. */
  failed: Answer;
  /** Called when a worker died, before the next one is started. */
  onWorkerLost?(): void;
}

interface Waiting<Job, Answer> {
  job: Job;
  resolve(answer: Answer | null): void;
}

export function workerRequests<Job, Reply extends { requestId: number }, Answer>(
  options: WorkerRequestOptions<Job, Reply, Answer>,
): WorkerRequests<Job, Answer> {
  let worker: Worker | null = null;
  let nextId = 1;
  let running: (Waiting<Job, Answer> & { requestId: number }) | null = null;
  const queued = new Map<string, Waiting<Job, Answer>>();

  const startWorker = (): Worker => {
    const started = options.start();
    started.onmessage = (event: MessageEvent<Reply>) => {
      const current = running;
      if (!current || event.data.requestId !== current.requestId) return;
      running = null;
      current.resolve(options.answer(event.data));
      pump();
    };
    started.onerror = (event) => {
      event.preventDefault();
      started.terminate();
      if (worker === started) {
        worker = null;
        options.onWorkerLost?.();
      }
      const current = running;
      running = null;
      current?.resolve(options.failed);
      pump();
    };
    return started;
  };

  function pump(): void {
    if (running) return;
    const next = queued.entries().next();
    if (next.done) return;
    const [owner, waiting] = next.value;
    queued.delete(owner);
    worker ??= startWorker();
    running = { ...waiting, requestId: nextId++ };
    options.send(worker, waiting.job, running.requestId);
  }

  return {
    ask(owner, job) {
      return new Promise((resolve) => {
        queued.get(owner)?.resolve(null);
        queued.set(owner, { job, resolve });
        pump();
      });
    },
    withdraw(owner) {
      const waiting = queued.get(owner);
      queued.delete(owner);
      waiting?.resolve(null);
    },
    current: () => worker,
  };
}

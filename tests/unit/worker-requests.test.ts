// The page's one-worker queue behind trajectory plots and dataset fits (components/workerRequests.ts),
// with a stand-in worker that answers when told: a panel's newer request replaces its waiting one,
// requests run one at a time, and a worker that dies answers with the failure and is replaced.
import { expect, test } from 'vitest';
import { workerRequests } from '../../components/workerRequests';

interface Reply {
  requestId: number;
  value: string;
}

class StandInWorker {
  onmessage: ((event: MessageEvent<Reply>) => void) | null = null;
  onerror: ((event: { preventDefault(): void }) => void) | null = null;
  received: { requestId: number; job: string }[] = [];
  terminated = false;
  postMessage(message: { requestId: number; job: string }) {
    this.received.push(message);
  }
  terminate() {
    this.terminated = true;
  }
  reply(value: string) {
    const last = this.received[this.received.length - 1]!;
    this.onmessage?.({ data: { requestId: last.requestId, value } } as MessageEvent<Reply>);
  }
  die() {
    this.onerror?.({ preventDefault: () => undefined });
  }
}

function queue() {
  const started: StandInWorker[] = [];
  const requests = workerRequests<string, Reply, string>({
    start: () => {
      const worker = new StandInWorker();
      started.push(worker);
      return worker as unknown as Worker;
    },
    send: (worker, job, requestId) => worker.postMessage({ requestId, job }),
    answer: (reply) => reply.value,
    failed: 'the worker stopped',
  });
  return { requests, started };
}

test('a panel’s newer request replaces its one still waiting; requests run one at a time', async () => {
  const { requests, started } = queue();
  const first = requests.ask('plot-1', 'a');
  const replaced = requests.ask('plot-2', 'b');
  const newest = requests.ask('plot-2', 'c');
  expect(await replaced).toBeNull();
  expect(started).toHaveLength(1);
  expect(started[0]!.received.map((r) => r.job)).toEqual(['a']);
  started[0]!.reply('answer to a');
  expect(await first).toBe('answer to a');
  expect(started[0]!.received.map((r) => r.job)).toEqual(['a', 'c']);
  started[0]!.reply('answer to c');
  expect(await newest).toBe('answer to c');
});

test('a worker that dies answers its running request with the failure, and the next request gets a fresh worker', async () => {
  const { requests, started } = queue();
  const running = requests.ask('fit', 'x');
  started[0]!.die();
  expect(await running).toBe('the worker stopped');
  expect(started[0]!.terminated).toBe(true);
  const again = requests.ask('fit', 'y');
  expect(started).toHaveLength(2);
  started[1]!.reply('answer to y');
  expect(await again).toBe('answer to y');
});

test('a withdrawn request is never sent', async () => {
  const { requests, started } = queue();
  const busy = requests.ask('one', 'first');
  const gone = requests.ask('two', 'second');
  requests.withdraw('two');
  expect(await gone).toBeNull();
  started[0]!.reply('done');
  expect(await busy).toBe('done');
  expect(started[0]!.received.map((r) => r.job)).toEqual(['first']);
});

// The code of the check thread (node worker_threads): runs the solver on the claim files it is
// sent, one message at a time, and posts each file's report back as soon as it is done, so the
// server's event loop never waits on numerics.
import { parentPort } from 'node:worker_threads';
import { checkClaims } from '../../flow/runner';
import type { ThreadReply, ThreadRequest } from './threadProtocol';

const port = parentPort;
if (!port) throw new Error('server/checks/thread.ts runs as a worker thread');

port.on('message', (request: ThreadRequest) => {
  request.jobs.forEach((job, index) => {
    let reply: ThreadReply;
    try {
      const report = checkClaims(job.file, { only: job.only, timeLimitMs: request.timeLimitMs });
      reply = { requestId: request.requestId, index, report };
    } catch (error) {
      // checkClaims reports every claim itself; this is a defect of the thread, said plainly.
      reply = { requestId: request.requestId, index, error: error instanceof Error ? error.message : String(error) };
    }
    port.postMessage(reply);
  });
});

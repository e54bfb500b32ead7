// A check thread that never answers (a solver stuck in a loop), for the test of the thread's bound.
import { parentPort } from 'node:worker_threads';

parentPort?.on('message', () => {
  for (;;) {
    // spin until the server ends this thread
  }
});

/**
 * Entry point of a batch worker thread: receives `{ job, settings }` messages, reduces each
 * star exposure with {@link processStar} and posts the outcome back. One job at a time.
 */
import { parentPort } from 'node:worker_threads';
import { processStar } from './job.js';
import type { BatchSettings, StarJob } from './types.js';

/** A message from the batch to a worker. */
export interface WorkerRequest {
  readonly job: StarJob;
  readonly settings: BatchSettings;
}

if (parentPort) {
  const port = parentPort;
  port.on('message', (m: WorkerRequest) => {
    port.postMessage(processStar(m.job, m.settings));
  });
}

/**
 * Worker thread that writes one demo year ({@link runYearJob}). Started by ./index.ts through
 * ./year-worker-boot.mjs, which registers the TypeScript loader in the worker thread. Messages to the parent:
 * `{ tick: hours }` while working, then `{ done: true }` or `{ error: message }`.
 */
import { parentPort, workerData } from 'node:worker_threads';
import { runYearJob, type YearJob } from './year-job.ts';

const job = workerData as YearJob;
try {
  await runYearJob(job, (hours) => parentPort!.postMessage({ tick: hours }));
  parentPort!.postMessage({ done: true });
} catch (e) {
  parentPort!.postMessage({ error: (e as Error)?.stack ?? String(e) });
}

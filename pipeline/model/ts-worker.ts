/** Starts a worker thread running a TypeScript module (through ts-worker-boot.mjs). */
import { Worker } from 'node:worker_threads';

/** @param entry URL of the .ts module the worker runs */
export function startTsWorker(entry: URL): Worker {
  return new Worker(new URL('./ts-worker-boot.mjs', import.meta.url), { workerData: { entry: entry.href } });
}

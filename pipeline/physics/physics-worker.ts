/**
 * Worker side of {@link runPhysicsParallel}: receives the shared arrays once, then computes the
 * hour ranges it is sent and replies with the counts. Started with `execArgv: ['--import', 'tsx']`.
 */
import { parentPort } from 'node:worker_threads';
import { computeHours, type PhysicsArrays, type PhysicsOptions } from './block.ts';

let arrays: PhysicsArrays | undefined;
parentPort!.on('message', (m: { arrays?: PhysicsArrays; t0?: number; t1?: number; opts?: PhysicsOptions; id?: number }) => {
  if (m.arrays) {
    arrays = m.arrays;
    parentPort!.postMessage({ ready: true });
    return;
  }
  const t = performance.now();
  const counts = computeHours(arrays!, m.t0!, m.t1!, m.opts);
  parentPort!.postMessage({ id: m.id, counts, ms: performance.now() - t });
});

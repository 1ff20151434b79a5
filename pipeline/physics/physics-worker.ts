/**
 * Worker side of {@link runPhysicsParallel}: receives the shared arrays once, then computes the
 * hour ranges it is sent (interleaved blocks) and replies with the counts, its wall and thread CPU time, and when it
 * started and ended. Loaded through physics-worker-boot.mjs, which registers the TypeScript loader.
 */
import { parentPort } from 'node:worker_threads';
import { computeHours, type PhysicsArrays, type PhysicsCounts, type PhysicsOptions } from './block.ts';
import { addCounts, emptyCounts } from './kernel.ts';
import { threadCpuNs } from './thread-cpu.ts';

let arrays: PhysicsArrays | undefined;
parentPort!.on('message', (m: { arrays?: PhysicsArrays; ranges?: Array<[number, number]>; opts?: PhysicsOptions; id?: number }) => {
  if (m.arrays) {
    arrays = m.arrays;
    parentPort!.postMessage({ ready: true });
    return;
  }
  const c0 = threadCpuNs();
  const t = performance.now();
  const counts = { ...emptyCounts(), timeOutOfRange: 0 } as PhysicsCounts;
  for (const [t0, t1] of m.ranges!) {
    const c = computeHours(arrays!, t0, t1, m.opts);
    addCounts(counts, c);
    counts.timeOutOfRange += c.timeOutOfRange;
  }
  const t1 = performance.now();
  const cpuNs = threadCpuNs() - c0;
  // Start and end as epoch ms so the caller can check that the workers ran at the same time.
  parentPort!.postMessage({ id: m.id, counts, ms: t1 - t, cpuNs, startMs: performance.timeOrigin + t, endMs: performance.timeOrigin + t1 });
});

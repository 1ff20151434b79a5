/**
 * Worker side of the physics pool (./physics-pool.ts, entry `physics` of
 * pipeline/infra/worker-pool.ts): takes the shared arrays on set-up, then computes the hour
 * ranges of each task and answers with the counts, its wall and thread CPU time, and when it
 * started and ended.
 */
import { computeHours, type PhysicsArrays, type PhysicsCounts } from '../physics/block.ts';
import { addCounts, emptyCounts } from '../physics/kernel.ts';
import { threadCpuNs } from '../infra/thread-cpu.ts';
import { serveTasks } from '../infra/worker-side.ts';
import type { PhysicsReply, PhysicsTask } from './physics-pool.ts';

let arrays: PhysicsArrays | undefined;

serveTasks<PhysicsArrays, PhysicsTask, PhysicsReply>({
  init(data) {
    arrays = data;
  },
  run({ ranges, opts }) {
    const c0 = threadCpuNs();
    const t = performance.now();
    const counts = { ...emptyCounts(), timeOutOfRange: 0 } as PhysicsCounts;
    for (const [t0, t1] of ranges) {
      const c = computeHours(arrays!, t0, t1, opts);
      addCounts(counts, c);
      counts.timeOutOfRange += c.timeOutOfRange;
    }
    const t1 = performance.now();
    const cpuNs = threadCpuNs() - c0;
    // Start and end as epoch ms so the caller can check that the workers ran at the same time.
    return { counts, ms: t1 - t, cpuNs, startMs: performance.timeOrigin + t, endMs: performance.timeOrigin + t1 };
  },
});

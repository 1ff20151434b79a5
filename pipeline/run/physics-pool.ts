/**
 * Runs the physics step (pipeline/physics `computeHours`) over the hours of one block on several
 * worker threads (the pool of pipeline/infra/worker-pool.ts running ./physics-worker.ts). The
 * arrays must live on SharedArrayBuffers (pipeline/infra/shared-memory.ts); each worker computes
 * whole hours in place. Used by the `wbgt-kernel-parallel` benchmark.
 */
import { availableParallelism } from 'node:os';
import type { PhysicsArrays, PhysicsOptions, PhysicsCounts } from '../physics/block.ts';
import { addCounts, emptyCounts } from '../physics/kernel.ts';
import { startWorkerPool } from '../infra/worker-pool.ts';

/** What one {@link PhysicsPool.run} did. */
export interface PoolRun {
  counts: PhysicsCounts;
  workerMs: number[];
  workerCpuNs: number[];
  workerStartMs: number[];
  workerEndMs: number[];
}

/** A pool of physics workers holding one set of shared arrays. */
export interface PhysicsPool {
  size: number;
  /**
   * Computes hours [0, nT) split into `size` disjoint sets of hours, one per worker, all at
   * once; resolves with merged counts and, per worker, wall ms, thread CPU ns, start and end
   * [epoch ms].
   */
  run(nT: number, opts?: PhysicsOptions): Promise<PoolRun>;
  close(): Promise<void>;
}

/** One worker's share of a run: the hour ranges [t0, t1) it computes. */
export interface PhysicsTask {
  ranges: Array<[number, number]>;
  opts: PhysicsOptions;
}

/** A worker's answer: its counts, wall time [ms], thread CPU time [ns], start and end [epoch ms]. */
export interface PhysicsReply {
  counts: PhysicsCounts;
  ms: number;
  cpuNs: number;
  startMs: number;
  endMs: number;
}

/** Hours per interleaved block handed to a worker. */
const INTERLEAVE_HOURS = 4;

/** Starts `size` workers (default: all cores) sharing `arrays`; resolves once all are ready. */
export async function startPhysicsPool(arrays: PhysicsArrays, size = availableParallelism()): Promise<PhysicsPool> {
  const pool = startWorkerPool<PhysicsTask, PhysicsReply>('physics', { size, init: arrays });
  try {
    await pool.ready();
  } catch (e) {
    await pool.close();
    throw e;
  }
  return {
    size,
    async run(nT, opts = {}) {
      // Hours are dealt out in small interleaved blocks (share k takes blocks k, k + size, …), so
      // each worker gets a like share of day and night hours, whose costs differ. One share per
      // worker: with as many tasks as workers, each idle worker takes exactly one.
      const block = Math.max(1, Math.min(INTERLEAVE_HOURS, Math.ceil(nT / size)));
      const tasks: PhysicsTask[] = Array.from({ length: size }, () => ({ ranges: [], opts }));
      for (let t0 = 0, b = 0; t0 < nT; t0 += block, b++) tasks[b % size].ranges.push([t0, Math.min(nT, t0 + block)]);
      const res: PhysicsReply[] = new Array(size);
      await pool.run(tasks, { onResult: (_t, r, k) => (res[k] = r) });
      const counts = { ...emptyCounts(), timeOutOfRange: 0 } as PhysicsCounts;
      for (const r of res) {
        addCounts(counts, r.counts);
        counts.timeOutOfRange += r.counts.timeOutOfRange;
      }
      return {
        counts,
        workerMs: res.map((r) => r.ms),
        workerCpuNs: res.map((r) => r.cpuNs),
        workerStartMs: res.map((r) => r.startMs),
        workerEndMs: res.map((r) => r.endMs),
      };
    },
    close: () => pool.close(),
  };
}

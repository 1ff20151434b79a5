/**
 * Runs the physics step over the hours of one block on several worker threads. The arrays must
 * live on SharedArrayBuffers ({@link sharedFloat32}); each worker computes whole hours in place.
 */
import { Worker } from 'node:worker_threads';
import { availableParallelism } from 'node:os';
import type { PhysicsArrays, PhysicsOptions, PhysicsCounts } from './block.ts';
import { addCounts, emptyCounts } from './kernel.ts';

/** A Float32Array of length n on a SharedArrayBuffer. */
export function sharedFloat32(n: number): Float32Array {
  return new Float32Array(new SharedArrayBuffer(n * 4));
}

/** A Uint8Array of length n on a SharedArrayBuffer. */
export function sharedUint8(n: number): Uint8Array {
  return new Uint8Array(new SharedArrayBuffer(n));
}

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
   * Computes hours [0, nT) split into `size` contiguous, disjoint ranges, one per worker, all at
   * once; resolves with merged counts and, per worker, wall ms, thread CPU ns, start and end
   * [epoch ms].
   */
  run(nT: number, opts?: PhysicsOptions): Promise<PoolRun>;
  close(): Promise<void>;
}

interface WorkerReply {
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
  const url = new URL('./physics-worker-boot.mjs', import.meta.url);
  const workers = Array.from({ length: size }, () => new Worker(url));
  await Promise.all(
    workers.map(
      (w) =>
        new Promise<void>((resolve, reject) => {
          w.once('error', reject);
          w.once('message', () => resolve());
          w.postMessage({ arrays });
        }),
    ),
  );
  return {
    size,
    async run(nT, opts = {}) {
      // Hours are dealt out in small interleaved blocks (worker k takes blocks k, k + size, …), so
      // each worker gets a like share of day and night hours, whose costs differ.
      const block = Math.max(1, Math.min(INTERLEAVE_HOURS, Math.ceil(nT / size)));
      const ranges: Array<Array<[number, number]>> = workers.map(() => []);
      for (let t0 = 0, b = 0; t0 < nT; t0 += block, b++) ranges[b % size].push([t0, Math.min(nT, t0 + block)]);
      const jobs = workers.map((w, k) => {
        return new Promise<WorkerReply>((resolve, reject) => {
          w.once('error', reject);
          w.once('message', (m: WorkerReply) => resolve(m));
          w.postMessage({ ranges: ranges[k], opts, id: k });
        });
      });
      const res = await Promise.all(jobs);
      const counts = { ...emptyCounts(), timeOutOfRange: 0 } as PhysicsCounts;
      for (const r of res) {
        addCounts(counts, r.counts);
        counts.timeOutOfRange += r.counts.timeOutOfRange;
      }
      return {
        counts, workerMs: res.map((r) => r.ms), workerCpuNs: res.map((r) => r.cpuNs),
        workerStartMs: res.map((r) => r.startMs), workerEndMs: res.map((r) => r.endMs),
      };
    },
    async close() {
      await Promise.all(workers.map((w) => w.terminate()));
    },
  };
}

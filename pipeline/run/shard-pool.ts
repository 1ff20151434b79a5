/**
 * The build's worker pool: runs compute tasks (pipeline/run/compute-task.ts) and merge tasks
 * (pipeline/run/merge-tile.ts) on `jobs` worker threads (default all cores) and hands each report
 * to the caller as it arrives. Results do not depend on the number of workers: each task is
 * computed whole by one worker, partials are integer counts, and merge tiles write disjoint files.
 */
import { startTsWorker } from '../model/ts-worker.ts';
import { HeathoursError } from '../model/errors.ts';
import type { KernelCounts } from '../physics/index.ts';
import type { ComputeTask } from './compute-task.ts';
import type { WorkerInit } from './shard-worker.ts';
import type { PartialMeta } from '../formats/partial-file.ts';
import type { MergeTileInput, MergeTileSummary } from './merge-tile.ts';

/** Where a compute task writes each shard's partial file. */
export type ShardStores = Record<string, { path: string; meta: Omit<PartialMeta, 'report'> }>;

/** A task for the pool. */
export type PoolTask = { kind: 'compute'; task: ComputeTask; stores: ShardStores } | { kind: 'merge'; tile: MergeTileInput };

/** What a worker reports per shard of a compute task. */
export interface ShardReport {
  physics: KernelCounts;
  cellHours: number;
  /** Wall-clock milliseconds reading (its share of the group's reads), in physics, in the reduction [ms]. */
  timing: { read: number; physics: number; reduce: number };
  /** Size of the partial file written [B] and the time encoding and writing it [ms]. */
  storedBytes: number;
  storeMs: number;
}

export interface PoolHandlers {
  /** A shard of a compute task is computed and its partial file written. */
  onShard?: (shardId: string, report: ShardReport) => void;
  /** A task is done (a merge task's summary with it). */
  onTask?: (taskId: string, summary: MergeTileSummary | undefined) => void;
}

interface WorkerError {
  catalogued: boolean;
  code?: string;
  title?: string;
  message: string;
  hint?: string;
  where?: Record<string, unknown>;
}

function toError(e: WorkerError, taskId?: string): Error {
  if (e.catalogued) return new HeathoursError(e.code!, e.title!, e.message, e.hint!, e.where ?? {});
  return new Error(`task ${taskId ?? '(start-up)'} failed in a worker: ${e.message}`);
}

const taskId = (t: PoolTask) => (t.kind === 'compute' ? t.task.id : t.tile.id);

/**
 * Runs `tasks` in order of the list on up to `jobs` workers. A handler's exception, a worker's
 * error or `signal` stops the pool (no new tasks; the workers are terminated) and is thrown.
 */
export async function runTasks(tasks: readonly PoolTask[], init: WorkerInit, jobs: number, handlers: PoolHandlers, signal?: AbortSignal): Promise<void> {
  if (tasks.length === 0) return;
  const size = Math.max(1, Math.min(jobs, tasks.length));
  const url = new URL('./shard-worker.ts', import.meta.url);
  const workers = Array.from({ length: size }, () => startTsWorker(url));
  const queue = [...tasks];
  let failure: unknown;
  try {
    await Promise.all(
      workers.map(
        (w) =>
          new Promise<void>((resolve, reject) => {
            // Up to two tasks in flight per worker while the queue is long: the worker starts its
            // next task at once, even while the main thread is busy. Near the end one at a time,
            // so no worker sits on a task another could take.
            let inFlight = 0;
            const next = () => {
              const depth = queue.length > workers.length ? 2 : 1;
              while (inFlight < depth && queue.length > 0) {
                inFlight += 1;
                w.postMessage({ task: queue.shift()! });
              }
              if (inFlight === 0) resolve();
            };
            const fail = (e: unknown) => {
              failure ??= e;
              queue.length = 0;
              reject(e);
            };
            w.on('error', fail);
            // The caller gave up (its own work failed): no more tasks, the workers are stopped.
            signal?.addEventListener('abort', () => fail(signal.reason));
            w.on('exit', (code) => {
              if (code !== 0) fail(new Error(`a build worker exited with code ${code}`));
            });
            w.on('message', (m: { ready?: boolean; error?: WorkerError; taskId?: string; shardId?: string; shard?: ShardReport; done?: boolean; summary?: MergeTileSummary }) => {
              if (m.error) return fail(toError(m.error, m.taskId));
              if (m.ready || failure !== undefined || signal?.aborted) return;
              try {
                if (m.shard && m.shardId) handlers.onShard?.(m.shardId, m.shard);
                if (m.done) {
                  inFlight -= 1;
                  // The worker gets its next task first: the main thread's work on this report
                  // then overlaps the worker's computing.
                  next();
                  handlers.onTask?.(m.taskId!, m.summary);
                }
              } catch (e) {
                fail(e);
              }
            });
            w.postMessage({ init });
            next();
          }),
      ),
    );
    if (failure !== undefined) throw failure;
  } finally {
    await Promise.all(workers.map((w) => w.terminate()));
  }
}

export { taskId };

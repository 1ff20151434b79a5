/**
 * Runs shards on worker threads (the pool of pipeline/infra/worker-pool.ts running
 * ./shard-worker.ts), one shard per task, `jobs` workers (default all cores), and hands each
 * result to `onResult` as it arrives. Results do not depend on the number of workers: each shard
 * is computed whole by one worker and partials are integer counts.
 */
import { runInWorkers } from '../infra/worker-pool.ts';
import type { ShardSpec } from './plan.ts';
import type { ShardResult } from './compute-shard.ts';
import type { WorkerInit } from './shard-worker.ts';
import type { PartialMeta } from '../reduce/partial-codec.ts';

/** One shard to compute, and where to write its partial file (optional). */
export interface ShardTask {
  shard: ShardSpec;
  store?: { path: string; meta: Omit<PartialMeta, 'report'> };
}

/** What the pool hands over per shard: the result (without its partial when not returned). */
export interface ShardOutcome {
  result: Omit<ShardResult, 'partial'> & { partial?: ShardResult['partial'] };
  /** Wall time of the task in the worker [ms]; of which encoding and writing the partial [ms]. */
  ms: number;
  storeMs: number;
  /** Size of the partial file written [B]; 0 without a store. */
  storedBytes: number;
}

export async function runShards(
  tasks: readonly ShardTask[],
  init: WorkerInit,
  jobs: number,
  onResult: (shard: ShardSpec, outcome: ShardOutcome) => void,
  signal?: AbortSignal,
): Promise<void> {
  await runInWorkers<ShardTask, ShardOutcome>('shard', tasks, {
    size: jobs,
    // The first shards go with the set-up: the worker starts on them as soon as it has opened
    // the dataset, whatever the main thread is doing then.
    init,
    describe: (t) => `shard ${t.shard.id}`,
    // Up to two shards in flight per worker while the queue is long: the worker starts its next
    // shard at once, even while the main thread is busy merging a year. Near the end one at a
    // time, so no worker sits on a shard another could take.
    depth: (queued, workers) => (queued > workers ? 2 : 1),
    onResult: (t, outcome) => onResult(t.shard, outcome),
    // The caller gave up (its own work failed): no more shards, the workers are stopped.
    signal,
  });
}

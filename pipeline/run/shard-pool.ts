/**
 * The build's tasks on worker threads (the pool of pipeline/infra/worker-pool.ts running
 * ./shard-worker.ts): compute tasks (pipeline/run/compute-task.ts) and merge bands
 * (pipeline/run/merge-tile.ts), `jobs` workers (default all cores), each report handed to the
 * caller as it arrives. Results do not depend on the number of workers: each task is computed
 * whole by one worker, partials are integer counts, and merge bands write disjoint files.
 */
import { startWorkerPool, type RunOptions, type WorkerPool } from '../infra/worker-pool.ts';
import type { ChangeCounts, KernelCounts } from '../physics/index.ts';
import type { OpenDatasetOptions, SummaryPart } from '../read/index.ts';
import type { ComputeTask, ShardContext } from './compute-task.ts';
import type { PartialMeta } from '../formats/partial-file.ts';
import type { MergeTileInput, MergeTileSummary, RegionPartsRef } from './merge-tile.ts';

/** What every worker is started with: the input files, how to open them, the shard context. */
export interface WorkerInit {
  files: string[];
  datasetOptions: OpenDatasetOptions;
  context: ShardContext;
}

/** Where a compute task writes each shard's partial file. */
export type ShardStores = Record<string, { path: string; meta: Omit<PartialMeta, 'report'> }>;

/** A task for the pool. */
export type PoolTask =
  | { kind: 'compute'; task: ComputeTask; stores: ShardStores }
  | { kind: 'merge'; tile: MergeTileInput }
  /** A slice of a band's regions merged apart (`tile.regionsOnly`; ./merge-stage.ts). */
  | { kind: 'merge-regions'; tile: MergeTileInput }
  /** One chunk of the inventory's summary of the inputs (hours [c0, c1) of the whole grid; pipeline/read/dataset.ts). */
  | { kind: 'summary'; hours: [number, number]; key: string };

/** What a worker reports per shard of a compute task. */
export interface ShardReport {
  shardId: string;
  physics: KernelCounts;
  /** Relative-humidity clamps made by a scenario's changes [cell-hours]. */
  change: ChangeCounts;
  cellHours: number;
  /** Wall-clock milliseconds reading (its share of the group's reads), in physics, in the reduction [ms]. */
  timing: { read: number; physics: number; reduce: number };
  /** Size of the partial file written [B] and the time encoding and writing it [ms]. */
  storedBytes: number;
  storeMs: number;
}

/** What a worker answers per task: the shards' reports of a compute task, a merge band's summary. */
export type PoolResult =
  | { kind: 'compute'; shards: ShardReport[] }
  | { kind: 'merge'; summary: MergeTileSummary }
  | { kind: 'merge-regions'; parts: RegionPartsRef }
  | { kind: 'summary'; key: string; part: SummaryPart };

export interface PoolHandlers {
  /** A shard of a compute task is computed and its partial written (reported as the task ends). */
  onShard?: (shardId: string, report: ShardReport) => void;
  /** One more shard done, while its task still runs (for progress). */
  onShardProgress?: () => void;
  /** A task is done (a merge band's summary with it). */
  onTask?: (taskId: string, summary: MergeTileSummary | undefined) => void;
  /** A slice of a band's regions is merged: its region parts. */
  onRegionParts?: (taskId: string, parts: RegionPartsRef) => void;
  /** A chunk of the inputs' summary is done. */
  onSummaryPart?: (key: string, part: SummaryPart) => void;
}

export const taskId = (t: PoolTask): string =>
  t.kind === 'compute' ? t.task.id : t.kind === 'merge' || t.kind === 'merge-regions' ? t.tile.id : `summary-${t.hours[0]}-${t.hours[1]}`;

/** A pool the caller keeps across runs (the compute stage's, started before the plan is made). */
export interface ShardPool {
  readonly size: number;
  /** @internal the worker pool itself */
  readonly pool: WorkerPool<PoolTask, PoolResult>;
  close(): Promise<void>;
}

/**
 * Starts the build's `jobs` workers now; `init` (what every worker is started with) may be a
 * promise, so the workers load their code while the plan is still being made (hashing the
 * inputs, the land cells, the shards). A rejected `init` stops the pool with its reason.
 */
export function startShardPool(jobs: number, init: WorkerInit | Promise<WorkerInit>): ShardPool {
  const pool = startWorkerPool<PoolTask, PoolResult>('shard', { size: jobs, init, describe });
  return { size: pool.size, pool, close: () => pool.close() };
}

function describe(t: PoolTask): string {
  const what = { compute: 'compute task', merge: 'merge band', 'merge-regions': "merge of a slice of a band's regions", summary: 'summary of the inputs' }[
    t.kind
  ];
  return `${what} ${taskId(t)}`;
}

/**
 * Runs `tasks` in order of the list on up to `jobs` workers: on `workers`, a pool the build keeps
 * (left running), or on a pool started with that set-up for this run and stopped after it. A
 * handler's exception, a worker's error or `signal` stops the run (no new tasks; a pool started
 * here is terminated, a kept one takes no further run) and is thrown.
 */
export async function runTasks(
  tasks: readonly PoolTask[],
  workers: WorkerInit | ShardPool,
  jobs: number,
  handlers: PoolHandlers,
  signal?: AbortSignal,
): Promise<void> {
  if (tasks.length === 0) return;
  const opts: RunOptions<PoolTask, PoolResult> = {
    // Up to two tasks in flight per worker while the queue is long: the worker starts its next
    // task at once, even while the main thread is busy. Near the end one at a time, so no worker
    // sits on a task another could take.
    depth: (queued, n) => (queued > n ? 2 : 1),
    onProgress: () => handlers.onShardProgress?.(),
    onResult: (t, r) => {
      if (r.kind === 'compute') for (const s of r.shards) handlers.onShard?.(s.shardId, s);
      if (r.kind === 'summary') handlers.onSummaryPart?.(r.key, r.part);
      if (r.kind === 'merge-regions') handlers.onRegionParts?.(taskId(t), r.parts);
      handlers.onTask?.(taskId(t), r.kind === 'merge' ? r.summary : undefined);
    },
    // The caller gave up (its own work failed): no more tasks, the workers are stopped.
    signal,
  };
  if ('pool' in workers) return workers.pool.run(tasks, opts);
  const pool = startWorkerPool<PoolTask, PoolResult>('shard', { size: Math.min(jobs, tasks.length), init: workers, describe });
  try {
    await pool.run(tasks, opts);
  } finally {
    await pool.close();
  }
}

/**
 * Runs shards on worker threads, one shard per task, `jobs` workers (default all cores), and
 * hands each result to `onResult` as it arrives. Results do not depend on the number of workers:
 * each shard is computed whole by one worker and partials are integer counts.
 */
import { startTsWorker } from '../model/ts-worker.ts';
import { HeathoursError } from '../model/errors.ts';
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

interface WorkerError {
  catalogued: boolean;
  code?: string;
  title?: string;
  message: string;
  hint?: string;
  where?: Record<string, unknown>;
  details?: string;
}

function toError(e: WorkerError, shardId?: string): Error {
  if (e.catalogued) return new HeathoursError(e.code!, e.title!, e.message, e.hint!, e.where ?? {}, e.details);
  return new Error(`shard ${shardId ?? '(start-up)'} failed in a worker: ${e.message}`);
}

export async function runShards(
  tasks: readonly ShardTask[],
  init: WorkerInit,
  jobs: number,
  onResult: (shard: ShardSpec, outcome: ShardOutcome) => void,
  signal?: AbortSignal,
): Promise<void> {
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
            // Up to two shards in flight per worker while the queue is long: the worker starts
            // its next shard at once, even while the main thread is busy merging a year. Near
            // the end one at a time, so no worker sits on a shard another could take.
            let inFlight = 0;
            const next = () => {
              const depth = queue.length > workers.length ? 2 : 1;
              while (inFlight < depth && queue.length > 0) {
                inFlight += 1;
                w.postMessage({ task: queue.shift()! });
              }
              if (inFlight === 0) resolve();
            };
            w.on('error', reject);
            // The caller gave up (its own work failed): no more shards, the workers are stopped.
            signal?.addEventListener('abort', () => {
              queue.length = 0;
              reject(signal.reason);
            });
            w.on('exit', (code) => {
              if (code !== 0) reject(new Error(`a shard worker exited with code ${code}`));
            });
            w.on('message', (m: { ready?: boolean; error?: WorkerError; shardId?: string; result?: ShardOutcome['result']; ms?: number; storeMs?: number; storedBytes?: number }) => {
              if (m.error) return reject(toError(m.error, m.shardId));
              if (m.ready) return;
              if (m.result) {
                if (signal?.aborted) return;
                inFlight -= 1;
                const shard = tasks.find((t) => t.shard.id === m.shardId)!.shard;
                // The worker gets its next shard first: the main thread's work on this result
                // (merging a finished year) then overlaps the worker's computing.
                next();
                try {
                  onResult(shard, { result: m.result, ms: m.ms ?? 0, storeMs: m.storeMs ?? 0, storedBytes: m.storedBytes ?? 0 });
                } catch (e) {
                  // This worker's promise may have resolved already (no shard left): keep the error.
                  failure ??= e;
                  return reject(e);
                }
              }
            });
            // The first shards go with the set-up: the worker starts on them as soon as it has
            // opened the dataset, whatever the main thread is doing then.
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

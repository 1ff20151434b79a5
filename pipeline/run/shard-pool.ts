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

interface WorkerError {
  catalogued: boolean;
  code?: string;
  title?: string;
  message: string;
  hint?: string;
  where?: Record<string, unknown>;
}

function toError(e: WorkerError, shardId?: string): Error {
  if (e.catalogued) return new HeathoursError(e.code!, e.title!, e.message, e.hint!, e.where ?? {});
  return new Error(`shard ${shardId ?? '(start-up)'} failed in a worker: ${e.message}`);
}

export async function runShards(
  shards: readonly ShardSpec[],
  init: WorkerInit,
  jobs: number,
  onResult: (shard: ShardSpec, result: ShardResult, ms: number) => void,
): Promise<void> {
  if (shards.length === 0) return;
  const size = Math.max(1, Math.min(jobs, shards.length));
  const url = new URL('./shard-worker.ts', import.meta.url);
  const workers = Array.from({ length: size }, () => startTsWorker(url));
  const queue = [...shards];
  try {
    await Promise.all(
      workers.map(
        (w) =>
          new Promise<void>((resolve, reject) => {
            const next = () => {
              const shard = queue.shift();
              if (!shard) return resolve();
              w.postMessage({ shard });
            };
            w.on('error', reject);
            w.on('exit', (code) => {
              if (code !== 0) reject(new Error(`a shard worker exited with code ${code}`));
            });
            w.on('message', (m: { ready?: boolean; error?: WorkerError; shardId?: string; result?: ShardResult; ms?: number }) => {
              if (m.error) return reject(toError(m.error, m.shardId));
              if (m.ready) return next();
              if (m.result) {
                const shard = shards.find((s) => s.id === m.shardId)!;
                onResult(shard, m.result, m.ms ?? 0);
                next();
              }
            });
            w.postMessage({ init });
          }),
      ),
    );
  } finally {
    await Promise.all(workers.map((w) => w.terminate()));
  }
}

/**
 * Worker side of the shard pool: opens the dataset once, then computes the shards it is sent
 * and posts each partial back (its arrays transferred, not copied). Started by shard-pool.ts with
 * startTsWorker (pipeline/model/ts-worker.ts), since the sources are TypeScript.
 */
import { parentPort } from 'node:worker_threads';
import { openDataset, type Dataset, type OpenDatasetOptions } from '../read/index.ts';
import { computeShard, type ShardContext } from './compute-shard.ts';
import type { ShardSpec } from './plan.ts';
import { partialBuffers } from './partial-transfer.ts';
import { HeathoursError } from '../model/errors.ts';

export interface WorkerInit {
  files: string[];
  datasetOptions: OpenDatasetOptions;
  context: ShardContext;
}

let ds: Dataset | undefined;
let ctx: ShardContext | undefined;

parentPort!.on('message', async (m: { init?: WorkerInit; shard?: ShardSpec; close?: boolean }) => {
  try {
    if (m.init) {
      ds = await openDataset(m.init.files, { ...m.init.datasetOptions });
      ctx = m.init.context;
      parentPort!.postMessage({ ready: true });
    } else if (m.shard) {
      const t = performance.now();
      const r = await computeShard(ds!, m.shard, ctx!);
      parentPort!.postMessage({ shardId: m.shard.id, result: r, ms: performance.now() - t }, partialBuffers(r.partial));
    } else if (m.close) {
      await ds?.close();
      parentPort!.postMessage({ closed: true });
    }
  } catch (e) {
    const err = e instanceof HeathoursError
      ? { catalogued: true, code: e.code, title: e.title, message: e.message, hint: e.hint, where: e.where }
      : { catalogued: false, message: (e as Error)?.stack ?? String(e) };
    parentPort!.postMessage({ error: err, shardId: m.shard?.id });
  }
});

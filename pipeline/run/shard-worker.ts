/**
 * Worker side of the shard pool: opens the dataset once, then computes the shards it is sent.
 * A task with a `storePath` also writes its partial file there (pipeline/run/partial-store.ts;
 * encoding runs here, in parallel); the partial is posted back (its arrays transferred, not
 * copied) unless the pool was started with `returnPartials: false`. Started by shard-pool.ts with
 * startTsWorker (pipeline/model/ts-worker.ts), since the sources are TypeScript.
 */
import { parentPort } from 'node:worker_threads';
import { openDataset, type Dataset, type OpenDatasetOptions } from '../read/index.ts';
import { computeShard, type ShardContext } from './compute-shard.ts';
import type { ShardTask } from './shard-pool.ts';
import { partialBuffers } from './partial-transfer.ts';
import { writePartialFile } from './partial-store.ts';
import { HeathoursError } from '../model/errors.ts';

export interface WorkerInit {
  files: string[];
  datasetOptions: OpenDatasetOptions;
  context: ShardContext;
  /** Post each partial back to the main thread (false when it is only written to a store). */
  returnPartials?: boolean;
}

let ds: Dataset | undefined;
let init: WorkerInit | undefined;

// Messages are handled one after another (the pool may send the next shard before this one is
// done; computeShard awaits reads, and two shards must not share the block buffers at once).
let chain: Promise<void> = Promise.resolve();
parentPort!.on('message', (m: { init?: WorkerInit; task?: ShardTask; close?: boolean }) => {
  chain = chain.then(() => handle(m));
});

async function handle(m: { init?: WorkerInit; task?: ShardTask; close?: boolean }): Promise<void> {
  try {
    if (m.init) {
      ds = await openDataset(m.init.files, { ...m.init.datasetOptions });
      init = m.init;
      parentPort!.postMessage({ ready: true });
    } else if (m.task) {
      const { shard, store } = m.task;
      const t = performance.now();
      const r = await computeShard(ds!, shard, init!.context);
      let storedBytes = 0;
      const te = performance.now();
      if (store) {
        const physics = { ...r.physics } as unknown as Record<string, number>;
        storedBytes = writePartialFile(store.path, r.partial, { ...store.meta, report: { cellHours: r.cellHours, physics } });
      }
      const storeMs = performance.now() - te;
      const keep = init!.returnPartials !== false;
      const result = keep ? r : { ...r, partial: undefined };
      parentPort!.postMessage({ shardId: shard.id, result, ms: performance.now() - t, storedBytes, storeMs }, keep ? partialBuffers(r.partial) : []);
    } else if (m.close) {
      await ds?.close();
      parentPort!.postMessage({ closed: true });
    }
  } catch (e) {
    const err = e instanceof HeathoursError
      ? { catalogued: true, code: e.code, title: e.title, message: e.message, hint: e.hint, where: e.where, details: e.details }
      : { catalogued: false, message: (e as Error)?.stack ?? String(e) };
    parentPort!.postMessage({ error: err, shardId: m.task?.shard.id });
  }
}

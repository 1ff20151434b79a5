/**
 * Worker side of the build's pool: opens the dataset once, then runs the tasks it is sent —
 * compute tasks (a piece of a year over a group of tiles, pipeline/run/compute-task.ts), each
 * shard's partial written to its file here (encoding runs in parallel), and merge tasks (one
 * merge tile, pipeline/run/merge-tile.ts). Only small reports travel back to the main thread.
 * Started by shard-pool.ts with startTsWorker (pipeline/model/ts-worker.ts), since the sources
 * are TypeScript.
 */
import { parentPort } from 'node:worker_threads';
import { openDataset, type Dataset, type OpenDatasetOptions } from '../read/index.ts';
import { computeTask, type ShardContext } from './compute-task.ts';
import type { PoolTask } from './shard-pool.ts';
import { writePartialFile } from './partial-store.ts';
import { HeathoursError } from '../model/errors.ts';
import { runMergeTile } from './merge-tile.ts';
import { DiskFull } from './errors.ts';

export interface WorkerInit {
  files: string[];
  datasetOptions: OpenDatasetOptions;
  context: ShardContext;
}

let ds: Dataset | undefined;
let init: WorkerInit | undefined;

// Messages are handled one after another (the pool may send the next task before this one is
// done; computeTask awaits reads, and two tasks must not share the block buffers at once).
let chain: Promise<void> = Promise.resolve();
parentPort!.on('message', (m: { init?: WorkerInit; task?: PoolTask; close?: boolean }) => {
  chain = chain.then(() => handle(m));
});

async function handle(m: { init?: WorkerInit; task?: PoolTask; close?: boolean }): Promise<void> {
  try {
    if (m.init) {
      init = m.init;
      parentPort!.postMessage({ ready: true });
    } else if (m.task?.kind === 'compute') {
      ds ??= await openDataset(init!.files, { ...init!.datasetOptions });
      const { task, stores } = m.task;
      const t = performance.now();
      await computeTask(ds, task, init!.context, (shard, r) => {
        const store = stores[shard.id];
        const te = performance.now();
        const physics = { ...r.physics } as unknown as Record<string, number>;
        const storedBytes = writePartialFile(store.path, r.partial, { ...store.meta, report: { cellHours: r.cellHours, physics } });
        const storeMs = performance.now() - te;
        parentPort!.postMessage({ taskId: task.id, shardId: shard.id, shard: { physics: r.physics, cellHours: r.cellHours, timing: r.timing, storedBytes, storeMs } });
      });
      parentPort!.postMessage({ taskId: task.id, done: true, ms: performance.now() - t });
    } else if (m.task?.kind === 'merge') {
      const t = performance.now();
      const summary = await runMergeTile(m.task.tile);
      parentPort!.postMessage({ taskId: m.task.tile.id, done: true, summary, ms: performance.now() - t });
    } else if (m.close) {
      await ds?.close();
      parentPort!.postMessage({ closed: true });
    }
  } catch (e0) {
    const code = (e0 as NodeJS.ErrnoException)?.code;
    const e = code === 'ENOSPC' || code === 'EDQUOT'
      ? DiskFull({ path: (e0 as NodeJS.ErrnoException).path ?? '(a file of the build)', what: m.task?.kind === 'compute' ? 'writing partials' : 'writing a band of the atlas' }, { file: (e0 as NodeJS.ErrnoException).path })
      : e0;
    const err = e instanceof HeathoursError
      ? { catalogued: true, code: e.code, title: e.title, message: e.message, hint: e.hint, where: e.where }
      : { catalogued: false, message: (e as Error)?.stack ?? String(e) };
    parentPort!.postMessage({ error: err, taskId: m.task?.kind === 'compute' ? m.task.task.id : m.task?.kind === 'merge' ? m.task.tile.id : undefined });
  }
}

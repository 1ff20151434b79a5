/**
 * Worker side of the build's pool (./shard-pool.ts, started through pipeline/infra/worker-pool.ts
 * as the entry `shard`): opens the dataset once, then runs the tasks it is sent — compute tasks
 * (a piece of a year over a group of tiles, ./compute-task.ts), each shard's partial written to
 * its file here (encoding runs in parallel), merge bands (./merge-tile.ts) and chunks of the
 * inputs' summary for the inventory. The compute stage's pool is started before the plan is made
 * (pipeline/run/build-atlas.ts). Only small reports travel back to the main thread. A full disk becomes the catalogued DiskFull.
 */
import { openDataset, type Dataset } from '../read/index.ts';
import { computeTask } from './compute-task.ts';
import type { PoolResult, PoolTask, ShardReport, WorkerInit } from './shard-pool.ts';
import { writePartialFile } from './partial-store.ts';
import { runMergeRegions, runMergeTile } from './merge-tile.ts';
import { serveTasks } from '../infra/worker-side.ts';
import { DiskFull } from './errors.ts';

let ds: Dataset | undefined;
let init: WorkerInit | undefined;

serveTasks<WorkerInit, PoolTask, PoolResult>({
  init(data) {
    init = data;
  },
  async run(t, progress) {
    try {
      if (t.kind === 'merge') return { kind: 'merge', summary: await runMergeTile(t.tile) };
      if (t.kind === 'merge-regions') return { kind: 'merge-regions', parts: await runMergeRegions(t.tile) };
      ds ??= await openDataset(init!.files, { ...init!.datasetOptions });
      if (t.kind === 'summary') return { kind: 'summary', key: t.key, part: await ds.summariseChunk(t.hours[0], t.hours[1]) };
      const shards: ShardReport[] = [];
      await computeTask(
        ds,
        t.task,
        init!.context,
        (shard, r) => {
          const store = t.stores[shard.id];
          const te = performance.now();
          const physics = { ...r.physics } as unknown as Record<string, number>;
          const change = { ...r.change } as unknown as Record<string, number>;
          const storedBytes = writePartialFile(store.path, r.partial, {
            ...store.meta,
            report: { cellHours: r.cellHours, physics, ...(shard.scenario !== undefined ? { change } : {}) },
          });
          shards.push({
            shardId: shard.id,
            physics: r.physics,
            change: r.change,
            cellHours: r.cellHours,
            timing: r.timing,
            storedBytes,
            storeMs: performance.now() - te,
          });
          progress(1);
          // The partial is encoded and written: nothing of it is kept, so its arrays may be reused.
        },
        true,
      );
      return { kind: 'compute', shards };
    } catch (e) {
      const code = (e as NodeJS.ErrnoException)?.code;
      if (code !== 'ENOSPC' && code !== 'EDQUOT') throw e;
      const path = (e as NodeJS.ErrnoException).path;
      throw DiskFull(
        { path: path ?? '(a file of the build)', what: t.kind === 'compute' ? 'writing partials' : 'writing a band of the atlas' },
        { file: path },
      );
    }
  },
});

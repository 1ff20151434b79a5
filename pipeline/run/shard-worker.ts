/**
 * Worker side of the shard pool (./shard-pool.ts, started through pipeline/infra/worker-pool.ts
 * as the entry `shard`): opens the dataset once, then computes the shards it is sent. A task with
 * a `store` also writes its partial file there (pipeline/run/partial-store.ts; encoding runs
 * here, in parallel); the partial is posted back (its arrays transferred, not copied) unless the
 * pool was started with `returnPartials: false`.
 */
import { openDataset, type Dataset, type OpenDatasetOptions } from '../read/index.ts';
import { computeShard, type ShardContext } from './compute-shard.ts';
import type { ShardOutcome, ShardTask } from './shard-pool.ts';
import { partialBuffers } from './partial-transfer.ts';
import { writePartialFile } from './partial-store.ts';
import { serveTasks } from '../infra/worker-side.ts';

export interface WorkerInit {
  files: string[];
  datasetOptions: OpenDatasetOptions;
  context: ShardContext;
  /** Post each partial back to the main thread (false when it is only written to a store). */
  returnPartials?: boolean;
}

let ds: Dataset | undefined;
let init: WorkerInit | undefined;

serveTasks<WorkerInit, ShardTask, ShardOutcome>({
  async init(data) {
    ds = await openDataset(data.files, { ...data.datasetOptions });
    init = data;
  },
  async run({ shard, store }) {
    const t = performance.now();
    const r = await computeShard(ds!, shard, init!.context);
    let storedBytes = 0;
    const te = performance.now();
    if (store) {
      const physics = { ...r.physics } as unknown as Record<string, number>;
      storedBytes = writePartialFile(store.path, r.partial, { ...store.meta, report: { cellHours: r.cellHours, physics } });
    }
    const storeMs = performance.now() - te;
    const result = init!.returnPartials !== false ? r : { ...r, partial: undefined };
    return { result, ms: performance.now() - t, storedBytes, storeMs };
  },
  transfer: (o) => (o.result.partial ? partialBuffers(o.result.partial) : []),
});

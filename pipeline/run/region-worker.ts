/**
 * Worker side of the region stage's pool (./region-stage.ts, started through
 * pipeline/infra/worker-pool.ts as the entry `region`): takes the weather's shared
 * {@link RegionContext} once, then writes one region per task (./region-write.ts), answering
 * with the region's index. Holds one region at a time.
 */
import { serveTasks } from '../infra/worker-side.ts';
import { regionScratch, writeRegion, type RegionContext, type RegionScratch, type RegionTask } from './region-write.ts';

let ctx: RegionContext | undefined;
let scratch: RegionScratch | undefined;

serveTasks<RegionContext, RegionTask, number>({
  init(data) {
    ctx = data;
    scratch = regionScratch(data.years.length);
  },
  async run(task) {
    await writeRegion(ctx!, task, scratch!);
    return task.index;
  },
});

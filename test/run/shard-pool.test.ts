/**
 * The build's pool (pipeline/run/shard-pool.ts): compute tasks on two workers write every shard's
 * partial file once, reports arrive whatever the main thread does meanwhile, and a caller that
 * gives up stops the workers. Invented small demo data (pipeline/demo).
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { writeDemoDataset } from '../../pipeline/demo/index.ts';
import { openDataset } from '../../pipeline/read/index.ts';
import { landCellsOf } from '../../pipeline/model/grid.ts';
import { planShards, yearPieces, type ShardSpec } from '../../pipeline/run/plan.ts';
import { runTasks, type PoolTask } from '../../pipeline/run/shard-pool.ts';
import { readPartialFile } from '../../pipeline/run/partial-store.ts';
import type { WorkerInit } from '../../pipeline/run/shard-pool.ts';
import { parseWorkloadClasses, resolveWorkSettings, workSettingsSchema } from '../../pipeline/work/index.ts';
import { physicsSettingsSchema } from '../../pipeline/physics/settings.ts';
import { parse } from 'yaml';

const ROOT = new URL('../../', import.meta.url).pathname;
let init: WorkerInit;
let shards: ShardSpec[] = [];
let out = '';

/** One task per shard, each writing its partial under `out`. */
function tasks(): PoolTask[] {
  return shards.map((shard) => ({
    kind: 'compute',
    task: { id: shard.id, shards: [shard], blockHours: 744 },
    stores: {
      [shard.id]: { path: join(out, `${shard.id}.hhp`), meta: { shardId: shard.id, year: shard.year, tileIndex: shard.tileIndex, key: 'k', provenance: {} } },
    },
  }));
}

beforeAll(async () => {
  const dir = mkdtempSync(join(tmpdir(), 'hh-pool-'));
  out = join(dir, 'partials');
  const written = await writeDemoDataset({ outDir: join(dir, 'inputs'), years: [2022], layout: 'legacy', grid: 'small', quiet: true });
  // The NetCDF files only (demo-data also writes the invented people raster).
  const paths = written.files.filter((f) => f.endsWith('.nc'));
  const options = { product: 'era5' as const, landSeaMask: { variable: 'lsm', threshold: 0.5 } };
  const ds = await openDataset(paths, options);
  const classes = parseWorkloadClasses(parse(readFileSync(join(ROOT, 'content/workload-classes.yaml'), 'utf8')));
  const work = resolveWorkSettings(workSettingsSchema.parse(undefined), classes);
  const grid = ds.grid;
  shards = planShards(landCellsOf(ds.grid, ds.landMask), [2022], (y) => yearPieces(ds.time, y, 'Etc/GMT+10', 1), 1024, 1);
  await ds.close();
  init = {
    files: paths,
    datasetOptions: { ...options, digests: false },
    context: { evaluations: work.evaluations, timeZone: 'Etc/GMT+10', shift: work.shift, physics: physicsSettingsSchema.parse(undefined), grid, scenarios: [] },
  };
}, 120_000);

describe('the build pool', () => {
  it('computes every shard once with two workers, each shard reported and its partial file written', async () => {
    expect(shards.length).toBe(12);
    const got: string[] = [];
    const done: string[] = [];
    await runTasks(tasks(), init, 2, {
      onShard: (id, r) => {
        expect(r.storedBytes).toBeGreaterThan(0);
        got.push(id);
      },
      onTask: (id) => done.push(id),
    });
    expect([...got].sort()).toEqual(shards.map((s) => s.id).sort());
    expect([...done].sort()).toEqual(shards.map((s) => s.id).sort());
    for (const s of shards) {
      const { partial } = readPartialFile(join(out, `${s.id}.hhp`));
      expect(partial.cells).toEqual(s.cells);
      expect(partial.months).toEqual(s.months);
    }
  }, 120_000);

  it('stops when the caller aborts: the promise rejects with the reason and no report is handed over after it', async () => {
    const stop = new AbortController();
    let after = 0;
    const run = runTasks(
      tasks(),
      init,
      2,
      {
        onShard: () => {
          if (stop.signal.aborted) after += 1;
          else stop.abort(new Error('the caller gave up'));
        },
      },
      stop.signal,
    );
    await expect(run).rejects.toThrow('the caller gave up');
    expect(after).toBe(0);
  }, 120_000);
});

/**
 * The region stage on worker threads: an invented atlas of 24 regions over the small demo grid,
 * with a scenario and the demo's invented workforce raster, built with 1 and with 2 workers, and
 * with 2 workers and the merge's regions shared out in slices (pipeline/run/merge-stage.ts
 * regionSlices), gives the same bytes in every file under data/ (each region is made whole by one
 * thread, its parts written by one merge task); a failure
 * in a worker is the catalogued RegionWriteFailed naming the region, as in the main thread.
 * Outside check: none beyond the project's own one-thread output (the reference for the bytes).
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { mkdirSync, mkdtempSync, readdirSync, readFileSync, statSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, relative } from 'node:path';
import { writeDemoDataset } from '../../pipeline/demo/index.ts';
import { POPULATION_FILE } from '../../pipeline/demo/population.ts';
import { buildAtlas } from '../../pipeline/run/build-atlas.ts';
import { startWorkerPool } from '../../pipeline/infra/worker-pool.ts';
import { HeathoursError } from '../../pipeline/model/errors.ts';
import { regionScratch, writeRegion, type RegionContext, type RegionTask } from '../../pipeline/run/region-write.ts';
import { testAtlasYaml } from '../helpers/atlas-yaml.ts';

let dir = '';

/** Every file under `root`, relative path → bytes. */
function files(root: string): Map<string, Buffer> {
  const out = new Map<string, Buffer>();
  const walk = (d: string) => {
    for (const f of readdirSync(d)) {
      const p = join(d, f);
      if (statSync(p).isDirectory()) walk(p);
      else out.set(relative(root, p), readFileSync(p));
    }
  };
  walk(root);
  return out;
}

beforeAll(async () => {
  dir = mkdtempSync(join(tmpdir(), 'hh-regionpool-'));
  await writeDemoDataset({ outDir: join(dir, 'inputs'), years: [2022, 2023], layout: 'mixed', grid: 'small', quiet: true });
  // 24 invented rectangles, each holding the two land cells centred at 20 °N, 146 and 145 °W
  // (as test/run/workforce-build.test.ts uses) and reaching out by a different amount west and north.
  mkdirSync(join(dir, 'regions'));
  for (let i = 0; i < 24; i++) {
    const w = -146.5 - (i % 6) * 0.5;
    const n = 20.5 + Math.floor(i / 6) * 0.5;
    const ring = [
      [w, 19.5],
      [-144.5, 19.5],
      [-144.5, n],
      [w, n],
      [w, 19.5],
    ];
    const id = `box-${String(i).padStart(2, '0')}`;
    writeFileSync(
      join(dir, 'regions', `${id}.geojson`),
      JSON.stringify({ type: 'Feature', properties: { id, name: `Box ${i} (invented)` }, geometry: { type: 'Polygon', coordinates: [ring] } }),
    );
  }
  writeFileSync(join(dir, 'shares.csv'), 'region_id,workload_class,share,acclimatized_share,sun_share\n*,moderate,0.05,,0.8\nbox-03,high,0.1,0.9,\n');
  const scenarioFile = readdirSync(join(dir, 'inputs', 'scenarios')).find((f) => f.endsWith('.nc'))!;
  writeFileSync(
    join(dir, 'atlas.yaml'),
    `${testAtlasYaml({ id: 'pool', title: 'Region pool test atlas (invented data)', years: [2022, 2023], regions: join(dir, 'regions') })}workforce:
  raster: inputs/${POPULATION_FILE}
  shares: shares.csv
  name: Invented people of the test territory
  year: 2024
  licence: Invented for the test; no licence applies
  invented: true
scenarios:
  - id: what-if
    name: A what-if (invented change factors)
    description: Invented change factors made by heathours demo-data.
    changeFile: inputs/scenarios/${scenarioFile}
    humidity: relative
`,
  );
}, 120_000);

describe('the region stage on worker threads', () => {
  it('writes the same bytes in every file under data/ with 1 and with 2 workers (24 regions, a scenario, a workforce)', async () => {
    process.env.HEATHOURS_BUILD_TIME = '2026-01-01T00:00:00.000Z';
    try {
      const common = { configPath: join(dir, 'atlas.yaml'), quiet: true, dataOnly: true, cache: false as const };
      await buildAtlas({ ...common, outDir: join(dir, 'one'), jobs: 1 });
      await buildAtlas({ ...common, outDir: join(dir, 'two'), jobs: 2, regionPoolMin: 1 });
      // The merge shares the regions of each band (the record's and the scenario's) out in 2
      // slices: 4 tasks on 3 workers.
      const logged: string[] = [];
      const logger = { info: (m: string) => logged.push(m), warn: (m: string) => logged.push(m) };
      await buildAtlas({ ...common, logger, outDir: join(dir, 'sliced'), jobs: 3, regionSlicing: { minRegions: 5, overlap: 0 } });
      expect(
        logged.some((m) => /2 more merge task\(s\) share out the regions of 2 band\(s\) among 3 workers/.test(m)),
        logged.join('\n'),
      ).toBe(true);
    } finally {
      delete process.env.HEATHOURS_BUILD_TIME;
    }
    const a = files(join(dir, 'one', 'data'));
    const regionFiles = [...a.keys()].filter((k) => /(^|\/)regions\/box-\d\d\.csv$/.test(k));
    expect(regionFiles.length, 'the record and the scenario each have 24 region tables').toBe(48);
    for (const other of ['two', 'sliced']) {
      const b = files(join(dir, other, 'data'));
      expect([...b.keys()].sort()).toEqual([...a.keys()].sort());
      for (const [k, v] of a) expect(b.get(k)!.equals(v), `${other}: ${k} is the same bytes`).toBe(true);
    }
  }, 600_000);

  it('ends a failure in a worker in the catalogued RegionWriteFailed naming the region, as in the main thread', async () => {
    const ctx = {
      dataDir: join(dir, 'no-such-folder'),
      years: [2022, 2023],
      latestYear: 2023,
      baseline: [2022, 2023],
      defs: [],
      nEval: 0,
      sheetInfo: {},
      regionWorkbooks: false,
    } as unknown as RegionContext;
    const task: RegionTask = {
      index: 0,
      region: { id: 'lost-region', name: 'Lost' },
      weights: { cells: new Uint32Array(0), coveredFraction: 0, regionArea: 0 },
      refs: [],
    };
    let inThread: unknown;
    try {
      await writeRegion(ctx, task, regionScratch(2));
    } catch (e) {
      inThread = e;
    }
    expect(inThread).toBeInstanceOf(HeathoursError);
    const pool = startWorkerPool<RegionTask, number>('region', { size: 1, init: ctx, describe: (t) => `region ${t.region.id}` });
    let inWorker: unknown;
    try {
      await pool.run([task]);
    } catch (e) {
      inWorker = e;
    } finally {
      await pool.close();
    }
    expect(inWorker).toBeInstanceOf(HeathoursError);
    const [t, w] = [inThread as HeathoursError, inWorker as HeathoursError];
    expect(w.code).toBe('RegionWriteFailed');
    expect(w.code).toBe(t.code);
    expect(w.message).toBe(t.message);
    expect(w.message).toContain('lost-region');
    expect(w.hint.length).toBeGreaterThan(10);
  }, 60_000);
});

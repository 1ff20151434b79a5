/**
 * The one worker pool (pipeline/infra/worker-pool.ts) through its three users: the physics pool
 * gives the same WBGT as one thread, the demo's year writers report progress and, after a
 * failure, let the years being written finish and start no other, and a catalogued error keeps
 * its code and hint across the thread boundary. Inputs are invented (pipeline/demo, seeded
 * synthetic weather).
 */
import { describe, expect, it } from 'vitest';
import { existsSync, mkdtempSync, readdirSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { allocatePhysicsArrays, computeHours, type PhysicsArrays } from '../../pipeline/physics/block.ts';
import { startPhysicsPool } from '../../pipeline/run/physics-pool.ts';
import { sharedFloat32, sharedUint8 } from '../../pipeline/infra/shared-memory.ts';
import { runInWorkers } from '../../pipeline/infra/worker-pool.ts';
import { HeathoursError } from '../../pipeline/model/errors.ts';
import { SMALL_GRID } from '../../pipeline/demo/index.ts';
import type { YearJob } from '../../pipeline/demo/year-job.ts';
import { runTasks, startShardPool } from '../../pipeline/run/shard-pool.ts';
import type { WorkerInit } from '../../pipeline/run/shard-pool.ts';
import type { ShardSpec } from '../../pipeline/run/plan.ts';

/** A small seeded block of weather on shared arrays: 30 hours × 6 × 7 cells, July 2021, 0–40 °C. */
function arrays(): PhysicsArrays {
  const nT = 30,
    nY = 6,
    nX = 7,
    n = nT * nY * nX;
  let s = 12345;
  const rnd = () => (s = (s * 1103515245 + 12345) & 0x7fffffff) / 0x7fffffff;
  const a = allocatePhysicsArrays(
    Float64Array.from({ length: nT }, (_, t) => Date.UTC(2021, 6, 15, t)),
    Float64Array.from({ length: nY }, (_, i) => 5 + 4 * i),
    Float64Array.from({ length: nX }, (_, i) => 20 + 6 * i),
    sharedFloat32,
    sharedUint8,
  );
  for (let i = 0; i < n; i++) {
    a.airTemperature[i] = 40 * rnd();
    a.dewPointTemperature[i] = a.airTemperature[i] - 1 - 20 * rnd();
    a.surfacePressure[i] = 900 + 120 * rnd();
    a.windSpeed[i] = 0.2 + 8 * rnd();
    a.solarGlobal[i] = Math.floor(i / (nY * nX)) % 24 > 12 ? 900 * rnd() : 0;
    a.solarDirect![i] = NaN;
  }
  return a;
}

describe('the worker pool', () => {
  it('the physics pool on two workers gives, bit for bit, the WBGT one thread computes', async () => {
    const one = arrays();
    computeHours(one, 0, one.time.length);
    const two = arrays();
    const pool = await startPhysicsPool(two, 2);
    try {
      const run = await pool.run(two.time.length);
      expect(run.workerMs.length).toBe(2);
      expect(run.counts.ok).toBeGreaterThan(0);
    } finally {
      await pool.close();
    }
    expect(Buffer.from(two.wbgtSun.buffer).equals(Buffer.from(one.wbgtSun.buffer))).toBe(true);
    expect(Buffer.from(two.wbgtShade.buffer).equals(Buffer.from(one.wbgtShade.buffer))).toBe(true);
    expect(Buffer.from(two.status.buffer).equals(Buffer.from(one.status.buffer))).toBe(true);
  }, 60_000);

  it('demo year writers report the hours they generate, and after a failure the year being written finishes whole and no further year starts', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'hh-pool-'));
    writeFileSync(join(dir, 'not-a-folder'), '');
    const job = (year: number, path: string): YearJob => ({ path, grid: SMALL_GRID, seed: 7, year, layout: 'legacy', preliminaryFromMs: Infinity });
    const jobs = [job(2021, join(dir, 'a.nc')), job(2022, join(dir, 'not-a-folder', 'b.nc')), job(2023, join(dir, 'c.nc'))];
    let hours = 0;
    const run = runInWorkers<YearJob, void>('demo-year', jobs, {
      size: 2,
      describe: (j) => `demo year ${j.year}`,
      onProgress: (_j, h) => (hours += h),
      onFailure: 'drain',
    });
    await expect(run).rejects.toThrow(/^demo year 2022 failed in a worker: Error: (ENOTDIR|EEXIST)/);
    // 2021 was being written when 2022 failed: it finished (two passes over its 8,760 hours: the
    // packing ranges, then the values); 2022 failed opening its file after its first pass; 2023
    // never started.
    expect(readdirSync(dir).sort()).toEqual(['a.nc', 'not-a-folder']);
    expect(hours).toBe(3 * 8760);
    expect(existsSync(join(dir, 'c.nc'))).toBe(false);
  }, 120_000);

  it('a catalogued error raised in a worker arrives as the same catalogued error (a compute task whose input file is missing)', async () => {
    const init = { files: ['/nowhere/era5-2021.nc'], datasetOptions: { product: 'era5' as const, digests: false }, context: {} as WorkerInit['context'] };
    const shard = { id: 't00-y2021-m01' } as ShardSpec;
    const err = await runTasks([{ kind: 'compute', task: { id: 'g00-y2021-m01', shards: [shard], blockHours: 744 }, stores: {} }], init, 1, {}).then(
      () => undefined,
      (e: unknown) => e,
    );
    expect(err).toBeInstanceOf(HeathoursError);
    expect((err as HeathoursError).code).toBe('NetcdfFileNotFound');
    expect((err as HeathoursError).where.file).toBe('/nowhere/era5-2021.nc');
    expect((err as HeathoursError).hint).toContain('check the path');
  }, 60_000);

  it('a pool started before its set-up is known serves its tasks with the set-up given later, run after run', async () => {
    let give!: (i: WorkerInit) => void;
    const pool = startShardPool(1, new Promise<WorkerInit>((ok) => (give = ok)));
    try {
      const task = { kind: 'compute' as const, task: { id: 'g00-y2021-m01', shards: [{ id: 't00-y2021-m01' } as ShardSpec], blockHours: 744 }, stores: {} };
      const first = runTasks([task], pool, 1, {}).then(
        () => undefined,
        (e: unknown) => e,
      );
      // The worker reads the files the set-up names, given only now.
      give({ files: ['/later/era5-2021.nc'], datasetOptions: { product: 'era5' as const, digests: false }, context: {} as WorkerInit['context'] });
      const err = await first;
      expect((err as HeathoursError).code).toBe('NetcdfFileNotFound');
      expect((err as HeathoursError).where.file).toBe('/later/era5-2021.nc');
      // That run failed with its one task answered (nothing in flight): the kept pool serves the next run.
      const again = await runTasks([task], pool, 1, {}).then(
        () => undefined,
        (e: unknown) => e,
      );
      expect((again as HeathoursError).code).toBe('NetcdfFileNotFound');
    } finally {
      await pool.close();
    }
  }, 60_000);

  it("a set-up that fails stops the pool started before it: a run rejects with the set-up's reason", async () => {
    const pool = startShardPool(2, Promise.reject(new Error('the plan failed')));
    try {
      await expect(runTasks([{ kind: 'summary', hours: [0, 1], key: 'k' }], pool, 2, {})).rejects.toThrow('the plan failed');
    } finally {
      await pool.close();
    }
  }, 60_000);
});

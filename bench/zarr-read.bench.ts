/**
 * zarr-read: values/s reading the demo year (pipeline/demo `writeDemoDataset`, invented values,
 * 0.25° 40 × 60 grid, 8 ERA5 variables) from a local Zarr v2 store with the NetCDF-4 demo's
 * chunks (168 h × the whole grid, float32, zlib level 1; test/helpers/write-zarr.ts), through
 * `readBlock` in month blocks (744 h) of the whole grid, as a ratio of the NetCDF-4 reader on the
 * NetCDF-4 demo files it was written from, measured in the same run (alternating, best of 3
 * after a warm-up each). Checksums of the two must agree.
 */
import { existsSync, rmSync } from 'node:fs';
import { join } from 'node:path';
import { BENCH_DIR, DEMO_GRID, demoInputs, streamAll, type StreamResult } from './decode.bench.ts';
import { writeZarrFromNetcdf } from '../test/helpers/write-zarr.ts';
import { BLOCK_HOURS } from '../pipeline/demo/legacy-layout.ts';
import { DEFLATE_LEVEL } from '../pipeline/demo/netcdf4-layout.ts';
import type { CanonicalName } from '../pipeline/model/fields.ts';
import type { Bench } from './types.ts';

const ALL: CanonicalName[] = ['airTemperature', 'dewPointTemperature', 'surfacePressure', 'windSpeed10m', 'solarGlobal', 'solarDirect', 'thermalDown'];

/** The demo's NetCDF-4 files (mask, year) and a store per file, written once under the bench cache. */
async function inputs(): Promise<{ nc: string[]; zarr: string[] }> {
  const nc = await demoInputs('netcdf4', [2021]);
  const dir = join(BENCH_DIR, `zarr-${DEMO_GRID.nLat}x${DEMO_GRID.nLon}`);
  const zarr = nc.map((f) => join(dir, f.split('/').pop()!.replace(/\.nc$/, '.zarr')));
  for (let i = 0; i < nc.length; i++) {
    if (existsSync(join(zarr[i], '.zmetadata'))) continue;
    rmSync(zarr[i], { recursive: true, force: true });
    await writeZarrFromNetcdf([nc[i]], zarr[i], { version: 2, chunkHours: BLOCK_HOURS, level: DEFLATE_LEVEL });
  }
  return { nc, zarr };
}

const mps = (r: StreamResult) => (r.values / r.seconds / 1e6).toFixed(2);

export const bench: Bench = {
  names: ['zarr-read'],
  async run() {
    const { nc, zarr } = await inputs();
    const opts = { reuse: true, require: ALL };
    await streamAll(nc, opts); // warm-up: page cache, JIT, h5wasm
    await streamAll(zarr, opts);
    const runsNc: StreamResult[] = [];
    const runsZarr: StreamResult[] = [];
    for (let i = 0; i < 3; i++) {
      runsNc.push(await streamAll(nc, opts));
      runsZarr.push(await streamAll(zarr, opts));
    }
    const best = (rs: StreamResult[]) => rs.reduce((a, b) => (b.seconds < a.seconds ? b : a));
    const n = best(runsNc);
    const z = best(runsZarr);
    if (Math.abs(n.checksum - z.checksum) > 1e-6 * Math.abs(n.checksum) || n.values !== z.values) {
      throw new Error(
        `zarr-read: the store reads other values than the NetCDF-4 files (checksum ${z.checksum} against ${n.checksum}, ${z.values} against ${n.values} values)`,
      );
    }
    const zv = z.values / z.seconds;
    const nv = n.values / n.seconds;
    return [
      {
        bench: 'zarr-read',
        value: Math.round(zv),
        unit: 'values/s',
        input:
          'demo year (invented) 2021, 0.25° 40x60 grid, 8 ERA5 variables -> 7 canonical fields; local Zarr v2 store, float32, zlib 1, chunks 168x40x60 (as the NetCDF-4 demo); readBlock month blocks (744 h) of the whole grid',
        netcdf4ValuesPerSecond: Math.round(nv),
        ratioToNetcdf4: Math.round((zv / nv) * 1000) / 1000,
        cpuRatioToNetcdf4: Math.round((z.values / z.cpuSeconds / (n.values / n.cpuSeconds)) * 1000) / 1000,
        runsZarr: runsZarr.map(mps).join('/') + ' M/s',
        runsNetcdf4: runsNc.map(mps).join('/') + ' M/s',
        values: z.values,
        checksum: z.checksum.toFixed(3),
        note: 'one core; best of 3 wall-clock runs each, alternating, after one warm-up each; machine shared with other jobs (2 cores), timings noisy',
      },
    ];
  },
};

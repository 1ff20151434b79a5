/**
 * decode-classic / decode-netcdf4: decoded values per second on one core through
 * `Dataset.readBlock` (byte-range reads + the fused mask/unpack/unit loop), for the legacy packed
 * layout (NetCDF-3 classic, int16 + scale_factor/add_offset + _FillValue) and for the 2024
 * layout (NetCDF-4, float32, deflate level 1 + shuffle, made from a classic float file with
 * Debian's `nccopy`). The figures read the demo dataset (pipeline/demo `writeDemoDataset`, all
 * eight variables); the t2m-only files of the small generator below are reported beside them.
 * All inputs are invented values, kept under .cache/bench/.
 */
import { execFileSync } from 'node:child_process';
import { existsSync, mkdirSync, openSync, writeSync, closeSync, renameSync, statSync } from 'node:fs';
import { join } from 'node:path';
import { openDataset } from '../pipeline/read/index.ts';
import { tileSize } from '../pipeline/model/grid.ts';
import type { CanonicalName } from '../pipeline/model/fields.ts';
import type { Bench, BenchFigure } from './types.ts';

export const BENCH_DIR = new URL('../.cache/bench/', import.meta.url).pathname;

/** Big-endian byte writer for a NetCDF-3 classic header (NetCDF format specification). */
class Header {
  parts: Buffer[] = [];
  u32(x: number) {
    const b = Buffer.alloc(4);
    b.writeUInt32BE(x >>> 0);
    this.parts.push(b);
  }
  name(s: string) {
    this.u32(s.length);
    const b = Buffer.alloc(Math.ceil(s.length / 4) * 4);
    b.write(s, 'latin1');
    this.parts.push(b);
  }
  bytes() {
    return Buffer.concat(this.parts);
  }
}

type Attr = [string, 'char', string] | [string, 'short' | 'float' | 'double', number];

function attrs(h: Header, list: Attr[]) {
  if (list.length === 0) {
    h.u32(0);
    h.u32(0);
    return;
  }
  h.u32(12);
  h.u32(list.length);
  for (const [n, t, v] of list) {
    h.name(n);
    if (t === 'char') {
      h.u32(2);
      h.name(v as string);
      continue;
    }
    const code = { short: 3, float: 5, double: 6 }[t];
    h.u32(code);
    h.u32(1);
    const b = Buffer.alloc(t === 'double' ? 8 : 4);
    if (t === 'short') b.writeInt16BE(v as number);
    else if (t === 'float') b.writeFloatBE(v as number);
    else b.writeDoubleBE(v as number);
    h.parts.push(b);
  }
}

/**
 * Writes one year of hourly 2 m temperature on an ny × nx 0.25° grid as a legacy-layout classic
 * file (`packed`: int16 + scale/offset + fill, else float32). Invented values; fill in 1 % of cells.
 */
export function writeBenchClassic(path: string, year: number, ny: number, nx: number, packed: boolean): void {
  const nt = (Date.UTC(year + 1, 0, 1) - Date.UTC(year, 0, 1)) / 3_600_000;
  const t0 = (Date.UTC(year, 0, 1) - Date.UTC(1900, 0, 1)) / 3_600_000;
  const sf = 0.0015,
    ao = 290,
    B = packed ? 2 : 4;
  const fieldBytes = Math.ceil((ny * nx * B) / 4) * 4;
  const build = (beginLat: number, beginLon: number, beginRec: number) => {
    const h = new Header();
    h.parts.push(Buffer.from('CDF\x01', 'latin1'));
    h.u32(nt);
    h.u32(10);
    h.u32(3);
    h.name('longitude');
    h.u32(nx);
    h.name('latitude');
    h.u32(ny);
    h.name('time');
    h.u32(0);
    attrs(h, [
      ['Conventions', 'char', 'CF-1.6'],
      ['history', 'char', 'heathours bench input (invented values)'],
    ]);
    h.u32(11);
    h.u32(4);
    h.name('longitude');
    h.u32(1);
    h.u32(0);
    attrs(h, [['units', 'char', 'degrees_east']]);
    h.u32(5);
    h.u32(nx * 4);
    h.u32(beginLon);
    h.name('latitude');
    h.u32(1);
    h.u32(1);
    attrs(h, [['units', 'char', 'degrees_north']]);
    h.u32(5);
    h.u32(ny * 4);
    h.u32(beginLat);
    h.name('time');
    h.u32(1);
    h.u32(2);
    attrs(h, [
      ['units', 'char', 'hours since 1900-01-01 00:00:00.0'],
      ['calendar', 'char', 'gregorian'],
    ]);
    h.u32(4);
    h.u32(4);
    h.u32(beginRec);
    h.name('t2m');
    h.u32(3);
    h.u32(2);
    h.u32(1);
    h.u32(0);
    attrs(
      h,
      packed
        ? [
            ['scale_factor', 'double', sf],
            ['add_offset', 'double', ao],
            ['_FillValue', 'short', -32767],
            ['missing_value', 'short', -32767],
            ['units', 'char', 'K'],
            ['long_name', 'char', '2 metre temperature'],
          ]
        : [
            ['_FillValue', 'float', NaN],
            ['units', 'char', 'K'],
            ['long_name', 'char', '2 metre temperature'],
          ],
    );
    h.u32(packed ? 3 : 5);
    h.u32(fieldBytes);
    h.u32(beginRec + 4);
    return h.bytes();
  };
  const headLen = build(0, 0, 0).length;
  const beginLon = headLen,
    beginLat = beginLon + nx * 4,
    beginRec = beginLat + ny * 4;
  const tmp = `${path}.${process.pid}.tmp`;
  const fd = openSync(tmp, 'w');
  writeSync(fd, build(beginLat, beginLon, beginRec));
  const lon = Buffer.alloc(nx * 4);
  for (let i = 0; i < nx; i++) lon.writeFloatBE(i * 0.25, i * 4);
  const lat = Buffer.alloc(ny * 4);
  for (let i = 0; i < ny; i++) lat.writeFloatBE(30 - i * 0.25, i * 4);
  writeSync(fd, lon);
  writeSync(fd, lat);
  const rec = Buffer.alloc(4 + fieldBytes);
  let seed = 12345;
  const chunk: Buffer[] = [];
  for (let t = 0; t < nt; t++) {
    rec.writeInt32BE(t0 + t, 0);
    const diurnal = 6 * Math.sin((2 * Math.PI * ((t % 24) - 9)) / 24) + 8 * Math.sin(2 * Math.PI * (t / 8760 - 0.3));
    for (let c = 0; c < ny * nx; c++) {
      seed = (seed * 1103515245 + 12345) & 0x7fffffff;
      const k = 295 + diurnal - (0.02 * c) / nx + (seed / 0x7fffffff - 0.5);
      const fill = c % 100 === 7;
      if (packed) rec.writeInt16BE(fill ? -32767 : Math.round((k - ao) / sf), 4 + c * 2);
      else rec.writeFloatBE(fill ? NaN : k, 4 + c * 4);
    }
    chunk.push(Buffer.from(rec));
    if (chunk.length === 256 || t === nt - 1) {
      writeSync(fd, Buffer.concat(chunk));
      chunk.length = 0;
    }
  }
  closeSync(fd);
  renameSync(tmp, path);
}

/** Bench inputs (cached): one classic packed file per year, and NetCDF-4 copies. */
export function benchInputs(kind: 'classic' | 'netcdf4', years: number[], ny = 40, nx = 60): string[] {
  mkdirSync(BENCH_DIR, { recursive: true });
  return years.map((y) => {
    const classic = join(BENCH_DIR, `t2m-${y}-${ny}x${nx}-packed.nc`);
    if (kind === 'classic') {
      if (!existsSync(classic)) writeBenchClassic(classic, y, ny, nx, true);
      return classic;
    }
    const flt = join(BENCH_DIR, `t2m-${y}-${ny}x${nx}-float.nc`);
    const nc4 = join(BENCH_DIR, `t2m-${y}-${ny}x${nx}-deflate.nc`);
    if (!existsSync(nc4)) {
      if (!existsSync(flt)) writeBenchClassic(flt, y, ny, nx, false);
      execFileSync('nccopy', ['-k', 'nc4', '-d', '1', '-s', '-c', `time/24,latitude/${ny},longitude/${nx}`, flt, `${nc4}.tmp`]);
      renameSync(`${nc4}.tmp`, nc4);
    }
    return nc4;
  });
}

/** Where the demo-dataset bench inputs live (0.25° 40 × 60 grid, one year). */
export const DEMO_GRID = { nLat: 40, nLon: 60, resolution: 0.25 };

/**
 * Demo-dataset bench inputs (pipeline/demo `writeDemoDataset`, invented values), cached under
 * .cache/bench/: one file per year with all eight ERA5 variables, plus the land-sea mask file.
 */
export async function demoInputs(layout: 'legacy' | 'netcdf4', years: number[]): Promise<string[]> {
  const dir = join(BENCH_DIR, `demo-${layout}-${DEMO_GRID.nLat}x${DEMO_GRID.nLon}`);
  const { writeDemoDataset, yearFileName, LSM_FILE } = await import('../pipeline/demo/index.ts');
  const files = [join(dir, LSM_FILE), ...years.map((y) => join(dir, yearFileName(y)))];
  const missing = years.filter((y) => !existsSync(join(dir, yearFileName(y))));
  if (missing.length > 0 || !existsSync(files[0]))
    await writeDemoDataset({ outDir: dir, years: missing.length > 0 ? missing : years.slice(0, 1), layout, grid: DEMO_GRID, quiet: true });
  return files;
}

export interface StreamResult {
  /** Source values decoded (each ERA5 variable read counts; u10 and v10 both) [values]. */
  values: number;
  /** Canonical values handed out [values]. */
  outValues: number;
  seconds: number;
  /** CPU time of this process (user + system) [s]. */
  cpuSeconds: number;
  checksum: number;
}

/**
 * Streams every month-sized block (744 h) of the whole grid through `readBlock`, all canonical
 * fields of the dataset; returns values decoded, wall and CPU seconds, and a checksum.
 */
export async function streamAll(files: string[], opts: { reuse?: boolean; require?: CanonicalName[] } = {}): Promise<StreamResult> {
  const ds = await openDataset(files, { product: 'era5', require: opts.require ?? ['airTemperature'], digests: false, reuseBlockBuffers: opts.reuse ?? true });
  const tile = { y0: 0, y1: ds.grid.lat.length, x0: 0, x1: ds.grid.lon.length };
  const sourcesPerBlock = ds.variables.reduce((s, c) => s + (c === 'windSpeed10m' ? 2 : 1), 0);
  let values = 0;
  let outValues = 0;
  let checksum = 0;
  let ns = 0n;
  let cpuUs = 0;
  for (let t0 = 0; t0 < ds.time.count; t0 += 744) {
    // Only readBlock is timed; the checksum below is not.
    const c0 = process.cpuUsage();
    const t = process.hrtime.bigint();
    const b = await ds.readBlock(t0, Math.min(744, ds.time.count - t0), tile);
    ns += process.hrtime.bigint() - t;
    const cu = process.cpuUsage(c0);
    cpuUs += cu.user + cu.system;
    for (const c of ds.variables) {
      const x = b.fields[c as keyof typeof b.fields]!;
      outValues += x.length;
      let s = 0;
      for (let i = 0; i < x.length; i++) if (x[i] === x[i]) s += x[i];
      checksum += s;
    }
    values += b.time.length * tileSize(tile) * sourcesPerBlock;
  }
  await ds.close();
  return { values, outValues, seconds: Number(ns) / 1e9, cpuSeconds: cpuUs / 1e6, checksum };
}

const ALL_FIELDS: CanonicalName[] = ['airTemperature', 'dewPointTemperature', 'surfacePressure', 'windSpeed10m', 'solarGlobal', 'solarDirect', 'thermalDown'];

/** Warm-up, then three timed runs; the figure is the best wall-clock run, CPU figures beside. */
async function timed(files: string[], opts: { reuse?: boolean; require?: CanonicalName[] }): Promise<{ best: StreamResult; runs: StreamResult[] }> {
  await streamAll(files, opts); // page cache and JIT
  const runs: StreamResult[] = [];
  for (let i = 0; i < 3; i++) runs.push(await streamAll(files, opts));
  return { best: runs.reduce((a, b) => (b.seconds < a.seconds ? b : a)), runs };
}

const mps = (r: StreamResult, cpu = false) => (r.values / (cpu ? r.cpuSeconds : r.seconds) / 1e6).toFixed(1);

async function figure(name: string, layout: 'legacy' | 'netcdf4'): Promise<BenchFigure> {
  const files = await demoInputs(layout, [2021]);
  const { best, runs } = await timed(files, { reuse: true, require: ALL_FIELDS });
  const fresh = await streamAll(files, { reuse: false, require: ALL_FIELDS });
  const single = await timed(benchInputs(layout === 'legacy' ? 'classic' : 'netcdf4', [2021]), { reuse: true });
  return {
    bench: name,
    value: best.values / best.seconds,
    unit: 'values/s',
    input: `demo dataset (invented), 1 year hourly, 0.25° 40x60 grid, 8 ERA5 variables -> 7 canonical fields, ${layout === 'legacy' ? 'NetCDF-3 classic int16 packed' : 'NetCDF-4 float32 deflate 1, chunks 168x40x60'}, readBlock month blocks (744 h) of the whole grid, readBlock calls timed`,
    values: best.values,
    seconds: Math.round(best.seconds * 1000) / 1000,
    cpuSeconds: Math.round(best.cpuSeconds * 1000) / 1000,
    cpuValuesPerSecond: Math.round(best.values / best.cpuSeconds),
    runsWall: runs.map((r) => mps(r)).join('/') + ' M/s',
    runsCpu: runs.map((r) => mps(r, true)).join('/') + ' M/s',
    freshBuffersWallCpu: `${mps(fresh)}/${mps(fresh, true)} M/s`,
    t2mOnlyWallCpu: `${mps(single.best)}/${mps(single.best, true)} M/s (${layout === 'legacy' ? 'bench writer, int16 packed' : 'bench writer via nccopy, deflate 1 + shuffle, chunks 24x40x60'})`,
    checksum: best.checksum.toFixed(3),
    note: 'one core; best of 3 wall-clock runs after a warm-up, CPU = process user+system; values = source values decoded; machine shared with other jobs (2 cores), timings noisy',
  };
}

/**
 * open-dataset: `openDataset` time without digests on six classic files of ~101 MB each
 * (six years of hourly packed t2m on a 60 x 96 grid, bench writer); with digests beside.
 */
async function openFigure(): Promise<BenchFigure> {
  const files = benchInputs('classic', [2015, 2016, 2017, 2018, 2019, 2020], 60, 96);
  const bytes = files.reduce((s, f) => s + statSync(f).size, 0);
  const time = async (digests: boolean) => {
    const c0 = process.cpuUsage();
    const t = performance.now();
    const ds = await openDataset(files, { product: 'era5', require: ['airTemperature'], digests });
    const wall = (performance.now() - t) / 1000;
    const cu = process.cpuUsage(c0);
    const hours = ds.time.count;
    const sha = ds.files.map((f) => f.sha256.slice(0, 8)).join(',');
    await ds.close();
    return { wall, cpu: (cu.user + cu.system) / 1e6, hours, sha };
  };
  await time(false); // page cache of headers
  const runs = [await time(false), await time(false), await time(false)];
  const best = runs.reduce((a, b) => (b.wall < a.wall ? b : a));
  const withDigests = await time(true);
  return {
    bench: 'open-dataset',
    value: Math.round(best.wall * 1000),
    unit: 'ms',
    input: `openDataset, digests: false, ${files.length} NetCDF-3 int16 files, ${(bytes / 1e6).toFixed(0)} MB in all, ${best.hours} hours on a 60x96 grid`,
    cpuMs: Math.round(best.cpu * 1000),
    runsMs: runs.map((r) => Math.round(r.wall * 1000)).join('/'),
    withDigestsMs: Math.round(withDigests.wall * 1000),
    checksum: `${best.hours} hours; digests ${withDigests.sha}`,
    note: 'best of 3 after a warm-up (page cache warm); shared machine',
  };
}

export const bench: Bench = {
  names: ['decode-classic', 'decode-netcdf4', 'open-dataset'],
  async run(only) {
    const out: BenchFigure[] = [];
    if (!only || only === 'open-dataset') out.push(await openFigure());
    if (!only || only === 'decode-classic') out.push(await figure('decode-classic', 'legacy'));
    if (!only || only === 'decode-netcdf4') out.push(await figure('decode-netcdf4', 'netcdf4'));
    return out;
  },
};

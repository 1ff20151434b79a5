/**
 * decode-classic / decode-netcdf4: decoded values per second on one core through
 * `Dataset.readBlock` (byte-range reads + the fused mask/unpack/unit loop), for the legacy packed
 * layout (NetCDF-3 classic, int16 + scale_factor/add_offset + _FillValue) and for the 2024
 * layout (NetCDF-4, float32, deflate level 1 + shuffle, made from a classic float file with
 * Debian's `nccopy`). Inputs are invented values from a small generator (the demo dataset writer
 * was not available when this was written), kept under .cache/bench/.
 */
import { execFileSync } from 'node:child_process';
import { existsSync, mkdirSync, openSync, writeSync, closeSync, renameSync } from 'node:fs';
import { join } from 'node:path';
import { openDataset } from '../pipeline/read/index.ts';
import type { Bench, BenchFigure } from './types.ts';

export const BENCH_DIR = new URL('../.cache/bench/', import.meta.url).pathname;

/** Big-endian byte writer for a NetCDF-3 classic header (NetCDF format specification). */
class Header {
  parts: Buffer[] = [];
  u32(x: number) { const b = Buffer.alloc(4); b.writeUInt32BE(x >>> 0); this.parts.push(b); }
  name(s: string) { this.u32(s.length); const b = Buffer.alloc(Math.ceil(s.length / 4) * 4); b.write(s, 'latin1'); this.parts.push(b); }
  bytes() { return Buffer.concat(this.parts); }
}

type Attr = [string, 'char', string] | [string, 'short' | 'float' | 'double', number];

function attrs(h: Header, list: Attr[]) {
  if (list.length === 0) { h.u32(0); h.u32(0); return; }
  h.u32(12); h.u32(list.length);
  for (const [n, t, v] of list) {
    h.name(n);
    if (t === 'char') { h.u32(2); h.name(v as string); continue; }
    const code = { short: 3, float: 5, double: 6 }[t];
    h.u32(code); h.u32(1);
    const b = Buffer.alloc(t === 'double' ? 8 : 4);
    if (t === 'short') b.writeInt16BE(v as number); else if (t === 'float') b.writeFloatBE(v as number); else b.writeDoubleBE(v as number);
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
  const sf = 0.0015, ao = 290, B = packed ? 2 : 4;
  const fieldBytes = Math.ceil((ny * nx * B) / 4) * 4;
  const build = (beginLat: number, beginLon: number, beginRec: number) => {
    const h = new Header();
    h.parts.push(Buffer.from('CDF\x01', 'latin1'));
    h.u32(nt);
    h.u32(10); h.u32(3); h.name('longitude'); h.u32(nx); h.name('latitude'); h.u32(ny); h.name('time'); h.u32(0);
    attrs(h, [['Conventions', 'char', 'CF-1.6'], ['history', 'char', 'heathours bench input (invented values)']]);
    h.u32(11); h.u32(4);
    h.name('longitude'); h.u32(1); h.u32(0); attrs(h, [['units', 'char', 'degrees_east']]); h.u32(5); h.u32(nx * 4); h.u32(beginLon);
    h.name('latitude'); h.u32(1); h.u32(1); attrs(h, [['units', 'char', 'degrees_north']]); h.u32(5); h.u32(ny * 4); h.u32(beginLat);
    h.name('time'); h.u32(1); h.u32(2); attrs(h, [['units', 'char', 'hours since 1900-01-01 00:00:00.0'], ['calendar', 'char', 'gregorian']]); h.u32(4); h.u32(4); h.u32(beginRec);
    h.name('t2m'); h.u32(3); h.u32(2); h.u32(1); h.u32(0);
    attrs(h, packed
      ? [['scale_factor', 'double', sf], ['add_offset', 'double', ao], ['_FillValue', 'short', -32767], ['missing_value', 'short', -32767], ['units', 'char', 'K'], ['long_name', 'char', '2 metre temperature']]
      : [['_FillValue', 'float', NaN], ['units', 'char', 'K'], ['long_name', 'char', '2 metre temperature']]);
    h.u32(packed ? 3 : 5); h.u32(fieldBytes); h.u32(beginRec + 4);
    return h.bytes();
  };
  const headLen = build(0, 0, 0).length;
  const beginLon = headLen, beginLat = beginLon + nx * 4, beginRec = beginLat + ny * 4;
  const tmp = `${path}.${process.pid}.tmp`;
  const fd = openSync(tmp, 'w');
  writeSync(fd, build(beginLat, beginLon, beginRec));
  const lon = Buffer.alloc(nx * 4); for (let i = 0; i < nx; i++) lon.writeFloatBE(i * 0.25, i * 4);
  const lat = Buffer.alloc(ny * 4); for (let i = 0; i < ny; i++) lat.writeFloatBE(30 - i * 0.25, i * 4);
  writeSync(fd, lon); writeSync(fd, lat);
  const rec = Buffer.alloc(4 + fieldBytes);
  let seed = 12345;
  const chunk: Buffer[] = [];
  for (let t = 0; t < nt; t++) {
    rec.writeInt32BE(t0 + t, 0);
    const diurnal = 6 * Math.sin((2 * Math.PI * ((t % 24) - 9)) / 24) + 8 * Math.sin((2 * Math.PI * (t / 8760 - 0.3)));
    for (let c = 0; c < ny * nx; c++) {
      seed = (seed * 1103515245 + 12345) & 0x7fffffff;
      const k = 295 + diurnal - 0.02 * c / nx + (seed / 0x7fffffff - 0.5);
      const fill = c % 100 === 7;
      if (packed) rec.writeInt16BE(fill ? -32767 : Math.round((k - ao) / sf), 4 + c * 2);
      else rec.writeFloatBE(fill ? NaN : k, 4 + c * 4);
    }
    chunk.push(Buffer.from(rec));
    if (chunk.length === 256 || t === nt - 1) { writeSync(fd, Buffer.concat(chunk)); chunk.length = 0; }
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

/** Streams every month-sized block of the whole grid; returns values decoded, seconds, checksum. */
export async function streamAll(files: string[]): Promise<{ values: number; seconds: number; checksum: number }> {
  const ds = await openDataset(files, { product: 'era5', require: ['airTemperature'] });
  const tile = { y0: 0, y1: ds.grid.lat.length, x0: 0, x1: ds.grid.lon.length };
  let values = 0;
  let checksum = 0;
  const t = process.hrtime.bigint();
  for (let t0 = 0; t0 < ds.time.count; t0 += 744) {
    const b = await ds.readBlock(t0, Math.min(744, ds.time.count - t0), tile);
    const x = b.fields.airTemperature!;
    values += x.length;
    let s = 0;
    for (let i = 0; i < x.length; i++) if (x[i] === x[i]) s += x[i];
    checksum += s;
  }
  const seconds = Number(process.hrtime.bigint() - t) / 1e9;
  await ds.close();
  return { values, seconds, checksum };
}

async function figure(name: string, kind: 'classic' | 'netcdf4'): Promise<BenchFigure> {
  const files = benchInputs(kind, [2021]);
  await streamAll(files); // warm the page cache and the JIT
  const runs = [];
  for (let i = 0; i < 3; i++) runs.push(await streamAll(files));
  const best = runs.reduce((a, b) => (b.seconds < a.seconds ? b : a));
  return {
    bench: name,
    value: best.values / best.seconds,
    unit: 'values/s',
    input: `1 year hourly t2m, 40x60 grid, ${kind === 'classic' ? 'NetCDF-3 int16 packed' : 'NetCDF-4 float32 deflate 1 + shuffle, chunks 24x40x60'}`,
    values: best.values,
    seconds: Math.round(best.seconds * 1000) / 1000,
    runs: runs.map((r) => (r.values / r.seconds / 1e6).toFixed(1)).join('/') + ' M/s',
    checksum: best.checksum.toFixed(3),
    note: 'one core, best of 3 after a warm-up; machine shared with other jobs, timings noisy',
  };
}

export const bench: Bench = {
  names: ['decode-classic', 'decode-netcdf4'],
  async run(only) {
    const out: BenchFigure[] = [];
    if (!only || only === 'decode-classic') out.push(await figure('decode-classic', 'classic'));
    if (!only || only === 'decode-netcdf4') out.push(await figure('decode-netcdf4', 'netcdf4'));
    return out;
  },
};

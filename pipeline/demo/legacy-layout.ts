/**
 * The legacy CDS layout (docs/methods.md §2.3, the legacy layout): NetCDF-3 classic,
 * dims (time UNLIMITED, latitude, longitude), `int time` in "hours since 1900-01-01 00:00:00.0"
 * (calendar "gregorian"), latitude descending, longitude ascending in 0..360, every variable a
 * `short` packed with a per-file `scale_factor`/`add_offset` from the data range,
 * `_FillValue` = `missing_value` = −32767, global `Conventions` "CF-1.6".
 *
 * Packing (as grib_to_netcdf does, per file from the range; the exact offset rule here is ours):
 * `scale_factor = (max − min)/65532`, `add_offset = min + 32766·scale_factor`, so min packs to
 * −32766, max to +32766, and a minimum of 0 (night-time radiation) unpacks to exactly 0.
 * Unpack: `x = packed·scale_factor + add_offset`.
 *
 * A year is generated twice: once for the range, once to pack and write record by record.
 */
import type { CellClimate } from './cell-climate.ts';
import { ERA5_VARIABLES, inventedLabels } from './era5-variables.ts';
import { Netcdf3Writer, type Nc3Attr, type Nc3Var } from '../formats/netcdf3-writer.ts';
import { DEMO_VARIABLES, YearWeather, type DemoVariable } from './weather.ts';

/** Fill value of packed legacy variables [–]. */
export const LEGACY_FILL = -32767;
/** Hours from 1970-01-01 back to the legacy time origin 1900-01-01 [h]. */
const HOURS_1900_TO_1970 = Date.UTC(1970, 0, 1) / 3_600_000 - Date.UTC(1900, 0, 1) / 3_600_000;
/** Hours per generated block [h]. */
export const BLOCK_HOURS = 168;
/** Time stamp of the single step of the invariant (land-sea mask) file [ms since 1970 UTC]. */
export const INVARIANT_STAMP_MS = Date.UTC(2020, 0, 1);

/** Packing parameters for a value range [units of the variable]. */
export function packingFor(min: number, max: number): { scale: number; offset: number } {
  if (!(max > min)) return { scale: 1, offset: Number.isFinite(min) ? min : 0 };
  const scale = (max - min) / 65532;
  return { scale, offset: min + 32766 * scale };
}

function pack(values: Float32Array, from: number, n: number, scale: number, offset: number, out: Int16Array): void {
  for (let i = 0; i < n; i++) {
    const x = values[from + i];
    out[i] = Number.isFinite(x) ? Math.round((x - offset) / scale) : LEGACY_FILL;
  }
}

function varAttrs(name: DemoVariable | 'lsm', scale: number, offset: number): Nc3Attr[] {
  const info = ERA5_VARIABLES[name];
  const attrs: Nc3Attr[] = [
    { name: 'scale_factor', value: { type: 'double', values: [scale] } },
    { name: 'add_offset', value: { type: 'double', values: [offset] } },
    { name: '_FillValue', value: { type: 'short', values: [LEGACY_FILL] } },
    { name: 'missing_value', value: { type: 'short', values: [LEGACY_FILL] } },
    { name: 'units', value: info.units },
    { name: 'long_name', value: info.long_name },
  ];
  if (info.standard_name) attrs.push({ name: 'standard_name', value: info.standard_name });
  return attrs;
}

function header(
  cc: CellClimate,
  numRecords: number,
  vars: Array<{ name: DemoVariable | 'lsm'; scale: number; offset: number }>,
  labels: ReturnType<typeof inventedLabels>,
) {
  const v: Nc3Var[] = [
    {
      name: 'longitude',
      type: 'float',
      dims: ['longitude'],
      attrs: [
        { name: 'units', value: 'degrees_east' },
        { name: 'long_name', value: 'longitude' },
      ],
    },
    {
      name: 'latitude',
      type: 'float',
      dims: ['latitude'],
      attrs: [
        { name: 'units', value: 'degrees_north' },
        { name: 'long_name', value: 'latitude' },
      ],
    },
    {
      name: 'time',
      type: 'int',
      dims: ['time'],
      attrs: [
        { name: 'units', value: 'hours since 1900-01-01 00:00:00.0' },
        { name: 'long_name', value: 'time' },
        { name: 'calendar', value: 'gregorian' },
      ],
    },
    ...vars.map((x): Nc3Var => ({ name: x.name, type: 'short', dims: ['time', 'latitude', 'longitude'], attrs: varAttrs(x.name, x.scale, x.offset) })),
  ];
  return {
    dims: [
      { name: 'longitude', length: cc.grid.nLon },
      { name: 'latitude', length: cc.grid.nLat },
      { name: 'time', length: 'unlimited' as const },
    ],
    attrs: [
      { name: 'Conventions', value: 'CF-1.6' },
      { name: 'title', value: labels.title },
      { name: 'source', value: labels.source },
      { name: 'history', value: labels.history },
    ],
    vars: v,
    numRecords,
    // A year of a country-size grid passes the 2 GiB offsets of CDF-1: write CDF-2 then, as the
    // data store does for large requests (both are "NetCDF-3" to the reader).
    format: legacyFileFormat(numRecords, cc.grid.nLat * cc.grid.nLon, vars.length),
  };
}

/** Data bytes above which a year is written as 64-bit-offset NetCDF (below 2 GiB, with room for the header) [B]. */
export const CDF1_SAFE_BYTES = 2 ** 31 - 2 ** 24;

/** The NetCDF-3 variant of a legacy year of `hours` records of `cells` cells and `nVars` packed variables. */
export function legacyFileFormat(hours: number, cells: number, nVars: number): 'classic' | '64bit-offset' {
  return hours * cells * 2 * nVars > CDF1_SAFE_BYTES ? '64bit-offset' : 'classic';
}

/** Writes one year of invented data in the legacy layout to `path` (atomically). */
export function writeLegacyYear(path: string, cc: CellClimate, seed: number, year: number, tick: (hours: number) => void): void {
  // Pass 1: the range of every variable.
  const min = Object.fromEntries(DEMO_VARIABLES.map((v) => [v, Infinity])) as Record<DemoVariable, number>;
  const max = Object.fromEntries(DEMO_VARIABLES.map((v) => [v, -Infinity])) as Record<DemoVariable, number>;
  let gen = new YearWeather(cc, seed, year);
  let block = gen.allocBlock(BLOCK_HOURS);
  while (gen.remaining > 0) {
    const nh = Math.min(BLOCK_HOURS, gen.remaining);
    gen.next(nh, block);
    const nv = nh * cc.nCells;
    for (const v of DEMO_VARIABLES) {
      const a = block[v];
      let lo = min[v];
      let hi = max[v];
      for (let i = 0; i < nv; i++) {
        const x = a[i];
        if (x < lo) lo = x;
        if (x > hi) hi = x;
      }
      min[v] = lo;
      max[v] = hi;
    }
    tick(nh);
  }
  const packs = DEMO_VARIABLES.map((name) => ({ name, ...packingFor(min[name], max[name]) }));
  // Pass 2: generate again (deterministic), pack and write record by record.
  const labels = inventedLabels({ seed, what: `hourly weather, year ${year}` });
  const w = new Netcdf3Writer(path, header(cc, gen.nHours, packs, labels));
  try {
    w.writeFixed('longitude', cc.grid.lon360);
    w.writeFixed('latitude', cc.grid.lat);
    gen = new YearWeather(cc, seed, year);
    block = gen.allocBlock(BLOCK_HOURS);
    const slabs: Record<string, Int16Array | Int32Array> = { time: new Int32Array(1) };
    for (const v of DEMO_VARIABLES) slabs[v] = new Int16Array(cc.nCells);
    while (gen.remaining > 0) {
      const nh = Math.min(BLOCK_HOURS, gen.remaining);
      const stamps = gen.next(nh, block);
      for (let t = 0; t < nh; t++) {
        (slabs.time as Int32Array)[0] = Math.round(stamps[t] / 3_600_000 + HOURS_1900_TO_1970);
        for (const p of packs) pack(block[p.name], t * cc.nCells, cc.nCells, p.scale, p.offset, slabs[p.name] as Int16Array);
        w.writeRecord(slabs);
      }
      tick(nh);
    }
    w.close();
  } catch (e) {
    w.abort();
    throw e;
  }
}

/** Writes the invariant land-sea mask `lsm` in the legacy layout (one time step). */
export function writeLegacyLandSeaMask(path: string, cc: CellClimate, seed: number): void {
  let lo = Infinity;
  let hi = -Infinity;
  for (const x of cc.landFraction) {
    if (x < lo) lo = x;
    if (x > hi) hi = x;
  }
  const p = packingFor(lo, hi);
  const labels = inventedLabels({ seed, what: 'land-sea mask' });
  const w = new Netcdf3Writer(path, header(cc, 1, [{ name: 'lsm', ...p }], labels));
  try {
    w.writeFixed('longitude', cc.grid.lon360);
    w.writeFixed('latitude', cc.grid.lat);
    const packed = new Int16Array(cc.nCells);
    pack(cc.landFraction, 0, cc.nCells, p.scale, p.offset, packed);
    w.writeRecord({ time: [Math.round(INVARIANT_STAMP_MS / 3_600_000 + HOURS_1900_TO_1970)], lsm: packed });
    w.close();
  } catch (e) {
    w.abort();
    throw e;
  }
}

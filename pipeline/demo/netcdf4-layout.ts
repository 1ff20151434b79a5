/**
 * The 2024 CDS NetCDF-4 layout (docs/methods.md §2.3, the 2024 layout): dims `valid_time` (int64
 * "seconds since 1970-01-01", calendar "proleptic_gregorian"), `latitude` (descending, attribute
 * `stored_direction` "decreasing"), `longitude` (0..360, as the legacy files); scalar coordinate
 * `number` (0) and string coordinate `expver` per valid_time ("0001" final, "0005" preliminary
 * ERA5T); float32 variables with `_FillValue` NaN, chunked and deflated.
 *
 * Values are rounded to the per-variable step of {@link ERA5_VARIABLES} (about what the 16-bit
 * GRIB packing of the source keeps), which is what lets deflate compress them.
 */
import type { CellClimate } from './cell-climate.ts';
import { ERA5_VARIABLES, inventedLabels } from './era5-variables.ts';
import { BLOCK_HOURS, INVARIANT_STAMP_MS } from './legacy-layout.ts';
import { Netcdf4Writer, type Nc4Attrs, type Nc4Spec, type Nc4Variable } from './netcdf4-writer.ts';
import { DEMO_VARIABLES, YearWeather, yearHours, type DemoVariable } from './weather.ts';

/** zlib deflate level of the NetCDF-4 files [1–9]: 1, since deflate inside h5wasm dominates the write time (level 4 saved 3 % of the size for 30 % more time, measured on the default grid). */
export const DEFLATE_LEVEL = 1;
/** Months at the end of the last year marked preliminary (expver "0005") [–]. */
export const PRELIMINARY_MONTHS = 3;

function round(values: Float32Array, n: number, step: number): void {
  const inv = 1 / step;
  for (let i = 0; i < n; i++) values[i] = Math.round(values[i] * inv) / inv;
}

function coordDims(cc: CellClimate, stamps: BigInt64Array): Nc4Spec['dims'] {
  return [
    {
      name: 'valid_time',
      values: stamps,
      attrs: [
        ['long_name', 'time'],
        ['standard_name', 'time'],
        ['units', 'seconds since 1970-01-01'],
        ['calendar', 'proleptic_gregorian'],
      ],
    },
    {
      name: 'latitude',
      values: cc.grid.lat,
      attrs: [
        ['units', 'degrees_north'],
        ['standard_name', 'latitude'],
        ['long_name', 'latitude'],
        ['stored_direction', 'decreasing'],
      ],
    },
    {
      name: 'longitude',
      values: cc.grid.lon360,
      attrs: [
        ['units', 'degrees_east'],
        ['standard_name', 'longitude'],
        ['long_name', 'longitude'],
      ],
    },
  ];
}

function dataVar(cc: CellClimate, name: DemoVariable | 'lsm', nTime: number): Nc4Variable {
  const info = ERA5_VARIABLES[name];
  const attrs: Nc4Attrs = [
    ['units', info.units],
    ['long_name', info.long_name],
  ];
  if (info.standard_name) attrs.push(['standard_name', info.standard_name]);
  attrs.push(['coordinates', 'number expver']);
  return {
    name,
    dims: ['valid_time', 'latitude', 'longitude'],
    attrs,
    chunks: [Math.min(nTime, BLOCK_HOURS), cc.grid.nLat, cc.grid.nLon],
    deflateLevel: DEFLATE_LEVEL,
  };
}

function globalAttrs(labels: ReturnType<typeof inventedLabels>): Nc4Attrs {
  return [
    ['Conventions', 'CF-1.7'],
    ['institution', 'none (invented demo data)'],
    ['title', labels.title],
    ['source', labels.source],
    ['history', labels.history],
  ];
}

/**
 * Writes one year of invented data in the NetCDF-4 layout to `path` (atomically).
 * @param preliminaryFromMs stamps at or after this instant get expver "0005" [ms since 1970 UTC]
 */
export function writeNetcdf4Year(path: string, cc: CellClimate, seed: number, year: number, preliminaryFromMs: number, tick: (hours: number) => void): void {
  const { firstStampMs, nHours } = yearHours(year);
  const stamps = new BigInt64Array(nHours);
  const expver: string[] = [];
  for (let k = 0; k < nHours; k++) {
    const ms = firstStampMs + k * 3_600_000;
    stamps[k] = BigInt(ms / 1000);
    expver.push(ms >= preliminaryFromMs ? '0005' : '0001');
  }
  const labels = inventedLabels({ seed, what: `hourly weather, year ${year}` });
  const w = new Netcdf4Writer(path, {
    dims: coordDims(cc, stamps),
    coords: [
      {
        kind: 'scalar-int64',
        name: 'number',
        value: 0n,
        attrs: [
          ['long_name', 'ensemble member numerical id'],
          ['units', '1'],
          ['standard_name', 'realization'],
        ],
      },
      { kind: 'strings', name: 'expver', dim: 'valid_time', values: expver, attrs: [['long_name', 'experiment version']] },
    ],
    vars: DEMO_VARIABLES.map((v) => dataVar(cc, v, nHours)),
    globalAttrs: globalAttrs(labels),
  });
  try {
    const gen = new YearWeather(cc, seed, year);
    const block = gen.allocBlock(BLOCK_HOURS);
    while (gen.remaining > 0) {
      const nh = Math.min(BLOCK_HOURS, gen.remaining);
      gen.next(nh, block);
      const nv = nh * cc.nCells;
      for (const v of DEMO_VARIABLES) {
        round(block[v], nv, ERA5_VARIABLES[v].step);
        w.writeBlock(v, nh, nh === BLOCK_HOURS ? block[v] : block[v].subarray(0, nv));
      }
      tick(nh);
    }
    w.close();
  } catch (e) {
    w.abort();
    throw e;
  }
}

/** Writes the invariant land-sea mask `lsm` in the NetCDF-4 layout (one valid_time). */
export function writeNetcdf4LandSeaMask(path: string, cc: CellClimate, seed: number): void {
  const labels = inventedLabels({ seed, what: 'land-sea mask' });
  const w = new Netcdf4Writer(path, {
    dims: coordDims(cc, new BigInt64Array([BigInt(INVARIANT_STAMP_MS / 1000)])),
    coords: [
      {
        kind: 'scalar-int64',
        name: 'number',
        value: 0n,
        attrs: [
          ['long_name', 'ensemble member numerical id'],
          ['units', '1'],
          ['standard_name', 'realization'],
        ],
      },
      { kind: 'strings', name: 'expver', dim: 'valid_time', values: ['0001'], attrs: [['long_name', 'experiment version']] },
    ],
    vars: [dataVar(cc, 'lsm', 1)],
    globalAttrs: globalAttrs(labels),
  });
  try {
    const lf = Float32Array.from(cc.landFraction);
    round(lf, lf.length, ERA5_VARIABLES.lsm.step);
    w.writeBlock('lsm', 1, lf);
    w.close();
  } catch (e) {
    w.abort();
    throw e;
  }
}

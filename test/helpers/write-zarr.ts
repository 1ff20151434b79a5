/**
 * Writes the variables of a NetCDF file as a Zarr store in the layout of the analysis-ready ERA5
 * stores (arrays named by the data store's long variable names, dims time × latitude ×
 * longitude), values and attributes copied as stored: the same raw numbers, packing and CF
 * attributes, so the store decodes to the same values as the file. Two forms:
 * - Zarr v2 (Zarr storage specification 2: `.zgroup`, `.zarray`, `.zattrs`, chunk keys `t.y.x`,
 *   numcodecs' "zlib" compressor = zlib stream, RFC 1950) with consolidated metadata
 *   (`.zmetadata`, zarr-python's consolidate_metadata format), `_FillValue` moved into
 *   `fill_value` as xarray does;
 * - Zarr v3 (Zarr core specification 3.0: `zarr.json` per node, chunk keys `c/t/y/x`, codecs
 *   "bytes" little-endian then "gzip", RFC 1952), without consolidated metadata (read by listing
 *   the folder), `_FillValue` kept as an attribute.
 * For tests and benchmarks only.
 */
import { mkdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { deflateSync, gzipSync } from 'node:zlib';
import { openSourceFile } from '../../pipeline/read/open-file.ts';
import { recognizeEra5 } from '../../pipeline/read/era5-variables.ts';
import type { RawType, SourceVariable } from '../../pipeline/read/source.ts';

/** Store names of the ERA5 short names (the data store's request names). */
export const STORE_NAME: Record<string, string> = {
  t2m: '2m_temperature',
  d2m: '2m_dewpoint_temperature',
  u10: '10m_u_component_of_wind',
  v10: '10m_v_component_of_wind',
  sp: 'surface_pressure',
  ssrd: 'surface_solar_radiation_downwards',
  fdir: 'total_sky_direct_solar_radiation_at_surface',
  strd: 'surface_thermal_radiation_downwards',
  lsm: 'land_sea_mask',
};

const V2_DTYPE: Partial<Record<RawType, string>> = {
  byte: '|i1',
  ubyte: '|u1',
  short: '<i2',
  ushort: '<u2',
  int: '<i4',
  uint: '<u4',
  int64: '<i8',
  float: '<f4',
  double: '<f8',
};
const V3_DTYPE: Partial<Record<RawType, string>> = {
  byte: 'int8',
  ubyte: 'uint8',
  short: 'int16',
  ushort: 'uint16',
  int: 'int32',
  uint: 'uint32',
  int64: 'int64',
  float: 'float32',
  double: 'float64',
};
const CTOR: Partial<
  Record<
    RawType,
    new (
      n: number,
    ) => ArrayLike<number> & {
      buffer: ArrayBufferLike;
      byteOffset: number;
      byteLength: number;
      set(a: ArrayLike<number>, o?: number): void;
      fill(v: number): unknown;
    }
  >
> = {
  byte: Int8Array,
  ubyte: Uint8Array,
  short: Int16Array,
  ushort: Uint16Array,
  int: Int32Array,
  uint: Uint32Array,
  float: Float32Array,
  double: Float64Array,
  int64: Float64Array,
};

export interface WriteZarrOptions {
  version: 2 | 3;
  /** Chunk length along time [hours]; the grid is one chunk. */
  chunkHours: number;
  /** zlib / gzip level [0–9]. */
  level?: number;
  /** Leave out these store arrays (for a store missing a variable). */
  omit?: string[];
}

const jsonNumber = (x: number): number | string => (Number.isNaN(x) ? 'NaN' : x === Infinity ? 'Infinity' : x === -Infinity ? '-Infinity' : x);

/** Writes (adds to) the store at `dir` from the NetCDF files `sources`. Returns the array names written. */
export async function writeZarrFromNetcdf(sources: string[], dir: string, o: WriteZarrOptions): Promise<string[]> {
  mkdirSync(dir, { recursive: true });
  const level = o.level ?? 1;
  const meta: Record<string, unknown> = {};
  const written: string[] = [];
  if (o.version === 2) {
    writeFileSync(join(dir, '.zgroup'), JSON.stringify({ zarr_format: 2 }));
    writeFileSync(join(dir, '.zattrs'), '{}');
    meta['.zgroup'] = { zarr_format: 2 };
    meta['.zattrs'] = {};
  } else writeFileSync(join(dir, 'zarr.json'), JSON.stringify({ zarr_format: 3, node_type: 'group', attributes: {} }));
  for (const src of sources) {
    const sf = await openSourceFile(src);
    try {
      for (const v of sf.variables) {
        const role = v.dims.length >= 2 ? recognizeEra5(v) : undefined;
        if (v.dims.length >= 2 && !role) continue;
        if (v.dims.length === 1 && v.dims[0] !== v.name) continue; // coordinates only
        if (v.dims.length === 0) continue;
        const name = role ? STORE_NAME[role.short] : v.name;
        if (written.includes(name) || o.omit?.includes(name)) continue;
        await writeArray(sf, v, name, dir, o, level, meta);
        written.push(name);
      }
    } finally {
      await sf.close();
    }
  }
  if (o.version === 2) writeFileSync(join(dir, '.zmetadata'), JSON.stringify({ metadata: meta, zarr_consolidated_format: 1 }));
  return written;
}

async function writeArray(
  sf: Awaited<ReturnType<typeof openSourceFile>>,
  v: SourceVariable,
  name: string,
  dir: string,
  o: WriteZarrOptions,
  level: number,
  meta: Record<string, unknown>,
): Promise<void> {
  const Ctor = CTOR[v.type];
  if (!Ctor) throw new Error(`${v.name}: type ${v.type} not written`);
  const type: RawType = v.type === 'int64' ? 'double' : v.type; // int64 values are read as doubles
  const chunks = v.shape.map((n, i) => (i === 0 && v.dims.length > 1 ? Math.min(o.chunkHours, n) : n));
  const attrs: Record<string, unknown> = {};
  for (const [k, x] of Object.entries(v.attrs))
    attrs[k] = typeof x === 'number' ? jsonNumber(x) : Array.isArray(x) ? x.map((e) => (typeof e === 'number' ? jsonNumber(e) : e)) : x;
  let fill: number | null = null;
  if (o.version === 2 && typeof v.attrs._FillValue === 'number') {
    fill = v.attrs._FillValue;
    delete attrs._FillValue;
  }
  const a = join(dir, name);
  mkdirSync(a, { recursive: true });
  if (o.version === 2) {
    const zarray = {
      zarr_format: 2,
      shape: v.shape,
      chunks,
      dtype: V2_DTYPE[type],
      compressor: { id: 'zlib', level },
      fill_value: fill === null ? null : jsonNumber(fill),
      order: 'C',
      filters: null,
    };
    const zattrs = { ...attrs, _ARRAY_DIMENSIONS: v.dims };
    writeFileSync(join(a, '.zarray'), JSON.stringify(zarray));
    writeFileSync(join(a, '.zattrs'), JSON.stringify(zattrs));
    meta[`${name}/.zarray`] = zarray;
    meta[`${name}/.zattrs`] = zattrs;
  } else {
    const fv = typeof v.attrs._FillValue === 'number' ? jsonNumber(v.attrs._FillValue) : type === 'float' || type === 'double' ? 'NaN' : 0;
    writeFileSync(
      join(a, 'zarr.json'),
      JSON.stringify({
        zarr_format: 3,
        node_type: 'array',
        shape: v.shape,
        data_type: V3_DTYPE[type],
        chunk_grid: { name: 'regular', configuration: { chunk_shape: chunks } },
        chunk_key_encoding: { name: 'default', configuration: { separator: '/' } },
        fill_value: fv,
        codecs: [
          { name: 'bytes', configuration: { endian: 'little' } },
          { name: 'gzip', configuration: { level } },
        ],
        attributes: attrs,
        dimension_names: v.dims,
      }),
    );
  }
  // Chunks along the first dimension only (the grid is one chunk); the last one padded to full size.
  const n0 = v.shape[0];
  const per = chunks.slice(1).reduce((p, c) => p * c, 1);
  for (let c0 = 0, k = 0; c0 < n0; c0 += chunks[0], k++) {
    const cnt = [Math.min(chunks[0], n0 - c0), ...v.shape.slice(1)];
    const raw = await sf.read(v, [c0, ...v.shape.slice(1).map(() => 0)], cnt);
    const buf = new Ctor(chunks[0] * per);
    if (fill !== null) buf.fill(fill);
    buf.set(raw as ArrayLike<number>);
    const bytes = new Uint8Array(buf.buffer, buf.byteOffset, buf.byteLength);
    const key = o.version === 2 ? [k, ...chunks.slice(1).map(() => 0)].join('.') : ['c', k, ...chunks.slice(1).map(() => 0)].join('/');
    const file = join(a, key);
    if (o.version === 3) mkdirSync(join(file, '..'), { recursive: true });
    writeFileSync(file, o.version === 2 ? deflateSync(bytes, { level }) : gzipSync(bytes, { level }));
  }
}

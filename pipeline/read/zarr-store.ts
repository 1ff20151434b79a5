/**
 * A Zarr store (v2 or v3; a local folder or an HTTP(S) URL) as a {@link SourceFile}, read with
 * zarrita: the store's arrays are the variables, their dimension names come from xarray's
 * `_ARRAY_DIMENSIONS` attribute (Zarr v2) or `dimension_names` (Zarr v3 specification §"Array
 * metadata"), and every read asks zarrita for a hyperslab (`zarr.get` with slices), which fetches
 * and decodes only the chunks it touches. The layout expected is that of the analysis-ready ERA5
 * stores: one array per variable, named by the data store's long variable names
 * (`2m_temperature`, …; era5-variables.ts), dims time × latitude × longitude, hourly, with CF
 * `units` / `calendar` on `time` and, where the values are packed, `scale_factor` / `add_offset`.
 *
 * Where the metadata comes from: consolidated metadata (`.zmetadata`, or `consolidated_metadata`
 * in a v3 `zarr.json`) when the store has it; otherwise a local folder is listed (one level:
 * the analysis-ready stores are flat) and a URL is refused (`ZarrStoreUnlisted`: HTTP has no
 * listing).
 *
 * The digest of a store is the SHA-256 of its arrays' metadata (shape, chunks, type, codecs,
 * attributes), not of its chunks: a cloud store of the whole record is far too big to hash.
 * A store whose chunks change without its metadata changing keeps its digest (stated in
 * pipeline/read/README.md).
 */
import { createHash } from 'node:crypto';
import { readdir, stat } from 'node:fs/promises';
import { join, resolve } from 'node:path';
import { gunzipSync, inflateSync } from 'node:zlib';
import * as zarr from 'zarrita';
import FileSystemStore from '@zarrita/storage/fs';
import { HeathoursError } from '../model/errors.ts';
import { NetcdfFileNotFound, ZarrChunkUnreadable, ZarrGridMismatch, ZarrMetadataInvalid, ZarrStoreUnlisted, ZarrStoreUnreachable } from './errors.ts';
import { ChunkCarry } from './chunk-carry.ts';
import {
  denseStrides,
  product,
  type AttrValue,
  type RawArray,
  type RawType,
  type SlabRequest,
  type SlabSink,
  type SourceDimension,
  type SourceFile,
  type SourceVariable,
} from './source.ts';

/**
 * zlib (RFC 1950) and gzip (RFC 1952) chunks inflated by Node's own zlib in one synchronous call,
 * instead of zarrita's default (the web DecompressionStream, a stream per chunk). Registered for
 * the v3 names and numcodecs' v2 ids; a chunk that does not inflate throws zlib's error
 * (`ZarrChunkUnreadable` below).
 */
function inflateCodec(gzip: boolean) {
  return class Inflate {
    kind = 'bytes_to_bytes' as const;
    static fromConfig() {
      return new Inflate();
    }
    encode(): never {
      throw new Error(`${gzip ? 'gzip' : 'zlib'} encode is not used by heathours`);
    }
    async decode(bytes: Uint8Array): Promise<Uint8Array> {
      const out = gzip ? gunzipSync(bytes) : inflateSync(bytes);
      return new Uint8Array(out.buffer, out.byteOffset, out.byteLength);
    }
  };
}
for (const [name, gzip] of [
  ['zlib', false],
  ['numcodecs.zlib', false],
  ['gzip', true],
  ['numcodecs.gzip', true],
] as const) {
  const codec = inflateCodec(gzip);
  zarr.registry.set(name, () => codec as never);
}

/** Time limit of one HTTP request to a store [ms]. */
export const ZARR_HTTP_TIMEOUT_MS = 30_000;

/** Whether an input names a Zarr store: an HTTP(S) URL, or a path ending in `.zarr`. */
export function isZarrLocation(p: string): boolean {
  return /^https?:\/\//i.test(p) || /\.zarr\/?$/i.test(p);
}

export interface ZarrOpenOptions {
  /** Time limit of one HTTP request [ms]; default {@link ZARR_HTTP_TIMEOUT_MS}. */
  timeoutMs?: number;
}

/** Storage type of a zarrita data type. */
function rawTypeOf(dtype: string): RawType {
  switch (dtype) {
    case 'int8':
      return 'byte';
    case 'uint8':
      return 'ubyte';
    case 'int16':
      return 'short';
    case 'uint16':
      return 'ushort';
    case 'int32':
      return 'int';
    case 'uint32':
      return 'uint';
    case 'int64':
      return 'int64';
    case 'uint64':
      return 'uint64';
    case 'float32':
      return 'float';
    case 'float64':
      return 'double';
    default:
      return /^v2:[US]/.test(dtype) || dtype === 'string' ? 'string' : 'other';
  }
}

/** Attributes that are Zarr / xarray machinery, not the variable's. */
const HIDDEN = new Set(['_ARRAY_DIMENSIONS', '_NCZARR_ARRAY', '_NCZARR_ATTR']);

/** A JSON attribute as an attribute value (numbers, text, lists of either), or undefined. */
function attrValue(x: unknown): AttrValue | undefined {
  if (typeof x === 'number' || typeof x === 'string') return x;
  if (typeof x === 'boolean') return x ? 1 : 0;
  if (Array.isArray(x) && x.length > 0) {
    if (x.every((e) => typeof e === 'number')) return x.length === 1 ? x[0] : (x as number[]);
    if (x.every((e) => typeof e === 'string')) return x.length === 1 ? x[0] : (x as string[]);
  }
  return undefined;
}

/** Why a request to the store failed, when the store could not be reached (else null). */
function unreachableReason(e: unknown): string | null {
  if (!(e instanceof Error)) return null;
  if (e.name === 'TimeoutError' || e.name === 'AbortError') return `no answer within the time limit (${e.message})`;
  const cause = (e as { cause?: { code?: string; message?: string } }).cause;
  if (e instanceof TypeError && /fetch failed/i.test(e.message)) return cause?.code ? `${cause.code}${cause.message ? ` (${cause.message})` : ''}` : e.message;
  if (/Unexpected response status|status \d{3}/i.test(e.message)) return e.message;
  return null;
}

/** `location` without a final slash, folders made absolute. */
function normalise(location: string): string {
  const l = location.replace(/\/+$/, '');
  return /^https?:\/\//i.test(l) ? l : resolve(l);
}

/** Opens a Zarr store as a source of variables; closing it releases nothing but its caches. */
export async function openZarrStore(location: string, opts: ZarrOpenOptions = {}): Promise<SourceFile> {
  const path = normalise(location);
  const http = /^https?:\/\//i.test(path);
  const where = { file: path };
  const timeoutMs = opts.timeoutMs ?? ZARR_HTTP_TIMEOUT_MS;
  let base: zarr.AsyncReadable;
  if (http) {
    base = new zarr.FetchStore(path, { fetch: (req: Request) => fetch(new Request(req, { signal: AbortSignal.timeout(timeoutMs) })) });
  } else {
    const s = await stat(path).catch(() => null);
    if (!s || !s.isDirectory()) throw NetcdfFileNotFound({ path }, where);
    base = new FileSystemStore(path);
  }
  // Every call into zarrita: a failure to reach the store, or metadata zarrita refuses, becomes catalogued.
  const guard = async <T>(what: string, fn: () => Promise<T>): Promise<T> => {
    try {
      return await fn();
    } catch (e) {
      if (e instanceof HeathoursError) throw e;
      const why = unreachableReason(e);
      if (why !== null) throw ZarrStoreUnreachable({ location: path, detail: `${what}: ${why}`, timeoutS: timeoutMs / 1000 }, where);
      throw ZarrMetadataInvalid({ location: path, detail: `${what}: ${e instanceof Error ? e.message : String(e)}` }, where);
    }
  };

  // Consolidated metadata when there is some; a damaged .zmetadata is an error, not a reason to list the folder.
  const store = await guard('reading consolidated metadata', async () => {
    try {
      return await zarr.withConsolidatedMetadata(base);
    } catch (e) {
      if ((await base.get('/.zmetadata')) !== undefined) throw e;
      return base;
    }
  });
  let names: string[];
  if ('contents' in store && typeof store.contents === 'function') {
    names = (store.contents() as Array<{ path: string; kind: string }>).filter((c) => c.kind === 'array').map((c) => c.path.replace(/^\//, ''));
  } else if (http) {
    // Without consolidated metadata a URL cannot be listed; say so after making sure the store is there.
    await guard('reading the root group', () => zarr.open(zarr.root(base), { kind: 'group' }));
    throw ZarrStoreUnlisted({ location: path }, where);
  } else {
    names = [];
    for (const e of await readdir(path, { withFileTypes: true })) {
      if (!e.isDirectory()) continue;
      const marks = await readdir(join(path, e.name)).catch(() => [] as string[]);
      if (marks.includes('.zarray') || marks.includes('zarr.json')) names.push(e.name);
    }
    if (names.length === 0) {
      const top = await readdir(path).catch(() => [] as string[]);
      if (!top.includes('.zgroup') && !top.includes('zarr.json') && !top.includes('.zmetadata')) {
        throw ZarrMetadataInvalid({ location: path, detail: 'the folder has no .zgroup, .zmetadata or zarr.json: it is not a Zarr store' }, where);
      }
    }
  }
  names.sort();

  const variables: SourceVariable[] = [];
  const arrays = new Map<SourceVariable, zarr.Array<zarr.DataType, zarr.Readable>>();
  const dims = new Map<string, SourceDimension & { by: string }>();
  const metaDigest = createHash('sha256');
  for (const name of names) {
    const arr = await guard(`opening array ${name}`, () => zarr.open(zarr.root(store).resolve(name), { kind: 'array' }));
    const shape = arr.shape.map(Number);
    const dn = arr.dimensionNames ?? (shape.length === 1 ? [name] : undefined);
    if (!dn || dn.length !== shape.length) {
      throw ZarrMetadataInvalid(
        {
          location: path,
          detail: `array ${name} names no dimensions (xarray's _ARRAY_DIMENSIONS attribute in Zarr v2, dimension_names in Zarr v3) for its ${shape.length} axes`,
        },
        { file: path, variable: name },
      );
    }
    const type = rawTypeOf(String(arr.dtype));
    const attrs: Record<string, AttrValue> = {};
    const attrTypes: Record<string, RawType> = {};
    for (const [k, x] of Object.entries(arr.attrs)) {
      if (HIDDEN.has(k)) continue;
      const val = attrValue(x);
      if (val === undefined) continue;
      attrs[k] = val;
      attrTypes[k] = typeof val === 'number' || (Array.isArray(val) && typeof val[0] === 'number') ? 'double' : 'char';
    }
    // xarray keeps the CF _FillValue as the array's fill_value; give it back as the attribute (NaN needs none: it is missing anyway).
    const fv = arr.fillValue;
    if (!('_FillValue' in attrs) && typeof fv === 'number' && !Number.isNaN(fv) && type !== 'string') {
      attrs._FillValue = fv;
      attrTypes._FillValue = type;
    }
    for (let i = 0; i < shape.length; i++) {
      const d = dims.get(dn[i]);
      if (!d) dims.set(dn[i], { name: dn[i], size: shape[i], unlimited: false, by: name });
      else if (d.size !== shape[i]) {
        throw ZarrGridMismatch(
          { location: path, dimension: dn[i], variableA: d.by, sizeA: d.size, variableB: name, sizeB: shape[i] },
          { file: path, variable: name },
        );
      }
    }
    const v: SourceVariable = { name, dims: [...dn], shape, type, attrs, attrTypes };
    variables.push(v);
    arrays.set(v, arr);
    metaDigest.update(
      JSON.stringify({
        name,
        shape,
        chunks: arr.chunks,
        dtype: String(arr.dtype),
        dims: dn,
        fill: String(fv),
        attrs: Object.entries(arr.attrs).sort(([a], [b]) => (a < b ? -1 : 1)),
      }),
    );
  }
  const digest = metaDigest.digest('hex');
  // Nominal size [bytes]: the values as stored, uncompressed (a store's real size would need a listing).
  let bytes = 0;
  for (const v of variables)
    bytes += product(v.shape) * (String(arrays.get(v)!.dtype).match(/(\d+)$/) ? Number(String(arrays.get(v)!.dtype).match(/(\d+)$/)![1]) / 8 : 1);

  const arrOf = (v: SourceVariable) => {
    const a = arrays.get(v);
    if (!a) throw new Error(`variable ${v.name} is not in ${path}`);
    return a;
  };

  /** Values [start, start + count) of `v` as a dense row-major typed array. */
  async function readRaw(v: SourceVariable, start: number[], count: number[]): Promise<{ data: unknown; strides: number[] }> {
    const arr = arrOf(v);
    const sel = start.map((s, i) => zarr.slice(s, s + count[i]));
    try {
      const out = await zarr.get(arr, v.shape.length === 0 ? null : sel);
      if (typeof out !== 'object' || out === null || !('data' in out)) return { data: out, strides: [] };
      return { data: out.data, strides: out.stride };
    } catch (e) {
      const why = unreachableReason(e);
      if (why !== null)
        throw ZarrStoreUnreachable({ location: path, detail: `reading ${v.name}: ${why}`, timeoutS: timeoutMs / 1000 }, { file: path, variable: v.name });
      const slab = start.map((s, i) => `${s}:${s + count[i]}`).join(', ');
      throw ZarrChunkUnreadable(
        { location: path, variable: v.name, slab: `[${slab}]`, detail: e instanceof Error ? e.message : String(e) },
        { file: path, variable: v.name },
      );
    }
  }

  function asRaw(v: SourceVariable, data: unknown): RawArray {
    if (data instanceof BigInt64Array || data instanceof BigUint64Array) return Float64Array.from(data, (x) => Number(x));
    if (typeof data === 'number') return Float64Array.of(data);
    if (typeof data === 'bigint') return Float64Array.of(Number(data));
    if (ArrayBuffer.isView(data) && !(data instanceof DataView)) return data as RawArray;
    throw ZarrMetadataInvalid({ location: path, detail: `array ${v.name}: values of type ${v.type} are not numbers` }, { file: path, variable: v.name });
  }

  async function read(v: SourceVariable, start: number[], count: number[]): Promise<RawArray> {
    const { data } = await readRaw(v, start, count);
    return asRaw(v, data);
  }

  // The last chunk(s) read of each variable along its first dimension, kept for the next block.
  const carry = new ChunkCarry<SourceVariable>();

  async function readSlabs(reqs: SlabRequest[], sink: SlabSink): Promise<void> {
    for (let i = 0; i < reqs.length; i++) {
      const { v, start, count } = reqs[i];
      if (count.some((c) => c === 0)) continue;
      // 64-bit integers are copied to doubles: their type is then 'double'.
      const typeOf = (raw: RawArray): RawType => (raw instanceof Float64Array && (v.type === 'int64' || v.type === 'uint64') ? 'double' : v.type);
      if (v.shape.length === 0) {
        const raw = await read(v, start, count);
        sink(i, { data: raw, view: null, type: typeOf(raw), base: 0, strides: [] }, 0, 1);
        continue;
      }
      // As the NetCDF-4 reader does (hdf5-file.ts): whole chunks along the first dimension, each
      // decoded once per block, and the last one kept for the block after.
      await carry.read(
        v,
        start,
        count,
        arrOf(v).chunks[0],
        v.shape[0],
        async (off, cnt) => {
          const { data, strides } = await readRaw(v, off, cnt);
          return { data: asRaw(v, data), strides: strides.length === cnt.length ? strides : denseStrides(cnt) };
        },
        (data, base, strides, at, n) => sink(i, { data, view: null, type: typeOf(data), base, strides }, at, n),
      );
    }
  }

  return {
    path,
    format: 'zarr',
    bytes,
    dims: [...dims.values()].map(({ name, size, unlimited }) => ({ name, size, unlimited })),
    variables,
    globalAttrs: {},
    read,
    readSlabs,
    async readNumbers(v) {
      const raw = await read(
        v,
        v.shape.map(() => 0),
        v.shape,
      );
      return raw instanceof Float64Array ? raw : Float64Array.from(raw);
    },
    async readStrings(v) {
      const { data } = await readRaw(
        v,
        v.shape.map(() => 0),
        v.shape,
      );
      if (data && typeof data === 'object' && Symbol.iterator in data) return Array.from(data as Iterable<unknown>, (x) => String(x).trim());
      return [String(data)];
    },
    digest: async () => digest,
    async close() {
      carry.clear();
      arrays.clear();
    },
  };
}

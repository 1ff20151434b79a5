/**
 * NetCDF-4 files, read through HDF5 with h5wasm. Dimensions come from HDF5 dimension scales
 * (the NetCDF-4 storage model: a coordinate variable is a dimension scale, other variables carry
 * DIMENSION_LIST), groups are walked recursively, and data are read by hyperslab
 * (`Dataset.slice`), so memory is bounded by what is requested.
 */
import { open } from 'node:fs/promises';
import type { Dataset as H5Dataset, Group as H5Group, File as H5File } from 'h5wasm/node';

/** h5wasm, loaded on first use: its WebAssembly heap costs hundreds of MB of RSS, so classic-only runs never load it. */
type H5 = typeof import('h5wasm/node').default;
let h5wasm: H5;
/** The Emscripten module behind h5wasm (its heap and the raw hyperslab reader). */
interface H5Module {
  HEAPU8: Uint8Array;
  _malloc(n: number): number;
  _free(p: number): void;
  get_dataset_data(fileId: bigint, path: string, count: bigint[], offset: bigint[], stride: bigint[], ptr: bigint): number;
}
let h5module: H5Module;
import { NetcdfFileTruncated, NetcdfNotNetcdf4, NetcdfReadFailed } from './errors.ts';
import { denseStrides, product, type AttrValue, type RawArray, type RawType, type SlabRequest, type SlabSink, type SourceDimension, type SourceFile, type SourceVariable } from './source.ts';

/** HDF5 attributes that belong to the NetCDF-4 / dimension-scale machinery, not to the user. */
const HIDDEN_ATTRS = new Set(['CLASS', 'NAME', 'REFERENCE_LIST', 'DIMENSION_LIST', '_Netcdf4Coordinates', '_Netcdf4Dimid', '_NCProperties', '_nc3_strict']);
/** NAME of a dimension scale that is a dimension without a coordinate variable (netCDF-C). */
const PURE_DIMENSION = 'This is a netCDF dimension but not a netCDF variable';

interface H5Metadata { type: number; size: number; signed?: boolean; vlen?: boolean; littleEndian?: boolean; shape?: number[] | null; maxshape?: number[] | null; chunks?: number[] | null }

/** Typed-array constructor for values read straight from the wasm heap, by raw type. */
const HEAP_VIEW: Partial<Record<RawType, new (b: ArrayBufferLike, o: number, n: number) => RawArray>> = {
  byte: Int8Array, ubyte: Uint8Array, short: Int16Array, ushort: Uint16Array, int: Int32Array, uint: Uint32Array, float: Float32Array, double: Float64Array,
};

/** The last chunk(s) read of a variable along its first dimension, kept for the next block. */
interface Carry {
  /** Start and count of the other dimensions, as text. */
  key: string;
  /** First-dimension indices [from, to) held. */
  from: number;
  to: number;
  data: RawArray;
  strides: number[];
}

let ready: Promise<unknown> | undefined;

/**
 * End-of-file address [bytes] the HDF5 superblock records (HDF5 File Format Specification,
 * §II.A "Disk Format: Level 0A - Format Signature and Superblock", versions 0-3), or null.
 */
export function hdf5EndOfFileAddress(head: Uint8Array): number | null {
  if (head.length < 16) return null;
  const version = head[8];
  const view = new DataView(head.buffer, head.byteOffset, head.byteLength);
  let sizeOfOffsets: number;
  let at: number;
  if (version === 0 || version === 1) {
    sizeOfOffsets = head[13];
    at = (version === 0 ? 24 : 28) + 2 * sizeOfOffsets;
  } else if (version === 2 || version === 3) {
    sizeOfOffsets = head[9];
    at = 12 + 2 * sizeOfOffsets;
  } else return null;
  if (sizeOfOffsets !== 8 && sizeOfOffsets !== 4) return null;
  if (head.length < at + sizeOfOffsets) return null;
  return sizeOfOffsets === 8 ? Number(view.getBigUint64(at, true)) : view.getUint32(at, true);
}

/** Opens a NetCDF-4 file whose size [bytes] is known; rejects truncated and non-NetCDF HDF5. */
export async function openHdf5File(path: string, bytes: number): Promise<SourceFile> {
  const fh = await open(path, 'r');
  const head = new Uint8Array(Math.min(bytes, 128));
  try {
    await fh.read(head, 0, head.length, 0);
  } finally {
    await fh.close();
  }
  const eof = hdf5EndOfFileAddress(head);
  if (eof === null && bytes < 48) throw NetcdfFileTruncated({ path, bytes, expected: null, detail: 'the HDF5 superblock is incomplete' }, { file: path });
  if (eof !== null && bytes < eof) throw NetcdfFileTruncated({ path, bytes, expected: eof, detail: 'the HDF5 superblock records a longer file' }, { file: path });
  ready ??= import('h5wasm/node').then(async (m) => {
    h5wasm = m.default;
    await h5wasm.ready;
    h5module = m.Module as unknown as H5Module;
  });
  await ready;
  let f: H5File;
  try {
    f = new h5wasm.File(path, 'r');
  } catch (e) {
    throw NetcdfReadFailed({ path, detail: `the HDF5 library could not open it (${(e as Error).message ?? e})` }, { file: path });
  }
  try {
    return buildHdf5File(f, path, bytes);
  } catch (e) {
    f.close();
    throw e;
  }
}

function rawType(m: H5Metadata): RawType {
  if (m.type === 0) {
    const s = m.signed !== false;
    switch (m.size) {
      case 1: return s ? 'byte' : 'ubyte';
      case 2: return s ? 'short' : 'ushort';
      case 4: return s ? 'int' : 'uint';
      case 8: return s ? 'int64' : 'uint64';
    }
  }
  if (m.type === 1) return m.size === 4 ? 'float' : m.size === 8 ? 'double' : 'other';
  if (m.type === 3) return 'string';
  return 'other';
}

/** An attribute or dataset value as plain numbers or text; 1-element arrays become scalars. */
function plainValue(v: unknown): AttrValue | undefined {
  if (v === null || v === undefined) return undefined;
  if (typeof v === 'string' || typeof v === 'number') return v;
  if (typeof v === 'bigint') return Number(v);
  if (typeof v === 'boolean') return v ? 1 : 0;
  if (ArrayBuffer.isView(v)) {
    const arr = Array.from(v as unknown as ArrayLike<number | bigint>, (x) => Number(x));
    return arr.length === 1 ? arr[0] : arr;
  }
  if (Array.isArray(v)) {
    if (v.every((x) => typeof x === 'string')) return v.length === 1 ? (v[0] as string) : (v as string[]);
    if (v.every((x) => typeof x === 'number' || typeof x === 'bigint')) {
      const arr = v.map((x) => Number(x));
      return arr.length === 1 ? arr[0] : arr;
    }
  }
  return undefined;
}

function buildHdf5File(f: H5File, path: string, bytes: number): SourceFile {
  const datasets: Array<{ name: string; ds: H5Dataset }> = [];
  const walk = (g: H5Group, prefix: string) => {
    for (const key of g.keys()) {
      const e = g.get(key);
      if (e instanceof h5wasm.Group) walk(e, `${prefix}${key}/`);
      else if (e instanceof h5wasm.Dataset) datasets.push({ name: `${prefix}${key}`, ds: e });
    }
  };
  walk(f, '');
  const rootAttrs = f.attrs;
  let netcdf = '_NCProperties' in rootAttrs;
  const dimSizes = new Map<string, SourceDimension>();
  const variables: SourceVariable[] = [];
  const byVar = new Map<SourceVariable, H5Dataset>();
  for (const { name, ds } of datasets) {
    const meta = ds.metadata as unknown as H5Metadata;
    const shape = ds.shape ?? [];
    const attrs: Record<string, AttrValue> = {};
    const attrTypes: Record<string, RawType> = {};
    const raw = ds.attrs;
    const isScale = raw.CLASS !== undefined && plainValue(safe(() => raw.CLASS.value)) === 'DIMENSION_SCALE';
    if (isScale || 'DIMENSION_LIST' in raw || '_Netcdf4Dimid' in raw || '_Netcdf4Coordinates' in raw) netcdf = true;
    for (const [an, a] of Object.entries(raw)) {
      if (HIDDEN_ATTRS.has(an)) continue;
      const val = plainValue(safe(() => a.value));
      if (val === undefined) continue;
      attrs[an] = val;
      attrTypes[an] = rawType(a.metadata as unknown as H5Metadata);
    }
    const dims: string[] = [];
    for (let i = 0; i < shape.length; i++) {
      let dn: string | undefined;
      if (isScale && shape.length === 1) dn = name;
      else {
        const scales = safe(() => ds.get_attached_scales(i)) ?? [];
        if (scales.length > 0) dn = scales[0].replace(/^\//, '');
      }
      dn ??= `${name}_dim${i}`;
      dims.push(dn);
      const maxshape = meta.maxshape ?? ds.shape ?? [];
      const unlimited = (maxshape[i] ?? 0) > Number.MAX_SAFE_INTEGER || (maxshape[i] ?? 0) < 0;
      if (!dimSizes.has(dn)) dimSizes.set(dn, { name: dn, size: shape[i], unlimited });
    }
    const nameAttr = isScale ? plainValue(safe(() => raw.NAME.value)) : undefined;
    if (typeof nameAttr === 'string' && nameAttr.startsWith(PURE_DIMENSION)) continue;
    const v: SourceVariable = { name, dims, shape, type: rawType(meta), attrs, attrTypes };
    variables.push(v);
    byVar.set(v, ds);
  }
  if (!netcdf) {
    f.close();
    throw NetcdfNotNetcdf4({ path }, { file: path });
  }
  const globalAttrs: Record<string, AttrValue> = {};
  for (const [an, a] of Object.entries(rootAttrs)) {
    if (HIDDEN_ATTRS.has(an)) continue;
    const val = plainValue(safe(() => a.value));
    if (val !== undefined) globalAttrs[an] = val;
  }
  const dsOf = (v: SourceVariable): H5Dataset => {
    const ds = byVar.get(v);
    if (!ds) throw new Error(`variable ${v.name} is not in ${path}`);
    return ds;
  };
  const fail = (v: SourceVariable, e: unknown) =>
    NetcdfReadFailed({ path, detail: `variable ${v.name}: ${(e as Error).message ?? e}` }, { file: path, variable: v.name });

  async function read(v: SourceVariable, start: number[], count: number[]): Promise<RawArray> {
    const ds = dsOf(v);
    let out: unknown;
    try {
      out = v.shape.length === 0 ? ds.value : ds.slice(start.map((s, i) => [s, s + count[i]]));
    } catch (e) {
      throw fail(v, e);
    }
    if (out instanceof BigInt64Array || out instanceof BigUint64Array) return Float64Array.from(out, (x) => Number(x));
    if (typeof out === 'number') return Float64Array.of(out);
    if (typeof out === 'bigint') return Float64Array.of(Number(out));
    if (ArrayBuffer.isView(out)) return out as RawArray;
    throw fail(v, new Error(`values of type ${v.type} are not numbers`));
  }

  // A wasm heap buffer reused by every hyperslab read of this file, and the carried chunks.
  let heapPtr = 0;
  let heapBytes = 0;
  const carry = new Map<SourceVariable, Carry>();

  /**
   * Reads a hyperslab into the reused heap buffer and returns a view on it (valid until the next
   * read or allocation in wasm); falls back to `slice` (a copy) for other value types.
   */
  function readDirect(v: SourceVariable, off: number[], cnt: number[]): RawArray | null {
    const ds = dsOf(v);
    const meta = ds.metadata as unknown as H5Metadata;
    const View = HEAP_VIEW[v.type];
    if (!View || meta.vlen || meta.littleEndian === false) return null;
    const total = product(cnt);
    const nbytes = total * meta.size;
    if (heapBytes < nbytes) {
      if (heapPtr) h5module._free(heapPtr);
      heapBytes = 0;
      heapPtr = h5module._malloc(nbytes);
      if (!heapPtr) throw fail(v, new Error(`could not allocate ${nbytes} bytes`));
      heapBytes = nbytes;
    }
    const ds0 = ds as unknown as { file_id: bigint; path: string };
    let status: number;
    try {
      status = h5module.get_dataset_data(ds0.file_id, ds0.path, cnt.map(BigInt), off.map(BigInt), cnt.map(() => 1n), BigInt(heapPtr));
    } catch (e) {
      throw fail(v, e);
    }
    if (status < 0) throw fail(v, new Error(`HDF5 read failed (status ${status})`));
    return new View(h5module.HEAPU8.buffer, heapPtr, total);
  }

  async function readSlabs(reqs: SlabRequest[], sink: SlabSink): Promise<void> {
    for (let i = 0; i < reqs.length; i++) {
      const { v, start, count } = reqs[i];
      if (v.shape.length === 0 || count.some((c) => c === 0)) {
        if (v.shape.length === 0) sink(i, { data: await read(v, start, count), view: null, type: v.type, base: 0, strides: [] }, 0, 1);
        continue;
      }
      const key = `${start.slice(1).join(',')}|${count.slice(1).join(',')}`;
      let s0 = start[0];
      const e0 = start[0] + count[0];
      let done = 0;
      const c = carry.get(v);
      if (c && c.key === key && s0 >= c.from && s0 < c.to) {
        const upto = Math.min(e0, c.to);
        sink(i, { data: c.data, view: null, type: v.type, base: (s0 - c.from) * c.strides[0], strides: c.strides }, 0, upto - s0);
        done = upto - s0;
        s0 = upto;
      }
      if (s0 >= e0) continue;
      // Whole chunks along the first dimension: each chunk is inflated once per block, and the
      // last one is kept for the block after (blocks rarely end on a chunk boundary).
      const meta = dsOf(v).metadata as unknown as H5Metadata;
      const C = meta.chunks?.[0] ?? 1;
      const a0 = C > 1 ? Math.floor(s0 / C) * C : s0;
      const a1 = C > 1 ? Math.min(v.shape[0], Math.ceil(e0 / C) * C) : e0;
      const off = [a0, ...start.slice(1)];
      const cnt = [a1 - a0, ...count.slice(1)];
      const strides = denseStrides(cnt);
      const data = readDirect(v, off, cnt) ?? (await read(v, off, cnt));
      sink(i, { data, view: null, type: v.type, base: (s0 - a0) * strides[0], strides }, done, e0 - s0);
      if (a1 > e0) {
        const k0 = Math.max(a0, Math.floor((a1 - 1) / C) * C);
        carry.set(v, { key, from: k0, to: a1, data: data.slice((k0 - a0) * strides[0], (a1 - a0) * strides[0]), strides });
      } else carry.delete(v);
    }
  }

  return {
    path,
    format: 'netcdf4',
    bytes,
    dims: [...dimSizes.values()],
    variables,
    globalAttrs,
    read,
    readSlabs,
    async readNumbers(v) {
      const raw = await this.read(v, v.shape.map(() => 0), v.shape);
      return raw instanceof Float64Array ? raw : Float64Array.from(raw);
    },
    async readStrings(v) {
      let out: unknown;
      try {
        out = dsOf(v).value;
      } catch (e) {
        throw fail(v, e);
      }
      if (typeof out === 'string') return [out];
      if (Array.isArray(out)) return out.map((x) => String(x));
      if (out instanceof Uint8Array || out instanceof Int8Array) {
        const len = v.shape.length > 0 ? v.shape[v.shape.length - 1] : 1;
        const dec = new TextDecoder('latin1');
        const res: string[] = [];
        for (let i = 0; i < out.length; i += len) res.push(dec.decode(new Uint8Array(out.buffer, out.byteOffset + i, len)).replace(/\0+$/, '').trim());
        return res;
      }
      return [];
    },
    async close() {
      if (heapPtr) h5module._free(heapPtr);
      heapPtr = 0;
      heapBytes = 0;
      carry.clear();
      f.close();
    },
  };
}

function safe<T>(fn: () => T): T | undefined {
  try {
    return fn();
  } catch {
    return undefined;
  }
}

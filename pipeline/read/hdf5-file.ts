/**
 * NetCDF-4 files, read through HDF5 with h5wasm. What the file holds (dimensions from HDF5
 * dimension scales, groups, variables, attributes) is described by the metadata worker
 * (hdf5-meta.ts, hdf5-describe.ts) under a time limit, since HDF5 can loop for ever on damaged
 * metadata; values are read here from the raw chunks (hdf5-chunks.ts) or, where those do not
 * serve, by hyperslab (`get_dataset_data` into the wasm heap, the library opened on first need),
 * so memory is bounded by what is requested. Every h5wasm call runs quietly (hdf5-quiet.ts): HDF5's own
 * diagnostics never reach the terminal; they become the details of the catalogued error.
 */
import { open, type FileHandle } from 'node:fs/promises';
import type { Dataset as H5Dataset, File as H5File } from 'h5wasm/node';

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
/** Set when HDF5 aborted in this thread: its WebAssembly instance cannot be used again. */
let stopped = '';
import { NetcdfFileTruncated, NetcdfReadFailed } from './errors.ts';
import { LITTLE_ENDIAN_HOST, beginRawSlab, inflateMode } from './hdf5-chunks.ts';
import { RawLayoutRefused, readChunkIndex, superblockSizes, type ChunkIndex, type Hdf5Sizes } from './hdf5-layout.ts';
import { superblockEndOfFile } from './hdf5-struct.ts';
import { describeNetcdf4, readNetcdf4Strings } from './hdf5-meta.ts';
import type { Hdf5Variable } from './hdf5-describe.ts';
import { hdf5Reason, isAbort, quietly } from './hdf5-quiet.ts';
import { denseStrides, product, type RawArray, type RawType, type SlabRequest, type SlabSink, type SourceFile, type SourceVariable } from './source.ts';
import { ChunkCarry, type CarryPlan, type CarrySink } from './chunk-carry.ts';

/** Typed-array constructor for values read straight from the wasm heap, by raw type. */
const HEAP_VIEW: Partial<Record<RawType, new (b: ArrayBufferLike, o: number, n: number) => RawArray>> = {
  byte: Int8Array,
  ubyte: Uint8Array,
  short: Int16Array,
  ushort: Uint16Array,
  int: Int32Array,
  uint: Uint32Array,
  float: Float32Array,
  double: Float64Array,
};

/** 64-bit integer arrays, read from the raw chunks and handed out as doubles (as the library path does). */
const WIDE: Partial<Record<RawType, new (b: ArrayBufferLike, o: number, n: number) => BigInt64Array | BigUint64Array>> = {
  int64: BigInt64Array,
  uint64: BigUint64Array,
};

let ready: Promise<unknown> | undefined;

/**
 * Where HDF5 aborted in this thread ('' when it has not): after an abort its WebAssembly
 * instance cannot be used again in this thread (an abort in the metadata worker does not count:
 * that worker is replaced).
 */
export function hdf5StoppedIn(): string {
  return stopped;
}

/**
 * End-of-file address [bytes] the HDF5 superblock records (HDF5 File Format Specification,
 * §II.A "Disk Format: Level 0A - Format Signature and Superblock", versions 0-3), or null.
 */
export function hdf5EndOfFileAddress(head: Uint8Array): number | null {
  return superblockEndOfFile(head);
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
  let sizes: Hdf5Sizes | string;
  try {
    sizes = superblockSizes(head);
  } catch (e) {
    if (!(e instanceof RawLayoutRefused)) throw e;
    sizes = e.message;
  }
  if (eof === null && bytes < 48) throw NetcdfFileTruncated({ path, bytes, expected: null, detail: 'the HDF5 superblock is incomplete' }, { file: path });
  if (eof !== null && bytes < eof)
    throw NetcdfFileTruncated({ path, bytes, expected: eof, detail: 'the HDF5 superblock records a longer file' }, { file: path });
  const d = await describeNetcdf4(path);
  return buildHdf5File(path, bytes, d, sizes);
}

/** Whether h5wasm has been asked for in this thread (tests: a file described and read in JavaScript never loads it). */
export function hdf5LibraryLoaded(): boolean {
  return ready !== undefined;
}

/** Loads h5wasm in this thread (once). */
async function loadHdf5Library(): Promise<void> {
  ready ??= import('h5wasm/node').then(async (m) => {
    h5wasm = m.default;
    await h5wasm.ready;
    h5module = m.Module as unknown as H5Module;
  });
  await ready;
}

/**
 * Runs an h5wasm call quietly; a failure becomes `NetcdfReadFailed` naming the file (and the
 * variable), with HDF5's diagnostics as its details. After an abort the instance is unusable,
 * and every later call says so.
 */
function h5call<T>(path: string, what: string, fn: () => T, variable?: string): T {
  const where = variable ? { file: path, variable } : { file: path };
  if (stopped)
    throw NetcdfReadFailed(
      { path, detail: `${what}: the HDF5 library stopped earlier in this run (${stopped}); run the command again without the damaged file` },
      where,
    );
  const r = quietly(fn);
  if (r.error === undefined) return r.value as T;
  if (isAbort(r.error)) stopped = `on ${path}`;
  throw NetcdfReadFailed(
    { path, detail: `${what}${variable ? ` of variable ${variable}` : ''}: ${hdf5Reason(r.error, r.printed)}` },
    where,
    r.printed || undefined,
  );
}

/**
 * How a variable's hyperslabs are read: `node:zlib` (its chunks read and inflated directly,
 * hdf5-chunks.ts), `contiguous` (its bytes read directly, as one chunk) or, with the reason,
 * `HDF5 library: …` (h5wasm).
 */
export type Netcdf4ReadPath = string;

/** The read path of a NetCDF-4 variable, for tests and benchmarks (undefined for other files). */
export async function netcdf4ReadPath(sf: SourceFile, v: SourceVariable): Promise<Netcdf4ReadPath | undefined> {
  return sf.readPath?.(v);
}

/**
 * Whether raw chunk reads are turned off for files opened from now on (HEATHOURS_NETCDF4_RAW=0:
 * every variable through the HDF5 library, as before; the benchmark compares both).
 */
const rawOff = (): boolean => process.env.HEATHOURS_NETCDF4_RAW === '0';

function buildHdf5File(path: string, bytes: number, d: Awaited<ReturnType<typeof describeNetcdf4>>, sizes: Hdf5Sizes | string): SourceFile {
  const variables: SourceVariable[] = [];
  const info = new Map<SourceVariable, Hdf5Variable>();
  for (const hv of d.variables) {
    const v: SourceVariable = { name: hv.name, dims: hv.dims, shape: hv.shape, type: hv.type, attrs: hv.attrs, attrTypes: hv.attrTypes };
    variables.push(v);
    info.set(v, hv);
  }
  const infoOf = (v: SourceVariable): Hdf5Variable => {
    const hv = info.get(v);
    if (!hv) throw new Error(`variable ${v.name} is not in ${path}`);
    return hv;
  };
  // The HDF5 library opens the file only when a variable needs it (a layout or filter the raw
  // chunk reader leaves to it, a scalar, chunks never written): a file whose variables are all
  // read from their raw chunks never loads h5wasm in this thread (~0.3 s and its heap).
  // One promise, as the file handle below: reads that start side by side open the file once.
  let f: Promise<H5File> | undefined;
  const library = (): Promise<H5File> =>
    (f ??= (async () => {
      await loadHdf5Library();
      return h5call(path, 'opening it', () => new h5wasm.File(path, 'r'));
    })());
  const datasets = new Map<SourceVariable, H5Dataset>();
  const dsOf = (file: H5File, v: SourceVariable): H5Dataset => {
    let ds = datasets.get(v);
    if (!ds) {
      ds = new h5wasm.Dataset(file.file_id, `/${v.name}`);
      datasets.set(v, ds);
    }
    return ds;
  };

  /** Reads a hyperslab into a new array: from the raw chunks where they serve, else through the library. */
  async function read(v: SourceVariable, start: number[], count: number[]): Promise<RawArray> {
    const raw = count.some((c) => c === 0) ? null : await readRaw(v, start, count, true);
    if (raw) return raw;
    const ds = dsOf(await library(), v);
    const out = h5call(path, 'reading values', () => (v.shape.length === 0 ? ds.value : ds.slice(start.map((s, i) => [s, s + count[i]]))), v.name) as unknown;
    if (out instanceof BigInt64Array || out instanceof BigUint64Array) return Float64Array.from(out, (x) => Number(x));
    if (typeof out === 'number') return Float64Array.of(out);
    if (typeof out === 'bigint') return Float64Array.of(Number(out));
    if (ArrayBuffer.isView(out)) return out as RawArray;
    throw NetcdfReadFailed({ path, detail: `variable ${v.name}: values of type ${v.type} are not numbers` }, { file: path, variable: v.name });
  }

  // A wasm heap buffer reused by every hyperslab read of this file, and the carried chunks.
  let heapPtr = 0;
  let heapBytes = 0;
  const carry = new ChunkCarry<SourceVariable>();

  /**
   * Reads a hyperslab into the reused heap buffer and returns a view on it (valid until the next
   * read or allocation in wasm); falls back to `slice` (a copy) for other value types.
   */
  async function readDirect(v: SourceVariable, off: number[], cnt: number[]): Promise<RawArray | null> {
    const hv = infoOf(v);
    const View = HEAP_VIEW[v.type];
    if (!View || !hv.plain) return null;
    const file = await library();
    const total = product(cnt);
    const nbytes = total * hv.valueBytes;
    if (heapBytes < nbytes) {
      if (heapPtr) h5module._free(heapPtr);
      heapBytes = 0;
      heapPtr = h5module._malloc(nbytes);
      if (!heapPtr)
        throw NetcdfReadFailed({ path, detail: `variable ${v.name}: could not allocate ${nbytes} bytes for a read` }, { file: path, variable: v.name });
      heapBytes = nbytes;
    }
    const slab = `[${off.map((o, i) => `${o}:${o + cnt[i]}`).join(', ')}]`;
    h5call(
      path,
      `reading hyperslab ${slab}`,
      () => {
        const st = h5module.get_dataset_data(
          file.file_id,
          `/${v.name}`,
          cnt.map(BigInt),
          off.map(BigInt),
          cnt.map(() => 1n),
          BigInt(heapPtr),
        );
        if (st < 0) throw new Error(`status ${st}`);
        return st;
      },
      v.name,
    );
    return new View(h5module.HEAPU8.buffer, heapPtr, total);
  }

  // Raw chunk reads: the file handle, each variable's chunk index (or why there is none), and
  // the reused output buffer.
  // Opened once, on first use (reads may start side by side).
  let fh: Promise<FileHandle> | undefined;
  const handle = (): Promise<FileHandle> => (fh ??= open(path, 'r'));
  const indexes = new Map<SourceVariable, Promise<ChunkIndex | string>>();
  // Two reused output buffers (a slab is read into one while the one before is decoded), on
  // shared memory when a helper thread may write chunks into them (hdf5-chunks.ts inflateMode).
  const rawBufs: Array<ArrayBuffer | SharedArrayBuffer> = [new ArrayBuffer(0), new ArrayBuffer(0)];
  const libraryOnly = rawOff();
  const readAt = async (at: number, n: number): Promise<Uint8Array> => {
    const b = Buffer.allocUnsafe(n);
    const { bytesRead } = await (await handle()).read(b, 0, n, at);
    return b.subarray(0, bytesRead);
  };
  function indexOf(v: SourceVariable): Promise<ChunkIndex | string> {
    let p = indexes.get(v);
    if (!p) {
      p = (async () => {
        const hv = infoOf(v);
        if (libraryOnly) return 'HDF5 library: HEATHOURS_NETCDF4_RAW=0';
        if (typeof sizes === 'string') return `HDF5 library: ${sizes}`;
        if (!LITTLE_ENDIAN_HOST) return 'HDF5 library: a big-endian machine';
        if (!(hv.plain && HEAP_VIEW[v.type]) && !(WIDE[v.type] && hv.valueBytes === 8))
          return `HDF5 library: values of type ${v.type} that are not plain little-endian numbers`;
        if (hv.header === null) return 'HDF5 library: no object header address';
        try {
          return await readChunkIndex(readAt, sizes, hv.header, v.shape, hv.valueBytes, bytes);
        } catch (e) {
          if (e instanceof RawLayoutRefused) return `HDF5 library: ${e.message}`;
          throw e;
        }
      })();
      indexes.set(v, p);
    }
    return p;
  }

  /**
   * Reads a hyperslab from the raw chunks into the reused buffer (a new one when `fresh`: the
   * caller keeps it, and reads may run side by side), or null (the HDF5 library reads it).
   */
  async function readRaw(v: SourceVariable, off: number[], cnt: number[], fresh = false): Promise<RawArray | null> {
    return (await beginRaw(v, off, cnt, fresh ? -1 : 0))();
  }

  /**
   * Starts {@link readRaw} into reused buffer `slot` (0 or 1; -1: a new one) and returns the call
   * that finishes it (hdf5-chunks.ts beginRawSlab: a helper thread starts on the chunks at once).
   */
  async function beginRaw(v: SourceVariable, off: number[], cnt: number[], slot: number): Promise<() => Promise<RawArray | null>> {
    const idx = await indexOf(v);
    if (typeof idx === 'string') return async () => null;
    // 64-bit integers (ERA5's `valid_time`, `number`) become doubles, as the library path gives them.
    const wide = WIDE[v.type];
    const View = HEAP_VIEW[v.type];
    const typed = (buf: ArrayBuffer | SharedArrayBuffer, n: number): RawArray =>
      wide ? Float64Array.from(new wide(buf, 0, n), (x) => Number(x)) : new (View as NonNullable<typeof View>)(buf, 0, n);
    if (v.shape.length === 0) {
      // A scalar: one value at the address of its contiguous or compact storage.
      if (!idx.contiguous || idx.address[0] < 0) return async () => null;
      const b = await readAt(idx.address[0], idx.elementBytes);
      if (b.length < idx.elementBytes) return async () => null;
      const one = new ArrayBuffer(idx.elementBytes);
      new Uint8Array(one).set(b);
      return async () => typed(one, 1);
    }
    const nbytes = product(cnt) * idx.elementBytes;
    const own = slot < 0 || wide !== undefined;
    const shared = inflateMode() === 'helper';
    if (!own && (rawBufs[slot].byteLength < nbytes || (shared && !(rawBufs[slot] instanceof SharedArrayBuffer))))
      rawBufs[slot] = shared ? new SharedArrayBuffer(nbytes) : new ArrayBuffer(nbytes);
    const buf = own ? new ArrayBuffer(nbytes) : rawBufs[slot];
    const out = new Uint8Array(buf, 0, nbytes);
    const finish = beginRawSlab({ fh: await handle(), path, fileBytes: bytes, variable: v.name, dims: v.dims, idx, off, cnt, out });
    return async () => ((await finish()) ? typed(buf, nbytes / idx.elementBytes) : null);
  }

  /**
   * Reads each request's slab and hands it to `sink`, request after request. Whole chunks along
   * the first dimension: each chunk is inflated once per block, and the last one is kept for the
   * block after (blocks rarely end on a chunk boundary). The raw read of the next request starts
   * (into the other reused buffer) before this one is finished, so a helper thread goes on to its
   * chunks while this thread finishes this one and `sink` decodes it.
   */
  async function readSlabs(reqs: SlabRequest[], sink: SlabSink): Promise<void> {
    interface Started {
      plan: CarryPlan<SourceVariable>;
      finish: () => Promise<RawArray | null>;
    }
    const sinkOf =
      (i: number): CarrySink =>
      (data, base, strides, at, n) =>
        sink(i, { data, view: null, type: reqs[i].v.type, base, strides }, at, n);
    let slot = 0;
    /** Serves request i from the kept chunk and starts the raw read of the rest, or null when nothing is left to read. */
    const begin = async (i: number): Promise<Started | null> => {
      const { v, start, count } = reqs[i];
      if (v.shape.length === 0 || count.some((c) => c === 0)) {
        if (v.shape.length === 0) sink(i, { data: await read(v, start, count), view: null, type: v.type, base: 0, strides: [] }, 0, 1);
        return null;
      }
      // A request of the variable of the one begun before it sees the chunk kept from the one
      // before that: at worst it decodes a chunk again.
      const plan = carry.begin(v, start, count, infoOf(v).chunk0, v.shape[0], sinkOf(i));
      if (!plan) return null;
      // Without a helper, chunks are written only when a read is finished, after the one before
      // was handed out: one buffer serves.
      slot = inflateMode() === 'helper' ? 1 - slot : 0;
      return { plan, finish: await beginRaw(v, plan.start, plan.count, slot) };
    };
    // Two requests begun at a time: while this thread finishes one, the helper goes on to the next.
    const started: Array<Started | null> = [];
    for (let i = 0; i < Math.min(2, reqs.length); i++) started.push(await begin(i));
    try {
      for (let i = 0; i < reqs.length; i++) {
        const cur = started[i];
        started[i] = null;
        if (cur) {
          const { v } = reqs[i];
          const { plan } = cur;
          const raw = await cur.finish();
          const slab = {
            data: raw ?? (await readDirect(v, plan.start, plan.count)) ?? (await read(v, plan.start, plan.count)),
            strides: denseStrides(plan.count),
          };
          carry.finish(plan, slab, sinkOf(i));
        }
        // Its buffer is free again: the request after next begins in it.
        if (i + 2 < reqs.length) started.push(await begin(i + 2));
      }
    } finally {
      // After a failure, a request begun and not finished is finished (its result dropped), so no
      // thread still writes into a reused buffer when the next read takes it.
      for (const left of started) if (left) await left.finish().catch(() => undefined);
    }
  }

  return {
    path,
    format: 'netcdf4',
    bytes,
    dims: d.dims,
    variables,
    globalAttrs: d.globalAttrs,
    read,
    readSlabs,
    async readNumbers(v) {
      const raw = await this.read(
        v,
        v.shape.map(() => 0),
        v.shape,
      );
      return raw instanceof Float64Array ? raw : Float64Array.from(raw);
    },
    // Text lives in HDF5's global heap, where damage can make the library loop: read it in the
    // metadata worker, under its time limit.
    readStrings: (v) => readNetcdf4Strings(path, v.name, v.shape),
    async readPath(v: SourceVariable): Promise<Netcdf4ReadPath> {
      const idx = await indexOf(v);
      return typeof idx === 'string' ? idx : idx.contiguous ? 'contiguous' : 'node:zlib';
    },
    async close() {
      indexes.clear();
      rawBufs.fill(new ArrayBuffer(0));
      const h = fh;
      fh = undefined;
      if (h) await (await h.catch(() => undefined))?.close();
      if (heapPtr && !stopped) h5module._free(heapPtr);
      heapPtr = 0;
      heapBytes = 0;
      carry.clear();
      const file = f;
      f = undefined;
      const opened = file ? await file.catch(() => undefined) : undefined;
      if (opened && !stopped) quietly(() => opened.close());
    },
  };
}

/**
 * Hyperslabs of chunked NetCDF-4 variables read without the HDF5 library: the chunks a slab
 * touches are found in the variable's chunk index (hdf5-layout.ts), their stored bytes read with
 * plain file reads, inflated by node:zlib (one reused stream and output buffer per thread), the
 * byte shuffle undone in JS, and the values copied into a dense row-major array of the slab's
 * shape, exactly what the HDF5 library returns. A slab of several chunks is shared with a helper
 * thread when this one reads alone on a machine of several cores (inflate-helper.ts): both take
 * chunks from one shared counter and write into the slab's shared memory.
 *
 * Filters: HDF5's deflate filter stores a zlib stream (RFC 1950) per chunk (H5Zdeflate.c); its
 * shuffle filter stores byte k of every value together, plane after plane, with the bytes of a
 * trailing partial value left as they are (H5Zshuffle.c; Format Specification §IV.A.2.l).
 * A chunk that does not inflate, inflates to the wrong size, or lies outside the file is
 * `NetcdfChunkDamaged` naming the file, the variable and the chunk; nothing is handed out then.
 */
import { readSync } from 'node:fs';
import { availableParallelism, endianness } from 'node:os';
import { isMainThread } from 'node:worker_threads';
import { Inflate, constants as zlibConstants, inflateSync } from 'node:zlib';
import type { FileHandle } from 'node:fs/promises';
import { NetcdfChunkDamaged } from './errors.ts';
import { FILTER_DEFLATE, type ChunkIndex } from './hdf5-layout.ts';
import { helperReady, runOnHelper, type SharedSlab } from './inflate-helper.ts';

/** Whether values can be copied as bytes into typed arrays of this machine (little-endian files only). */
export const LITTLE_ENDIAN_HOST = endianness() === 'LE';

/**
 * One zlib inflate stream reused for every chunk of this thread, writing into one reused buffer:
 * no stream set up and no output allocated per chunk. The stream is reset before each chunk and
 * dropped after a failure. Uses the stream's native handle (`_handle.writeSync`, as node:zlib's
 * own inflateSync does), so a node:zlib that no longer has it falls back to inflateSync.
 */
interface NativeInflate {
  _handle?: {
    writeSync(flush: number, src: Uint8Array, srcOff: number, srcLen: number, dst: Uint8Array, dstOff: number, dstLen: number): void;
    onerror: (message: string, errno: number) => void;
  };
  _writeState?: Uint32Array;
  reset(): void;
}
let reusedInflate: NativeInflate | null = null;
let reusedOut = new Uint8Array(0);

/**
 * Inflates the zlib stream `src` (RFC 1950) of a chunk of `expected` bytes; the result is a view
 * of a reused buffer, valid until the next call in this thread [bytes]. Throws with code
 * ERR_BUFFER_TOO_LARGE when the stream holds more than `expected` bytes, or zlib's error.
 */
export function inflateChunkSync(src: Uint8Array, expected: number): Uint8Array {
  if (reusedOut.length < expected + 1) reusedOut = new Uint8Array(expected + 1);
  let z = reusedInflate;
  if (z) z.reset();
  else z = reusedInflate = new Inflate() as unknown as NativeInflate;
  const h = z._handle;
  const state = z._writeState;
  if (!h || !state || typeof h.writeSync !== 'function') {
    reusedInflate = null;
    const out = inflateSync(src, { chunkSize: Math.max(64, expected + 64), maxOutputLength: Math.max(1, expected) });
    return out;
  }
  let failure: Error | null = null;
  h.onerror = (message: string, errno: number) => {
    failure = Object.assign(new Error(message), { errno });
  };
  // One byte more than a chunk: a stream that fills it holds more than a chunk.
  h.writeSync(zlibConstants.Z_FINISH, src, 0, src.length, reusedOut, 0, expected + 1);
  if (failure) {
    reusedInflate = null;
    throw failure;
  }
  const written = expected + 1 - state[0];
  if (written > expected) {
    reusedInflate = null;
    throw Object.assign(new Error(`inflates to more than ${expected} bytes`), { code: 'ERR_BUFFER_TOO_LARGE' });
  }
  return reusedOut.subarray(0, written);
}

/** Where the chunk of linear index `lin` starts along each dimension [values]. */
export function chunkOrigin(idx: Pick<ChunkIndex, 'grid' | 'chunk'>, lin: number): number[] {
  const o = new Array<number>(idx.grid.length);
  for (let d = idx.grid.length - 1; d >= 0; d--) {
    o[d] = (lin % idx.grid[d]) * idx.chunk[d];
    lin = Math.floor(lin / idx.grid[d]);
  }
  return o;
}

/** Linear indices of the chunks that the slab [off, off + cnt) touches, row-major. */
export function chunksOfSlab(idx: ChunkIndex, off: number[], cnt: number[]): number[] {
  const rank = idx.grid.length;
  const lo = off.map((o, d) => Math.floor(o / idx.chunk[d]));
  const hi = off.map((o, d) => Math.floor((o + cnt[d] - 1) / idx.chunk[d]));
  const out: number[] = [];
  const c = lo.slice();
  if (cnt.some((n) => n <= 0)) return out;
  for (;;) {
    let lin = 0;
    for (let d = 0; d < rank; d++) lin = lin * idx.grid[d] + c[d];
    out.push(lin);
    let d = rank - 1;
    while (d >= 0 && c[d] === hi[d]) {
      c[d] = lo[d];
      d--;
    }
    if (d < 0) return out;
    c[d]++;
  }
}

/**
 * Undoes the shuffle filter of one chunk (`src`, `n` values of `size` bytes in `size` planes,
 * then the trailing bytes as they are) into `dst` [bytes].
 */
export function unshuffle(src: Uint8Array, dst: Uint8Array, size: number): void {
  const n = Math.floor(src.length / size);
  if (size === 4 && (dst.byteOffset & 3) === 0) {
    const out = new Uint32Array(dst.buffer, dst.byteOffset, n);
    const n2 = 2 * n;
    const n3 = 3 * n;
    for (let i = 0; i < n; i++) out[i] = (src[i] | (src[n + i] << 8) | (src[n2 + i] << 16) | (src[n3 + i] << 24)) >>> 0;
  } else if (size === 2 && (dst.byteOffset & 1) === 0) {
    const out = new Uint16Array(dst.buffer, dst.byteOffset, n);
    for (let i = 0; i < n; i++) out[i] = src[i] | (src[n + i] << 8);
  } else {
    for (let b = 0; b < size; b++) {
      const plane = b * n;
      for (let i = 0; i < n; i++) dst[i * size + b] = src[plane + i];
    }
  }
  const tail = n * size;
  if (tail < src.length) dst.set(src.subarray(tail), tail);
}

/**
 * Copies the part of one chunk (values at `origin`, shape `idx.chunk`, as bytes in `chunk`) that
 * lies inside the slab [off, off + cnt) into `out` (the slab's dense bytes). With `shuffled`, the
 * chunk's bytes are still shuffled (planes of `n` bytes, n values per chunk) and are put back
 * together on the way; 2- and 4-byte values are joined straight into the slab, other sizes
 * through `scratch` (a chunk's bytes). Runs that are contiguous in both the chunk and the slab
 * are copied as one.
 */
export function scatterChunk(
  idx: Pick<ChunkIndex, 'chunk' | 'elementBytes'>,
  origin: number[],
  chunk: Uint8Array,
  off: number[],
  cnt: number[],
  out: Uint8Array,
  shuffled = false,
  scratch?: Uint8Array,
): void {
  const rank = origin.length;
  const E = idx.elementBytes;
  if (shuffled && E !== 2 && E !== 4) {
    const dst = scratch ?? new Uint8Array(chunk.length);
    unshuffle(chunk, dst, E);
    scatterChunk(idx, origin, dst, off, cnt, out, false);
    return;
  }
  const lo = new Array<number>(rank);
  const n = new Array<number>(rank);
  for (let d = 0; d < rank; d++) {
    lo[d] = Math.max(origin[d], off[d]);
    n[d] = Math.min(origin[d] + idx.chunk[d], off[d] + cnt[d]) - lo[d];
    if (n[d] <= 0) return;
  }
  // Strides in values of the chunk and of the slab.
  const cs = new Array<number>(rank);
  const os = new Array<number>(rank);
  cs[rank - 1] = 1;
  os[rank - 1] = 1;
  for (let d = rank - 2; d >= 0; d--) {
    cs[d] = cs[d + 1] * idx.chunk[d + 1];
    os[d] = os[d + 1] * cnt[d + 1];
  }
  // Collapse: while the inner dimensions are whole in both, the run spans the next one out too.
  let inner = rank - 1;
  let run = n[rank - 1];
  while (inner > 0 && n[inner] === idx.chunk[inner] && n[inner] === cnt[inner]) {
    inner--;
    run *= n[inner];
  }
  const nChunk = idx.chunk.reduce((a, b) => a * b, 1);
  const out32 = shuffled && E === 4 ? new Uint32Array(out.buffer, out.byteOffset, out.byteLength >>> 2) : null;
  const out16 = shuffled && E === 2 ? new Uint16Array(out.buffer, out.byteOffset, out.byteLength >>> 1) : null;
  const i = new Array<number>(rank).fill(0);
  for (;;) {
    let src = 0;
    let dst = 0;
    for (let d = 0; d < rank; d++) {
      const k = d < inner ? i[d] : 0;
      src += (lo[d] - origin[d] + k) * cs[d];
      dst += (lo[d] - off[d] + k) * os[d];
    }
    if (out32) joinPlanes4(chunk, nChunk, src, out32, dst, run);
    else if (out16) joinPlanes2(chunk, nChunk, src, out16, dst, run);
    else out.set(chunk.subarray(src * E, (src + run) * E), dst * E);
    let d = inner - 1;
    while (d >= 0 && i[d] === n[d] - 1) {
      i[d] = 0;
      d--;
    }
    if (d < 0) return;
    i[d]++;
  }
}

/** Values [src, src + run) of a shuffled chunk of `n` 4-byte values, joined into out[dst …]. */
function joinPlanes4(b: Uint8Array, n: number, src: number, out: Uint32Array, dst: number, run: number): void {
  if (((n | src | run | b.byteOffset) & 3) === 0) {
    // Four values at a time: a 4 × 4 byte transpose of one word from each plane.
    const w = new Uint32Array(b.buffer, b.byteOffset, n);
    const n4 = n >>> 2;
    const s4 = src >>> 2;
    const r4 = run >>> 2;
    for (let i = 0; i < r4; i++) {
      const x0 = w[s4 + i];
      const x1 = w[n4 + s4 + i];
      const x2 = w[2 * n4 + s4 + i];
      const x3 = w[3 * n4 + s4 + i];
      const o = dst + 4 * i;
      out[o] = ((x0 & 0xff) | ((x1 & 0xff) << 8) | ((x2 & 0xff) << 16) | (x3 << 24)) >>> 0;
      out[o + 1] = (((x0 >>> 8) & 0xff) | (x1 & 0xff00) | ((x2 & 0xff00) << 8) | ((x3 & 0xff00) << 16)) >>> 0;
      out[o + 2] = (((x0 >>> 16) & 0xff) | ((x1 >>> 8) & 0xff00) | (x2 & 0xff0000) | ((x3 & 0xff0000) << 8)) >>> 0;
      out[o + 3] = ((x0 >>> 24) | ((x1 >>> 16) & 0xff00) | ((x2 >>> 8) & 0xff0000) | (x3 & 0xff000000)) >>> 0;
    }
    return;
  }
  const p1 = n + src;
  const p2 = 2 * n + src;
  const p3 = 3 * n + src;
  for (let k = 0; k < run; k++) out[dst + k] = (b[src + k] | (b[p1 + k] << 8) | (b[p2 + k] << 16) | (b[p3 + k] << 24)) >>> 0;
}

/** Values [src, src + run) of a shuffled chunk of `n` 2-byte values, joined into out[dst …]. */
function joinPlanes2(b: Uint8Array, n: number, src: number, out: Uint16Array, dst: number, run: number): void {
  const p1 = n + src;
  for (let k = 0; k < run; k++) out[dst + k] = b[src + k] | (b[p1 + k] << 8);
}

/** What names a chunk in an error: its first index along each dimension. */
function chunkLabel(dims: string[], origin: number[]): string {
  return origin.map((o, d) => `${dims[d] ?? `dim${d}`} ${o}`).join(', ');
}

export interface RawSlabRead {
  fh: FileHandle;
  path: string;
  fileBytes: number;
  variable: string;
  dims: string[];
  idx: ChunkIndex;
  off: number[];
  cnt: number[];
  /** The slab's dense bytes (row-major over `cnt`), written in full. */
  out: Uint8Array;
}

/** Most bytes read in one go for the chunks of one slab [bytes]. */
const MAX_SPAN = 64 << 20;

/**
 * Who inflates a slab's chunks: `sync` (this thread alone: one reused zlib stream inflating into
 * one reused buffer, {@link inflateChunkSync}) or `helper` (this thread and one helper thread,
 * inflate-helper.ts, each taking the next chunk from a shared counter). The default is `helper`
 * in a process's main thread on a machine of two or more cores, where the reader is alone (the
 * pipeline's workers, which already fill the cores, read alone in theirs); an environment
 * HEATHOURS_NETCDF4_INFLATE of `sync` or `helper` says which.
 */
export type InflateMode = 'helper' | 'sync';
export const inflateMode = (): InflateMode => {
  const e = process.env.HEATHOURS_NETCDF4_INFLATE;
  if (e === 'sync' || e === 'helper') return e;
  return isMainThread && availableParallelism() > 1 ? 'helper' : 'sync';
};

/** Why a chunk's bytes cannot be a chunk of the variable; the caller names the chunk. */
class ChunkFault extends Error {}

/** The filters of a chunked variable, as far as undoing them goes. */
type ChunkFilters = Pick<ChunkIndex, 'filters' | 'elementBytes'>;

/**
 * The stored bytes of one chunk with its filters undone (filter k skipped where bit k of `mask`
 * is set), in the reverse of the order they were applied: its bytes [bytes] (a view of this
 * thread's reused inflate buffer when deflate was last undone) and whether a shuffle is left to
 * undo while copying. Throws {@link ChunkFault} saying what is wrong.
 */
function unfilterChunk(idx: ChunkFilters, mask: number, stored: Uint8Array, chunkBytes: number): { b: Uint8Array; shuffledLast: boolean } {
  let b = stored;
  let shuffledLast = false;
  for (let k = idx.filters.length - 1; k >= 0; k--) {
    if (mask & (1 << k)) continue;
    if (idx.filters[k].id === FILTER_DEFLATE) {
      try {
        b = inflateChunkSync(b, chunkBytes);
      } catch (e) {
        throw new ChunkFault(
          (e as { code?: string }).code === 'ERR_BUFFER_TOO_LARGE'
            ? `it inflates to more than the ${chunkBytes} bytes of a chunk`
            : `it does not inflate (${(e as Error).message})`,
        );
      }
    } else if (idx.elementBytes > 1) {
      // A shuffle undone last is undone while copying into the slab.
      if (k === 0) shuffledLast = true;
      else {
        if (b.length !== chunkBytes) throw new ChunkFault(`it holds ${b.length} bytes where a chunk has ${chunkBytes}`);
        const dst = new Uint8Array(chunkBytes);
        unshuffle(b, dst, idx.elementBytes);
        b = dst;
      }
    }
  }
  if (b.length !== chunkBytes) throw new ChunkFault(`it holds ${b.length} bytes where a chunk has ${chunkBytes}`);
  return { b, shuffledLast };
}

/**
 * Reads the slab [off, off + cnt) of a variable into `out`. Returns false, having written
 * nothing that counts, when a chunk it needs was never written (HDF5 then gives the fill value,
 * so the caller reads through the library).
 */
export function readRawSlab(r: RawSlabRead): Promise<boolean> {
  return beginRawSlab(r)();
}

/**
 * Starts reading the slab [off, off + cnt) of a variable into `out` and returns the call that
 * finishes it ({@link readRawSlab}'s answer). With a helper thread, the helper starts taking the
 * slab's chunks at once, so the caller can do other work (decode the slab before) in between;
 * this thread takes its share when the call is made. Errors surface from that call.
 */
export function beginRawSlab(r: RawSlabRead): () => Promise<boolean> {
  const { idx } = r;
  const list = chunksOfSlab(idx, r.off, r.cnt);
  for (const lin of list) if (idx.address[lin] < 0) return async () => false;
  const chunkBytes = idx.chunk.reduce((a, b) => a * b, 1) * idx.elementBytes;
  const damaged = (lin: number, detail: string) =>
    NetcdfChunkDamaged(
      { path: r.path, variable: r.variable, chunk: chunkLabel(r.dims, chunkOrigin(idx, lin)), at: idx.address[lin], size: idx.size[lin], detail },
      { file: r.path, variable: r.variable },
    );
  // Stored bytes: checked against the file, then read in one go when the chunks lie close together.
  let lo = Infinity;
  let hi = 0;
  let stored = 0;
  for (const lin of list) {
    const at = idx.address[lin];
    const size = idx.size[lin];
    if (at + size > r.fileBytes) {
      const e = damaged(lin, `its ${size} bytes end past the end of the file (${r.fileBytes} bytes)`);
      return () => Promise.reject(e);
    }
    if (size > 4 * chunkBytes + (1 << 20)) {
      const e = damaged(lin, `it is recorded as ${size} bytes, more than a chunk of ${chunkBytes} bytes can take compressed`);
      return () => Promise.reject(e);
    }
    lo = Math.min(lo, at);
    hi = Math.max(hi, at + size);
    stored += size;
  }
  const decodeOne = (lin: number, b: Uint8Array): void => {
    try {
      const u = unfilterChunk(idx, idx.mask[lin], b, chunkBytes);
      scatterChunk(idx, chunkOrigin(idx, lin), u.b, r.off, r.cnt, r.out, u.shuffledLast);
    } catch (e) {
      throw e instanceof ChunkFault ? damaged(lin, e.message) : e;
    }
  };
  const readOne = async (lin: number): Promise<Uint8Array> => {
    const size = idx.size[lin];
    const b = Buffer.allocUnsafe(size);
    const { bytesRead } = await r.fh.read(b, 0, size, idx.address[lin]);
    if (bytesRead < size) throw damaged(lin, `only ${bytesRead} of its ${size} bytes could be read`);
    return b;
  };
  if (list.length > 1 && r.out.buffer instanceof SharedArrayBuffer && inflateMode() === 'helper' && helperReady()) {
    const n = list.length;
    const job: SharedSlab = {
      fd: r.fh.fd,
      chunk: idx.chunk,
      grid: idx.grid,
      elementBytes: idx.elementBytes,
      filters: idx.filters,
      chunkBytes,
      off: r.off,
      cnt: r.cnt,
      out: r.out,
      lins: Float64Array.from(list),
      at: Float64Array.from(list, (lin) => idx.address[lin]),
      size: Float64Array.from(list, (lin) => idx.size[lin]),
      mask: Uint32Array.from(list, (lin) => idx.mask[lin]),
      ctrl: new Int32Array(new SharedArrayBuffer(4 * (n + 1))),
    };
    const helped = runOnHelper(job);
    begun.add(job);
    return async () => {
      try {
        claimChunks(job);
        // While the helper finishes its last chunks of this slab, this thread takes chunks of
        // slabs begun after it rather than wait.
        while (!settled(job)) {
          let stole = false;
          for (const other of begun) if (other !== job && (stole = claimChunk(other))) break;
          if (!stole) {
            await helped;
            break;
          }
        }
      } finally {
        begun.delete(job);
      }
      // What the helper could not do (a damaged chunk, or the helper stopped) is done here, with
      // the chunk's catalogued error.
      for (let k = 0; k < n; k++) if (Atomics.load(job.ctrl, k + 1) !== CHUNK_DONE) decodeOne(list[k], await readOne(list[k]));
      return true;
    };
  }
  return async () => {
    let span: Buffer | null = null;
    let taken: Buffer | null = null;
    if (list.length > 1 && hi - lo <= MAX_SPAN && hi - lo <= 2 * stored + (1 << 20)) {
      taken = takeSpan(hi - lo);
      span = taken.subarray(0, hi - lo);
      const { bytesRead } = await r.fh.read(span, 0, hi - lo, lo);
      if (bytesRead < hi - lo) span = null;
    }
    try {
      for (const lin of list) {
        const at = idx.address[lin];
        decodeOne(lin, span ? span.subarray(at - lo, at - lo + idx.size[lin]) : await readOne(lin));
      }
      return true;
    } finally {
      if (taken) giveSpan(taken);
    }
  };
}

/** A chunk's state in {@link SharedSlab.ctrl}: done, or failed (its thread goes on with the next). */
export const CHUNK_DONE = 1;
const CHUNK_FAILED = 2;

/** Stored bytes of one chunk, read into a buffer kept for this thread's next chunk. */
let storedBuf = Buffer.alloc(0);

/**
 * Takes chunks of `job` from its shared counter until none is left: reads each one's stored bytes
 * (a synchronous read from the descriptor), undoes its filters and copies it into the slab,
 * marking it done, or failed without a word (the reading thread does it again and says why).
 * Runs in the reading thread and in the helper; returns how many chunks it took.
 */
export function claimChunks(job: SharedSlab): number {
  let taken = 0;
  while (claimChunk(job)) taken++;
  return taken;
}

/** Takes the next chunk of `job` and does it (see {@link claimChunks}); false when none was left. */
function claimChunk(job: SharedSlab): boolean {
  const k = Atomics.add(job.ctrl, 0, 1);
  if (k >= job.lins.length) return false;
  let state = CHUNK_FAILED;
  try {
    const size = job.size[k];
    if (storedBuf.length < size) storedBuf = Buffer.allocUnsafe(Math.ceil(size * 1.25));
    if (readSync(job.fd, storedBuf, 0, size, job.at[k]) === size) {
      const u = unfilterChunk(job, job.mask[k], storedBuf.subarray(0, size), job.chunkBytes);
      scatterChunk(job, chunkOrigin(job, job.lins[k]), u.b, job.off, job.cnt, job.out, u.shuffledLast);
      state = CHUNK_DONE;
    }
  } catch {
    // failed: the reading thread does it again and names the chunk
  }
  Atomics.store(job.ctrl, k + 1, state);
  return true;
}

/** Whether every chunk of `job` is done or failed. */
function settled(job: SharedSlab): boolean {
  for (let k = 1; k <= job.lins.length; k++) if (Atomics.load(job.ctrl, k) === 0) return false;
  return true;
}

/** Slabs of this thread shared with the helper and not yet finished, oldest first. */
const begun = new Set<SharedSlab>();

/**
 * One span buffer kept for the next slab of this thread (at most {@link SPAN_KEPT} bytes): a
 * fresh buffer of several MB costs more in page faults than reading the file into it (8 MB:
 * 24 ms to allocate and touch, 6 ms to read from the page cache into a reused one, measured
 * here). A slab read while another holds it gets its own.
 */
let spare: Buffer | null = null;
const SPAN_KEPT = 32 << 20;

function takeSpan(bytes: number): Buffer {
  // A new one with room to spare: the next slab's span is often a little larger.
  const b = spare !== null && spare.length >= bytes ? spare : Buffer.allocUnsafe(Math.max(bytes, Math.min(Math.ceil(bytes * 1.5), SPAN_KEPT)));
  if (b === spare) spare = null;
  return b;
}

function giveSpan(b: Buffer): void {
  if (b.length <= SPAN_KEPT && (spare === null || spare.length < b.length)) spare = b;
}

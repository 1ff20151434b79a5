/**
 * NetCDF-3 classic and 64-bit-offset files, read by byte range. The header is parsed by
 * classic-header.ts from the first bytes of the file only; data are read with `fs` at offsets
 * computed from it (NetCDF format specification: a non-record variable starts at `begin`, record
 * `t` of a record variable at `begin + t * recordSize`), so memory is bounded by what is
 * requested. Before any data is read, the layout the header describes is checked: every
 * variable's data lie after the header, none overlap, and the file is long enough.
 */
import { open } from 'node:fs/promises';
import type { ByteRange } from './zip-archive.ts';

/** Reads bytes at a position of the file (or of the archive member) the classic file lies in. */
interface ByteReader {
  read(buf: Uint8Array, offset: number, length: number, position: number): Promise<{ bytesRead: number }>;
  close(): Promise<void>;
}
import { HeaderNeedsBytes, parseClassicHeader, type ClassicHeader } from './classic-header.ts';
import { NetcdfFileTruncated, NetcdfHeaderInvalid, NetcdfReadFailed } from './errors.ts';
import type { NetcdfFormat } from './format.ts';
import {
  denseStrides,
  product,
  rawTypeBytes,
  type AttrValue,
  type RawArray,
  type RawType,
  type SlabRequest,
  type SlabSink,
  type SourceDimension,
  type SourceFile,
  type SourceVariable,
} from './source.ts';

/** Where a classic variable's bytes lie. */
interface ClassicLayout {
  /** Byte offset of the first value [bytes]. */
  begin: number;
  record: boolean;
  /** Size of one value [bytes]. */
  valueBytes: number;
}

/** Largest read that gathers several runs into one window [bytes]. */
const MAX_WINDOW = 16 << 20;
/** Largest unused gap a window may span between two runs [bytes]. */
const MAX_GAP = 64 << 10;
/** A shared window is read when the wanted bytes are at least this share of it [1]. */
const MIN_USE = 1 / 8;

/** Opens a classic or 64-bit-offset file whose size [bytes] and format are already known. */
export async function openClassicFile(path: string, format: NetcdfFormat, bytes: number, range?: ByteRange): Promise<SourceFile> {
  const fh = await rangeReader(range ?? { path, offset: 0, length: bytes });
  try {
    const header = await readHeader(fh, path, bytes);
    return buildClassicFile(fh, header, path, format, bytes);
  } catch (e) {
    await fh.close();
    throw e;
  }
}

/** Reads and parses the header from the first bytes: 64 KiB first, more when it asks for more. */
async function readHeader(fh: ByteReader, path: string, bytes: number): Promise<ClassicHeader> {
  let n = Math.min(bytes, 64 << 10);
  for (;;) {
    const head = new Uint8Array(n);
    await readAt(fh, path, head, 0, n, 0);
    try {
      return parseClassicHeader(head, bytes, path);
    } catch (e) {
      if (!(e instanceof HeaderNeedsBytes)) throw e;
      n = e.bytes;
    }
  }
}

function buildClassicFile(fh: ByteReader, header: ClassicHeader, path: string, format: NetcdfFormat, bytes: number): SourceFile {
  const numRecs = header.numRecs;
  const dims: SourceDimension[] = header.dims.map((d) => ({ name: d.name, size: d.size, unlimited: d.unlimited }));
  const layouts = new Map<SourceVariable, ClassicLayout>();
  const variables: SourceVariable[] = [];
  for (const nv of header.variables) {
    const attrs: Record<string, AttrValue> = {};
    const attrTypes: Record<string, RawType> = {};
    for (const a of nv.attributes) {
      attrs[a.name] = a.value;
      attrTypes[a.name] = a.type;
    }
    const v: SourceVariable = {
      name: nv.name,
      dims: nv.dimIds.map((id) => dims[id].name),
      shape: nv.dimIds.map((id) => dims[id].size),
      type: nv.type,
      attrs,
      attrTypes,
    };
    variables.push(v);
    layouts.set(v, { begin: nv.begin, record: nv.record, valueBytes: rawTypeBytes(v.type) });
  }
  // Record size: the padded per-record sizes of all record variables, except that a file with
  // a single record variable has no padding (NetCDF format specification, "Notes on vsize").
  const recVars = variables.filter((v) => layouts.get(v)!.record);
  const perRecord = (v: SourceVariable) => product(v.shape.slice(1)) * layouts.get(v)!.valueBytes;
  const recordSize = recVars.length === 1 ? perRecord(recVars[0]) : recVars.reduce((s, v) => s + Math.ceil(perRecord(v) / 4) * 4, 0);
  checkLayout(path, header.end, variables, layouts, recordSize, perRecord);

  let expected = 0;
  for (const v of variables) {
    const L = layouts.get(v)!;
    const end = L.record ? (numRecs > 0 ? L.begin + (numRecs - 1) * recordSize + perRecord(v) : 0) : L.begin + product(v.shape) * L.valueBytes;
    expected = Math.max(expected, end);
  }
  if (bytes < expected) {
    throw NetcdfFileTruncated({ path, bytes, expected, detail: 'the data section ends early, or a length in the header is damaged' }, { file: path });
  }

  const globalAttrs: Record<string, AttrValue> = {};
  for (const a of header.globalAttributes) globalAttrs[a.name] = a.value;

  async function readBytes(v: SourceVariable, start: number[], count: number[]): Promise<Uint8Array> {
    const L = layouts.get(v);
    if (!L) throw new Error(`variable ${v.name} is not in ${path}`);
    const B = L.valueBytes;
    const total = product(count);
    if (L.record && v.shape.length === 1) {
      // A 1-D record variable: one value per record; a trailing dimension of length 1 makes
      // the general loop below step record by record.
      v = { ...v, shape: [...v.shape, 1] };
      start = [...start, 0];
      count = [...count, 1];
    }
    const n = v.shape.length;
    const out = new Uint8Array(Buffer.allocUnsafeSlow(total * B).buffer, 0, total * B); // own, aligned, not zero-filled
    if (total === 0) return out;
    if (n === 0) {
      await readAt(fh, path, out, 0, B, L.begin);
      return out;
    }
    // Strides [bytes] of each dimension in the file.
    const stride = new Array<number>(n);
    let s = B;
    for (let k = n - 1; k >= 0; k--) {
      stride[k] = s;
      s *= v.shape[k];
    }
    if (L.record) stride[0] = recordSize;
    // The innermost dims that are fully selected make one contiguous run.
    let m = n - 1;
    let runLen = count[m];
    const lowest = L.record ? 1 : 0;
    while (m > lowest && count[m] === v.shape[m]) {
      m--;
      runLen *= count[m];
    }
    const runBytes = runLen * B;
    // Enumerate run offsets over the outer dims 0..m-1 (row-major).
    const runs: number[] = [];
    const idx = new Array<number>(m).fill(0);
    const baseInner = L.begin + start[m] * stride[m] + (m + 1 < n ? sumStart(start, stride, m + 1, n) : 0);
    for (;;) {
      let off = baseInner;
      for (let k = 0; k < m; k++) off += (start[k] + idx[k]) * stride[k];
      runs.push(off);
      let k = m - 1;
      while (k >= 0) {
        idx[k]++;
        if (idx[k] < count[k]) break;
        idx[k] = 0;
        k--;
      }
      if (k < 0) break;
    }
    // Gather runs into windows: one read per window.
    let r = 0;
    let dest = 0;
    while (r < runs.length) {
      let last = r;
      while (last + 1 < runs.length && runs[last + 1] - (runs[last] + runBytes) <= MAX_GAP && runs[last + 1] + runBytes - runs[r] <= MAX_WINDOW) last++;
      const winStart = runs[r];
      const winLen = runs[last] + runBytes - winStart;
      if (last === r || winLen === (last - r + 1) * runBytes) {
        await readAt(fh, path, out, dest, winLen, winStart);
        dest += winLen;
      } else {
        const win = takeWindow(winLen);
        try {
          await readAt(fh, path, win, 0, winLen, winStart);
          for (let q = r; q <= last; q++) {
            const o = runs[q] - winStart;
            out.set(win.subarray(o, o + runBytes), dest);
            dest += runBytes;
          }
        } finally {
          giveWindow(win);
        }
      }
      r = last + 1;
    }
    return out;
  }

  async function read(v: SourceVariable, start: number[], count: number[]): Promise<RawArray> {
    const raw = await readBytes(v, start, count);
    return bigEndianToNative(raw, v.type);
  }

  /** File strides [bytes] of each dimension of `v` (record stride for the record dimension). */
  function fileStrides(v: SourceVariable, L: ClassicLayout): number[] {
    const n = v.shape.length;
    const stride = new Array<number>(n);
    let s = L.valueBytes;
    for (let k = n - 1; k >= 0; k--) {
      stride[k] = s;
      s *= v.shape[k];
    }
    if (L.record && n > 0) stride[0] = recordSize;
    return stride;
  }

  /**
   * Reads the requests in windows of whole dim-0 slices (records): one byte range per window
   * for all requests whose dim-0 steps agree (the variables of a record interleave per record),
   * decoded by the caller straight from the big-endian bytes.
   */
  async function readSlabs(reqs: SlabRequest[], sink: SlabSink): Promise<void> {
    const g = reqs.map(({ v, start, count }) => {
      const L = layouts.get(v);
      if (!L) throw new Error(`variable ${v.name} is not in ${path}`);
      const st = fileStrides(v, L);
      let lo = L.begin;
      let inner = L.valueBytes;
      for (let k = 0; k < st.length; k++) {
        lo += start[k] * st[k];
        if (k > 0) inner += (count[k] - 1) * st[k];
      }
      const n0 = st.length > 0 ? count[0] : 1;
      const wanted = (st.length > 0 ? product(count.slice(1)) : 1) * L.valueBytes;
      return { v, L, st, lo, inner, n0, s0: st.length > 0 ? st[0] : 0, wanted, total: product(count) };
    });
    // Requests that step alike along dim 0 share windows (record variables of the same hours).
    const byStep = new Map<string, typeof g>();
    for (const x of g) {
      const key = `${x.n0}|${x.s0}`;
      const list = byStep.get(key);
      if (list) list.push(x);
      else byStep.set(key, [x]);
    }
    const groups = [...byStep.values()];
    for (const grp of groups) {
      const n0 = grp[0].n0;
      const s0 = grp[0].s0;
      if (grp.some((x) => x.total === 0)) continue;
      const lo = Math.min(...grp.map((x) => x.lo));
      const hi1 = Math.max(...grp.map((x) => x.lo + x.inner)); // end of the first slice's span
      const wanted = grp.reduce((s, x) => s + x.wanted, 0);
      const perSlice = n0 > 1 ? Math.max(s0, hi1 - lo) : hi1 - lo;
      if (wanted < MIN_USE * perSlice && perSlice > MAX_GAP) {
        // Sparse selection (a small tile of a large grid): gather runs, then native values.
        if (grp.length > 1) {
          for (const x of grp)
            await readSlabs([{ v: x.v, start: reqs[g.indexOf(x)].start, count: reqs[g.indexOf(x)].count }], (_i, slab, from, n) =>
              sink(g.indexOf(x), slab, from, n),
            );
          continue;
        }
        const x = grp[0];
        const r = reqs[g.indexOf(x)];
        const data = await read(x.v, r.start, r.count);
        sink(g.indexOf(x), { data, view: null, type: x.v.type, base: 0, strides: denseStrides(r.count) }, 0, n0);
        continue;
      }
      const k = s0 > 0 ? Math.max(1, Math.min(n0, Math.floor(MAX_WINDOW / s0))) : n0;
      let buf = takeWindow(0);
      try {
        for (let j = 0; j < n0; j += k) {
          const kk = Math.min(k, n0 - j);
          const winLo = lo + j * s0;
          const winLen = hi1 + (j + kk - 1) * s0 - winLo;
          if (buf.length < winLen) {
            giveWindow(buf);
            buf = takeWindow(winLen);
          }
          await readAt(fh, path, buf, 0, winLen, winLo);
          const bytes = new Uint8Array(buf.buffer, buf.byteOffset, winLen);
          const view = new DataView(buf.buffer, buf.byteOffset, winLen);
          for (const x of grp) {
            sink(g.indexOf(x), { data: bytes, view, type: x.v.type, base: x.lo + j * s0 - winLo, strides: x.st }, j, kk);
          }
        }
      } finally {
        giveWindow(buf);
      }
    }
  }

  return {
    path,
    format,
    bytes,
    dims,
    variables,
    globalAttrs,
    read,
    readSlabs,
    async readNumbers(v) {
      const raw = await read(
        v,
        v.shape.map(() => 0),
        v.shape,
      );
      return Float64Array.from(raw as ArrayLike<number>);
    },
    async readStrings(v) {
      const raw = await readBytes(
        v,
        v.shape.map(() => 0),
        v.shape,
      );
      const len = v.shape.length > 0 ? v.shape[v.shape.length - 1] : 1;
      const out: string[] = [];
      const dec = new TextDecoder('latin1');
      for (let i = 0; i < raw.length; i += len)
        out.push(
          dec
            .decode(raw.subarray(i, i + len))
            .replace(/\0+$/, '')
            .trim(),
        );
      return out;
    },
    close: () => fh.close(),
  };
}

/**
 * The data layout the header describes must make sense before any byte is read: every
 * variable's data start after the header, fixed-size variables do not overlap each other or the
 * record section, and record variables do not overlap inside a record (NetCDF format
 * specification: fixed-size data first, then the records, each record holding every record
 * variable once). A damaged size or offset shows up here as a catalogued error.
 */
function checkLayout(
  path: string,
  headerEnd: number,
  variables: SourceVariable[],
  layouts: Map<SourceVariable, ClassicLayout>,
  recordSize: number,
  perRecord: (v: SourceVariable) => number,
): void {
  const bad = (v: SourceVariable, detail: string): never => {
    throw NetcdfHeaderInvalid({ path, detail: `variable ${v.name}: ${detail}` }, { file: path, variable: v.name });
  };
  const spans: Array<{ v: SourceVariable; from: number; to: number }> = [];
  let recStart = Infinity;
  for (const v of variables) {
    const L = layouts.get(v)!;
    if (L.begin < headerEnd) bad(v, `its data offset ${L.begin} lies inside the header (which ends at byte ${headerEnd})`);
    const size = L.record ? perRecord(v) : product(v.shape) * L.valueBytes;
    if (!Number.isSafeInteger(size)) bad(v, `its shape [${v.shape.join(', ')}] is too large to be real`);
    if (L.record) recStart = Math.min(recStart, L.begin);
    else spans.push({ v, from: L.begin, to: L.begin + size });
  }
  spans.sort((a, b) => a.from - b.from);
  for (let i = 1; i < spans.length; i++) {
    if (spans[i].from < spans[i - 1].to)
      bad(
        spans[i].v,
        `its data (bytes ${spans[i].from}-${spans[i].to}) overlap those of ${spans[i - 1].v.name} (bytes ${spans[i - 1].from}-${spans[i - 1].to})`,
      );
  }
  const last = spans[spans.length - 1];
  if (last && Number.isFinite(recStart) && last.to > recStart)
    bad(last.v, `its data (bytes ${last.from}-${last.to}) run into the records, which start at byte ${recStart}`);
  for (const v of variables) {
    const L = layouts.get(v)!;
    if (L.record && L.begin - recStart + perRecord(v) > recordSize)
      bad(v, `its data offset ${L.begin} puts it outside the record of ${recordSize} bytes that starts at byte ${recStart}`);
  }
}

/**
 * Byte reads of a range of a file: a whole file, or a member stored (uncompressed) in a ZIP
 * archive, read in place at its data offset; nothing past the range's end is ever returned.
 */
async function rangeReader(r: ByteRange): Promise<ByteReader> {
  const fh = await open(r.path, 'r');
  if (r.offset === 0) return fh;
  return {
    read: (buf, offset, length, position) => {
      const n = Math.max(0, Math.min(length, r.length - position));
      return n === 0 ? Promise.resolve({ bytesRead: 0 }) : fh.read(buf, offset, n, r.offset + position);
    },
    close: () => fh.close(),
  };
}

/**
 * Window buffers shared by all classic files of the process: a read takes one (the largest
 * free one, grown when too small) and gives it back, so sequential reads reuse the same memory
 * (no per-block allocation, and no buffer per open file) while concurrent reads never share.
 */
const freeWindows: Buffer[] = [];

function takeWindow(n: number): Buffer {
  freeWindows.sort((a, b) => a.length - b.length);
  const b = freeWindows.pop();
  if (b && b.length >= n) return b;
  return Buffer.allocUnsafeSlow(Math.max(n, b ? Math.ceil(b.length * 1.5) : 0, 1));
}

function giveWindow(b: Buffer): void {
  freeWindows.push(b);
  if (freeWindows.length > 4) {
    freeWindows.sort((a, c) => a.length - c.length);
    freeWindows.shift();
  }
}

function sumStart(start: number[], stride: number[], from: number, to: number): number {
  let s = 0;
  for (let k = from; k < to; k++) s += start[k] * stride[k];
  return s;
}

async function readAt(fh: ByteReader, path: string, buf: Uint8Array, offset: number, length: number, position: number): Promise<void> {
  let done = 0;
  while (done < length) {
    const { bytesRead } = await fh.read(buf, offset + done, length - done, position + done);
    if (bytesRead === 0) throw NetcdfReadFailed({ path, detail: `unexpected end of file at byte ${position + done}` }, { file: path });
    done += bytesRead;
  }
}

/**
 * Turns big-endian bytes (NetCDF-3 stores big-endian) into a native typed array. Byte swapping
 * uses Buffer.swap16/32/64, native code, so there is no per-value JavaScript call.
 */
export function bigEndianToNative(raw: Uint8Array, type: RawType): RawArray {
  const buf = Buffer.from(raw.buffer, raw.byteOffset, raw.byteLength);
  switch (type) {
    case 'byte':
      return new Int8Array(raw.buffer, raw.byteOffset, raw.byteLength);
    case 'char':
    case 'ubyte':
      return raw;
    case 'short':
      buf.swap16();
      return new Int16Array(raw.buffer, raw.byteOffset, raw.byteLength / 2);
    case 'int':
      buf.swap32();
      return new Int32Array(raw.buffer, raw.byteOffset, raw.byteLength / 4);
    case 'float':
      buf.swap32();
      return new Float32Array(raw.buffer, raw.byteOffset, raw.byteLength / 4);
    case 'double':
      buf.swap64();
      return new Float64Array(raw.buffer, raw.byteOffset, raw.byteLength / 8);
    default:
      throw new Error(`cannot read values of type ${type}`);
  }
}

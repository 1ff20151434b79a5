/**
 * Where a chunked NetCDF-4 variable keeps its chunks, read from the HDF5 structures themselves
 * (HDF5 File Format Specification version 3.0, The HDF Group): the superblock's base address
 * (§II.A), the variable's object header, version 1 or 2 (§IV.A.1.a, §IV.A.1.b), its Data Layout
 * message (type 0x0008, §IV.A.2.i, version 3: chunked storage indexed by a version 1 B-tree) and
 * Filter Pipeline message (type 0x000B, §IV.A.2.l), and the version 1 B-tree of raw data chunks
 * (node type 1, §III.A.1): for every chunk its byte address, stored size and filter mask.
 *
 * Only what netCDF-C and h5wasm write by default is understood: layout version 3 with a version 1
 * B-tree, filters deflate (1) and shuffle (2). Anything else (layout version 4 chunk indexes,
 * other filters, shared messages, big-endian values, a damaged structure) is a
 * {@link RawLayoutRefused} with the reason: the caller then reads that variable through the HDF5
 * library as before. Every count read from the file is checked against the bytes there are and
 * against the dataset's shape before it is looped over, so a damaged file cannot make this loop
 * for long or allocate much.
 */

import { lookup3 } from './hdf5-checksum.ts';
import { addr, le, refuse, RawLayoutRefused, superblockSizes, type Hdf5Sizes } from './hdf5-struct.ts';

export { RawLayoutRefused, superblockSizes, type Hdf5Sizes };

/** Reads `length` bytes at file offset `at` [bytes]; fewer only at the end of the file. */
export type ReadAt = (at: number, length: number) => Promise<Uint8Array>;

/** HDF5 filter ids (H5Zpublic.h; Format Specification §IV.A.2.l). */
export const FILTER_DEFLATE = 1;
export const FILTER_SHUFFLE = 2;

export interface Hdf5Filter {
  id: number;
  /** Client data values (deflate: level; shuffle: element size [bytes]). */
  params: number[];
}

/** The chunks of one variable, as laid out in the file. */
export interface ChunkIndex {
  /** Chunk shape [values per dimension]. */
  chunk: number[];
  /** Number of chunks along each dimension. */
  grid: number[];
  /** Bytes per value as stored [bytes]. */
  elementBytes: number;
  /** Filters in the order they were applied when writing. */
  filters: Hdf5Filter[];
  /** Per chunk (row-major over `grid`): absolute file offset [bytes], or -1 when not written. */
  address: Float64Array;
  /** Per chunk: stored (filtered) size [bytes]. */
  size: Float64Array;
  /** Per chunk: filter mask (bit i set: filter i was skipped for this chunk). */
  mask: Uint32Array;
  /** Set for a contiguous variable, indexed as one unfiltered chunk spanning it. */
  contiguous?: true;
}

/** Most chunks one variable's index may list (keeps a damaged count from allocating much). */
const MAX_CHUNKS = 1 << 24;
/** Largest chunk read directly [bytes] (HDF5 itself limits a chunk to 4 GiB). */
const MAX_CHUNK_BYTES = 1 << 30;
/** Most object header continuation blocks followed. */
const MAX_CONTINUATIONS = 64;

/** One header message: its type, flags (§IV.A.1.a: bit 1 shared), data and creation order (version 2 headers that track it). */
export interface Message {
  type: number;
  flags: number;
  data: Uint8Array;
  /** Where the data lie in the file [bytes]. */
  at: number;
  order?: number;
}

/** An object header's messages and its flags (§IV.A.1.b; 0 for a version 1 header). */
export interface ObjectHeader {
  version: 1 | 2;
  flags: number;
  messages: Message[];
}

async function readExact(read: ReadAt, at: number, n: number, what: string): Promise<Uint8Array> {
  if (at < 0 || n < 0 || n > 64 << 20) refuse(`${what}: ${n} bytes at ${at}`);
  const b = await read(at, n);
  if (b.length < n) refuse(`${what} at byte ${at} runs past the end of the file`);
  return b;
}

/** The messages of an object header, continuation blocks followed (§IV.A.1.a version 1, §IV.A.1.b version 2). */
export async function objectHeaderMessages(read: ReadAt, at: number, s: Hdf5Sizes): Promise<Message[]> {
  return (await readObjectHeader(read, at, s)).messages;
}

/**
 * Reads an object header (§IV.A.1.a version 1, §IV.A.1.b version 2), following its continuation
 * messages (type 0x0010, §IV.A.2.q) up to {@link MAX_CONTINUATIONS} blocks; a version 2 header's
 * first block and every continuation block ("OCHK") must match their lookup3 checksums.
 */
export async function readObjectHeader(read: ReadAt, at: number, s: Hdf5Sizes): Promise<ObjectHeader> {
  const head = await readExact(read, at, 16, 'object header');
  const out: Message[] = [];
  const blocks: Array<{ at: number; length: number }> = [];
  let v2 = false;
  let flags = 0;
  if (head[0] === 1) {
    const size = le(head, 8, 4);
    blocks.push({ at: at + 16, length: size });
  } else if (head[0] === 0x4f && head[1] === 0x48 && head[2] === 0x44 && head[3] === 0x52) {
    // "OHDR", version 2
    v2 = true;
    if (head[4] !== 2) refuse(`object header version ${head[4]}`);
    flags = head[5];
    if (flags & 0xc0) refuse(`object header flags ${flags} with reserved bits set`);
    let p = 6;
    if (flags & 0x20) p += 16;
    if (flags & 0x10) p += 4;
    const sizeBytes = 1 << (flags & 3);
    const pre = await readExact(read, at, p + sizeBytes, 'object header');
    const size = le(pre, p, sizeBytes);
    // Messages start after the size field; the block ends with a 4-byte checksum of everything before it.
    const whole = await readExact(read, at, p + sizeBytes + size + 4, 'object header');
    if (lookup3(whole.subarray(0, p + sizeBytes + size)) !== le(whole, p + sizeBytes + size, 4))
      refuse(`the object header checksum at byte ${at} does not match`);
    blocks.push({ at: at + p + sizeBytes, length: size });
  } else refuse(`object header version ${head[0]}`);
  for (let k = 0; k < blocks.length; k++) {
    if (k > MAX_CONTINUATIONS) refuse('more than 64 object header continuation blocks');
    const { at: bAt, length } = blocks[k];
    const b = await readExact(read, bAt, length, 'object header block');
    let p = 0;
    let end = length;
    if (v2 && k > 0) {
      if (!(b[0] === 0x4f && b[1] === 0x43 && b[2] === 0x48 && b[3] === 0x4b)) refuse('an object header continuation block without its OCHK signature');
      if (length < 8 || lookup3(b.subarray(0, length - 4)) !== le(b, length - 4, 4))
        refuse(`the checksum of the continuation block at byte ${bAt} does not match`);
      p = 4;
      end = length - 4;
    }
    // A version 2 header's first block holds messages up to its checksum, which follows the block.
    const tracked = v2 && (flags & 0x04) !== 0;
    const headerBytes = v2 ? 4 + (tracked ? 2 : 0) : 8;
    while (p + headerBytes <= end) {
      let type: number;
      let size: number;
      let mflags: number;
      let order: number | undefined;
      if (v2) {
        type = b[p];
        size = le(b, p + 1, 2);
        mflags = b[p + 3];
        if (tracked) order = le(b, p + 4, 2);
      } else {
        type = le(b, p, 2);
        size = le(b, p + 2, 2);
        mflags = b[p + 4];
      }
      const d0 = p + headerBytes;
      if (d0 + size > end) refuse(`an object header message of ${size} bytes runs past its block`);
      const data = b.subarray(d0, d0 + size);
      if (type === 0x10) {
        blocks.push({ at: addr(data, 0, s.offsets), length: le(data, s.offsets, s.lengths) });
      } else out.push(order === undefined ? { type, flags: mflags, data, at: bAt + d0 } : { type, flags: mflags, data, at: bAt + d0, order });
      p = d0 + size;
      if (!v2) p = (p + 7) & ~7;
    }
  }
  return { version: v2 ? 2 : 1, flags, messages: out };
}

/** The Filter Pipeline message (§IV.A.2.l, versions 1 and 2). */
export function parseFilters(d: Uint8Array): Hdf5Filter[] {
  const version = d[0];
  const n = d[1];
  if (version !== 1 && version !== 2) refuse(`filter pipeline version ${version}`);
  let p = version === 1 ? 8 : 2;
  const out: Hdf5Filter[] = [];
  for (let i = 0; i < n; i++) {
    const id = le(d, p, 2);
    p += 2;
    let nameLength = 0;
    if (version === 1 || id >= 256) {
      nameLength = le(d, p, 2);
      p += 2;
    }
    p += 2; // flags (optional or not: either way this reader must undo it)
    const nValues = le(d, p, 2);
    p += 2;
    p += nameLength;
    const params: number[] = [];
    for (let j = 0; j < nValues; j++) params.push(le(d, p + 4 * j, 4));
    p += 4 * nValues;
    if (version === 1 && nValues % 2 === 1) p += 4;
    out.push({ id, params });
  }
  return out;
}

/**
 * A Data Layout message (§IV.A.2.i, version 3): chunked (B-tree address, chunk shape with the
 * element size last), contiguous (address, size [bytes]) or compact (the values themselves).
 */
export type Hdf5Layout =
  | { kind: 'chunked'; btree: number; dims: number[] }
  | { kind: 'contiguous'; address: number; size: number }
  | { kind: 'compact'; data: Uint8Array };

/** Reads a Data Layout message, version 3: class 0 (compact), 1 (contiguous) or 2 (chunked); other versions are refused. */
export function parseLayout(d: Uint8Array, s: Hdf5Sizes): Hdf5Layout {
  const version = d[0];
  if (version !== 3) refuse(`data layout version ${version} (version 4 chunk indexes are read by the HDF5 library)`);
  if (d[1] === 0) {
    const size = le(d, 2, 2);
    if (4 + size > d.length) refuse(`compact data of ${size} bytes in a layout message of ${d.length}`);
    return { kind: 'compact', data: d.subarray(4, 4 + size) };
  }
  if (d[1] === 1) return { kind: 'contiguous', address: addr(d, 2, s.offsets), size: le(d, 2 + s.offsets, s.lengths) };
  if (d[1] !== 2) refuse(`data layout class ${d[1]} (neither compact, contiguous nor chunked)`);
  const ndims = le(d, 2, 1);
  if (ndims < 1 || ndims > 33) refuse(`chunk dimensionality ${ndims}`);
  const btree = addr(d, 3, s.offsets);
  const dims: number[] = [];
  for (let i = 0; i < ndims; i++) dims.push(le(d, 3 + s.offsets + 4 * i, 4));
  return { kind: 'chunked', btree, dims };
}

/** Largest contiguous variable read whole as one chunk [bytes]: coordinates; larger ones go through the HDF5 library's hyperslabs. */
const MAX_CONTIGUOUS_BYTES = 1 << 24;

/**
 * A contiguous (or compact) variable as an index of one unfiltered chunk that spans the whole
 * variable (the address -1 when HDF5 never wrote it: all fill values); a scalar is one value.
 */
function contiguousIndex(l: { address: number; size: number }, shape: number[], elementBytes: number, fileBytes: number): ChunkIndex {
  if (shape.some((n) => n < 1)) refuse('a contiguous variable without values along every dimension');
  const bytes = shape.reduce((a, b) => a * b, elementBytes);
  if (bytes > MAX_CONTIGUOUS_BYTES) refuse(`a contiguous variable of ${bytes} bytes`);
  if (l.address !== -1 && l.size !== bytes) refuse(`contiguous storage of ${l.size} bytes for ${bytes} bytes of values`);
  if (l.address !== -1 && l.address + l.size > fileBytes) refuse(`contiguous storage at byte ${l.address} runs past the end of the file`);
  return {
    chunk: [...shape],
    grid: shape.map(() => 1),
    elementBytes,
    filters: [],
    address: Float64Array.of(l.address),
    size: Float64Array.of(l.address === -1 ? 0 : bytes),
    mask: new Uint32Array(1),
    contiguous: true,
  };
}

/**
 * Reads a variable's chunk index from its object header at `header` [bytes]. `shape` and
 * `elementBytes` come from the metadata already described; a layout that disagrees is refused.
 */
export async function readChunkIndex(
  read: ReadAt,
  s: Hdf5Sizes,
  header: number,
  shape: number[],
  elementBytes: number,
  fileBytes: number,
): Promise<ChunkIndex> {
  const messages = await objectHeaderMessages(read, header, s);
  const rank = shape.length;
  const layoutMsg = messages.find((m) => m.type === 0x0008);
  if (!layoutMsg) return refuse('no data layout message');
  if (layoutMsg.flags & 0x02) refuse('a shared data layout message');
  // Values must be little-endian numbers (Datatype message, §IV.A.2.d: bit 0 of the class bit field).
  const typeMsg = messages.find((m) => m.type === 0x0003);
  if (!typeMsg || typeMsg.flags & 0x02) refuse('no datatype message of its own');
  const cls = le((typeMsg as Message).data, 0, 1) & 0x0f;
  if ((cls === 0 || cls === 1) && le((typeMsg as Message).data, 1, 1) & 0x41) refuse('big-endian values');
  const layout = parseLayout(layoutMsg.data, s);
  // Compact storage: the values are the layout message's own bytes (after version, class and size).
  if (layout.kind === 'compact') return contiguousIndex({ address: layoutMsg.at + 4, size: layout.data.length }, shape, elementBytes, fileBytes);
  if (layout.kind === 'contiguous') return contiguousIndex(layout, shape, elementBytes, fileBytes);
  if (rank === 0) refuse('a chunked scalar');
  const { btree, dims } = layout;
  if (dims.length !== rank + 1) refuse(`chunks of rank ${dims.length - 1} for a variable of rank ${rank}`);
  if (dims[rank] !== elementBytes) refuse(`chunk element size ${dims[rank]} for values of ${elementBytes} bytes`);
  const chunk = dims.slice(0, rank);
  if (chunk.some((c) => c < 1)) refuse('a chunk dimension of 0');
  const chunkBytes = chunk.reduce((a, b) => a * b, elementBytes);
  if (chunkBytes > MAX_CHUNK_BYTES) refuse(`chunks of ${chunkBytes} bytes`);
  const filterMsg = messages.find((m) => m.type === 0x000b);
  if (filterMsg && filterMsg.flags & 0x02) refuse('a shared filter pipeline message');
  const filters = filterMsg ? parseFilters(filterMsg.data) : [];
  for (const f of filters) {
    if (f.id !== FILTER_DEFLATE && f.id !== FILTER_SHUFFLE)
      refuse(
        `filter ${f.id} (${f.id === 3 ? 'Fletcher-32' : f.id === 4 ? 'szip' : f.id === 5 ? 'n-bit' : f.id === 6 ? 'scale-offset' : 'a registered plugin'})`,
      );
    if (f.id === FILTER_SHUFFLE && f.params.length > 0 && f.params[0] !== elementBytes)
      refuse(`shuffle of ${f.params[0]}-byte elements for ${elementBytes}-byte values`);
  }
  const grid = shape.map((n, i) => Math.ceil(n / chunk[i]));
  const count = grid.reduce((a, b) => a * b, 1);
  if (count > MAX_CHUNKS) refuse(`${count} chunks`);
  const idx: ChunkIndex = {
    chunk,
    grid,
    elementBytes,
    filters,
    address: new Float64Array(count).fill(-1),
    size: new Float64Array(count),
    mask: new Uint32Array(count),
  };
  if (btree !== -1 && count > 0) await walkBtree(read, s, btree, -1, idx, rank, fileBytes, { nodes: 0, limit: 2 * count + 16 });
  return idx;
}

/** Visits a version 1 B-tree of raw data chunks (§III.A.1, node type 1), filling `idx`. */
async function walkBtree(
  read: ReadAt,
  s: Hdf5Sizes,
  at: number,
  wantLevel: number,
  idx: ChunkIndex,
  rank: number,
  fileBytes: number,
  seen: { nodes: number; limit: number },
): Promise<void> {
  if (++seen.nodes > seen.limit) refuse('a chunk B-tree with more nodes than the variable has chunks');
  const O = s.offsets;
  const head = await readExact(read, at, 8 + 2 * O, 'chunk B-tree node');
  if (!(head[0] === 0x54 && head[1] === 0x52 && head[2] === 0x45 && head[3] === 0x45)) refuse(`no B-tree node signature at byte ${at}`);
  if (head[4] !== 1) refuse(`B-tree node type ${head[4]} where chunks are indexed`);
  const level = head[5];
  if (wantLevel >= 0 && level !== wantLevel) refuse(`B-tree node at byte ${at} has level ${level}, ${wantLevel} expected`);
  const entries = le(head, 6, 2);
  const keyBytes = 8 + 8 * (rank + 1);
  const bodyBytes = (entries + 1) * keyBytes + entries * O;
  if (at + 8 + 2 * O + bodyBytes > fileBytes) refuse(`B-tree node at byte ${at} runs past the end of the file`);
  const body = await readExact(read, at + 8 + 2 * O, bodyBytes, 'chunk B-tree node');
  for (let e = 0; e < entries; e++) {
    const k = e * (keyBytes + O);
    const child = addr(body, k + keyBytes, O);
    if (child < 0 || child >= fileBytes) refuse(`B-tree child address ${child} outside the file`);
    if (level > 0) {
      await walkBtree(read, s, child, level - 1, idx, rank, fileBytes, seen);
      continue;
    }
    const size = le(body, k, 4);
    const mask = le(body, k + 4, 4);
    let lin = 0;
    for (let d = 0; d < rank; d++) {
      const off = le(body, k + 8 + 8 * d, 8);
      if (off % idx.chunk[d] !== 0) refuse(`chunk offset ${off} not on a chunk boundary of dimension ${d}`);
      const c = off / idx.chunk[d];
      if (c >= idx.grid[d]) refuse(`chunk offset ${off} beyond dimension ${d}`);
      lin = lin * idx.grid[d] + c;
    }
    if (idx.address[lin] !== -1) refuse('a chunk listed twice in the B-tree');
    idx.address[lin] = child;
    idx.size[lin] = size;
    idx.mask[lin] = mask;
  }
}

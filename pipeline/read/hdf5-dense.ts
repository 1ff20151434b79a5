/**
 * Dense storage of links and attributes, read in JavaScript (HDF5 File Format Specification
 * version 3.0): a group or object with many links or attributes keeps their messages as objects
 * of a fractal heap (§III.G: header "FRHP", root direct block "FHDB" or a root indirect block
 * "FHIB" of direct blocks) indexed by name in a version 2 B-tree (§III.A.2: header "BTHD", leaf
 * "BTLF", internal "BTIN"; record type 5 for links, 8 for attributes). The heap's objects are
 * Link (§IV.A.2.g) or Attribute (§IV.A.2.m) messages, returned here as bytes.
 *
 * Only what small files use is read: managed objects (not huge or tiny ones), no I/O filters on
 * the heap, a root block that is direct or indirect over direct blocks only, B-trees of depth 0
 * or 1. Every lookup3 checksum is verified; anything else is refused ({@link RawLayoutRefused}),
 * and the caller falls back to the HDF5 library.
 */
import { lookup3 } from './hdf5-checksum.ts';
import type { ReadAt } from './hdf5-layout.ts';
import { addr, le, refuse, type Hdf5Sizes } from './hdf5-struct.ts';

/** Most records one dense index may list (a bound on a damaged count). */
const MAX_RECORDS = 100_000;

async function exact(read: ReadAt, at: number, n: number, fileBytes: number, what: string): Promise<Uint8Array> {
  if (at < 0 || n < 0 || at + n > fileBytes || n > 64 << 20) refuse(`${what} at byte ${at} (${n} bytes) outside the file`);
  const b = await read(at, n);
  if (b.length < n) refuse(`${what} at byte ${at} runs past the end of the file`);
  return b;
}

function signature(b: Uint8Array, sig: string, at: number): void {
  for (let i = 0; i < 4; i++) if (b[i] !== sig.charCodeAt(i)) refuse(`no ${sig} signature at byte ${at}`);
}

function checksum(b: Uint8Array, end: number, what: string, at: number): void {
  if (lookup3(b.subarray(0, end)) !== le(b, end, 4)) refuse(`the ${what} checksum at byte ${at} does not match`);
}

/** Bytes needed to encode numbers up to `n` (H5VM_limit_enc_size: log2(n) / 8 + 1). */
const limitBytes = (n: number): number => Math.floor(Math.log2(Math.max(1, n)) / 8) + 1;

/** The records of a version 2 B-tree of `type` (§III.A.2), each `recordSize` bytes, in key order. */
export async function btree2Records(read: ReadAt, at: number, type: number, s: Hdf5Sizes, fileBytes: number): Promise<Uint8Array[]> {
  const O = s.offsets;
  const L = s.lengths;
  const headBytes = 4 + 1 + 1 + 4 + 2 + 2 + 1 + 1 + O + 2 + L;
  const h = await exact(read, at, headBytes + 4, fileBytes, 'version 2 B-tree header');
  signature(h, 'BTHD', at);
  checksum(h, headBytes, 'version 2 B-tree header', at);
  if (h[4] !== 0) refuse(`version 2 B-tree version ${h[4]}`);
  if (h[5] !== type) refuse(`version 2 B-tree of type ${h[5]} where type ${type} is expected`);
  const nodeSize = le(h, 6, 4);
  const recordSize = le(h, 10, 2);
  const depth = le(h, 12, 2);
  const root = addr(h, 16, O);
  const rootCount = le(h, 16 + O, 2);
  const total = le(h, 18 + O, L);
  if (total > MAX_RECORDS || recordSize < 1 || nodeSize < 16 || nodeSize > 1 << 20)
    refuse(`a version 2 B-tree of ${total} records of ${recordSize} bytes in nodes of ${nodeSize}`);
  if (total === 0) return [];
  if (root < 0) refuse('a version 2 B-tree with records but no root');
  if (depth > 1) refuse(`a version 2 B-tree of depth ${depth}`);
  const out: Uint8Array[] = [];
  const leaf = async (lat: number, count: number) => {
    const need = 6 + count * recordSize;
    if (need + 4 > nodeSize) refuse(`a version 2 B-tree leaf of ${count} records beyond its node size`);
    const b = await exact(read, lat, need + 4, fileBytes, 'version 2 B-tree leaf');
    signature(b, 'BTLF', lat);
    checksum(b, need, 'version 2 B-tree leaf', lat);
    if (b[5] !== type) refuse(`a version 2 B-tree leaf of type ${b[5]}`);
    for (let i = 0; i < count; i++) out.push(b.subarray(6 + i * recordSize, 6 + (i + 1) * recordSize));
  };
  if (depth === 0) await leaf(root, rootCount);
  else {
    // An internal node over leaves: records, then per child its address and record count.
    const leafMax = Math.floor((nodeSize - 10) / recordSize);
    const countBytes = limitBytes(leafMax);
    const need = 6 + rootCount * recordSize + (rootCount + 1) * (O + countBytes);
    if (need + 4 > nodeSize) refuse('a version 2 B-tree internal node beyond its node size');
    const b = await exact(read, root, need + 4, fileBytes, 'version 2 B-tree internal node');
    signature(b, 'BTIN', root);
    checksum(b, need, 'version 2 B-tree internal node', root);
    if (b[5] !== type) refuse(`a version 2 B-tree internal node of type ${b[5]}`);
    const seen = new Set<number>();
    for (let c = 0; c <= rootCount; c++) {
      const p = 6 + rootCount * recordSize + c * (O + countBytes);
      const child = addr(b, p, O);
      const n = le(b, p + O, countBytes);
      if (child < 0 || seen.has(child)) refuse('a version 2 B-tree child reached twice or without an address');
      seen.add(child);
      if (n > leafMax) refuse(`a version 2 B-tree leaf of ${n} records`);
      await leaf(child, n);
      if (c < rootCount) out.push(b.subarray(6 + c * recordSize, 6 + (c + 1) * recordSize));
    }
  }
  if (out.length !== total) refuse(`a version 2 B-tree holding ${out.length} records where its header says ${total}`);
  return out;
}

/** A fractal heap (§III.G) whose managed objects can be read by heap ID. */
export class FractalHeap {
  private constructor(
    private readonly read: ReadAt,
    private readonly fileBytes: number,
    readonly idLength: number,
    private readonly offBytes: number,
    private readonly lenBytes: number,
    private readonly checksummed: boolean,
    /** Direct blocks: heap offset, size and address [bytes]. */
    private readonly blocks: Array<{ offset: number; size: number; at: number }>,
    private readonly heapAt: number,
    private readonly O: number,
  ) {}

  /** Reads the heap header at `at` and its root block's map. */
  static async open(read: ReadAt, at: number, s: Hdf5Sizes, fileBytes: number): Promise<FractalHeap> {
    const O = s.offsets;
    const L = s.lengths;
    const headBytes = 4 + 1 + 2 + 2 + 1 + 4 + L + O + L + O + 8 * L + 2 + L + L + 2 + 2 + O + 2;
    const h = await exact(read, at, headBytes + 4, fileBytes, 'fractal heap header');
    signature(h, 'FRHP', at);
    if (h[4] !== 0) refuse(`fractal heap version ${h[4]}`);
    const idLength = le(h, 5, 2);
    const filterBytes = le(h, 7, 2);
    if (filterBytes !== 0) refuse('a fractal heap with I/O filters');
    checksum(h, headBytes, 'fractal heap header', at);
    const flags = h[9];
    const maxManaged = le(h, 10, 4);
    let p = 14 + L + O + L + O + 8 * L;
    const width = le(h, p, 2);
    const startSize = le(h, p + 2, L);
    const maxDirect = le(h, p + 2 + L, L);
    const maxHeapBits = le(h, p + 2 + 2 * L, 2);
    p += 2 + 2 * L + 2 + 2;
    const root = addr(h, p, O);
    const rows = le(h, p + O, 2);
    const pow2 = (x: number) => x > 0 && Number.isSafeInteger(x) && Number.isInteger(Math.log2(x));
    if (width < 1 || width > 1024 || !pow2(startSize) || !pow2(maxDirect) || maxDirect < startSize || maxHeapBits < 1 || maxHeapBits > 53)
      refuse('a fractal heap whose doubling table does not hold together');
    const offBytes = Math.ceil(maxHeapBits / 8);
    const lenBytes = Math.min(Math.ceil(Math.log2(maxDirect) / 8), limitBytes(maxManaged));
    if (1 + offBytes + lenBytes > idLength) refuse(`fractal heap IDs of ${idLength} bytes`);
    const blocks: Array<{ offset: number; size: number; at: number }> = [];
    if (root >= 0 && rows === 0) blocks.push({ offset: 0, size: startSize, at: root });
    else if (root >= 0) {
      const maxDirectRows = Math.log2(maxDirect) - Math.log2(startSize) + 2;
      if (rows > maxDirectRows) refuse('a fractal heap with indirect blocks below its root');
      const ibBytes = 4 + 1 + O + offBytes + rows * width * O;
      const ib = await exact(read, root, ibBytes + 4, fileBytes, 'fractal heap indirect block');
      signature(ib, 'FHIB', root);
      checksum(ib, ibBytes, 'fractal heap indirect block', root);
      if (addr(ib, 5, O) !== at) refuse('a fractal heap indirect block of another heap');
      let offset = 0;
      for (let r = 0; r < rows; r++) {
        const size = r === 0 ? startSize : startSize * 2 ** (r - 1);
        for (let c = 0; c < width; c++) {
          const child = addr(ib, 5 + O + offBytes + (r * width + c) * O, O);
          if (child >= 0) blocks.push({ offset, size, at: child });
          offset += size;
        }
      }
    }
    return new FractalHeap(read, fileBytes, idLength, offBytes, lenBytes, (flags & 0x02) !== 0, blocks, at, O);
  }

  /** The bytes of the managed object whose heap ID is `id`. */
  async object(id: Uint8Array): Promise<Uint8Array> {
    if (id.length < this.idLength) refuse('a fractal heap ID cut short');
    const kind = id[0];
    if (kind >> 6 !== 0) refuse(`fractal heap ID version ${kind >> 6}`);
    if (((kind >> 4) & 3) !== 0) refuse(`a ${((kind >> 4) & 3) === 1 ? 'huge' : 'tiny'} fractal heap object`);
    const offset = le(id, 1, this.offBytes);
    const length = le(id, 1 + this.offBytes, this.lenBytes);
    const block = this.blocks.find((b) => offset >= b.offset && offset < b.offset + b.size);
    if (!block) return refuse(`fractal heap offset ${offset} in no direct block`);
    if (offset + length > block.offset + block.size || length < 1) refuse(`a fractal heap object of ${length} bytes past its block`);
    const b = await this.directBlock(block);
    const headerBytes = 5 + this.O + this.offBytes;
    const start = offset - block.offset;
    if (start < headerBytes + (this.checksummed ? 4 : 0)) refuse('a fractal heap object inside its block header');
    return b.subarray(start, start + length);
  }

  /** The last direct block read, checked once (a heap's objects are read one after another). */
  private last: { at: number; bytes: Uint8Array } | undefined;

  private async directBlock(block: { offset: number; size: number; at: number }): Promise<Uint8Array> {
    if (this.last?.at === block.at) return this.last.bytes;
    const b = await exact(this.read, block.at, block.size, this.fileBytes, 'fractal heap direct block');
    signature(b, 'FHDB', block.at);
    if (addr(b, 5, this.O) !== this.heapAt) refuse('a fractal heap direct block of another heap');
    if (le(b, 5 + this.O, this.offBytes) !== block.offset) refuse(`a fractal heap direct block at byte ${block.at} with the wrong offset`);
    const headerBytes = 5 + this.O + this.offBytes;
    if (this.checksummed) {
      // The checksum field is taken as 0 while the block is summed (H5HF__cache_dblock_verify_chksum).
      const copy = b.slice();
      const stored = le(b, headerBytes, 4);
      copy.fill(0, headerBytes, headerBytes + 4);
      if (lookup3(copy) !== stored) refuse(`the fractal heap direct block checksum at byte ${block.at} does not match`);
    }
    this.last = { at: block.at, bytes: b };
    return b;
  }
}

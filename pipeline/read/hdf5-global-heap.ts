/**
 * Objects of HDF5 global heap collections, read in JavaScript (HDF5 File Format Specification
 * version 3.0, §III.E "Global Heap"): a collection "GCOL" (version 1, collection size [bytes]
 * including its header, at least 4096) holds objects, each a 2-byte index, 2-byte reference count, 4 reserved
 * bytes, its size [bytes] and its data padded to 8 bytes; index 0 is free space. NetCDF-4 keeps
 * variable-length data there: DIMENSION_LIST's object references and variable-length strings.
 * A collection is first walked by the same check the metadata worker applies before HDF5 reads
 * one (hdf5-heap-check.ts `globalHeapProblem`); one that fails it, or an object that is not in
 * it, is refused. Each collection is read once per description and kept in a small map.
 */
import type { ReadAt } from './hdf5-layout.ts';
import { globalHeapProblem } from './hdf5-heap-check.ts';
import { addr, le, refuse, type Hdf5Sizes } from './hdf5-struct.ts';

/** Largest collection read [bytes]; a larger one is declined (netCDF-C's collections hold kilobytes). */
const MAX_COLLECTION = 16 * 1024 * 1024;
/** Most collections kept at once (memory stays bounded by this times {@link MAX_COLLECTION}; NetCDF-4 files have one or a few). */
const KEPT = 4;

/** The objects of global heap collections, read on demand. */
export class GlobalHeap {
  private readonly collections = new Map<number, Map<number, Uint8Array>>();
  constructor(
    private readonly read: ReadAt,
    private readonly s: Hdf5Sizes,
    private readonly fileBytes: number,
  ) {}

  /** The data of object `index` in the collection at `at` [bytes]. */
  async object(at: number, index: number): Promise<Uint8Array> {
    let c = this.collections.get(at);
    if (!c) {
      c = await this.collection(at);
      if (this.collections.size >= KEPT) this.collections.delete(this.collections.keys().next().value as number);
      this.collections.set(at, c);
    }
    const o = c.get(index);
    if (o === undefined) refuse(`global heap object ${index} is not in the collection at byte ${at}`);
    return o as Uint8Array;
  }

  private async collection(at: number): Promise<Map<number, Uint8Array>> {
    const L = this.s.lengths;
    if (at < 0 || at + 8 + L > this.fileBytes) refuse(`a global heap collection at byte ${at} outside the file`);
    const head = await this.read(at, 8 + L);
    if (!(head[0] === 0x47 && head[1] === 0x43 && head[2] === 0x4f && head[3] === 0x4c)) refuse(`no global heap signature at byte ${at}`);
    if (head[4] !== 1) refuse(`global heap version ${head[4]}`);
    const size = le(head, 8, L);
    if (size < 4096 || size > MAX_COLLECTION || at + size > this.fileBytes) refuse(`a global heap collection of ${size} bytes at byte ${at}`);
    const bytes = await this.read(at, size);
    if (bytes.length < size) refuse(`the global heap collection at byte ${at} runs past the end of the file`);
    const problem = globalHeapProblem(bytes, L, at);
    if (problem !== null) refuse(problem);
    // The same walk as the check, now keeping the objects.
    const objects = new Map<number, Uint8Array>();
    const header = 8 + L;
    let p = 8 + L;
    while (p + header <= size) {
      const index = le(bytes, p, 2);
      const n = le(bytes, p + 8, L);
      if (index === 0) {
        // free space: its size covers its own header, not padded (the check made sure it advances)
        p += n;
        continue;
      }
      const start = p + header;
      if (start + n > size) refuse(`global heap object ${index} at byte ${at + p} runs past its collection`);
      if (objects.has(index)) refuse(`global heap object ${index} twice in the collection at byte ${at}`);
      objects.set(index, bytes.subarray(start, start + n));
      p = start + ((n + 7) & ~7);
    }
    return objects;
  }
}

/** A global heap ID in a variable-length element (§III.E, "Global Heap ID"): collection address and object index. */
export function heapId(b: Uint8Array, at: number, s: Hdf5Sizes): { collection: number; index: number } {
  return { collection: addr(b, at, s.offsets), index: le(b, at + s.offsets, 4) };
}

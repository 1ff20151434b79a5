/**
 * The last decoded chunk of each variable, kept for the next block: the chunked readers (NetCDF-4
 * in hdf5-file.ts, Zarr in zarr-store.ts) read whole chunks along the first dimension (time), so
 * a block that ends inside a chunk leaves that chunk's remaining hours decoded; the next block,
 * which starts there, takes them from here instead of inflating the chunk again. One chunk per
 * variable at most (memory bounded by a chunk, never by the record).
 */
import type { RawArray } from './source.ts';

/** A decoded slab along the first dimension: its values and row-major strides [elements]. */
export interface DecodedSlab {
  data: RawArray;
  strides: number[];
}

interface Kept {
  /** Start and count of the other dimensions, as text (a later request must match them). */
  key: string;
  /** First-dimension indices [from, to) held. */
  from: number;
  to: number;
  data: RawArray;
  strides: number[];
}

/**
 * Receives indices [at, at + n) of the request along its first dimension (relative to its start)
 * from `data`, starting at element `base` with `strides`.
 */
export type CarrySink = (data: RawArray, base: number, strides: number[], at: number, n: number) => void;

export class ChunkCarry<V> {
  private readonly kept = new Map<V, Kept>();

  /**
   * Serves the request `start`, `count` of `v` (chunks of `chunk0` along a first dimension of
   * `length0`): first from the kept chunk if it holds the request's first indices and the other
   * dimensions match, then by decoding whole chunks with `decode(start, count)`; keeps the last
   * decoded chunk when the request ends inside it.
   */
  async read(
    v: V,
    start: readonly number[],
    count: readonly number[],
    chunk0: number,
    length0: number,
    decode: (start: number[], count: number[]) => Promise<DecodedSlab>,
    sink: CarrySink,
  ): Promise<void> {
    const key = `${start.slice(1).join(',')}|${count.slice(1).join(',')}`;
    let s0 = start[0];
    const e0 = start[0] + count[0];
    let done = 0;
    const c = this.kept.get(v);
    if (c && c.key === key && s0 >= c.from && s0 < c.to) {
      const upto = Math.min(e0, c.to);
      sink(c.data, (s0 - c.from) * c.strides[0], c.strides, 0, upto - s0);
      done = upto - s0;
      s0 = upto;
    }
    if (s0 >= e0) return;
    const C = chunk0;
    const a0 = C > 1 ? Math.floor(s0 / C) * C : s0;
    const a1 = C > 1 ? Math.min(length0, Math.ceil(e0 / C) * C) : e0;
    const { data, strides } = await decode([a0, ...start.slice(1)], [a1 - a0, ...count.slice(1)]);
    sink(data, (s0 - a0) * strides[0], strides, done, e0 - s0);
    if (a1 > e0) {
      const k0 = Math.max(a0, Math.floor((a1 - 1) / C) * C);
      this.kept.set(v, { key, from: k0, to: a1, data: data.slice((k0 - a0) * strides[0], (a1 - a0) * strides[0]), strides });
    } else this.kept.delete(v);
  }

  /** Drops every kept chunk. */
  clear(): void {
    this.kept.clear();
  }
}

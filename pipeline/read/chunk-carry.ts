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

/** What {@link ChunkCarry.begin} leaves to decode: whole chunks `start`, `count` of variable `v`. */
export interface CarryPlan<V> {
  v: V;
  key: string;
  /** The request's first-dimension indices [s0, e0) not served from the kept chunk, `done` served before them. */
  s0: number;
  e0: number;
  done: number;
  /** Whole chunks [a0, a1) along the first dimension, of `chunk0` each. */
  a0: number;
  a1: number;
  chunk0: number;
  start: number[];
  count: number[];
}

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
    const plan = this.begin(v, start, count, chunk0, length0, sink);
    if (plan) this.finish(plan, await decode(plan.start, plan.count), sink);
  }

  /**
   * The first half of {@link read}: serves from the kept chunk what it can and returns the whole
   * chunks still to decode (`start`, `count`), or null when the kept chunk held it all. The
   * decoded chunks go to {@link finish}.
   */
  begin(v: V, start: readonly number[], count: readonly number[], chunk0: number, length0: number, sink: CarrySink): CarryPlan<V> | null {
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
    if (s0 >= e0) return null;
    const C = chunk0;
    const a0 = C > 1 ? Math.floor(s0 / C) * C : s0;
    const a1 = C > 1 ? Math.min(length0, Math.ceil(e0 / C) * C) : e0;
    return { v, key, s0, e0, done, a0, a1, chunk0, start: [a0, ...start.slice(1)], count: [a1 - a0, ...count.slice(1)] };
  }

  /** The second half of {@link read}: keeps the last decoded chunk of `plan` when the request ends inside it, then hands the request's part to `sink`. */
  finish(plan: CarryPlan<V>, slab: DecodedSlab, sink: CarrySink): void {
    this.keep(plan, slab);
    this.serve(plan, slab, sink);
  }

  /** Hands the request's part of the decoded chunks of `plan` to `sink`. */
  serve(plan: CarryPlan<V>, slab: DecodedSlab, sink: CarrySink): void {
    const { s0, e0, done, a0 } = plan;
    sink(slab.data, (s0 - a0) * slab.strides[0], slab.strides, done, e0 - s0);
  }

  /** Keeps a copy of the last decoded chunk of `plan` when the request ends inside it (else drops the kept one). */
  keep(plan: CarryPlan<V>, slab: DecodedSlab): void {
    const { v, key, e0, a0, a1, chunk0: C } = plan;
    const { data, strides } = slab;
    if (a1 > e0) {
      const k0 = Math.max(a0, Math.floor((a1 - 1) / C) * C);
      const part = data.subarray((k0 - a0) * strides[0], (a1 - a0) * strides[0]);
      // The array kept before is reused when it fits (no allocation per block).
      const was = this.kept.get(v)?.data;
      let copy: RawArray;
      if (was && was.constructor === part.constructor && was.length === part.length) {
        was.set(part as never);
        copy = was;
      } else copy = part.slice();
      this.kept.set(v, { key, from: k0, to: a1, data: copy, strides });
    } else this.kept.delete(v);
  }

  /** Drops every kept chunk. */
  clear(): void {
    this.kept.clear();
  }
}

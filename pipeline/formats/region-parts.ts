/**
 * The region-part file of one merge tile: what the tile adds to each region it overlaps (figure
 * sums, weighted mean annual temperature, weighted WBGT histograms per year), as records the
 * region stage reads back by offset, one region at a time. A scratch file of the build, never
 * published.
 *
 * Record layout (little-endian): uint32 kind, uint32 region, uint32 year index (0 when the kind
 * has none), uint32 payload bytes, payload. Kinds:
 * - 1 histogram of one year: per slot (month × hour × exposure) of HIST_LEN bins, uint16 first
 *   bin, uint16 n, then n double-double pairs (float64 hi, float64 lo);
 * - 2 figure sums: for each figure, uint32 fields, uint32 years, then swx, sw (pairs), worstValue
 *   (float64), worstCell (int32);
 * - 3 weighted means: uint32 n, then n float64 values;
 * - 4 workforce sums: as kind 2, with people weights instead of area weights (hours above the
 *   limit, hours lost, shift hours; pipeline/regions/person-hours.ts).
 */
import { closeSync, openSync, readSync, writeSync } from 'node:fs';
import type { RegionFigureSums } from '../regions/region-sums.ts';
import { HIST_LEN } from '../reduce/layout.ts';

export const RECORD_HISTOGRAM = 1;
export const RECORD_FIGURES = 2;
export const RECORD_MEANS = 3;
export const RECORD_WORKFORCE = 4;

/** Where a record lies in its file. */
export interface RegionRecordRef {
  kind: number;
  region: number;
  year: number;
  offset: number;
  bytes: number;
}

/** Appends records to a region-part file. */
export class RegionPartWriter {
  private fd: number;
  private at = 0;
  readonly records: RegionRecordRef[] = [];

  constructor(readonly path: string) {
    this.fd = openSync(path, 'w');
  }

  private put(kind: number, region: number, year: number, payload: Uint8Array): void {
    const head = Buffer.alloc(16);
    head.writeUInt32LE(kind, 0);
    head.writeUInt32LE(region, 4);
    head.writeUInt32LE(year, 8);
    head.writeUInt32LE(payload.length, 12);
    writeAll(this.fd, head);
    writeAll(this.fd, payload);
    this.records.push({ kind, region, year, offset: this.at, bytes: 16 + payload.length });
    this.at += 16 + payload.length;
  }

  /**
   * A region's histogram pairs of one year (dense pairs, one per histogram value). With `touched`
   * (one byte per group of slots, e.g. per month × hour of both exposures), only the marked groups
   * are looked at: the others must be all zero, and are written as empty slots as they would be.
   */
  histogram(region: number, year: number, pairs: Float64Array, touched?: Uint8Array): void {
    this.put(RECORD_HISTOGRAM, region, year, encodeHistogramPairs(pairs, touched));
  }

  /** Figure sums of a region: area-weighted ({@link RECORD_FIGURES}) or people-weighted ({@link RECORD_WORKFORCE}). */
  figures(region: number, sums: readonly RegionFigureSums[], kind: typeof RECORD_FIGURES | typeof RECORD_WORKFORCE = RECORD_FIGURES): void {
    const parts: Buffer[] = [];
    for (const s of sums) {
      const h = Buffer.alloc(8);
      h.writeUInt32LE(s.nFields, 0);
      h.writeUInt32LE(s.nYears, 4);
      parts.push(h, bytes(s.swx), bytes(s.sw), bytes(s.worstValue), bytes(s.worstCell));
    }
    this.put(kind, region, 0, Buffer.concat(parts));
  }

  means(region: number, values: Float64Array): void {
    const h = Buffer.alloc(4);
    h.writeUInt32LE(values.length, 0);
    this.put(RECORD_MEANS, region, 0, Buffer.concat([h, bytes(values)]));
  }

  close(): void {
    closeSync(this.fd);
  }
}

function writeAll(fd: number, b: Uint8Array): void {
  let done = 0;
  while (done < b.length) done += writeSync(fd, b, done, b.length - done);
}

function bytes(a: ArrayBufferView): Buffer {
  return Buffer.from(a.buffer, a.byteOffset, a.byteLength);
}

function encodeHistogramPairs(pairs: Float64Array, touched?: Uint8Array): Uint8Array {
  const n = pairs.length >> 1;
  const slots = n / HIST_LEN;
  const per = touched ? slots / touched.length : 1;
  if (touched && !Number.isInteger(per)) throw new RangeError(`${slots} slots do not split into ${touched.length} groups`);
  // Sized for the worst case (every bin of every slot), then cut to what was written.
  let out = scratch;
  const most = slots * 4 + 16 * n;
  if (out.length < most) out = scratch = new Uint8Array(most);
  const view = new DataView(out.buffer);
  const bytesOf = new Uint8Array(pairs.buffer, pairs.byteOffset, pairs.byteLength);
  let at = 0;
  for (let s = 0; s < slots; s++) {
    let first = -1;
    let last = -1;
    if (!touched || touched[Math.floor(s / per)] !== 0) {
      for (let b = 0; b < HIST_LEN; b++) {
        const i = s * HIST_LEN + b;
        if (pairs[2 * i] !== 0 || pairs[2 * i + 1] !== 0) {
          if (first < 0) first = b;
          last = b;
        }
      }
    }
    if (first < 0) {
      view.setUint32(at, 0, true);
      at += 4;
      continue;
    }
    view.setUint16(at, first, true);
    view.setUint16(at + 2, last - first + 1, true);
    at += 4;
    const i0 = s * HIST_LEN + first;
    out.set(bytesOf.subarray(16 * i0, 16 * (s * HIST_LEN + last + 1)), at);
    at += 16 * (last - first + 1);
  }
  return out.subarray(0, at);
}

/** The writer's encoding buffer, reused from record to record (written out before the next). */
let scratch = new Uint8Array(0);

/** Reads one record's payload. */
function readPayload(path: string, ref: RegionRecordRef): Buffer {
  const fd = openSync(path, 'r');
  try {
    const buf = Buffer.alloc(ref.bytes);
    let done = 0;
    while (done < ref.bytes) {
      const n = readSync(fd, buf, done, ref.bytes - done, ref.offset + done);
      if (n === 0) throw new RangeError(`region part ${path} ends at ${ref.offset + done} inside a record of ${ref.bytes} bytes`);
      done += n;
    }
    return buf.subarray(16);
  } finally {
    closeSync(fd);
  }
}

/**
 * Adds a histogram record's pairs into `acc` (dense pairs, same length as written); with
 * `touched` (one byte per slot), marks each slot the record holds bins of.
 */
export function readHistogramInto(
  path: string,
  ref: RegionRecordRef,
  acc: Float64Array,
  add: (a: Float64Array, i: number, b: Float64Array, j: number) => void,
  touched?: Uint8Array,
): void {
  const p = readPayload(path, ref);
  const slots = (acc.length >> 1) / HIST_LEN;
  let at = 0;
  const view = new Float64Array(HIST_LEN * 2);
  for (let s = 0; s < slots; s++) {
    const first = p.readUInt16LE(at);
    const n = p.readUInt16LE(at + 2);
    at += 4;
    if (n === 0) continue;
    if (touched) touched[s] = 1;
    Buffer.from(view.buffer).set(p.subarray(at, at + 16 * n));
    at += 16 * n;
    for (let k = 0; k < n; k++) add(acc, s * HIST_LEN + first + k, view, k);
  }
}

/** The figure sums of a figures record (kind 2 or 4). */
export function readFigureSums(path: string, ref: RegionRecordRef): RegionFigureSums[] {
  const p = readPayload(path, ref);
  const out: RegionFigureSums[] = [];
  let at = 0;
  const take = <T>(ctor: new (b: ArrayBuffer) => T, n: number, size: number): T => {
    const b = new ArrayBuffer(n * size);
    new Uint8Array(b).set(p.subarray(at, at + n * size));
    at += n * size;
    return new ctor(b);
  };
  while (at < p.length) {
    const nFields = p.readUInt32LE(at);
    const nYears = p.readUInt32LE(at + 4);
    at += 8;
    const swx = take(Float64Array, 2 * nYears * nFields, 8);
    const sw = take(Float64Array, 2 * nYears * nFields, 8);
    const worstValue = take(Float64Array, nFields, 8);
    const worstCell = take(Int32Array, nFields, 4);
    out.push({ nFields, nYears, swx, sw, worstValue, worstCell });
  }
  return out;
}

/** The values of a weighted-means record. */
export function readMeans(path: string, ref: RegionRecordRef): Float64Array {
  const p = readPayload(path, ref);
  const n = p.readUInt32LE(0);
  const out = new Float64Array(n);
  new Uint8Array(out.buffer).set(p.subarray(4, 4 + 8 * n));
  return out;
}

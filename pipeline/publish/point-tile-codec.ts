/**
 * The format of the per-cell histogram tiles (`data/calculator/cells/<chunk>.bin`), encode and
 * decode. Pure and isomorphic (no node: imports): the pipeline writes with it, the browser
 * calculator reads with it. point-tiles.ts does the I/O.
 *
 * What a tile holds: for each land cell of a run of consecutive land cells (row-major order) and
 * each year, the cell's counts of hourly WBGT per month (1–12) × local hour (0–23) × exposure
 * (sun, shade) × bin, bins of pipeline/work/wbgt-bins.ts (0.25 °C from 5 to 45 °C, open ends) —
 * the same layout as the region tiles (histogram-tiles.ts), but whole hours of one cell.
 *
 * One cell-year is 576 slots (month × hour × exposure, in that nesting order). Each slot is
 * `uint8 first` (first non-empty bin, 0–161), `uint8 n` (bins from first to the last non-empty
 * bin; 0 = empty slot), then the n counts "in unary", bit-packed: for each bin, `count` one-bits
 * then one zero-bit, least significant bit first, padded with zero-bits to a whole byte. A slot
 * of one year holds at most 31 days (32 values in the autumn daylight-saving hour), so most bins
 * hold 0–3 hours and unary costs about count + 1 bits per bin: on the invented small demo 4.3 kB
 * per cell-year against 6.8 kB for one uint8 per bin (measured on the 41 land cells × 3 years).
 * A count above 255 is refused (it cannot come from one year of hourly data).
 *
 * Chunk file (little-endian):
 *   bytes 0–3  magic "HHPT"; byte 4 format version; bytes 5–7 zero;
 *   uint32 nYears; uint32 nCells;
 *   nCells × uint32 global cell index (ascending);
 *   (nCells + 1) × uint32 byte offsets of each cell's data from the start of the data section;
 *   data: per cell, its years in the order of the index's `years`, each one cell-year as above.
 */
import { HIST_LEN, HOURS, MONTHS, N_EXPOSURES } from '../reduce/layout.ts';
import { PointTileCorrupt, PointTileCountTooLarge } from './point-tile-errors.ts';

export const POINT_TILE_VERSION = 1;
/** "HHPT" */
export const POINT_TILE_MAGIC: readonly number[] = [0x48, 0x48, 0x50, 0x54];
/** Slots per cell-year: months × local hours × exposures. */
export const POINT_SLOTS = MONTHS * HOURS * N_EXPOSURES;
/** Values per decoded cell-year: slots × bins. */
export const POINT_YEAR_SIZE = POINT_SLOTS * HIST_LEN;
/** Largest count one bin can hold [h]. */
export const POINT_MAX_COUNT = 255;
const HEADER_BYTES = 16;

/** A growable byte buffer. */
export class ByteWriter {
  private buf = new Uint8Array(4096);
  length = 0;

  push(b: number): void {
    if (this.length === this.buf.length) {
      const next = new Uint8Array(this.buf.length * 2);
      next.set(this.buf);
      this.buf = next;
    }
    this.buf[this.length++] = b;
  }

  /** A copy of the bytes written. */
  bytes(): Uint8Array {
    return this.buf.slice(0, this.length);
  }
}

function slotName(s: number): string {
  const m = Math.floor(s / (HOURS * N_EXPOSURES));
  const h = Math.floor(s / N_EXPOSURES) % HOURS;
  return `month ${m + 1}, local hour ${h}, ${s % N_EXPOSURES === 0 ? 'sun' : 'shade'}`;
}

/**
 * Encodes one cell-year of counts [h] into `out`. The cell's slot s (month × hour × exposure) starts
 * at `offset + ⌊s / N_EXPOSURES⌋ · mhStride + (s mod N_EXPOSURES) · HIST_LEN`: with the default
 * stride the cell-year is contiguous; a month-major year of many cells (pipeline/reduce/merge.ts)
 * passes its cells' count × exposures × bins as the stride. Catalogued error:
 * PointTileCountTooLarge for a count above {@link POINT_MAX_COUNT} or not a whole number.
 */
export function encodeCellYear(hist: ArrayLike<number>, offset: number, out: ByteWriter, cell = -1, year = 0, mhStride = N_EXPOSURES * HIST_LEN): void {
  const whole = hist instanceof Uint16Array || hist instanceof Uint8Array;
  for (let s = 0; s < POINT_SLOTS; s++) {
    const x = s % N_EXPOSURES;
    const base = offset + ((s - x) / N_EXPOSURES) * mhStride + x * HIST_LEN;
    let first = -1;
    let last = -1;
    for (let b = 0; b < HIST_LEN; b++) {
      const c = hist[base + b];
      if (c !== 0) {
        if (c > POINT_MAX_COUNT || (!whole && !(Number.isInteger(c) && c > 0))) throw PointTileCountTooLarge({ cell, year, slot: slotName(s), count: c });
        if (first < 0) first = b;
        last = b;
      }
    }
    if (first < 0) {
      out.push(0);
      out.push(0);
      continue;
    }
    out.push(first);
    out.push(last - first + 1);
    // `count` one-bits, then a zero-bit, least significant bit first: gathered in `acc`, whole
    // bytes written as they fill.
    let acc = 0;
    let bits = 0;
    for (let b = first; b <= last; b++) {
      let k = hist[base + b];
      while (k > 0) {
        const take = Math.min(k, 24 - bits);
        acc |= ((1 << take) - 1) << bits;
        bits += take;
        k -= take;
        while (bits >= 8) {
          out.push(acc & 0xff);
          acc >>>= 8;
          bits -= 8;
        }
      }
      bits += 1;
      if (bits >= 8) {
        out.push(acc & 0xff);
        acc >>>= 8;
        bits -= 8;
      }
    }
    if (bits > 0) out.push(acc & 0xff);
  }
}

/**
 * Decodes one cell-year starting at `bytes[p]` into `into[offset …]` ({@link POINT_YEAR_SIZE}
 * values [h], which must be zero where nothing is stored) and returns the position after it.
 * Catalogued error: PointTileCorrupt (`path` names the file).
 */
export function decodeCellYear(bytes: Uint8Array, p: number, into: Float64Array, offset: number, path = 'point tile'): number {
  const end = bytes.length;
  for (let s = 0; s < POINT_SLOTS; s++) {
    if (p + 2 > end) throw PointTileCorrupt({ path, problem: `data end inside slot ${s} of a cell-year (byte ${p})` });
    const first = bytes[p++];
    const n = bytes[p++];
    if (n === 0) continue;
    if (first + n > HIST_LEN) throw PointTileCorrupt({ path, problem: `slot ${s} claims bins ${first}…${first + n - 1}; there are ${HIST_LEN}` });
    const base = offset + s * HIST_LEN + first;
    let b = 0;
    let count = 0;
    let byte = 0;
    let bit = 8;
    while (b < n) {
      if (bit === 8) {
        if (p >= end) throw PointTileCorrupt({ path, problem: `data end inside slot ${s} of a cell-year (byte ${p})` });
        byte = bytes[p++];
        bit = 0;
      }
      if ((byte >> bit) & 1) count++;
      else {
        into[base + b] = count;
        count = 0;
        b++;
      }
      bit++;
    }
  }
  return p;
}

/** The parsed header of a chunk file. */
export interface PointChunk {
  bytes: Uint8Array;
  path: string;
  nYears: number;
  /** Global cell indices, ascending. */
  cells: Uint32Array;
  /** Byte offsets of each cell's data from `dataStart` (nCells + 1 values). */
  offsets: Uint32Array;
  dataStart: number;
}

/**
 * Builds a chunk file from the cells' encoded years: `parts[i]` holds cell `cells[i]`'s cell-years
 * one after the other (years in index order).
 */
export function assemblePointChunk(nYears: number, cells: ArrayLike<number>, parts: ReadonlyArray<readonly Uint8Array[]>): Uint8Array {
  const nCells = cells.length;
  let dataBytes = 0;
  for (const years of parts) for (const b of years) dataBytes += b.length;
  const dataStart = HEADER_BYTES + 4 * nCells + 4 * (nCells + 1);
  const out = new Uint8Array(dataStart + dataBytes);
  const dv = new DataView(out.buffer);
  out.set(POINT_TILE_MAGIC, 0);
  out[4] = POINT_TILE_VERSION;
  dv.setUint32(8, nYears, true);
  dv.setUint32(12, nCells, true);
  let off = 0;
  let p = dataStart;
  for (let i = 0; i < nCells; i++) {
    dv.setUint32(HEADER_BYTES + 4 * i, cells[i], true);
    dv.setUint32(HEADER_BYTES + 4 * nCells + 4 * i, off, true);
    for (const b of parts[i]) {
      out.set(b, p);
      p += b.length;
      off += b.length;
    }
  }
  dv.setUint32(HEADER_BYTES + 4 * nCells + 4 * nCells, off, true);
  return out;
}

/** Parses a chunk file's header. Catalogued error: PointTileCorrupt. */
export function parsePointChunk(bytes: Uint8Array, path = 'point tile'): PointChunk {
  if (bytes.length < HEADER_BYTES || POINT_TILE_MAGIC.some((m, i) => bytes[i] !== m)) {
    throw PointTileCorrupt({ path, problem: 'no "HHPT" signature at the start; not a per-cell histogram tile' });
  }
  if (bytes[4] !== POINT_TILE_VERSION) throw PointTileCorrupt({ path, problem: `format version ${bytes[4]}; this code reads version ${POINT_TILE_VERSION}` });
  const dv = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  const nYears = dv.getUint32(8, true);
  const nCells = dv.getUint32(12, true);
  const dataStart = HEADER_BYTES + 4 * nCells + 4 * (nCells + 1);
  if (dataStart > bytes.length) throw PointTileCorrupt({ path, problem: `header lists ${nCells} cells but the file holds only ${bytes.length} bytes` });
  const cells = new Uint32Array(nCells);
  const offsets = new Uint32Array(nCells + 1);
  for (let i = 0; i < nCells; i++) {
    cells[i] = dv.getUint32(HEADER_BYTES + 4 * i, true);
    if (i > 0 && cells[i] <= cells[i - 1]) throw PointTileCorrupt({ path, problem: `cell list not ascending at entry ${i}` });
  }
  for (let i = 0; i <= nCells; i++) offsets[i] = dv.getUint32(HEADER_BYTES + 4 * nCells + 4 * i, true);
  if (dataStart + offsets[nCells] !== bytes.length) {
    throw PointTileCorrupt({ path, problem: `data section should end at byte ${dataStart + offsets[nCells]}, the file has ${bytes.length}` });
  }
  return { bytes, path, nYears, cells, offsets, dataStart };
}

/**
 * A cell's histograms from a parsed chunk: one Float64Array of {@link POINT_YEAR_SIZE} [h] per
 * year, or null when the chunk does not hold the cell. Catalogued error: PointTileCorrupt.
 */
export function cellHistograms(chunk: PointChunk, cell: number): Float64Array[] | null {
  const { cells } = chunk;
  let lo = 0;
  let hi = cells.length - 1;
  while (lo <= hi) {
    const mid = (lo + hi) >> 1;
    if (cells[mid] < cell) lo = mid + 1;
    else if (cells[mid] > cell) hi = mid - 1;
    else {
      const start = chunk.dataStart + chunk.offsets[mid];
      const stop = chunk.dataStart + chunk.offsets[mid + 1];
      const view = chunk.bytes.subarray(0, stop);
      const out: Float64Array[] = [];
      let p = start;
      for (let y = 0; y < chunk.nYears; y++) {
        const hist = new Float64Array(POINT_YEAR_SIZE);
        p = decodeCellYear(view, p, hist, 0, chunk.path);
        out.push(hist);
      }
      if (p !== stop) throw PointTileCorrupt({ path: chunk.path, problem: `cell ${cell} has ${stop - p} bytes after its ${chunk.nYears} years` });
      return out;
    }
  }
  return null;
}

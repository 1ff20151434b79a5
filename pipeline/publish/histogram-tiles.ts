/**
 * Histogram tiles for the browser calculator: `data/calculator/<region-id>.bin`, one per region,
 * described by `data/calculator/index.json`.
 *
 * Binary layout (little-endian), for each year (in `years` order), month 1–12, local hour 0–23,
 * exposure (sun, shade): a uint8 `first` (index of the first non-empty bin, 0–161), a uint8 `n`
 * (number of bins stored; 0 = empty), then `n` uint16 values = hours × 100 (the area-weighted
 * counts, rounded to 0.01 h). Bins follow pipeline/work/wbgt-bins.ts (0.25 °C from 5 to 45 °C,
 * open bins at both ends). Decoder: src/lib or tests; the format version is in the index.
 */
import { HIST_EDGES, HIST_LEN, HOURS, MONTHS, N_EXPOSURES } from '../reduce/layout.ts';

export const HISTOGRAM_TILE_VERSION = 1;
/** Fixed-point scale of the stored counts [1/h]. */
export const HISTOGRAM_SCALE = 100;

/** Encodes one region's per-year histograms (each REGION_HIST_SIZE values [h]). */
export function encodeHistogramTile(perYear: readonly Float32Array[]): Uint8Array {
  const parts: number[] = [];
  const slots = MONTHS * HOURS * N_EXPOSURES;
  for (const hist of perYear) {
    for (let s = 0; s < slots; s++) {
      const base = s * HIST_LEN;
      let first = -1;
      let last = -1;
      for (let b = 0; b < HIST_LEN; b++) {
        if (Math.round(hist[base + b] * HISTOGRAM_SCALE) > 0) {
          if (first < 0) first = b;
          last = b;
        }
      }
      if (first < 0) {
        parts.push(0, 0);
        continue;
      }
      const n = last - first + 1;
      parts.push(first, n);
      for (let b = first; b <= last; b++) {
        const v = Math.min(65535, Math.round(hist[base + b] * HISTOGRAM_SCALE));
        parts.push(v & 0xff, v >> 8);
      }
    }
  }
  return Uint8Array.from(parts);
}

/** Slots of one year of a tile: month × local hour × exposure. */
const TILE_SLOTS = MONTHS * HOURS * N_EXPOSURES;
/** The most bytes one year of a tile can take: every slot's two header bytes and all its bins [bytes]. */
export const HISTOGRAM_TILE_YEAR_MAX_BYTES = TILE_SLOTS * (2 + 2 * HIST_LEN);

/**
 * Encodes one year of a tile from a region's histograms kept as double-double pairs
 * (pipeline/regions/double-double.ts: value i at `pairs[2i] + pairs[2i + 1]`, each taken as the
 * float32 {@link encodeHistogramTile} stores it as), where only the slots marked in `touched`
 * (one byte per month × hour × exposure) can hold a count: the same bytes as
 * {@link encodeHistogramTile} writes for that year's dense float32 histogram (an unmarked slot is
 * all zero, so empty there too), without building the dense array or a list of numbers. Writes
 * into `out` from byte `at` (room for {@link HISTOGRAM_TILE_YEAR_MAX_BYTES}) and returns the end.
 */
export function encodeHistogramTileYearPairs(pairs: Float64Array, touched: Uint8Array, out: Uint8Array, at: number): number {
  if (pairs.length !== 2 * TILE_SLOTS * HIST_LEN || touched.length !== TILE_SLOTS)
    throw new RangeError(`a tile year holds ${TILE_SLOTS} slots of ${HIST_LEN} pairs`);
  if (out.length - at < HISTOGRAM_TILE_YEAR_MAX_BYTES)
    throw new RangeError(`room for ${HISTOGRAM_TILE_YEAR_MAX_BYTES} bytes needed at byte ${at} of ${out.length}`);
  let p = at;
  for (let s = 0; s < TILE_SLOTS; s++) {
    if (touched[s] === 0) {
      out[p++] = 0;
      out[p++] = 0;
      continue;
    }
    const base = s * HIST_LEN;
    let first = -1;
    let last = -1;
    for (let b = 0; b < HIST_LEN; b++) {
      const i = base + b;
      if (Math.round(Math.fround(pairs[2 * i] + pairs[2 * i + 1]) * HISTOGRAM_SCALE) > 0) {
        if (first < 0) first = b;
        last = b;
      }
    }
    if (first < 0) {
      out[p++] = 0;
      out[p++] = 0;
      continue;
    }
    out[p++] = first;
    out[p++] = last - first + 1;
    for (let b = first; b <= last; b++) {
      const i = base + b;
      const v = Math.min(65535, Math.round(Math.fround(pairs[2 * i] + pairs[2 * i + 1]) * HISTOGRAM_SCALE));
      out[p++] = v & 0xff;
      out[p++] = v >> 8;
    }
  }
  return p;
}

/**
 * Decodes a tile into per-year Float64Arrays of MONTHS × HOURS × N_EXPOSURES × HIST_LEN [h]. With
 * `into` (arrays of that length from an earlier call), those are zeroed and filled instead of new
 * ones (no fresh memory per tile). Throws RangeError when the bytes end early, a slot's bins run
 * past the histogram, or bytes are left over.
 */
export function decodeHistogramTile(bytes: Uint8Array, nYears: number, into?: Float64Array[]): Float64Array[] {
  const slots = MONTHS * HOURS * N_EXPOSURES;
  const out: Float64Array[] = [];
  const end = bytes.length;
  let p = 0;
  for (let y = 0; y < nYears; y++) {
    const kept = into?.[y];
    const hist = kept && kept.length === slots * HIST_LEN ? kept.fill(0) : new Float64Array(slots * HIST_LEN);
    for (let s = 0; s < slots; s++) {
      if (p + 2 > end) throw new RangeError(`histogram tile ends early (${end} bytes: year ${y + 1} of ${nYears}, slot ${s + 1} of ${slots})`);
      const first = bytes[p++];
      const n = bytes[p++];
      if (first + n > HIST_LEN)
        throw new RangeError(`histogram tile slot ${s + 1} of year ${y + 1} has bins ${first}–${first + n - 1}, past the ${HIST_LEN} bins`);
      if (p + 2 * n > end) throw new RangeError(`histogram tile ends early (${end} bytes: year ${y + 1} of ${nYears}, slot ${s + 1} of ${slots})`);
      const at = s * HIST_LEN + first;
      for (let b = 0; b < n; b++) {
        hist[at + b] = (bytes[p] | (bytes[p + 1] << 8)) / HISTOGRAM_SCALE;
        p += 2;
      }
    }
    out.push(hist);
  }
  if (p !== end) throw new RangeError(`histogram tile has ${end - p} trailing bytes (expected ${nYears} years)`);
  return out;
}

/** The index the calculator reads first. */
export function histogramIndex(years: number[], baseline: [number, number], regions: Array<{ id: string; name: string }>) {
  return {
    version: HISTOGRAM_TILE_VERSION,
    scale: HISTOGRAM_SCALE,
    years,
    baseline,
    layout: 'year × month (1-12) × local hour (0-23) × exposure (sun, shade): uint8 first, uint8 n, n × uint16 hours×scale',
    bins: { edges: Array.from(HIST_EDGES), openEnds: true },
    regions: regions.map((r) => ({ id: r.id, name: r.name, path: `data/calculator/${r.id}.bin` })),
  };
}

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

/** Decodes a tile into per-year Float64Arrays of MONTHS × HOURS × N_EXPOSURES × HIST_LEN [h]. */
export function decodeHistogramTile(bytes: Uint8Array, nYears: number): Float64Array[] {
  const slots = MONTHS * HOURS * N_EXPOSURES;
  const out: Float64Array[] = [];
  let p = 0;
  for (let y = 0; y < nYears; y++) {
    const hist = new Float64Array(slots * HIST_LEN);
    for (let s = 0; s < slots; s++) {
      const first = bytes[p++];
      const n = bytes[p++];
      for (let b = 0; b < n; b++) {
        hist[s * HIST_LEN + first + b] = (bytes[p] | (bytes[p + 1] << 8)) / HISTOGRAM_SCALE;
        p += 2;
      }
    }
    out.push(hist);
  }
  if (p !== bytes.length) throw new RangeError(`histogram tile has ${bytes.length - p} trailing bytes (expected ${nYears} years)`);
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

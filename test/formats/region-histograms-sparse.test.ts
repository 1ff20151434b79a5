/**
 * The regions' histograms touch only the slots (month × local hour) their cells have hours in: the
 * merge encodes and clears only those slots, and the region stage encodes a calculator tile year
 * straight from its double-double pairs. Both must give the bytes the dense code gives: the
 * reference is the tile format's own dense encoder (pipeline/publish/histogram-tiles.ts
 * `encodeHistogramTile`, whose layout its file comment states) and the region-part writer without
 * the marks. Counts are invented (a seeded generator), with values at the 0.01 h rounding edge and
 * above the uint16 clamp.
 */
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { RegionPartWriter, readHistogramInto, RECORD_HISTOGRAM } from '../../pipeline/formats/region-parts.ts';
import {
  decodeHistogramTile,
  encodeHistogramTile,
  encodeHistogramTileYearPairs,
  HISTOGRAM_TILE_YEAR_MAX_BYTES,
} from '../../pipeline/publish/histogram-tiles.ts';
import { CELL_YEAR_HIST } from '../../pipeline/reduce/merge.ts';
import { HIST_LEN, HOURS, MONTHS, N_EXPOSURES } from '../../pipeline/reduce/layout.ts';
import { ddAdd, ddAddPair } from '../../pipeline/regions/double-double.ts';
import { addWeightedHistograms, type RegionTileCells } from '../../pipeline/regions/region-sums.ts';

const SLOTS = MONTHS * HOURS * N_EXPOSURES;
const dir = mkdtempSync(join(tmpdir(), 'heathours-sparse-hist-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

function rng(seed: number): () => number {
  let s = seed >>> 0;
  return () => (s = (s * 1664525 + 1013904223) >>> 0) / 2 ** 32;
}

/** Double-double pairs of one year with counts in about a fifth of the slots; the slots marked. */
function sparseYear(seed: number): { pairs: Float64Array; touched: Uint8Array } {
  const r = rng(seed);
  const pairs = new Float64Array(2 * CELL_YEAR_HIST);
  const touched = new Uint8Array(SLOTS);
  const edge = [0.004, 0.005, 0.0049999, 0.015, 700, 655.35, 655.36, 1 / 3];
  for (let s = 0; s < SLOTS; s++) {
    if (r() > 0.2) continue;
    touched[s] = 1;
    const first = Math.floor(r() * HIST_LEN);
    const n = 1 + Math.floor(r() * Math.min(20, HIST_LEN - first));
    for (let b = first; b < first + n; b++) {
      if (r() < 0.2) continue; // holes inside the run
      const x = r() < 0.25 ? edge[Math.floor(r() * edge.length)] : r() * 30;
      ddAdd(pairs, s * HIST_LEN + b, x);
      ddAdd(pairs, s * HIST_LEN + b, x * 1e-17); // a lower part the float32 value must take in
    }
  }
  // A slot marked whose values round to nothing: empty in both encoders.
  const s0 = SLOTS - 1;
  touched[s0] = 1;
  pairs.fill(0, 2 * s0 * HIST_LEN, 2 * (s0 + 1) * HIST_LEN);
  ddAdd(pairs, s0 * HIST_LEN + 3, 0.001);
  return { pairs, touched };
}

describe("sparse region histograms give the dense encoders' bytes", () => {
  it('a calculator tile encoded year by year from double-double pairs equals encodeHistogramTile of the float32 years', () => {
    const years = [11, 12, 13].map(sparseYear);
    const dense = years.map(({ pairs }) => {
      const h = new Float32Array(CELL_YEAR_HIST);
      for (let i = 0; i < CELL_YEAR_HIST; i++) h[i] = pairs[2 * i] + pairs[2 * i + 1];
      return h;
    });
    const want = encodeHistogramTile(dense);
    const out = new Uint8Array(3 * HISTOGRAM_TILE_YEAR_MAX_BYTES);
    let at = 0;
    for (const y of years) at = encodeHistogramTileYearPairs(y.pairs, y.touched, out, at);
    expect(at).toBe(want.length);
    expect(Buffer.from(out.subarray(0, at)).equals(Buffer.from(want))).toBe(true);
    // The clamp and the rounding edge were exercised: some stored value is 65535, some bin 0.005 h → 1.
    const back = decodeHistogramTile(want, 3);
    expect(back.some((h) => h.some((v) => v === 655.35))).toBe(true);
    expect(back.some((h) => h.some((v) => v === 0.01))).toBe(true);
  });

  it('a tile decoded into the arrays of an earlier one gives the same values; one cut short, with bins past the histogram or with bytes left over is refused saying which', () => {
    const years = [11, 12, 13].map(sparseYear);
    const dense = years.map(({ pairs }) => Float32Array.from({ length: CELL_YEAR_HIST }, (_, i) => pairs[2 * i] + pairs[2 * i + 1]));
    const tile = encodeHistogramTile(dense);
    const fresh = decodeHistogramTile(tile, 3);
    // Arrays of another tile (every bin set) are zeroed and refilled, not returned as they were.
    const other = [0, 1, 2].map(() => new Float64Array(CELL_YEAR_HIST).fill(7));
    const again = decodeHistogramTile(tile, 3, other);
    expect(again[0]).toBe(other[0]);
    expect(again).toEqual(fresh);
    expect(() => decodeHistogramTile(tile.subarray(0, 50), 3)).toThrow(/ends early \(50 bytes: year 1 of 3/);
    expect(() => decodeHistogramTile(tile.subarray(0, tile.length - 1), 3)).toThrow(/ends early/);
    expect(() => decodeHistogramTile(Uint8Array.of(...tile, 0, 0), 3)).toThrow(/2 trailing bytes/);
    // Slot 1 claiming bins from HIST_LEN − 1 on, two of them: past the histogram.
    const bad = Uint8Array.of(HIST_LEN - 1, 2, 1, 0, 1, 0);
    expect(() => decodeHistogramTile(bad, 1)).toThrow(new RegExp(`slot 1 of year 1 has bins ${HIST_LEN - 1}–${HIST_LEN}, past the ${HIST_LEN} bins`));
  });

  it('an unmarked slot is written empty, and a tile year without room is refused', () => {
    const { pairs } = sparseYear(5);
    const none = new Uint8Array(SLOTS);
    const out = new Uint8Array(HISTOGRAM_TILE_YEAR_MAX_BYTES);
    expect(encodeHistogramTileYearPairs(pairs, none, out, 0)).toBe(2 * SLOTS);
    expect(out.subarray(0, 2 * SLOTS).every((b) => b === 0)).toBe(true);
    expect(() => encodeHistogramTileYearPairs(pairs, none, out, 1)).toThrow(/room for/);
  });

  it('a region-part histogram record written with the marks has the bytes of one written without, and reading it back marks the same slots', () => {
    const { pairs, touched } = sparseYear(21);
    // The writer's marks are per month × hour (both exposures), as the merge keeps them.
    const perHour = new Uint8Array(MONTHS * HOURS);
    for (let s = 0; s < SLOTS; s++) if (touched[s]) perHour[Math.floor(s / N_EXPOSURES)] = 1;
    const a = new RegionPartWriter(join(dir, 'a.regions'));
    a.histogram(7, 1, pairs);
    a.histogram(8, 2, new Float64Array(2 * CELL_YEAR_HIST));
    a.close();
    const b = new RegionPartWriter(join(dir, 'b.regions'));
    b.histogram(7, 1, pairs, perHour);
    b.histogram(8, 2, new Float64Array(2 * CELL_YEAR_HIST), new Uint8Array(MONTHS * HOURS));
    b.close();
    expect(readFileSync(join(dir, 'b.regions')).equals(readFileSync(join(dir, 'a.regions')))).toBe(true);
    expect(b.records).toEqual(a.records);
    expect(b.records[0].kind).toBe(RECORD_HISTOGRAM);
    const acc = new Float64Array(2 * CELL_YEAR_HIST);
    const marks = new Uint8Array(SLOTS);
    readHistogramInto(join(dir, 'b.regions'), b.records[0], acc, ddAddPair, marks);
    // Marked: every slot holding a non-zero pair (the empty-looking last slot holds 0.001 h).
    for (let s = 0; s < SLOTS; s++) {
      const holds = pairs.subarray(2 * s * HIST_LEN, 2 * (s + 1) * HIST_LEN).some((v) => v !== 0);
      expect(marks[s], `slot ${s}`).toBe(holds ? 1 : 0);
    }
    expect(Array.from(acc)).toEqual(Array.from(pairs));
  });

  it('adding weighted cell histograms with marks adds the same pairs and marks exactly the slots a cell has hours in', () => {
    const r = rng(99);
    const nCells = 5;
    const slots = MONTHS * HOURS;
    const run = N_EXPOSURES * HIST_LEN;
    const hist = new Uint16Array(slots * nCells * run);
    for (let s = 0; s < slots; s++) {
      if (r() > 0.3) continue;
      const c = Math.floor(r() * nCells);
      const b = Math.floor(r() * run);
      hist[(s * nCells + c) * run + b] = 1 + Math.floor(r() * 5000);
    }
    const rc: RegionTileCells = {
      region: 0,
      local: Int32Array.from([1, 3]),
      cells: Int32Array.from([101, 103]),
      weight: Float64Array.from([0.25, 0.75]),
      histWeight: Float64Array.from([0.3, 0.7]),
    };
    const plain = new Float64Array(2 * slots * run);
    addWeightedHistograms(plain, hist, nCells, slots, run, rc);
    const marked = new Float64Array(2 * slots * run);
    const marks = new Uint8Array(slots);
    addWeightedHistograms(marked, hist, nCells, slots, run, rc, marks);
    expect(Array.from(marked)).toEqual(Array.from(plain));
    let n = 0;
    for (let s = 0; s < slots; s++) {
      const holds = [1, 3].some((c) => hist.subarray((s * nCells + c) * run, (s * nCells + c + 1) * run).some((v) => v !== 0));
      expect(marks[s], `slot ${s}`).toBe(holds ? 1 : 0);
      n += marks[s];
    }
    expect(n).toBeGreaterThan(10);
    expect(n).toBeLessThan(slots);
  });
});

/**
 * The per-cell histogram tiles of the calculator (pipeline/publish/point-tile-codec.ts,
 * point-tiles.ts): the codec round trip on random counts, a published cell's tile against the
 * merged histogram it came from (a whole invented year run through the real accumulator), the
 * chunking, and every bad input with its catalogued error.
 */
import { describe, expect, it } from 'vitest';
import { mkdtempSync, readFileSync, readdirSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import fc from 'fast-check';
import { parse } from 'yaml';
import {
  ByteWriter,
  POINT_SLOTS,
  POINT_YEAR_SIZE,
  assemblePointChunk,
  cellHistograms,
  decodeCellYear,
  encodeCellYear,
  parsePointChunk,
} from '../../pipeline/publish/point-tile-codec.ts';
import { PointTileStore, writePointTileIndex, type PointTileIndex } from '../../pipeline/publish/point-tiles.ts';
import { accumulateBlock, createPartial, createScratch } from '../../pipeline/reduce/accumulator.ts';
import { histogramSlot, mergeYear, type YearCounts } from '../../pipeline/reduce/merge.ts';
import { HIST_LEN, HOURS, MONTHS, N_EXPOSURES } from '../../pipeline/reduce/layout.ts';
import { localHours, parseWorkloadClasses, resolveWorkSettings, workSettingsSchema } from '../../pipeline/work/index.ts';
import { expectCatalogued, expectCataloguedAsync } from '../helpers/catalogued.ts';

const classes = parseWorkloadClasses(parse(readFileSync(new URL('../../content/workload-classes.yaml', import.meta.url), 'utf8')));
const work = resolveWorkSettings(workSettingsSchema.parse(undefined), classes);
const HOUR = 3_600_000;

/** Random whole-hour histograms of one cell-year: some empty slots, counts 0–255, bins up to both open ends. */
function randomCellYear(seed: number): Uint16Array {
  let s = seed >>> 0;
  const rnd = () => (s = (s * 1664525 + 1013904223) >>> 0) / 2 ** 32;
  const h = new Uint16Array(POINT_YEAR_SIZE);
  for (let slot = 0; slot < POINT_SLOTS; slot++) {
    const r = rnd();
    if (r < 0.1) continue;
    const first = r < 0.15 ? 0 : Math.floor(rnd() * HIST_LEN);
    const last = r > 0.95 ? HIST_LEN - 1 : Math.min(HIST_LEN - 1, first + Math.floor(rnd() * 40));
    for (let b = first; b <= last; b++) h[slot * HIST_LEN + b] = rnd() < 0.4 ? 0 : Math.floor(rnd() * (rnd() < 0.02 ? 256 : 6));
  }
  return h;
}

/** Cell c's year of a merged (month-major) histogram, contiguous as a point tile holds it: month × hour × exposure × bin. */
function cellYear(hist: Uint16Array, c: number, nCells: number): Uint16Array {
  const out = new Uint16Array(POINT_YEAR_SIZE);
  const run = N_EXPOSURES * HIST_LEN;
  for (let m = 0; m < MONTHS; m++)
    for (let h = 0; h < HOURS; h++) out.set(hist.subarray(histogramSlot(m, h, c, nCells), histogramSlot(m, h, c, nCells) + run), (m * HOURS + h) * run);
  return out;
}

/** One local year of invented hourly WBGT for `cells`, through the real accumulator (as a shard would). */
function inventedYear(year: number, cells: Int32Array, seed: number): YearCounts {
  let s = seed >>> 0;
  const rnd = () => (s = (s * 1664525 + 1013904223) >>> 0) / 2 ** 32;
  const start = Date.UTC(year, 0, 1, 10); // local midnight in Etc/GMT+10
  const nt = (Date.UTC(year + 1, 0, 1) - Date.UTC(year, 0, 1)) / HOUR;
  const nc = cells.length;
  const time = Float64Array.from({ length: nt }, (_, t) => start + (t + 1) * HOUR);
  const sun = new Float32Array(nt * nc);
  const shade = new Float32Array(nt * nc);
  const air = new Float32Array(nt * nc);
  for (let t = 0; t < nt; t++) {
    const d = Math.sin((((t + 14) % 24) / 24) * 2 * Math.PI);
    const season = 3 * Math.sin(((t / 24 - 100) / 365) * 2 * Math.PI);
    for (let c = 0; c < nc; c++) {
      const i = t * nc + c;
      shade[i] = 22 + season + 4 * d + c * 0.7 + 5 * (rnd() - 0.5);
      sun[i] = shade[i] + Math.max(0, 3.5 * d) + rnd();
      air[i] = shade[i] + 4;
      if (i % 211 === 0) sun[i] = NaN;
    }
  }
  const p = createPartial(year, cells, work.evaluations);
  const scratch = createScratch(nt * nc, work.evaluations);
  const local = localHours(time, 'Etc/GMT+10', work.shift);
  accumulateBlock(p, { nHours: nt, wbgtSun: sun, wbgtShade: shade, airTemperature: air, local }, work.evaluations, scratch);
  return mergeYear(year, cells, [p]);
}

describe('per-cell histogram tile codec', () => {
  it('decodes every random cell-year (empty slots, both open end bins, counts up to 255) to exactly the counts encoded', () => {
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 2 ** 31 }), (seed) => {
        const h = randomCellYear(seed);
        const w = new ByteWriter();
        encodeCellYear(h, 0, w);
        const bytes = w.bytes();
        const back = new Float64Array(POINT_YEAR_SIZE);
        expect(decodeCellYear(bytes, 0, back, 0)).toBe(bytes.length);
        expect(Array.from(back)).toEqual(Array.from(h));
      }),
      { numRuns: 40 },
    );
  });

  it('stores an empty slot in 2 bytes and a one-bin slot of 31 hours in 2 + 4 bytes (31 one-bits and a zero-bit)', () => {
    const h = new Uint16Array(POINT_YEAR_SIZE);
    const empty = new ByteWriter();
    encodeCellYear(h, 0, empty);
    expect(empty.length).toBe(2 * POINT_SLOTS);
    h[7 * HIST_LEN + 80] = 31;
    const one = new ByteWriter();
    encodeCellYear(h, 0, one);
    expect(one.length).toBe(2 * POINT_SLOTS + 4);
  });

  it('a chunk holds several cells and years; each cell decodes to its own years and a cell not in the chunk gives null', () => {
    const cells = [4, 9, 30];
    const years = 2;
    const raw = cells.map((_, i) => Array.from({ length: years }, (_, y) => randomCellYear(100 + i * 10 + y)));
    const parts = raw.map((ys) =>
      ys.map((h) => {
        const w = new ByteWriter();
        encodeCellYear(h, 0, w);
        return w.bytes();
      }),
    );
    const chunk = parsePointChunk(assemblePointChunk(years, cells, parts));
    expect(Array.from(chunk.cells)).toEqual(cells);
    cells.forEach((cell, i) => {
      const got = cellHistograms(chunk, cell)!;
      expect(got.length).toBe(years);
      got.forEach((h, y) => expect(Array.from(h)).toEqual(Array.from(raw[i][y])));
    });
    expect(cellHistograms(chunk, 5)).toBeNull();
  });
});

describe('per-cell histogram tiles as the build publishes them', () => {
  it('every land cell is in exactly one chunk, and its decoded tile equals the merged histogram of each year, count for count', async () => {
    const cells = Int32Array.from([2, 3, 4, 11, 12, 13, 14, 25, 26]);
    const ys = [inventedYear(2021, cells, 7), inventedYear(2022, cells, 8)];
    const snapshot = ys.map((yc) => Uint16Array.from(yc.histogram));
    const store = new PointTileStore(cells);
    // Years arrive in any order (the build merges a year when its last shard is done).
    store.addYear(ys[1]);
    store.addYear(ys[0]);
    const dir = mkdtempSync(join(tmpdir(), 'hh-point-tiles-'));
    const written = await store.write(dir, { years: [2021, 2022], targetBytes: 20_000, prefix: 'band-' });
    await writePointTileIndex(dir, {
      years: [2022, 2021],
      grid: { lat: [10, 11, 12], lon: [60, 61, 62, 63, 64, 65, 66, 67, 68, 69] },
      chunks: [...written].reverse(),
    });
    const index = JSON.parse(readFileSync(join(dir, 'calculator/cells/index.json'), 'utf8')) as PointTileIndex;
    expect(index.years).toEqual([2021, 2022]);
    expect(index.grid).toEqual({ nLat: 3, nLon: 10, lat0: 10, dLat: 1, lon0: 60, dLon: 1 });
    expect(index.chunks).toEqual(written);
    expect(index.chunks[0].path).toBe('data/calculator/cells/band-0000.bin');
    expect(index.chunks.length).toBeGreaterThan(1);
    expect(readdirSync(join(dir, 'calculator/cells')).filter((f) => f.endsWith('.bin')).length).toBe(index.chunks.length);
    const seen: number[] = [];
    let bytes = 0;
    for (const entry of index.chunks) {
      const file = readFileSync(join(dir, entry.path.replace(/^data\//, '')));
      expect(file.length).toBe(entry.bytes);
      bytes += file.length;
      const chunk = parsePointChunk(new Uint8Array(file), entry.path);
      expect(chunk.cells[0]).toBe(entry.firstCell);
      expect(chunk.cells[chunk.cells.length - 1]).toBe(entry.lastCell);
      for (const cell of chunk.cells) {
        seen.push(cell);
        const c = cells.indexOf(cell);
        const got = cellHistograms(chunk, cell)!;
        got.forEach((h, y) => expect(Array.from(h), `cell ${cell} year ${2021 + y}`).toEqual(Array.from(cellYear(snapshot[y], c, cells.length))));
      }
    }
    expect(seen).toEqual(Array.from(cells));
    expect(bytes).toBe(written.reduce((s, c) => s + c.bytes, 0));
    // The merged year really holds hours (a whole year per cell, NaN hours left out).
    expect(cellYear(snapshot[0], 0, cells.length).reduce((a, b) => a + b, 0)).toBeGreaterThan(2 * 8700 - 100);
  });
});

describe('per-cell histogram tiles refuse bad input with catalogued errors', () => {
  it('a bin count above 255 or not whole is PointTileCountTooLarge', () => {
    const h = new Float64Array(POINT_YEAR_SIZE);
    h[3] = 256;
    expectCatalogued(() => encodeCellYear(h, 0, new ByteWriter(), 5, 2021), 'PointTileCountTooLarge', /cell 5, year 2021, month 1, local hour 0, sun: 256/);
    h[3] = 2.5;
    expectCatalogued(() => encodeCellYear(h, 0, new ByteWriter()), 'PointTileCountTooLarge');
  });

  it('a file without the signature, of another version, truncated or with bytes added is PointTileCorrupt', () => {
    const w = new ByteWriter();
    encodeCellYear(randomCellYear(3), 0, w);
    const good = assemblePointChunk(1, [7], [[w.bytes()]]);
    expect(parsePointChunk(good).cells[0]).toBe(7);
    expectCatalogued(() => parsePointChunk(new Uint8Array(good.length)), 'PointTileCorrupt', /signature/);
    const version = good.slice();
    version[4] = 9;
    expectCatalogued(() => parsePointChunk(version, 'x.bin'), 'PointTileCorrupt', /x\.bin: format version 9/);
    expectCatalogued(() => parsePointChunk(good.subarray(0, good.length - 3)), 'PointTileCorrupt', /data section should end/);
    const longer = new Uint8Array(good.length + 1);
    longer.set(good);
    expectCatalogued(() => parsePointChunk(longer), 'PointTileCorrupt', /data section should end/);
    expectCatalogued(() => decodeCellYear(w.bytes().subarray(0, 100), 0, new Float64Array(POINT_YEAR_SIZE), 0), 'PointTileCorrupt', /data end inside slot/);
    const badBins = new Uint8Array(2 * POINT_SLOTS);
    badBins[0] = 160;
    badBins[1] = 5;
    expectCatalogued(() => decodeCellYear(badBins, 0, new Float64Array(POINT_YEAR_SIZE), 0), 'PointTileCorrupt', /claims bins 160…164/);
  });

  it('writing years that were not all added is PointTileYearsIncomplete; a year of other cells is PointTileCellsMismatch', async () => {
    const cells = Int32Array.from([1, 2]);
    const store = new PointTileStore(cells);
    store.addYear(inventedYear(2021, cells, 1));
    await expectCataloguedAsync(store.write(mkdtempSync(join(tmpdir(), 'hh-pt-')), { years: [2021, 2022] }), 'PointTileYearsIncomplete', /2021, 2022.*2021/);
    expectCatalogued(() => store.addYear(inventedYear(2022, Int32Array.from([1, 3]), 2)), 'PointTileCellsMismatch', /year 2022/);
  });
});

/**
 * The estimate calculator's pure logic (src/lib/estimate): hand-computed cases (calendar counts of
 * the shift shares, the allowable-work-fraction formula of docs/methods.md §8.6 and its worked example,
 * the quantile check values of docs/methods.md §10.1), and the published data: with the atlas's own
 * settings the calculator reproduces the region tables (data/regions/<id>.csv) and the cell table
 * (the per-cell tables, data/cell-tables/*.csv) within measured tolerances, and its rest-in-shade approximation a
 * pipeline build with `work.restLocation: shade`. Every bad input gets its catalogued error.
 *
 * External checks: weekday counts from the Gregorian calendar (2021-01-01 was a Friday, 2021-07-01
 * a Thursday); docs/methods.md §8.6 worked example (f = 0.189 in place, 0.532 resting at 26 °C, 0 for
 * unacclimatized at 31 °C, heavy work 415 W); docs/methods.md §10.1 type-7 example (P90 142.4 h).
 */
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { execFileSync } from 'node:child_process';
import { tmpdir } from 'node:os';
import { splitCsvRecord } from '../../pipeline/formats/csv.ts';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { buildRestShadeData } from './rest-shade-data.ts';
import { loadEstimateContext } from '../../src/data/estimate.ts';
import type { EstimateContext } from '../../pipeline/schedule/context.ts';
import { cellAt, parseInputs, placeFromQuery, type RawInputs } from '../../pipeline/schedule/inputs.ts';
import { runEstimate, type EstimateResult } from '../../src/lib/estimate/estimate.ts';
import { monthlyFigures, type MonthlyYear } from '../../src/lib/estimate/monthly.ts';
import { monthOccurrences } from '../../pipeline/schedule/project-period.ts';
import { clearShiftShareCache, shiftShares } from '../../src/lib/estimate/shift-shares.ts';
import { estimateStatistics } from '../../src/lib/estimate/statistics.ts';
import { ESTIMATE_COLUMNS, estimateRows } from '../../src/lib/estimate/table.ts';
import { estimateCsv } from '../../src/lib/estimate/csv.ts';
import { REGION_TABLE_TOLERANCE } from '../../src/lib/estimate/measured.ts';
import { regionTileHistograms } from '../../pipeline/schedule/tiles.ts';
import { cellTileHistograms, chunkForCell } from '../../pipeline/schedule/cell-tiles.ts';
import { HIST_LEN, HOURS, N_EXPOSURES } from '../../pipeline/reduce/layout.ts';
import { POINT_YEAR_SIZE } from '../../pipeline/publish/point-tile-codec.ts';
import { CAUTION_SUMMARY, DEFAULT_SHIFT, prepareWorkKernel, wbgtBinIndex } from '../../pipeline/work/index.ts';
import { readCellTables } from '../helpers/cell-tables.ts';
import { parsePattern, patternFromWorkShift } from '../../pipeline/schedule/shift-pattern.ts';
import { expectCatalogued } from '../helpers/catalogued.ts';

let dataDir = '';
let restShadeDir = '';
let ctx: EstimateContext;
let atlasTitle = '';

beforeAll(async () => {
  const shade = await buildRestShadeData();
  dataDir = shade.baseDataDir;
  restShadeDir = shade.dataDir;
  const loaded = loadEstimateContext(dataDir)!;
  ctx = loaded.ctx;
  atlasTitle = loaded.atlasTitle;
}, 300_000);

const ALL_DAYS = ['mon', 'tue', 'wed', 'thu', 'fri', 'sat', 'sun'];
const pad = (m: number) => String(m + 1).padStart(2, '0');

/** A tidy CSV as row objects. */
function readCsv(path: string): Array<Record<string, string>> {
  const lines = readFileSync(path, 'utf8')
    .trim()
    .split('\n')
    .filter((l) => !l.startsWith('#'));
  const head = lines[0].split(',');
  return lines.slice(1).map((l) => Object.fromEntries(l.split(',').map((v, i) => [head[i], v])));
}

function regionTable(dir: string, id: string): Map<string, number> {
  return new Map(
    readCsv(join(dir, 'data/regions', `${id}.csv`)).map((r) => [
      `${r.period}|${r.figure}|${r.workload_class}.${r.acclimatization}.${r.exposure}|${r.statistic}`,
      Number(r.value),
    ]),
  );
}

function regionHist(id: string): Float64Array[] {
  const r = ctx.regions.find((x) => x.id === id)!;
  return regionTileHistograms(new Uint8Array(readFileSync(join(dataDir, r.path))), r.path, ctx);
}

function estimate(hist: Float64Array[], raw: RawInputs): EstimateResult {
  return runEstimate(hist, parseInputs(raw, ctx, 'C'), ctx);
}

/** One synthetic year of histograms: `put(month 0-11, hour, exposure 0 sun / 1 shade, WBGT °C, hours)`. */
function syntheticYear(fill: (put: (m: number, h: number, x: number, wbgt: number, hours: number) => void) => void): Float64Array {
  const hist = new Float64Array(POINT_YEAR_SIZE);
  fill((m, h, x, wbgt, hours) => {
    hist[((m * HOURS + h) * N_EXPOSURES + x) * HIST_LEN + wbgtBinIndex(wbgt)] += hours;
  });
  return hist;
}

/** Largest |estimate − table| as a share of the month's shift hours, over every check made. */
class Worst {
  share = 0;
  hours = 0;
  what = '';
  add(got: number, want: number, shiftHours: number, what: string): void {
    const d = Math.abs(got - want);
    if (d / shiftHours > this.share) {
      this.share = d / shiftHours;
      this.what = `${what}: ${got.toFixed(2)} h vs ${want} h`;
    }
    this.hours = Math.max(this.hours, d);
  }
  report(name: string): string {
    return `${name}: largest difference ${(100 * this.share).toFixed(2)} % of the month's shift hours (${this.hours.toFixed(2)} h at most; ${this.what})`;
  }
}

describe('shift shares from the calendar (pipeline/work/shifts.ts)', () => {
  it('07–17 Monday to Saturday in January 2021 (Etc/GMT+10): 26 of 31 days in hours 7–16, none outside; February 24 of 28', () => {
    const [y] = shiftShares([2021], 'Etc/GMT+10', patternFromWorkShift(DEFAULT_SHIFT));
    for (let h = 0; h < 24; h++) {
      expect(y.share[h], `hour ${h}`).toBeCloseTo(h >= 7 && h < 17 ? 26 / 31 : 0, 12);
      expect(y.slotHours[h]).toBe(31);
      expect(y.share[24 + h]).toBeCloseTo(h >= 7 && h < 17 ? 24 / 28 : 0, 12);
    }
  });

  it('a night shift 22–06 Monday to Friday counts the hours after midnight for the day it started: January 2021 hours 22–23 on 21 days, hours 0–5 on 22', () => {
    const [y] = shiftShares([2021], 'Etc/GMT+10', parsePattern(['22:00-06:00'], 'mon-fri'));
    for (let h = 0; h < 24; h++) expect(y.share[h], `hour ${h}`).toBeCloseTo(h >= 22 ? 21 / 31 : h < 6 ? 22 / 31 : 0, 12);
  });
});

describe('shift shares are computed once per year, zone and pattern', () => {
  it('shares asked again, in another order, with another zone or pattern, or for more years than the cache holds equal the shares computed afresh', () => {
    const day = patternFromWorkShift(DEFAULT_SHIFT);
    const night = parsePattern(['22:00-06:00'], 'mon-fri');
    const fresh = (years: number[], zone: string, p: typeof day) => {
      clearShiftShareCache();
      const out = shiftShares(years, zone, p).map((y) => ({ year: y.year, share: Array.from(y.share), slot: Array.from(y.slotHours) }));
      clearShiftShareCache();
      return out;
    };
    const view = (ys: ReturnType<typeof shiftShares>) => ys.map((y) => ({ year: y.year, share: Array.from(y.share), slot: Array.from(y.slotHours) }));
    const dayWant = fresh([2021, 2024], 'Etc/GMT+10', day);
    const nightWant = fresh([2021, 2024], 'Etc/GMT+10', night);
    const zoneWant = fresh([2024, 2021], 'Europe/Berlin', day);
    expect(view(shiftShares([2021, 2024], 'Etc/GMT+10', day))).toEqual(dayWant);
    expect(view(shiftShares([2021, 2024], 'Etc/GMT+10', night))).toEqual(nightWant);
    expect(view(shiftShares([2024, 2021], 'Europe/Berlin', day))).toEqual(zoneWant);
    expect(view(shiftShares([2024, 2021], 'Etc/GMT+10', day))).toEqual([dayWant[1], dayWant[0]]);
    expect(nightWant[0].share).not.toEqual(dayWant[0].share);
    // Berlin's clocks went forward on 28 March 2021: its March 02:00 slot has 30 hours, not 31.
    expect(zoneWant[1].slot[2 * 24 + 2]).toBe(30);
    expect(dayWant[0].slot[2 * 24 + 2]).toBe(31);
    // January 2021, hour 8, Monday to Saturday: 26 of 31 days (the calendar; as the test above).
    expect(dayWant[0].share[8]).toBeCloseTo(26 / 31, 12);
    // More years than the cache holds (64): each still its own calendar year.
    const many = Array.from({ length: 70 }, (_, i) => 1960 + i);
    const got = shiftShares(many, 'Etc/GMT+10', day);
    expect(got.map((y) => y.year)).toEqual(many);
    expect(view([got[0], got[69]])).toEqual(fresh([1960, 2029], 'Etc/GMT+10', day));
  });
});

describe('monthly figures from a histogram (hand-computed)', () => {
  it('10 hours of July noon at 30.125 °C, moderate work: 27/31 of them above the limit, each losing 1 − f with f from the docs/methods.md §8.6 closed form', () => {
    const hist = syntheticYear((put) => put(6, 12, 0, 30.1, 10));
    const [shares] = shiftShares([2021], 'Etc/GMT+10', patternFromWorkShift(DEFAULT_SHIFT));
    const kernel = prepareWorkKernel({ workRate: 300, restRate: 115, limit: { model: 'curve-2017', acclimatization: 'acclimatized' } });
    const y = monthlyFigures(hist, shares, { kernel, exposure: 'sun', rest: { kind: 'same-place' } });
    // docs/methods.md §8.6: M_lim = 10^((56.7 − WBGT)/11.5), f = (M_lim − M_rest)/(M_work − M_rest); bin middle 30.125 °C.
    const f = (10 ** ((56.7 - 30.125) / 11.5) - 115) / (300 - 115);
    const share = 27 / 31; // July 2021: 4 Sundays (4, 11, 18, 25)
    expect(y.shiftHours[6]).toBeCloseTo(share * 10, 10);
    expect(y.above[6]).toBeCloseTo(share * 10, 10);
    expect(y.lost[6]).toBeCloseTo(share * 10 * (1 - f), 10);
    expect(y.validHours[6]).toBe(10);
    expect(y.expectedHours[6]).toBe(31 * 24);
    // The same hours in the shade column do not count for work in the sun, and a shade estimate sees none.
    expect(monthlyFigures(hist, shares, { kernel, exposure: 'shade', rest: { kind: 'same-place' } }).above[6]).toBe(0);
  });

  it('reproduces the docs/methods.md §8.6 worked example for heavy work (415 W) at an effective 31 °C: f = 0.189 in place, 0.532 resting in shade at 26 °C, 0 unacclimatized', () => {
    // Measured sun WBGT in the bin [30, 30.25) (middle 30.125), shade in [25, 25.25) (median 25.125),
    // clothing adjustment 0.875: effective 31.0 °C at work and 26.0 °C at rest.
    const hist = syntheticYear((put) => {
      put(3, 10, 0, 30.1, 4);
      put(3, 10, 1, 25.1, 4);
    });
    const [shares] = shiftShares([2021], 'Etc/GMT+10', parsePattern(['00:00-24:00'], 'mon-sun'));
    const kernel = (acclimatization: 'acclimatized' | 'unacclimatized') =>
      prepareWorkKernel({ workRate: 415, restRate: 115, limit: { model: 'curve-2017', acclimatization }, clothingAdjustment: 0.875 });
    const lost = (k: ReturnType<typeof kernel>, rest: 'same-place' | 'shade') =>
      monthlyFigures(hist, shares, { kernel: k, exposure: 'sun', rest: { kind: rest } }).lost[3] / 4;
    expect(1 - lost(kernel('acclimatized'), 'same-place')).toBeCloseTo(0.189, 3);
    expect(1 - lost(kernel('acclimatized'), 'shade')).toBeCloseTo(0.532, 3);
    expect(1 - lost(kernel('unacclimatized'), 'same-place')).toBe(0);
    // Resting at a fixed measured WBGT of 25.125 °C is the same rest place as the paired shade here.
    const fixed = monthlyFigures(hist, shares, { kernel: kernel('acclimatized'), exposure: 'sun', rest: { kind: 'fixed', wbgt: 25.125 } }).lost[3] / 4;
    expect(1 - fixed).toBeCloseTo(0.532, 3);
  });
});

describe('statistics across the baseline years (pipeline/climate, type 7)', () => {
  it('the P90 year of the docs/methods.md §10.1 example (30 years, given unsorted) is 142.4 h and the mean is their mean', () => {
    const counts = [40, 43, 48, 52, 55, 57, 66, 72, 74, 88, 89, 95, 97, 97, 100, 102, 103, 112, 117, 123, 129, 137, 137, 137, 138, 140, 142, 146, 148, 154];
    const shuffled = counts.map((_c, i) => counts[(i * 7) % 30]);
    const perYear: MonthlyYear[] = shuffled.map((c, i) => {
      const expected = Float64Array.from({ length: 12 }, (_, m) => 24 * new Date(Date.UTC(1991 + i, m + 1, 0)).getUTCDate());
      return {
        year: 1991 + i,
        validHours: expected.slice(),
        expectedHours: expected,
        shiftHours: new Float64Array(12).fill(200),
        above: new Float64Array(12).fill(c),
        lost: new Float64Array(12).fill(c / 2),
      };
    });
    const occ = new Uint16Array(12);
    occ[0] = 1;
    const s = estimateStatistics(perYear, [1991, 2020], occ);
    expect(s.months[0].above.p90).toBeCloseTo(142.4, 10);
    expect(s.months[0].above.mean).toBeCloseTo(counts.reduce((a, b) => a + b, 0) / 30, 10);
    expect(s.total.above.p90).toBeCloseTo(142.4, 10);
    expect(s.months[0].above.yearsUsed).toBe(30);
  });

  it('a project from 2027-11 to 2028-02 holds those four months once; totals replay each baseline year over the period, and a month with too many missing hours leaves its year out', () => {
    expect(Array.from(monthOccurrences({ start: { year: 2027, month: 11 }, end: { year: 2028, month: 2 } }))).toEqual([1, 1, 0, 0, 0, 0, 0, 0, 0, 0, 1, 1]);
    expect(Array.from(monthOccurrences({ start: { year: 2027, month: 4 }, end: { year: 2029, month: 3 } }))).toEqual(new Array(12).fill(2));
    const mk = (year: number, above: number[], missingJan = 0): MonthlyYear => {
      const expected = Float64Array.from({ length: 12 }, (_, m) => 24 * new Date(Date.UTC(year, m + 1, 0)).getUTCDate());
      const valid = expected.slice();
      valid[0] -= missingJan;
      return {
        year,
        validHours: valid,
        expectedHours: expected,
        shiftHours: new Float64Array(12).fill(200),
        above: Float64Array.from(above),
        lost: Float64Array.from(above, (a) => a / 4),
      };
    };
    const a = [10, 20, 0, 0, 0, 0, 0, 0, 0, 0, 30, 40];
    const b = [14, 10, 0, 0, 0, 0, 0, 0, 0, 0, 50, 30];
    const occ = monthOccurrences({ start: { year: 2027, month: 11 }, end: { year: 2028, month: 2 } });
    const s = estimateStatistics([mk(2021, a), mk(2022, b)], [2021, 2022], occ);
    // Year totals 100 and 104: mean 102, P90 = 100 + 0.9·4 (type 7, two years).
    expect(s.total.above.mean).toBeCloseTo(102, 10);
    expect(s.total.above.p90).toBeCloseTo(103.6, 10);
    expect(s.months[0].above.p90).toBeCloseTo(10 + 0.9 * 4, 10);
    // 241 missing hours in January of 2022: that January does not count, nor does 2022's total; one of two years is too few.
    const t = estimateStatistics([mk(2021, a), mk(2022, b, 241)], [2021, 2022], occ);
    expect(t.months[0].above.yearsUsed).toBe(1);
    expect(Number.isNaN(t.months[0].above.mean)).toBe(true);
    expect(t.months[1].above.mean).toBeCloseTo(15, 10);
    expect(Number.isNaN(t.total.above.mean)).toBe(true);
  });
});

describe('against the published tables of the invented small demo', () => {
  it('with the atlas settings (default shift Mon–Sat 07–17, work clothes, rest in place) every region, month, class, acclimatization and exposure matches the region CSV within 1.2 % (mean) and 1.9 % (P90) of the month’s shift hours for hours above the limit, 0.6 % and 1.1 % for hours lost', () => {
    const worst = { aboveMean: new Worst(), aboveP90: new Worst(), lostMean: new Worst(), lostP90: new Worst() };
    let checks = 0;
    for (const region of ctx.regions) {
      const table = regionTable(dataDir, region.id);
      const hist = regionHist(region.id);
      for (const cls of ctx.classes) {
        for (const acclimatization of ['acclimatized', 'unacclimatized']) {
          for (const exposure of ['sun', 'shade']) {
            const r = estimate(hist, { region: region.id, work: cls.id, acclimatization, exposure });
            const key = `${cls.id}.${acclimatization}.${exposure}`;
            for (let m = 0; m < 12; m++) {
              const q = r.statistics.months[m];
              const what = `${region.id} ${pad(m)} ${key}`;
              worst.aboveMean.add(q.above.mean, table.get(`${pad(m)}|hours-above-limit-shift|${key}|mean`)!, q.shiftHours.mean, what);
              worst.aboveP90.add(q.above.p90, table.get(`${pad(m)}|hours-above-limit-shift|${key}|p90`)!, q.shiftHours.mean, what);
              worst.lostMean.add(q.lost.mean, table.get(`${pad(m)}|hours-lost-shift|${key}|mean`)!, q.shiftHours.mean, what);
              worst.lostP90.add(q.lost.p90, table.get(`${pad(m)}|hours-lost-shift|${key}|p90`)!, q.shiftHours.mean, what);
              checks++;
            }
          }
        }
      }
    }
    process.stderr.write(
      `region tables, ${checks} month × setting checks:\n  ${Object.entries(worst)
        .map(([k, w]) => w.report(k))
        .join('\n  ')}\n`,
    );
    expect(checks).toBe(ctx.regions.length * ctx.classes.length * 4 * 12);
    expect(worst.aboveMean.share).toBeLessThanOrEqual(REGION_TABLE_TOLERANCE.aboveMean);
    expect(worst.aboveP90.share).toBeLessThanOrEqual(REGION_TABLE_TOLERANCE.aboveP90);
    expect(worst.lostMean.share).toBeLessThanOrEqual(REGION_TABLE_TOLERANCE.lostMean);
    expect(worst.lostP90.share).toBeLessThanOrEqual(REGION_TABLE_TOLERANCE.lostP90);
    // Not trivially zero: the tables hold hours above the limit.
    expect([...regionTable(dataDir, ctx.regions[0].id).values()].some((v) => v > 10)).toBe(true);
  });

  it('over all hours of every day (no weekday scaling) the histogram alone matches the region tables’ hours above the limit within 0.2 % of the hours', () => {
    const w = new Worst();
    for (const region of ctx.regions) {
      const table = regionTable(dataDir, region.id);
      const hist = regionHist(region.id);
      for (const cls of ctx.classes) {
        for (const acclimatization of ['acclimatized', 'unacclimatized']) {
          const r = estimate(hist, { region: region.id, work: cls.id, acclimatization, exposure: 'sun', shifts: '00:00-24:00', days: ALL_DAYS });
          for (let m = 0; m < 12; m++) {
            const q = r.statistics.months[m];
            w.add(
              q.above.mean,
              table.get(`${pad(m)}|hours-above-limit-all|${cls.id}.${acclimatization}.sun|mean`)!,
              q.shiftHours.mean,
              `${region.id} ${pad(m)} ${cls.id} ${acclimatization}`,
            );
          }
        }
      }
    }
    process.stderr.write(`${w.report('all hours, histogram only')}\n`);
    expect(w.share).toBeLessThanOrEqual(0.002);
  });

  it('a grid cell’s tile with the atlas settings matches its per-cell table (data/cell-tables) within 3.5 % (mean) and 4.2 % (P90) of shift hours for hours above the limit, 1.5 % and 2.2 % for hours lost (measured 3.0, 3.8, 1.4, 1.9 % with the 150 mm globe)', () => {
    const rows = readCsvText(readCellTables(join(dataDir, 'data')));
    const index = new Map(rows.map((r) => [`${r.cell_id}|${r.period}|${r.figure}|${r.workload_class}.${r.acclimatization}.${r.exposure}`, r]));
    const cells = [...new Set(rows.map((r) => Number(r.cell_id)))];
    expect(cells.length).toBeGreaterThan(30);
    const worst = { aboveMean: new Worst(), aboveP90: new Worst(), lostMean: new Worst(), lostP90: new Worst() };
    for (const cell of cells) {
      const chunk = chunkForCell(ctx, cell);
      const hist = cellTileHistograms(new Uint8Array(readFileSync(join(dataDir, chunk.path))), chunk.path, cell, ctx);
      for (const cls of ctx.classes) {
        for (const acclimatization of ['acclimatized', 'unacclimatized']) {
          for (const exposure of ['sun', 'shade']) {
            const r = estimate(hist, { place: 'cell', cell: String(cell), work: cls.id, acclimatization, exposure });
            const key = `${cls.id}.${acclimatization}.${exposure}`;
            for (let m = 0; m < 12; m++) {
              const q = r.statistics.months[m];
              const above = index.get(`${cell}|${pad(m)}|hours-above-limit-shift|${key}`)!;
              const lost = index.get(`${cell}|${pad(m)}|hours-lost-shift|${key}`)!;
              const what = `cell ${cell} ${pad(m)} ${key}`;
              worst.aboveMean.add(q.above.mean, Number(above.mean), q.shiftHours.mean, what);
              worst.aboveP90.add(q.above.p90, Number(above.p90), q.shiftHours.mean, what);
              worst.lostMean.add(q.lost.mean, Number(lost.mean), q.shiftHours.mean, what);
              worst.lostP90.add(q.lost.p90, Number(lost.p90), q.shiftHours.mean, what);
            }
          }
        }
      }
    }
    process.stderr.write(
      `cell table, ${cells.length} cells:\n  ${Object.entries(worst)
        .map(([k, w]) => w.report(k))
        .join('\n  ')}\n`,
    );
    expect(worst.aboveMean.share).toBeLessThanOrEqual(0.035);
    expect(worst.aboveP90.share).toBeLessThanOrEqual(0.042);
    expect(worst.lostMean.share).toBeLessThanOrEqual(0.015);
    expect(worst.lostP90.share).toBeLessThanOrEqual(0.022);
  });

  it('breaks in the shade while working in the sun (quantile pairing of sun and shade hours) match a pipeline build with restLocation: shade within 0.55 % (mean) and 0.9 % (P90) of shift hours', () => {
    const worst = { mean: new Worst(), p90: new Worst() };
    let shadeHelps = 0;
    for (const region of ctx.regions) {
      const shadeTable = regionTable(restShadeDir, region.id);
      const sameTable = regionTable(dataDir, region.id);
      const hist = regionHist(region.id);
      for (const cls of ctx.classes) {
        for (const acclimatization of ['acclimatized', 'unacclimatized']) {
          const r = estimate(hist, { region: region.id, work: cls.id, acclimatization, exposure: 'sun', rest: 'shade' });
          const key = `${cls.id}.${acclimatization}.sun`;
          for (let m = 0; m < 12; m++) {
            const q = r.statistics.months[m];
            const want = shadeTable.get(`${pad(m)}|hours-lost-shift|${key}|mean`)!;
            worst.mean.add(q.lost.mean, want, q.shiftHours.mean, `${region.id} ${pad(m)} ${key}`);
            worst.p90.add(q.lost.p90, shadeTable.get(`${pad(m)}|hours-lost-shift|${key}|p90`)!, q.shiftHours.mean, `${region.id} ${pad(m)} ${key}`);
            if (sameTable.get(`${pad(m)}|hours-lost-shift|${key}|mean`)! - want > 5) shadeHelps++;
          }
        }
      }
    }
    process.stderr.write(
      `rest in shade vs the pipeline:\n  ${Object.entries(worst)
        .map(([k, w]) => w.report(k))
        .join('\n  ')}\n`,
    );
    expect(shadeHelps, 'rest in shade saves hours in the pipeline’s own figures').toBeGreaterThan(20);
    expect(worst.mean.share).toBeLessThanOrEqual(0.0055);
    expect(worst.p90.share).toBeLessThanOrEqual(0.009);
  });

  it('hours go up with the clothing adjustment and with the workload, and down for acclimatized workers against unacclimatized ones', () => {
    const hist = regionHist(ctx.regions[0].id);
    const base = { region: ctx.regions[0].id, work: 'moderate', exposure: 'sun' };
    const year = (raw: RawInputs) => {
      const t = estimate(hist, { ...base, ...raw }).statistics.total;
      return { above: t.above.mean, lost: t.lost.mean };
    };
    const plain = year({});
    const coveralls = year({ clothing: 'microporous-coveralls' });
    const heavy = year({ work: 'high' });
    const custom = year({ work: 'custom', 'metabolic-rate': '360' });
    const unacc = year({ acclimatization: 'unacclimatized' });
    expect(plain.above).toBeGreaterThan(0);
    expect(coveralls.above).toBeGreaterThan(plain.above);
    expect(coveralls.lost).toBeGreaterThan(plain.lost);
    expect(heavy.above).toBeGreaterThan(custom.above);
    expect(custom.above).toBeGreaterThan(plain.above);
    expect(heavy.lost).toBeGreaterThan(plain.lost);
    expect(plain.above).toBeLessThan(unacc.above);
    expect(plain.lost).toBeLessThan(unacc.lost);
  });
});

describe('inputs, URL and CSV', () => {
  it('temperatures typed in °F convert to °C: a clothing adjustment as a difference, a rest-place WBGT with the offset', () => {
    const f = parseInputs({ region: ctx.regions[0].id, clothing: 'custom', cav: '1.8', rest: 'fixed', 'rest-wbgt': '77' }, ctx, 'F');
    expect(f.clothing.cav).toBeCloseTo(1, 12);
    expect(f.rest).toEqual({ kind: 'fixed', wbgt: 25 });
    const c = parseInputs({ region: ctx.regions[0].id, clothing: 'custom', cav: '1', rest: 'fixed', 'rest-wbgt': '25' }, ctx, 'C');
    expect(c.clothing.cav).toBe(1);
    expect(c.rest).toEqual({ kind: 'fixed', wbgt: 25 });
  });

  it('?region=<id> and ?cell=<cell_id> name the place; a point picks the nearest cell centre (row-major id)', () => {
    expect(placeFromQuery(`?region=${ctx.regions[1].id}`, ctx)).toEqual({ kind: 'region', id: ctx.regions[1].id });
    expect(placeFromQuery('?cell=45', ctx)).toEqual({ kind: 'cell', cell: 45 });
    expect(placeFromQuery('', ctx)).toBeNull();
    const g = ctx.cells!.grid;
    // Row 2, column 3: centre lat0 + 2·dLat, lon0 + 3·dLon; a point 0.4 cell away still picks it.
    expect(cellAt(g, g.lat0 + 2 * g.dLat + 0.4 * g.dLat, g.lon0 + 3 * g.dLon - 0.4 * g.dLon)).toBe(2 * g.nLon + 3);
    expect(cellAt(g, g.lat0, g.lon0 + 360)).toBe(0);
  });

  it('the CSV download starts with a byte order mark, holds the invented-data label, the settings and the cautions as #,"text" lines (two fields each, commas quoted: Python csv reads them so), units in every column name, and one line per table row with the same values', () => {
    const r = estimate(regionHist(ctx.regions[0].id), {
      region: ctx.regions[0].id,
      months: ['5', '6', '7'],
      'period-start': '2027-05',
      'period-end': '2028-07',
      crew: '12',
    });
    const text = estimateCsv(r, ctx, atlasTitle, { kind: 'region', id: ctx.regions[0].id, name: ctx.regions[0].name });
    expect(text.startsWith('\uFEFF#,')).toBe(true);
    const csv = text.slice(1);
    const commentLines = csv.split('\n').filter((l) => l.startsWith('#'));
    expect(commentLines.some((l) => l.includes(','))).toBe(true);
    for (const l of commentLines) expect(splitCsvRecord(l), l).toHaveLength(2);
    // Python's csv module (an outside RFC 4180 reader) splits every comment line into exactly '#' and the text.
    const py = execFileSync(
      '/usr/bin/python3',
      ['-c', 'import csv,sys,json; print(json.dumps([r for r in csv.reader(open(sys.argv[1], encoding="utf-8-sig")) if r and r[0] == "#"]))', writeTemp(text)],
      { encoding: 'utf8' },
    );
    const pyRows = JSON.parse(py) as string[][];
    expect(pyRows.length).toBe(commentLines.length);
    for (const row of pyRows) expect(row.length).toBe(2);
    const comments = pyRows.map((x) => x[1]);
    expect(comments.join('\n')).toContain('INVENTED DATA');
    expect(comments.join('\n')).toContain(CAUTION_SUMMARY);
    expect(comments.join('\n')).toMatch(/Crew: 12 workers/);
    const rows = readCsvText(csv);
    const tableRows = estimateRows(r);
    expect(rows.map((x) => x.period)).toEqual(['05', '06', '07', 'total']);
    expect(Object.keys(rows[0]).slice(2)).toEqual(ESTIMATE_COLUMNS.map((c) => c.csv));
    for (const c of ESTIMATE_COLUMNS) expect(c.csv, 'unit suffix').toMatch(/(_h|_pct|_used|_project)$/);
    rows.forEach((row, i) => {
      for (const c of ESTIMATE_COLUMNS) expect(Number(row[c.csv])).toBeCloseTo(tableRows[i].values[c.key], c.csvDigits - 1);
    });
    // May–July occur twice in 2027-05 … 2028-07; the crew columns are 12 × the per-worker ones.
    expect(Number(rows[3].months_in_project)).toBe(6);
    expect(tableRows[0].values.crew_lost_mean).toBeCloseTo(12 * tableRows[0].values.lost_mean, 10);
    expect(tableRows[3].values.lost_mean).toBeCloseTo(2 * (tableRows[0].values.lost_mean + tableRows[1].values.lost_mean + tableRows[2].values.lost_mean), 8);
  });
});

function writeTemp(text: string): string {
  const p = join(mkdtempSync(join(tmpdir(), 'estimate-csv-')), 'estimate.csv');
  writeFileSync(p, text);
  return p;
}

function readCsvText(text: string): Array<Record<string, string>> {
  const lines = text
    .replace(/^\uFEFF/, '')
    .trim()
    .split('\n')
    .filter((l) => !l.startsWith('#'));
  const head = lines[0].split(',');
  return lines.slice(1).map((l) => Object.fromEntries(l.split(',').map((v, i) => [head[i], v])));
}

describe('bad inputs give catalogued errors', () => {
  const region = () => ctx.regions[0].id;
  it('an unknown region, a cell that is not a number, outside the grid or at sea, a point outside the grid', () => {
    expectCatalogued(() => parseInputs({ region: 'atlantis' }, ctx, 'C'), 'EstimateRegionUnknown', /no region "atlantis"/);
    expectCatalogued(() => placeFromQuery('?region=atlantis', ctx), 'EstimateRegionUnknown');
    expectCatalogued(() => placeFromQuery('?cell=12b', ctx), 'EstimateCellInvalid', /not a whole number/);
    expectCatalogued(() => parseInputs({ place: 'cell', cell: '99999' }, ctx, 'C'), 'EstimateCellInvalid', /outside the grid/);
    const g = ctx.cells!.grid;
    const land = new Set(ctx.cells!.chunks.flatMap((c) => [c.firstCell, c.lastCell]));
    const sea = [...Array(g.nLat * g.nLon).keys()].find((c) => c < ctx.cells!.chunks[0].firstCell && !land.has(c))!;
    expectCatalogued(() => chunkForCell(ctx, sea), 'EstimateCellInvalid', /not a land cell/);
    expectCatalogued(() => parseInputs({ place: 'point', lat: String(g.lat0 - 5 * g.dLat), lon: String(g.lon0) }, ctx, 'C'), 'EstimatePointOutsideGrid');
    expectCatalogued(() => parseInputs({ place: 'point', lat: 'north', lon: '0' }, ctx, 'C'), 'EstimateNumberInvalid', /lat is "north"/);
  });

  it('a sea cell inside a chunk’s range is refused when its tile is read', () => {
    const chunk = ctx.cells!.chunks[0];
    const bytes = new Uint8Array(readFileSync(join(dataDir, chunk.path)));
    const inChunk = new Set<number>();
    for (let c = chunk.firstCell; c <= chunk.lastCell; c++) {
      try {
        cellTileHistograms(bytes, chunk.path, c, ctx);
        inChunk.add(c);
      } catch {
        /* sea */
      }
    }
    const sea = [...Array(chunk.lastCell - chunk.firstCell + 1).keys()].map((i) => chunk.firstCell + i).find((c) => !inChunk.has(c));
    expect(sea, 'the small demo has sea between land cells').toBeDefined();
    expectCatalogued(() => cellTileHistograms(bytes, chunk.path, sea!, ctx), 'EstimateCellInvalid', /sea cells are not computed/);
    expectCatalogued(() => cellTileHistograms(bytes, chunk.path, chunk.firstCell, { ...ctx, years: [2021] }), 'EstimateYearsMismatch');
    expectCatalogued(() => regionTileHistograms(bytes.subarray(0, 50), 'x.bin', ctx), 'EstimateDataUnavailable', /x\.bin/);
  });

  it('work rate, clothing, rest place, shift, months, period and crew out of range or unknown', () => {
    const r = region();
    expectCatalogued(() => parseInputs({ region: r, work: 'custom', 'metabolic-rate': '100' }, ctx, 'C'), 'EstimateNumberInvalid', /metabolic-rate/);
    expectCatalogued(() => parseInputs({ region: r, work: 'custom', 'metabolic-rate': '' }, ctx, 'C'), 'EstimateNumberInvalid');
    expectCatalogued(() => parseInputs({ region: r, work: 'sprinting' }, ctx, 'C'), 'EstimateChoiceUnknown', /work "sprinting"/);
    expectCatalogued(() => parseInputs({ region: r, acclimatization: 'partly' }, ctx, 'C'), 'EstimateChoiceUnknown');
    expectCatalogued(() => parseInputs({ region: r, clothing: 'chainmail' }, ctx, 'C'), 'EstimateChoiceUnknown');
    expectCatalogued(() => parseInputs({ region: r, clothing: 'custom', cav: '25' }, ctx, 'C'), 'ClothingAdjustmentOutOfRange');
    expectCatalogued(() => parseInputs({ region: r, clothing: 'custom', cav: 'hot' }, ctx, 'C'), 'EstimateNumberInvalid');
    expectCatalogued(() => parseInputs({ region: r, rest: 'fixed', 'rest-wbgt': '60' }, ctx, 'C'), 'EstimateNumberInvalid', /rest-wbgt/);
    expectCatalogued(() => parseInputs({ region: r, shifts: '07:00-12:00, 11:00-15:00' }, ctx, 'C'), 'ScheduleShiftInvalid', /overlaps/);
    expectCatalogued(() => parseInputs({ region: r, shifts: '6.5-17' }, ctx, 'C'), 'ScheduleShiftInvalid');
    expectCatalogued(() => parseInputs({ region: r, days: [] }, ctx, 'C'), 'ScheduleDaysInvalid', /no work day/);
    expectCatalogued(() => parseInputs({ region: r, days: ['funday'] }, ctx, 'C'), 'ScheduleDaysInvalid');
    expectCatalogued(() => parseInputs({ region: r, months: [] }, ctx, 'C'), 'EstimateMonthsEmpty');
    expectCatalogued(() => parseInputs({ region: r, months: ['13'] }, ctx, 'C'), 'EstimateChoiceUnknown');
    expectCatalogued(() => parseInputs({ region: r, 'period-start': '2027-05' }, ctx, 'C'), 'EstimatePeriodInvalid', /period-end ""/);
    expectCatalogued(() => parseInputs({ region: r, 'period-start': '2027-13', 'period-end': '2028-01' }, ctx, 'C'), 'EstimatePeriodInvalid');
    const backwards = parseInputs({ region: r, 'period-start': '2028-05', 'period-end': '2027-05' }, ctx, 'C');
    expectCatalogued(() => runEstimate(regionHist(r), backwards, ctx), 'EstimatePeriodInvalid', /before the first/);
    const tooLong = parseInputs({ region: r, 'period-start': '2000-01', 'period-end': '2030-01' }, ctx, 'C');
    expectCatalogued(() => runEstimate(regionHist(r), tooLong, ctx), 'EstimatePeriodInvalid', /at most 240/);
    const noWorkMonth = parseInputs({ region: r, months: ['7'], 'period-start': '2027-01', 'period-end': '2027-03' }, ctx, 'C');
    expectCatalogued(() => runEstimate(regionHist(r), noWorkMonth, ctx), 'EstimatePeriodInvalid', /none of the ticked/);
    expectCatalogued(() => parseInputs({ region: r, crew: '2.5' }, ctx, 'C'), 'ScheduleNumberInvalid', /crew/);
    expectCatalogued(() => parseInputs({ region: r, crew: '0' }, ctx, 'C'), 'ScheduleNumberInvalid');
    // The largest clothing value with the most demanding work pushes the threshold below the histogram.
    const extreme = parseInputs({ region: r, work: 'very-high', acclimatization: 'unacclimatized', clothing: 'custom', cav: '20' }, ctx, 'C');
    expectCatalogued(() => runEstimate(regionHist(r), extreme, ctx), 'LimitOutsideHistogram');
  });
});

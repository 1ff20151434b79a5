import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { parse } from 'yaml';
import { accumulateBlock, createPartial, createScratch, type ReduceScratch, type ShardPartial } from '../../pipeline/reduce/accumulator.ts';
import { CELL_YEAR_HIST, histogramSlot, mergeYear } from '../../pipeline/reduce/merge.ts';
import { HIST_EDGES, HIST_LEN, HOURS, MILLI, MONTHS, N_EXPOSURES } from '../../pipeline/reduce/layout.ts';
import {
  allowableWorkFraction,
  estimateFromHistogram,
  localHours,
  parseWorkloadClasses,
  resolveWorkSettings,
  workSettingsSchema,
  type WorkEvaluation,
} from '../../pipeline/work/index.ts';
import { HeathoursError } from '../../pipeline/model/errors.ts';

const classes = parseWorkloadClasses(parse(readFileSync(new URL('../../content/workload-classes.yaml', import.meta.url), 'utf8')));
const work = resolveWorkSettings(workSettingsSchema.parse(undefined), classes);
const HOUR = 3_600_000;

/** Seeded invented hourly WBGT for `nc` cells over `nt` hours from `start` (a diurnal cycle plus noise). */
function inventedBlock(nc: number, nt: number, start: number, seed: number, nanEvery = 0) {
  let s = seed >>> 0;
  const rnd = () => (s = (s * 1664525 + 1013904223) >>> 0) / 2 ** 32;
  const time = Float64Array.from({ length: nt }, (_, t) => start + (t + 1) * HOUR);
  const sun = new Float32Array(nt * nc);
  const shade = new Float32Array(nt * nc);
  const air = new Float32Array(nt * nc);
  for (let t = 0; t < nt; t++) {
    for (let c = 0; c < nc; c++) {
      const i = t * nc + c;
      const d = Math.sin((((t + 14) % 24) / 24) * 2 * Math.PI);
      shade[i] = 24 + 4 * d + c * 0.5 + 5 * (rnd() - 0.5); // day-to-day spread of ±2.5 °C
      sun[i] = shade[i] + Math.max(0, 3.5 * d) + rnd();
      air[i] = shade[i] + 4;
      if (nanEvery && i % nanEvery === 0) sun[i] = NaN;
    }
  }
  return { time, sun, shade, air };
}

function run(evals: readonly WorkEvaluation[], general: boolean, nc: number, nt: number, seed: number, tz = 'Etc/GMT+10'): ShardPartial {
  const start = Date.UTC(2021, 5, 20);
  const b = inventedBlock(nc, nt, start, seed, 97);
  const p = createPartial(
    2021,
    Int32Array.from({ length: nc }, (_, i) => i * 3),
    evals,
  );
  const scratch = createScratch(nt * nc, evals, general);
  const local = localHours(b.time, tz, work.shift);
  accumulateBlock(p, { nHours: nt, wbgtSun: b.sun, wbgtShade: b.shade, airTemperature: b.air, local }, evals, scratch);
  return p;
}

/** Counts hours [t0, t1) of invented block `b` (UTC−10) for `cells` into a new partial of 2021 holding `months`, with `scratch`. */
function countPiece(
  b: ReturnType<typeof inventedBlock>,
  cells: Int32Array,
  t0: number,
  t1: number,
  scratch: ReduceScratch,
  months: [number, number] = [0, 12],
): ShardPartial {
  const nc = cells.length;
  const p = createPartial(2021, cells, work.evaluations, months);
  const sl = (a: Float32Array) => a.subarray(t0 * nc, t1 * nc);
  const local = localHours(b.time.subarray(t0, t1), 'Etc/GMT+10', work.shift);
  accumulateBlock(p, { nHours: t1 - t0, wbgtSun: sl(b.sun), wbgtShade: sl(b.shade), airTemperature: sl(b.air), local }, work.evaluations, scratch);
  return p;
}

describe('per-shard accumulation', () => {
  it('the fused path gives exactly the counts of the general per-evaluation path (invented data, NaN hours included)', () => {
    const a = run(work.evaluations, false, 7, 24 * 40, 11);
    const b = run(work.evaluations, true, 7, 24 * 40, 11);
    for (const k of Object.keys(a) as (keyof ShardPartial)[]) expect(a[k], k).toEqual(b[k]);
    expect(a.aboveShift.reduce((x, y) => x + y, 0)).toBeGreaterThan(0);
    expect(a.failedHours.reduce((x, y) => x + y, 0)).toBeGreaterThan(0);
  });

  it('counts hours above the limit and milli-hours lost exactly as the work model computes them hour by hour', () => {
    const nc = 3;
    const nt = 24 * 10;
    const p = run(work.evaluations, false, nc, nt, 5);
    const b = inventedBlock(nc, nt, Date.UTC(2021, 5, 20), 5, 97);
    const local = localHours(b.time, 'Etc/GMT+10', work.shift);
    const nE = work.evaluations.length;
    work.evaluations.forEach((ev, e) => {
      for (let c = 0; c < nc; c++) {
        let above = 0;
        let lost = 0;
        for (let t = 0; t < nt; t++) {
          if (local.year[t] !== 2021 || local.inShift[t] !== 1) continue;
          const i = t * nc + c;
          if (Number.isNaN(b.sun[i])) continue;
          const w = ev.exposure === 'sun' ? b.sun[i] : b.shade[i];
          const f = allowableWorkFraction(w, null, ev.kernel);
          if (f < 1) {
            above++;
            lost += Math.round((1 - f) * MILLI);
          }
        }
        const k = (c * MONTHS + 5) * nE + e; // June
        expect(p.aboveShift[k], ev.key).toBe(above);
        expect(Math.abs(p.lostShift[k] - lost), ev.key).toBeLessThanOrEqual(above); // f in float32 vs float64: at most 1 milli-hour per hour
      }
    });
  });

  it("hours are assigned to the local month and only to the partial's local year (Etc/GMT+10: 31 Dec 14:00 UTC is still December)", () => {
    const evals = work.evaluations;
    const nc = 1;
    const start = Date.UTC(2021, 11, 31, 0);
    const b = inventedBlock(nc, 24, start, 3);
    const p = createPartial(2021, Int32Array.of(0), evals);
    const scratch = createScratch(24 * nc, evals);
    accumulateBlock(
      p,
      { nHours: 24, wbgtSun: b.sun, wbgtShade: b.shade, airTemperature: b.air, local: localHours(b.time, 'Etc/GMT+10', work.shift) },
      evals,
      scratch,
    );
    // Hours ending 01:00 … 24:00 UTC on 31 Dec start 14:00 on 30 Dec … 13:00 on 31 Dec local: all December 2021.
    expect(p.coveredHours[11]).toBe(24);
    expect(p.validHours[11]).toBe(24);
  });
});

describe('merging partials', () => {
  it('two tiles merged in either order equal the counts of both cells computed as one tile', () => {
    const evals = work.evaluations;
    const whole = run(evals, false, 4, 24 * 5, 9);
    const nc = whole.cells.length;
    const split = (from: number, to: number) => {
      const q = createPartial(2021, whole.cells.slice(from, to), evals);
      const per = (f: keyof ShardPartial) => (whole[f] as ArrayLike<number>).length / nc;
      for (const f of [
        'validHours',
        'shiftHours',
        'aboveAll',
        'aboveShift',
        'lostShift',
        'capacityLoss',
        'wbgtSum',
        'wbgtMax',
        'airSum',
        'airHours',
        'failedHours',
      ] as const) {
        const w = per(f);
        (q[f] as unknown as { set(a: ArrayLike<number>): void }).set(
          (whole[f] as unknown as { subarray(a: number, b: number): ArrayLike<number> }).subarray(from * w, to * w),
        );
      }
      // The histogram is month-major (month × hour × cell × exposure × bin): copy the cells' runs.
      const run = N_EXPOSURES * HIST_LEN;
      for (let mh = 0; mh < MONTHS * HOURS; mh++)
        q.histogram.set(whole.histogram.subarray((mh * nc + from) * run, (mh * nc + to) * run), mh * (to - from) * run);
      q.coveredHours.set(whole.coveredHours);
      return q;
    };
    const a = mergeYear(2021, whole.cells, [split(0, 1), split(1, 4)]);
    const b = mergeYear(2021, whole.cells, [split(1, 4), split(0, 1)]);
    const w = mergeYear(2021, whole.cells, [whole]);
    expect(a).toEqual(b);
    expect(a).toEqual(w);
    expect(a.aboveShift).toEqual(whole.aboveShift);
    expect(a.wbgtMax).toEqual(whole.wbgtMax);
    expect(a.histogram.some((x) => x > 0)).toBe(true);
  });

  it("a merge over a subset of a partial's cells keeps exactly those cells, and refuses the others unless asked to skip them", () => {
    const evals = work.evaluations;
    const whole = run(evals, false, 4, 24 * 5, 9);
    const all = mergeYear(2021, whole.cells, [whole]);
    const some = whole.cells.slice(1, 3);
    const sub = mergeYear(2021, some, [whole], ['t00-y2021'], { subset: true });
    const per = all.aboveShift.length / whole.cells.length;
    expect(sub.aboveShift).toEqual(all.aboveShift.slice(per, 3 * per));
    // Histograms are month × hour × cell: each (month, hour) row of the subset is cells 1–2 of the whole.
    expect(sub.histogram.length).toBe(2 * CELL_YEAR_HIST);
    for (let m = 0; m < MONTHS; m++) {
      for (let h = 0; h < HOURS; h++) {
        expect(sub.histogram.subarray(histogramSlot(m, h, 0, 2), histogramSlot(m, h, 2, 2))).toEqual(
          all.histogram.subarray(histogramSlot(m, h, 1, 4), histogramSlot(m, h, 3, 4)),
        );
      }
    }
    expect(() => mergeYear(2021, some, [whole], ['t00-y2021'])).toThrow(/holds cell 0, which is not a land cell/);
  });

  it("the pieces of a tile's year (split by time) add up to the tile computed whole, covered hours summed", () => {
    const evals = work.evaluations;
    const nc = 3;
    const nt = 24 * 6;
    const start = Date.UTC(2021, 5, 20);
    const b = inventedBlock(nc, nt, start, 9, 53);
    const cells = Int32Array.from({ length: nc }, (_, i) => i * 3);
    const piece = (t0: number, t1: number) => countPiece(b, cells, t0, t1, createScratch((t1 - t0) * nc, evals));
    const whole = mergeYear(2021, cells, [piece(0, nt)]);
    const split = mergeYear(2021, cells, [piece(50, nt), piece(0, 50)], ['t00-y2021-u2022', 't00-y2021']);
    expect(split).toEqual(whole);
    expect(Array.from(split.coveredHours).reduce((x, y) => x + y, 0)).toBe(nt);
  });

  it("monthly pieces, each holding only its month of histograms, add up to the whole, and an hour outside a piece's months is refused", () => {
    const evals = work.evaluations;
    const nc = 4;
    const nt = 24 * 70;
    const start = Date.UTC(2021, 5, 20);
    const b = inventedBlock(nc, nt, start, 5, 41);
    const cells = Int32Array.from({ length: nc }, (_, i) => i * 2);
    const local = localHours(b.time, 'Etc/GMT+10', work.shift);
    const scratch = createScratch(nt * nc, evals);
    const whole = mergeYear(2021, cells, [countPiece(b, cells, 0, nt, scratch)]);
    // Cut where the local month changes (June, July, August): each piece holds one month.
    const cuts = [0];
    for (let t = 1; t < nt; t++) if (local.month[t] !== local.month[t - 1]) cuts.push(t);
    cuts.push(nt);
    expect(cuts.length).toBe(4);
    const pieces = cuts.slice(0, -1).map((t0, i) => {
      const m = local.month[t0] - 1;
      return countPiece(b, cells, t0, cuts[i + 1], scratch, [m, m + 1]);
    });
    for (const p of pieces) expect(p.histogram.length).toBe(HOURS * nc * N_EXPOSURES * HIST_LEN);
    expect(mergeYear(2021, cells, pieces)).toEqual(whole);
    // July's hours into a piece for June: a RangeError, not counts in the wrong month.
    expect(() => countPiece(b, cells, cuts[1], cuts[2], scratch, [5, 6])).toThrow(/local month 7 fell outside the shard's months 6-6/);
  });

  it('a cell in two tiles and a cell in none are catalogued errors naming the shards', () => {
    const evals = work.evaluations;
    const p = run(evals, false, 2, 24, 1);
    const q = run(evals, false, 3, 24, 1);
    try {
      mergeYear(2021, q.cells, [p, q], ['t00-y2021', 't01-y2021']);
      throw new Error('no error');
    } catch (e) {
      expect(e).toBeInstanceOf(HeathoursError);
      expect((e as HeathoursError).code).toBe('PartialsInconsistent');
      expect((e as HeathoursError).message).toContain('t00-y2021');
    }
    expect(() => mergeYear(2021, Int32Array.of(0, 3, 99), [p])).toThrow(/1 land cell\(s\) in no partial/);
  });
});

describe('histograms of the partials', () => {
  it('hours above the limit and hours lost estimated from the month × hour histograms (0.25 °C bins) of a small region (6 cells, one month of shift hours) are within 1 % of the hours of the hourly computation', () => {
    const nc = 6;
    const nt = 24 * 30;
    const p = run(work.evaluations, false, nc, nt, 21);
    const b = inventedBlock(nc, nt, Date.UTC(2021, 5, 20), 21, 97);
    const local = localHours(b.time, 'Etc/GMT+10', work.shift);
    // The calculator's view: the histograms of the shift's local hours of June, pooled over the cells.
    const shiftHoursOfDay = new Set<number>();
    for (let t = 0; t < nt; t++) if (local.inShift[t] === 1) shiftHoursOfDay.add(local.hour[t]);
    for (const ev of work.evaluations) {
      const x = ev.exposure === 'sun' ? 0 : 1;
      let above = 0;
      let lost = 0;
      let hours = 0;
      const counts = new Float64Array(HIST_LEN);
      for (let c = 0; c < nc; c++) {
        for (let t = 0; t < nt; t++) {
          if (local.month[t] !== 6 || local.year[t] !== 2021 || !shiftHoursOfDay.has(local.hour[t])) continue;
          const i = t * nc + c;
          if (Number.isNaN(b.sun[i])) continue;
          hours++;
          const f = allowableWorkFraction(ev.exposure === 'sun' ? b.sun[i] : b.shade[i], null, ev.kernel);
          if (f < 1) {
            above++;
            lost += 1 - f;
          }
        }
        for (const h of shiftHoursOfDay) {
          // The partial's histogram is month-major: month × hour × cell × exposure × bin.
          const base = (((5 * HOURS + h) * nc + c) * N_EXPOSURES + x) * HIST_LEN;
          for (let j = 0; j < HIST_LEN; j++) counts[j] += p.histogram[base + j];
        }
      }
      const est = estimateFromHistogram(HIST_EDGES, counts, ev.kernel);
      expect(est.hours).toBe(hours);
      expect(Math.abs(est.hoursAbove - above), `${ev.key} above`).toBeLessThanOrEqual(0.01 * hours);
      expect(Math.abs(est.hoursLost - lost), `${ev.key} lost`).toBeLessThanOrEqual(0.01 * hours);
    }
  });
});

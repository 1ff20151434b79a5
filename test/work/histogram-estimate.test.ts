import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { estimateFromHistogram } from '../../pipeline/work/histogram-estimate.ts';
import { addToWbgtHistogram, WBGT_BIN_EDGES, WBGT_BIN_LOWER, WBGT_BIN_UPPER, WBGT_HISTOGRAM_LENGTH, wbgtBinIndex } from '../../pipeline/work/wbgt-bins.ts';
import { aboveLimitInto, prepareWorkKernel, workFractionInto, type WorkKernel } from '../../pipeline/work/work-fraction.ts';
import { expectWorkError } from './helpers.ts';
import { fixturePath } from '../helpers/fixtures.ts';

/**
 * An invented (synthetic, seeded) hourly WBGT series for a hot, humid place: seasonal cycle
 * 21–29 °C, diurnal cycle ±4.5 °C peaking mid-afternoon, AR(1) weather noise (σ ≈ 1.6 °C). Not data
 * of any real place; used only to compare the histogram estimate with the hourly computation.
 */
function inventedHourlyWbgt(years: number, seed: number): { wbgt: Float32Array; month: Uint8Array } {
  let s = seed >>> 0;
  const rand = () => {
    s = (s + 0x6d2b79f5) >>> 0;
    let t = s;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
  const n = years * 8760;
  const wbgt = new Float32Array(n);
  const month = new Uint8Array(n);
  let noise = 0;
  for (let h = 0; h < n; h++) {
    const day = (h / 24) % 365;
    const hour = h % 24;
    const u = Math.max(rand(), 1e-12);
    const gauss = Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * rand());
    noise = 0.97 * noise + 0.39 * gauss;
    wbgt[h] = 25 + 4 * Math.sin((2 * Math.PI * (day - 110)) / 365) + 4.5 * Math.sin((2 * Math.PI * (hour - 9)) / 24) + noise;
    month[h] = Math.min(11, Math.floor(day / 30.42));
  }
  return { wbgt, month };
}

function direct(wbgt: Float32Array, kernel: WorkKernel): { above: number; lost: number } {
  const f = workFractionInto(new Float32Array(wbgt.length), wbgt, null, kernel);
  const a = aboveLimitInto(new Uint8Array(wbgt.length), wbgt, kernel);
  let above = 0;
  let lost = 0;
  for (let i = 0; i < wbgt.length; i++) {
    above += a[i];
    lost += 1 - f[i];
  }
  return { above, lost };
}

describe('histogram estimate of hours above the limit and hours lost', () => {
  it('the recommended bins are 0.25 °C wide from 5 to 45 °C with one open bin at each end', () => {
    expect(WBGT_BIN_EDGES.length).toBe(161);
    expect(WBGT_BIN_EDGES[0]).toBe(WBGT_BIN_LOWER);
    expect(WBGT_BIN_EDGES[160]).toBe(WBGT_BIN_UPPER);
    expect(WBGT_HISTOGRAM_LENGTH).toBe(162);
    expect([wbgtBinIndex(4.99), wbgtBinIndex(5), wbgtBinIndex(5.24), wbgtBinIndex(5.25), wbgtBinIndex(44.99), wbgtBinIndex(45), wbgtBinIndex(NaN)]).toEqual([
      0, 1, 1, 2, 160, 161, -1,
    ]);
  });

  it('on an invented 5-year hourly series, month by month, the histogram answer is within 1 % of the hours of the direct hourly computation, for 4 classes × 2 acclimatization × 2 models × 3 clothing values', () => {
    const { wbgt, month } = inventedHourlyWbgt(5, 20240601);
    let worst = 0;
    for (const model of ['curve-2017', 'table-1989'] as const) {
      for (const acclimatization of ['acclimatized', 'unacclimatized'] as const) {
        for (const workRate of [180, 300, 415, 520]) {
          for (const cav of [0, 1, 3]) {
            const kernel = prepareWorkKernel({ workRate, restRate: 115, limit: { model, acclimatization }, clothingAdjustment: cav });
            for (let m = 0; m < 12; m++) {
              const sel = wbgt.filter((_, i) => month[i] === m);
              const counts = new Float64Array(WBGT_HISTOGRAM_LENGTH);
              addToWbgtHistogram(counts, sel);
              const est = estimateFromHistogram(WBGT_BIN_EDGES, counts, kernel);
              const d = direct(sel, kernel);
              expect(est.hours).toBe(sel.length);
              const err = Math.max(Math.abs(est.hoursAbove - d.above), Math.abs(est.hoursLost - d.lost)) / sel.length;
              worst = Math.max(worst, err);
              expect(err).toBeLessThan(0.01);
            }
          }
        }
      }
    }
    // Measured worst case 0.28 % of the month's hours; keep the margin visible.
    console.info(`histogram vs hourly: worst monthly difference ${(100 * worst).toFixed(3)} % of hours`);
    expect(worst).toBeLessThan(0.005);
  });

  it('on the 150 WBGT values of the Liljegren reference table (Liljegren et al. 2008, reference implementation v1.1; test/fixtures/reference) the histogram answer is within 1 % of the hours of the direct computation', () => {
    const text = readFileSync(fixturePath('reference', 'liljegren-wbgt-public.csv'), 'utf8');
    const lines = text.split('\n').filter((l) => l && !l.startsWith('#'));
    const col = lines[0].split(',').indexOf('wbgt_c');
    const wbgt = Float32Array.from(lines.slice(1), (l) => Number(l.split(',')[col]));
    expect(wbgt.length).toBe(150);
    const counts = new Float64Array(WBGT_HISTOGRAM_LENGTH);
    addToWbgtHistogram(counts, wbgt);
    for (const workRate of [180, 300, 415, 520]) {
      for (const acclimatization of ['acclimatized', 'unacclimatized'] as const) {
        const kernel = prepareWorkKernel({ workRate, restRate: 115, limit: { model: 'curve-2017', acclimatization } });
        const est = estimateFromHistogram(WBGT_BIN_EDGES, counts, kernel);
        const d = direct(wbgt, kernel);
        expect(Math.abs(est.hoursAbove - d.above)).toBeLessThan(1.5);
        expect(Math.abs(est.hoursLost - d.lost)).toBeLessThan(1.5);
      }
    }
  });

  it('hours in the bin that holds the threshold split linearly: 10 hours in [27.85, 28.1) with the 300 W table limit 28 °C → 4 above; 10 hours in [28, 28.25) → all 10', () => {
    const k = prepareWorkKernel({ workRate: 300, restRate: 115, limit: { model: 'table-1989', acclimatization: 'acclimatized' } });
    expect(k.threshold).toBe(28);
    expect(estimateFromHistogram([27.75, 27.85, 28.1, 28.35], [0, 0, 10, 0, 0], k).hoursAbove).toBeCloseTo(4, 12);
    expect(estimateFromHistogram([27.75, 28, 28.25, 28.5], [0, 0, 10, 0, 0], k).hoursAbove).toBeCloseTo(10, 12);
  });

  it('rest at a fixed cooler WBGT lowers the hours lost but not the hours above', () => {
    const { wbgt } = inventedHourlyWbgt(1, 7);
    const counts = new Float64Array(WBGT_HISTOGRAM_LENGTH);
    addToWbgtHistogram(counts, wbgt);
    const k = prepareWorkKernel({ workRate: 415, restRate: 115, limit: { model: 'curve-2017', acclimatization: 'acclimatized' } });
    const same = estimateFromHistogram(WBGT_BIN_EDGES, counts, k);
    const cool = estimateFromHistogram(WBGT_BIN_EDGES, counts, k, 24);
    expect(cool.hoursAbove).toBe(same.hoursAbove);
    expect(cool.hoursLost).toBeLessThan(same.hoursLost);
  });

  it('a mask keeps only the marked hours', () => {
    const counts = new Uint32Array(WBGT_HISTOGRAM_LENGTH);
    addToWbgtHistogram(counts, Float32Array.from([20, 21, 22, NaN]), Uint8Array.from([1, 0, 1, 1]));
    expect(counts.reduce((a, b) => a + b, 0)).toBe(2);
  });

  it('a threshold outside the bin edges is a LimitOutsideHistogram error', () => {
    const k = prepareWorkKernel({ workRate: 520, restRate: 115, limit: { model: 'table-1989', acclimatization: 'unacclimatized' }, clothingAdjustment: 12 });
    expect(k.threshold).toBe(6);
    expect(() => estimateFromHistogram(WBGT_BIN_EDGES, new Float64Array(WBGT_HISTOGRAM_LENGTH), k)).not.toThrow();
    expectWorkError(() => estimateFromHistogram([10, 20, 30], [0, 0, 0, 0], k), 'LimitOutsideHistogram', /threshold 6.00 °C/);
  });

  it('a bad layout is a WbgtHistogramInvalid error', () => {
    const k = prepareWorkKernel({ workRate: 300, restRate: 115, limit: { model: 'curve-2017', acclimatization: 'acclimatized' } });
    expectWorkError(() => estimateFromHistogram([20, 30], [1, 2], k), 'WbgtHistogramInvalid', /2 counts for 2 edges/);
    expectWorkError(() => estimateFromHistogram([20, 30, 25], [0, 0, 0, 0], k), 'WbgtHistogramInvalid', /edge 2/);
    expectWorkError(() => estimateFromHistogram([20, 30], [0, -1, 0], k), 'WbgtHistogramInvalid', /count 1 is -1/);
    expectWorkError(() => estimateFromHistogram([20], [0, 0], k), 'WbgtHistogramInvalid');
  });
});

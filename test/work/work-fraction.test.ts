import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import {
  aboveLimitInto,
  allowableWorkFraction,
  isAboveLimit,
  prepareWorkKernel,
  workFractionInto,
  type WorkFractionParams,
} from '../../pipeline/work/work-fraction.ts';
import { limitCurve2017, limitWbgt, type LimitChoice } from '../../pipeline/work/limit-curves.ts';
import { expectWorkError, readFixture } from './helpers.ts';

const heavy = (acclimatization: 'acclimatized' | 'unacclimatized', extra: Partial<WorkFractionParams> = {}) =>
  prepareWorkKernel({ workRate: 415, restRate: 115, limit: { model: 'curve-2017', acclimatization }, ...extra });

describe('allowable work fraction', () => {
  // docs/methods.md §8.6 worked example (scipy): heavy work 415 W, rest 115 W.
  const table: [number, number, number, number][] = [
    [28.0, 0.66, 0.764, 0.227],
    [29.5, 0.39, 0.623, 0.094],
    [31.0, 0.189, 0.532, 0],
  ];
  for (const [w, same, rest26, ral] of table) {
    it(`at WBGT ${w} °C, 415 W: f = ${same} resting in place, ${rest26} resting at 26 °C, ${ral} unacclimatized (docs/methods.md §8.6 worked table), within 0.0005`, () => {
      expect(Math.abs(allowableWorkFraction(w, null, heavy('acclimatized')) - same)).toBeLessThan(5e-4);
      expect(Math.abs(allowableWorkFraction(w, 26, heavy('acclimatized')) - rest26)).toBeLessThan(5e-4);
      expect(Math.abs(allowableWorkFraction(w, null, heavy('unacclimatized')) - ral)).toBeLessThan(5e-4);
    });
  }

  it('the limiting rate M_lim = 10^((56.7 − WBGT)/11.5) is 313.1 / 231.9 / 171.7 W at 28 / 29.5 / 31 °C (docs/methods.md §8.6)', () => {
    const k = heavy('acclimatized');
    for (const [w, mlim] of [
      [28, 313.1],
      [29.5, 231.9],
      [31, 171.7],
    ]) {
      const f = allowableWorkFraction(w, null, k);
      expect(115 + f * 300).toBeCloseTo(mlim, 1);
      expect(limitCurve2017(mlim, 'acclimatized')).toBeCloseTo(w, 2);
    }
  });

  it('rest at another WBGT agrees with SciPy brentq on 56 cases within 1e-6 (fixtures/scipy-brentq-work-fraction.csv)', () => {
    const rows = readFixture('scipy-brentq-work-fraction.csv');
    expect(rows.length).toBe(56);
    for (const r of rows) {
      const k = prepareWorkKernel({
        workRate: Number(r.work_rate_w),
        restRate: 115,
        limit: { model: 'curve-2017', acclimatization: r.acclimatization as 'acclimatized' },
      });
      expect(Math.abs(allowableWorkFraction(Number(r.wbgt_work_c), Number(r.wbgt_rest_c), k) - Number(r.fraction))).toBeLessThan(1e-6);
    }
  });

  it('the same-place fraction satisfies the time-weighted limit equation exactly where 0 < f < 1 (docs/methods.md §8.6)', () => {
    fc.assert(
      fc.property(
        fc.double({ min: 15, max: 40, noNaN: true }),
        fc.constantFrom(180, 300, 415, 520),
        fc.constantFrom<LimitChoice['acclimatization']>('acclimatized', 'unacclimatized'),
        (w, m, acc) => {
          const k = prepareWorkKernel({ workRate: m, restRate: 115, limit: { model: 'curve-2017', acclimatization: acc } });
          const f = allowableWorkFraction(w, null, k);
          if (f > 0 && f < 1) expect(Math.abs(limitCurve2017(f * m + (1 - f) * 115, acc) - w)).toBeLessThan(1e-9);
        },
      ),
    );
  });

  it('the table-1989 fraction satisfies f·W_w + (1 − f)·W_r = L(f·M_w + (1 − f)·M_r) where 0 < f < 1', () => {
    const limit: LimitChoice = { model: 'table-1989', acclimatization: 'unacclimatized', airMovement: true };
    fc.assert(
      fc.property(
        fc.double({ min: 15, max: 40, noNaN: true }),
        fc.double({ min: 10, max: 40, noNaN: true }),
        fc.constantFrom(180, 300, 415, 520, 650),
        (w, r0, m) => {
          const k = prepareWorkKernel({ workRate: m, restRate: 115, limit });
          const r = Math.min(r0, w);
          const f = allowableWorkFraction(w, r0, k);
          if (f > 0 && f < 1) expect(Math.abs(f * w + (1 - f) * r - limitWbgt(f * m + (1 - f) * 115, limit))).toBeLessThan(1e-9);
        },
      ),
    );
  });

  it('table-1989 same place: at 28 °C and 415 W the limiting rate is the 300 W class value, f = 185/300 (docs/methods.md §8.3 table, our interpolation rule)', () => {
    const k = prepareWorkKernel({ workRate: 415, restRate: 115, limit: { model: 'table-1989', acclimatization: 'acclimatized' } });
    expect(allowableWorkFraction(28, null, k)).toBeCloseTo(185 / 300, 12);
    expect(allowableWorkFraction(25, null, k)).toBe(1);
    expect(allowableWorkFraction(33.5, null, k)).toBe(0);
  });

  it('an hour exactly at the limit is not above it and has f = 1; just above it, f < 1', () => {
    const k = prepareWorkKernel({ workRate: 300, restRate: 115, limit: { model: 'table-1989', acclimatization: 'acclimatized' } });
    expect(isAboveLimit(28, k)).toBe(false);
    expect(allowableWorkFraction(28, null, k)).toBe(1);
    expect(isAboveLimit(28.001, k)).toBe(true);
    expect(allowableWorkFraction(28.001, null, k)).toBeLessThan(1);
  });

  it('an hour is above the limit exactly when f < 1, for every model, clothing and rest place (property)', () => {
    fc.assert(
      fc.property(
        fc.double({ min: 0, max: 45, noNaN: true }),
        fc.double({ min: 0, max: 45, noNaN: true }),
        fc.constantFrom(180, 300, 415, 520),
        fc.constantFrom<LimitChoice['model']>('curve-2017', 'table-1989'),
        fc.constantFrom<LimitChoice['acclimatization']>('acclimatized', 'unacclimatized'),
        fc.constantFrom(0, 0.5, 3, 11),
        fc.boolean(),
        (w, r, m, model, acc, cav, elsewhere) => {
          const k = prepareWorkKernel({ workRate: m, restRate: 115, limit: { model, acclimatization: acc }, clothingAdjustment: cav });
          const f = allowableWorkFraction(w, elsewhere ? r : null, k);
          expect(f).toBeGreaterThanOrEqual(0);
          expect(f).toBeLessThanOrEqual(1);
          expect(isAboveLimit(w, k)).toBe(f < 1);
        },
      ),
    );
  });

  it('the fraction falls as WBGT rises, and resting somewhere cooler never lowers it (property)', () => {
    fc.assert(
      fc.property(
        fc.double({ min: 20, max: 40, noNaN: true }),
        fc.double({ min: 0, max: 3, noNaN: true }),
        fc.double({ min: 0, max: 8, noNaN: true }),
        (w, dw, cooler) => {
          for (const model of ['curve-2017', 'table-1989'] as const) {
            const k = prepareWorkKernel({ workRate: 415, restRate: 115, limit: { model, acclimatization: 'acclimatized' } });
            expect(allowableWorkFraction(w + dw, null, k)).toBeLessThanOrEqual(allowableWorkFraction(w, null, k) + 1e-12);
            expect(allowableWorkFraction(w, w - cooler, k)).toBeGreaterThanOrEqual(allowableWorkFraction(w, null, k) - 1e-12);
          }
        },
      ),
    );
  });

  it('a rest place hotter than the work place is not used (f equals the same-place value)', () => {
    const k = heavy('acclimatized');
    expect(allowableWorkFraction(29, 31, k)).toBe(allowableWorkFraction(29, null, k));
  });

  it('the clothing adjustment is added to the WBGT: CAV 2 at 27 °C equals bare 29 °C (docs/methods.md §8.4)', () => {
    expect(allowableWorkFraction(27, null, heavy('acclimatized', { clothingAdjustment: 2 }))).toBeCloseTo(
      allowableWorkFraction(29, null, heavy('acclimatized')),
      12,
    );
    expect(allowableWorkFraction(27, 24, heavy('acclimatized', { clothingAdjustment: 2 }))).toBeCloseTo(
      allowableWorkFraction(29, 26, heavy('acclimatized')),
      9,
    );
  });

  it('workFractionInto and aboveLimitInto agree with the scalar functions (Float32 rounding) for every model and rest place', () => {
    const n = 2000;
    const w = Float32Array.from({ length: n }, (_, i) => 15 + (25 * i) / n);
    const r = Float32Array.from({ length: n }, (_, i) => 12 + ((i * 7919) % n) * (22 / n));
    w[5] = Number.NaN;
    for (const model of ['curve-2017', 'table-1989'] as const) {
      for (const rest of [null, r]) {
        const k = prepareWorkKernel({ workRate: 415, restRate: 115, limit: { model, acclimatization: 'unacclimatized' }, clothingAdjustment: 1 });
        const out = workFractionInto(new Float32Array(n), w, rest, k);
        const above = aboveLimitInto(new Uint8Array(n), w, k);
        for (let i = 0; i < n; i++) {
          if (i === 5) {
            expect(out[i]).toBeNaN();
            expect(above[i]).toBe(0);
            continue;
          }
          expect(out[i]).toBeCloseTo(Math.fround(allowableWorkFraction(w[i], rest ? rest[i] : null, k)), 6);
          expect(above[i]).toBe(isAboveLimit(w[i], k) ? 1 : 0);
        }
      }
    }
  });

  it('in Float32 output too, out[i] < 1 exactly when the hour is above the limit, even one float step above it', () => {
    for (const model of ['curve-2017', 'table-1989'] as const) {
      for (const rest of [null, Float32Array.from([20, 20, 20])]) {
        const k = prepareWorkKernel({ workRate: 300, restRate: 115, limit: { model, acclimatization: 'acclimatized' } });
        const at = Math.fround(k.limitWork);
        const up = new Float32Array(Float64Array.from([at]));
        const bits = new Uint32Array(up.buffer);
        const above = Float32Array.from([at, 0, 0]);
        bits[0] += 1;
        above[1] = up[0];
        bits[0] += 1;
        above[2] = up[0];
        const out = workFractionInto(new Float32Array(3), above, rest, k);
        const flags = aboveLimitInto(new Uint8Array(3), above, k);
        for (let i = 0; i < 3; i++) expect(out[i] < 1, `${model} ${i}`).toBe(flags[i] === 1);
        expect(flags[2]).toBe(1);
      }
    }
  });

  it('missing WBGT (NaN) gives f = NaN and is not above the limit', () => {
    const k = heavy('acclimatized');
    expect(allowableWorkFraction(Number.NaN, null, k)).toBeNaN();
    expect(allowableWorkFraction(30, Number.NaN, k)).toBeNaN();
    expect(isAboveLimit(Number.NaN, k)).toBe(false);
  });

  it('bad parameters are catalogued errors', () => {
    const limit: LimitChoice = { model: 'curve-2017', acclimatization: 'acclimatized' };
    expectWorkError(() => prepareWorkKernel({ workRate: 0, restRate: 115, limit }), 'MetabolicRateOutOfRange');
    expectWorkError(() => prepareWorkKernel({ workRate: 1200, restRate: 115, limit }), 'MetabolicRateOutOfRange');
    expectWorkError(() => prepareWorkKernel({ workRate: 115, restRate: 115, limit }), 'RestRateNotBelowWork');
    expectWorkError(() => prepareWorkKernel({ workRate: 300, restRate: 115, limit, clothingAdjustment: -2 }), 'ClothingAdjustmentOutOfRange');
    expectWorkError(
      () => prepareWorkKernel({ workRate: 300, restRate: 115, limit: { model: 'curve-1986' as 'curve-2017', acclimatization: 'acclimatized' } }),
      'WorkParameterInvalid',
      /limit\.model is curve-1986/,
    );
    expectWorkError(
      () => prepareWorkKernel({ workRate: 300, restRate: 115, limit: { model: 'curve-2017', acclimatization: 'seasoned' as 'acclimatized' } }),
      'WorkParameterInvalid',
    );
    const k = heavy('acclimatized');
    expectWorkError(() => workFractionInto(new Float32Array(10), new Float32Array(5), null, k), 'WorkParameterInvalid', /input length/);
  });
});

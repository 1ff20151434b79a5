/**
 * Annual mean temperature per year and cell from monthly sums of hourly temperature, as `reduce`
 * accumulates them. Each month's mean (sum / valid hours) is weighted by the hours the month
 * holds, so hours lost in one season do not tilt the year: MAT_y = Σ_m mean_m · E_m / Σ_m E_m.
 * A year has a value only when all 12 months count (each month at most `maxMissingHours`
 * missing, completeness.ts); otherwise NaN. Requiring every month for an annual value follows
 * common practice for annual normals (from memory).
 */
import { completenessMask, MONTHLY_COMPLETENESS, type CompletenessRule } from './completeness.ts';
import { ClimateShapeMismatch } from './stack-errors.ts';

export interface MonthlySums {
  /** Calendar year of each row [year]. */
  years: ArrayLike<number>;
  nCells: number;
  /** Σ hourly air temperature per year × month × cell, index (y·12 + m)·nCells + c [°C·h]. */
  sum: ArrayLike<number>;
  /** Hours that entered each sum [h]. */
  validHours: ArrayLike<number>;
  /** Hours each month holds (744 for January) [h]. */
  expectedHours: ArrayLike<number>;
}

/**
 * Annual mean per year × cell, year-major (ready for {@link assessNiche} / computeNormals).
 * @returns Float64Array of years.length × nCells [°C], NaN where a month is incomplete
 */
export function annualMeanFromMonthlySums(input: MonthlySums, rule: CompletenessRule = MONTHLY_COMPLETENESS): Float64Array {
  const { years, nCells, sum, validHours, expectedHours } = input;
  const nYears = years.length;
  const expected = nYears * 12 * nCells;
  for (const [what, a] of [
    ['sum', sum],
    ['validHours', validHours],
    ['expectedHours', expectedHours],
  ] as const) {
    if (a.length !== expected) throw ClimateShapeMismatch({ what: `${what} (years × 12 months × cells)`, expected, actual: a.length }, { variable: what });
  }
  const mask = completenessMask(validHours, expectedHours, 12 * nCells, rule);
  const out = new Float64Array(nYears * nCells);
  for (let y = 0; y < nYears; y++) {
    for (let c = 0; c < nCells; c++) {
      let acc = 0;
      let hours = 0;
      let ok = true;
      for (let m = 0; m < 12; m++) {
        const k = (y * 12 + m) * nCells + c;
        const v = validHours[k];
        if (mask[k] === 0 || v === 0) {
          ok = false;
          break;
        }
        const e = expectedHours[k];
        acc += (sum[k] / v) * e;
        hours += e;
      }
      out[y * nCells + c] = ok ? acc / hours : NaN;
    }
  }
  return out;
}

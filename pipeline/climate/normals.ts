/**
 * Normals across years, vectorised over items: for every item of a {@link YearStack}, the
 * baseline mean, median, 90th-percentile year, minimum, maximum and the number of years used,
 * and the latest year against the baseline (difference from the baseline mean and its rank).
 *
 * - Quantiles: Hyndman–Fan type 7 (docs/methods.md §10.1), see quantile.ts.
 * - Completeness (completeness.ts, WMO-No. 1203 spirit): a year counts for an item only when
 *   its value is finite and, if hour counts are given, at most `maxMissingHours` are missing;
 *   a normal is published only when at least ⌈minYearShare · period length⌉ years count
 *   (24 of 30 by default). Otherwise every statistic of that item is NaN and `yearsUsed` tells why.
 */
import { checkRule, completenessMask, minYearsForNormal, MONTHLY_COMPLETENESS, type CompletenessRule } from './completeness.ts';
import { quantileSorted } from './quantile.ts';
import { checkStack, periodRows, type YearPeriod, type YearStack } from './year-stack.ts';
import { ClimatePeriodNotInStack } from './stack-errors.ts';

export interface NormalsOptions {
  /** Baseline period, e.g. [1991, 2020] [year]. */
  baseline: YearPeriod;
  /** Year to compare with the baseline (usually the newest built) [year]; omit for none. */
  latestYear?: number;
  /** Completeness rule; default {@link MONTHLY_COMPLETENESS}. */
  rule?: CompletenessRule;
}

/** Normals per item; every array has one entry per item. Units are those of the stack's values. */
export interface Normals {
  nItems: number;
  baseline: [number, number];
  /** Length of the baseline period [years]. */
  periodYears: number;
  /** Years needed for a normal [years]. */
  minYears: number;
  /** Baseline mean [unit of the values]. */
  mean: Float64Array;
  /** Baseline median, type 7 [unit of the values]. */
  median: Float64Array;
  /** Baseline 90th-percentile year, type 7 ("exceeded in about 3 of 30 years") [unit of the values]. */
  p90: Float64Array;
  /** Lowest and highest baseline year [unit of the values]. */
  min: Float64Array;
  max: Float64Array;
  /** Baseline years that counted [years]. */
  yearsUsed: Uint16Array;
  /** Baseline years of the period that did not count: absent, NaN or incomplete [years]. */
  yearsMissing: Uint16Array;
  /** The year compared, or undefined. */
  latestYear: number | undefined;
  /** Value in the latest year [unit of the values]; NaN when missing or incomplete. */
  latest: Float64Array;
  /** Latest minus baseline mean [unit of the values]; NaN without both. */
  latestDifference: Float64Array;
  /**
   * Rank of the latest year among the baseline years that counted, highest first [1]:
   * 1 + (number of baseline years strictly above the latest value). 1 = at or above every
   * baseline year; yearsUsed + 1 = below every one. NaN without both.
   */
  latestRank: Float64Array;
}

/** Items processed per block, so the transposed block stays in cache. */
const BLOCK = 1024;

/**
 * Normals of a year stack over a baseline period.
 * @param stack Values per year × item, year-major (year-stack.ts)
 * @param options Baseline period, latest year and completeness rule
 */
export function computeNormals(stack: YearStack, options: NormalsOptions): Normals {
  checkStack(stack);
  const rule = options.rule ?? MONTHLY_COMPLETENESS;
  checkRule(rule);
  const { values, nItems, years } = stack;
  const { rows, periodYears } = periodRows(years, options.baseline, 'baseline');
  const minYears = minYearsForNormal(periodYears, rule);
  const mask = stack.validHours && stack.expectedHours ? completenessMask(stack.validHours, stack.expectedHours, nItems, rule) : undefined;

  let latestRow = -1;
  if (options.latestYear !== undefined) {
    for (let y = 0; y < years.length; y++) if (years[y] === options.latestYear) latestRow = y;
    if (latestRow < 0) {
      throw ClimatePeriodNotInStack(
        { period: 'latest year', first: options.latestYear, last: options.latestYear, years: `${years[0]}–${years[years.length - 1]}` },
        { key: 'latestYear' },
      );
    }
  }

  const mean = new Float64Array(nItems);
  const median = new Float64Array(nItems);
  const p90 = new Float64Array(nItems);
  const min = new Float64Array(nItems);
  const max = new Float64Array(nItems);
  const yearsUsed = new Uint16Array(nItems);
  const yearsMissing = new Uint16Array(nItems);
  const latest = new Float64Array(nItems).fill(NaN);
  const latestDifference = new Float64Array(nItems).fill(NaN);
  const latestRank = new Float64Array(nItems).fill(NaN);

  const nRows = rows.length;
  const block = new Float64Array(nRows * BLOCK);
  const sorted = new Float64Array(nRows);

  for (let i0 = 0; i0 < nItems; i0 += BLOCK) {
    const b = Math.min(BLOCK, nItems - i0);
    // Transpose the block: block[r * BLOCK + k] = value of item i0 + k in baseline row r, NaN if it does not count.
    for (let r = 0; r < nRows; r++) {
      const base = rows[r] * nItems + i0;
      const off = r * BLOCK;
      for (let k = 0; k < b; k++) {
        const v = values[base + k];
        block[off + k] = mask !== undefined && mask[base + k] === 0 ? NaN : v;
      }
    }
    for (let k = 0; k < b; k++) {
      const item = i0 + k;
      // Gather finite values and insertion-sort them (n is a few tens).
      let n = 0;
      let sum = 0;
      for (let r = 0; r < nRows; r++) {
        const v = block[r * BLOCK + k];
        if (v === v && v !== Infinity && v !== -Infinity) {
          sum += v;
          let j = n++;
          while (j > 0 && sorted[j - 1] > v) {
            sorted[j] = sorted[j - 1];
            j--;
          }
          sorted[j] = v;
        }
      }
      yearsUsed[item] = n;
      yearsMissing[item] = periodYears - n;
      let m = NaN;
      if (n >= minYears) {
        m = sum / n;
        mean[item] = m;
        median[item] = quantileSorted(sorted, 0.5, n);
        p90[item] = quantileSorted(sorted, 0.9, n);
        min[item] = sorted[0];
        max[item] = sorted[n - 1];
      } else {
        mean[item] = median[item] = p90[item] = min[item] = max[item] = NaN;
      }
      if (latestRow >= 0) {
        const at = latestRow * nItems + item;
        const v = mask !== undefined && mask[at] === 0 ? NaN : values[at];
        if (Number.isFinite(v)) {
          latest[item] = v;
          if (n >= minYears) {
            latestDifference[item] = v - m;
            let above = 0;
            for (let j = n - 1; j >= 0 && sorted[j] > v; j--) above++;
            latestRank[item] = above + 1;
          }
        }
      }
    }
  }
  return {
    nItems,
    baseline: [options.baseline[0], options.baseline[1]],
    periodYears,
    minYears,
    mean,
    median,
    p90,
    min,
    max,
    yearsUsed,
    yearsMissing,
    latestYear: options.latestYear,
    latest,
    latestDifference,
    latestRank,
  };
}

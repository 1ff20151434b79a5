/**
 * The trend of the record (docs/methods.md §10.5): for each item of a year stack (an annual figure of a cell or a region),
 * the Theil–Sen slope and the Mann–Kendall test of a monotonic trend, over the years with a value.
 * Pure: arrays in, arrays out.
 *
 * - Theil–Sen slope (Theil 1950; Sen 1968, "Estimates of the regression coefficient based on
 *   Kendall's tau", JASA 63:1379–1389, as scipy.stats.theilslopes' documentation cites and
 *   describes it: "the median of all slopes between paired values"; the papers themselves were not
 *   read, so no equation number; docs/methods.md eq. 10.5): the median of (x_j − x_i)/(t_j − t_i)
 *   over every pair of years i < j, the median of an even count being the mean of the middle two;
 *   shown per decade (× {@link YEARS_PER_DECADE}).
 * - Mann–Kendall test (Mann 1945, Econometrica 13:245–259; Kendall 1975, Rank Correlation Methods;
 *   volume, pages and the variance formula from memory, docs/methods.md eqs. 10.6–10.8, and checked
 *   against scipy's kendalltau below): S = Σ_{i<j} sign(x_j − x_i); with ties among the values,
 *   Var(S) = [n(n − 1)(2n + 5) − Σ_g t_g(t_g − 1)(2t_g + 5)]/18 over the groups of t_g equal values;
 *   Z = S/√Var(S) (no continuity correction) and the two-sided p-value 2·(1 − Φ(|Z|)) = erfc(|Z|/√2)
 *   from the normal approximation. This is the p-value scipy.stats.kendalltau(years, x,
 *   method='asymptotic') gives when the years are distinct (test/climate/trend.test.ts pins its
 *   values). All values equal: S = 0, p = 1.
 * - A trend is shown only where at least {@link MIN_TREND_YEARS} years have a value (ours, as the
 *   atlas states with every trend: fewer years give a slope that the year-to-year weather
 *   dominates); otherwise the slope and the p-value are NaN and `years` says why.
 */
import { erfc } from '../work/erf.ts';
import { checkStack, type YearStack } from './year-stack.ts';

/** Fewest years with a value for a trend to be shown [years]. */
export const MIN_TREND_YEARS = 15;
/** Years in a decade, the unit the slope is shown in [years]. */
export const YEARS_PER_DECADE = 10;

/** The trends of the items asked for; every array has one entry per item asked for. */
export interface Trends {
  /** Theil–Sen slope per decade [unit of the values per decade]; NaN below the minimum years. */
  slopePerDecade: Float64Array;
  /** Two-sided p-value of the Mann–Kendall test [–]; NaN below the minimum years. */
  pValue: Float64Array;
  /** Mann–Kendall statistic S [–]; NaN below the minimum years. */
  s: Float64Array;
  /** Years with a value [years]. */
  years: Uint16Array;
}

/** The Theil–Sen slope of points (t, x) [unit of x per unit of t] (t distinct); NaN for fewer than 2 points. */
export function theilSenSlope(t: ArrayLike<number>, x: ArrayLike<number>, n = x.length, scratch?: Float64Array): number {
  if (n < 2) return NaN;
  const m = (n * (n - 1)) / 2;
  const slopes = scratch && scratch.length >= m ? scratch : new Float64Array(m);
  let k = 0;
  for (let i = 0; i < n; i++) for (let j = i + 1; j < n; j++) slopes[k++] = (x[j] - x[i]) / (t[j] - t[i]);
  const s = slopes.subarray(0, m).sort();
  return m % 2 === 1 ? s[(m - 1) / 2] : (s[m / 2 - 1] + s[m / 2]) / 2;
}

/**
 * The Mann–Kendall test of values in time order: S, its variance with the tie correction, and the
 * two-sided p-value of the normal approximation (file comment). @param n values used [–]
 */
export function mannKendall(x: ArrayLike<number>, n = x.length, scratch?: Float64Array): { s: number; variance: number; pValue: number } {
  let s = 0;
  for (let i = 0; i < n; i++) {
    const xi = x[i];
    for (let j = i + 1; j < n; j++) s += x[j] > xi ? 1 : x[j] < xi ? -1 : 0;
  }
  const sorted = scratch && scratch.length >= n ? scratch.subarray(0, n) : new Float64Array(n);
  for (let i = 0; i < n; i++) sorted[i] = x[i];
  sorted.sort();
  let ties = 0;
  for (let i = 0; i < n; ) {
    let j = i + 1;
    while (j < n && sorted[j] === sorted[i]) j++;
    const g = j - i;
    if (g > 1) ties += g * (g - 1) * (2 * g + 5);
    i = j;
  }
  const variance = (n * (n - 1) * (2 * n + 5) - ties) / 18;
  const pValue = variance > 0 ? erfc(Math.abs(s) / Math.sqrt(variance) / Math.SQRT2) : 1;
  return { s, variance, pValue };
}

/**
 * Trends of the items `items` of a year stack (all items when omitted), over the stack's years
 * with a finite value.
 * @param minYears fewest years with a value for a trend [years] (default {@link MIN_TREND_YEARS})
 */
export function computeTrends(stack: YearStack, items?: ArrayLike<number>, minYears = MIN_TREND_YEARS): Trends {
  checkStack(stack);
  const { years, values, nItems } = stack;
  const nY = years.length;
  const n = items ? items.length : nItems;
  const out: Trends = {
    slopePerDecade: new Float64Array(n).fill(NaN),
    pValue: new Float64Array(n).fill(NaN),
    s: new Float64Array(n).fill(NaN),
    years: new Uint16Array(n),
  };
  const t = new Float64Array(nY);
  const x = new Float64Array(nY);
  const pairs = new Float64Array((nY * (nY - 1)) / 2);
  for (let k = 0; k < n; k++) {
    const item = items ? items[k] : k;
    let m = 0;
    for (let y = 0; y < nY; y++) {
      const v = values[y * nItems + item];
      if (v === v && v !== Infinity && v !== -Infinity) {
        t[m] = years[y];
        x[m++] = v;
      }
    }
    out.years[k] = m;
    if (m < minYears) continue;
    out.slopePerDecade[k] = YEARS_PER_DECADE * theilSenSlope(t, x, m, pairs);
    const mk = mannKendall(x, m, pairs);
    out.s[k] = mk.s;
    out.pValue[k] = mk.pValue;
  }
  return out;
}

/**
 * Trends of the whole-year values of a figure's per-cell stack (items ordered cell × period ×
 * combination, the merge's layout, the last of `periods` the year): one slope per decade and one
 * Mann–Kendall p-value per cell × combination, in that order (cell-major) — the per-cell trend
 * layers (`trend-year`, `trend-p-year`, pipeline/publish/grid-fields.ts).
 * @param nCells cells of the stack [–] @param nCombos combinations of the figure [–] @param periods periods per cell (13: twelve months and the year) [–]
 */
export function annualCellTrends(stack: YearStack, nCells: number, nCombos: number, periods: number, minYears = MIN_TREND_YEARS): Trends {
  const items = Int32Array.from({ length: nCells * nCombos }, (_, j) => (Math.floor(j / nCombos) * periods + periods - 1) * nCombos + (j % nCombos));
  return computeTrends(stack, items, minYears);
}

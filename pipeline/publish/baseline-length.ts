/**
 * What a baseline of n years can honestly say about its 90th-percentile year, in words for the
 * pages, the data dictionary and the build's log. Pure.
 *
 * The rule (ours, from arithmetic; stated on the methods page): a 90th-percentile year is one that
 * about 1 year in 10 exceeds, so a baseline needs at least 10 years before it can be expected to
 * hold one such year. With the Hyndman–Fan type-7 quantile the normals use (docs/methods.md §10.1, eq. 10.1:
 * rank h = 1 + 0.9 (n − 1) of the n sorted years) a baseline of n ≤ 11 years puts the P90
 * between its two highest years, a share 1.1 − 0.1 n of the way to the highest: for 4 years 70 %,
 * so the figure is mostly the hottest year seen, not a 1-in-10 year. For comparison, the WMO's
 * standard climate normals use 30 years (WMO-No. 1203, 2017) and its Technical Regulations call
 * an average over at least ten years a period average (as quoted by WMO's climate-normals page).
 */

/** Fewest baseline years for a 90th-percentile year to be read as "about 1 year in 10" [years]. */
export const MIN_BASELINE_YEARS_P90 = 10;

/** Years in a baseline [first, last], both included [years]. */
export function baselineYearCount(baseline: readonly [number, number]): number {
  return baseline[1] - baseline[0] + 1;
}

/** Whether a P90 of `n` years is short of {@link MIN_BASELINE_YEARS_P90}. */
export function isShortForP90(n: number): boolean {
  return n < MIN_BASELINE_YEARS_P90;
}

/**
 * The type-7 rank of the 90th percentile among `n` sorted years (1 = lowest) [rank]; for
 * n = 30, 27.1 (docs/methods.md §10.1, eq. 10.1: P90 = x27 + 0.1 (x28 − x27)).
 */
export function p90Rank(n: number): number {
  return 1 + 0.9 * (n - 1);
}

/**
 * Where a P90 of `n` years lies, in words: "between the second-highest and the highest of the 4
 * years, 70 % of the way to the highest" for a short baseline; "about 1 year in 10 is higher" for
 * `n` ≥ {@link MIN_BASELINE_YEARS_P90}.
 */
export function p90Position(n: number): string {
  if (n <= 1) return n === 1 ? 'the one baseline year itself' : 'not defined without baseline years';
  if (!isShortForP90(n)) return 'a hot year: about 1 year in 10 is higher';
  const share = Math.round((p90Rank(n) - (n - 1)) * 100);
  return `between the second-highest and the highest of the ${n} years, ${share} % of the way to the highest`;
}

/** Short label of the statistic for menus and table heads: "P90 of 4 years (near the highest)" / "P90 of 30 years (a hot year, about 1 in 10)". */
export function p90Label(n: number): string {
  return isShortForP90(n) ? `P90 of ${n} ${n === 1 ? 'year' : 'years'} (near the highest)` : `P90 of ${n} years (a hot year, about 1 in 10)`;
}

/** One sentence for a caption or the data dictionary. */
export function p90Description(n: number, baseline: readonly [number, number]): string {
  const base = `90th-percentile year of the baseline ${baseline[0]}–${baseline[1]} (${n} ${n === 1 ? 'year' : 'years'}; Hyndman–Fan type 7)`;
  return isShortForP90(n)
    ? `${base}: with fewer than ${MIN_BASELINE_YEARS_P90} years it lies ${p90Position(n)}; it is not a 1-in-10 year`
    : `${base}: ${p90Position(n)}`;
}

/**
 * The warning for a baseline too short for a P90 (null when it is long enough), for the build's
 * log and the pages.
 */
export function shortBaselineWarning(baseline: readonly [number, number]): string | null {
  const n = baselineYearCount(baseline);
  if (!isShortForP90(n)) return null;
  return (
    `the baseline ${baseline[0]}–${baseline[1]} has ${n} ${n === 1 ? 'year' : 'years'}, fewer than the ${MIN_BASELINE_YEARS_P90} a 90th-percentile (P90) year needs: ` +
    `its P90 figures lie ${p90Position(n)}, and the pages label them so; set a baseline of ${MIN_BASELINE_YEARS_P90} years or more (30 for a WMO standard normal) for a 1-in-10 year`
  );
}

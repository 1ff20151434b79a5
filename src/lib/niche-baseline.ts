/**
 * The length of the baseline beside every niche figure. The human climate niche was described
 * with mean annual temperatures over 20 years or more (Lenton et al. 2023 average over 20-year
 * intervals, caption of their Fig. 2); a class from a shorter baseline, or from one year, moves
 * with the weather of those years. Pure.
 */

/** Years of mean annual temperature the niche was described with [years] (Lenton et al. 2023). */
export const NICHE_BASELINE_YEARS = 20;

/** Years in a baseline [first, last] (inclusive) [years]. */
export function baselineYears(baseline: readonly [number, number]): number {
  return baseline[1] - baseline[0] + 1;
}

/** "2020–2023, 4 years" [text]. */
export function baselineLength(baseline: readonly [number, number]): string {
  const n = baselineYears(baseline);
  return `${baseline[0]}–${baseline[1]}, ${n} year${n === 1 ? '' : 's'}`;
}

/**
 * The caution for a baseline shorter than {@link NICHE_BASELINE_YEARS}, or null [text]. A single
 * latest year is always this short.
 */
export function nicheBaselineCaution(baseline: readonly [number, number]): string | null {
  const n = baselineYears(baseline);
  if (n >= NICHE_BASELINE_YEARS) return null;
  return (
    `The niche was described with mean annual temperatures over ${NICHE_BASELINE_YEARS} years or more; this baseline has ${n} year${n === 1 ? '' : 's'} ` +
    '(and the latest year is one), so a warm or cool year can move the class. Read the class as indicative.'
  );
}

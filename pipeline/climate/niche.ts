/**
 * Mean annual temperature (MAT) against the human climate niche (docs/methods.md §11).
 *
 * Sources:
 * - Xu, Kohler, Lenton, Svenning & Scheffer (2020), "Future of the human climate niche", PNAS
 *   (vol. 117, pp. 11350–11355, doi 10.1073/pnas.1910114117 from memory): people have lived mostly
 *   in a narrow band of MAT with a major mode at ~11–15 °C ("around ~13 °C" in the summary) and a
 *   secondary mode at ~20–25 °C; MAT > 29 °C occurs today on only 0.8 % of land.
 * - Lenton et al. (2023), "Quantifying the human cost of global warming", Nature Sustainability
 *   6:1237–1247, doi 10.1038/s41893-023-01132-6: "unprecedented heat" is MAT ≥ 29 °C; MAT is
 *   averaged over 20-year intervals.
 *
 * The four classes below are the per-cell classification proposed in docs/methods.md §11, built only on
 * those published statements; the labels are our own words. It is not the fitted double-Gaussian
 * niche of Xu 2020 (whose parameters we did not verify), so it says where a MAT falls, not how
 * densely people live there.
 *
 * How boundaries count (all bounds are inclusive on the side named):
 * - `core`     11 °C ≤ MAT ≤ 15 °C  (so 11.0 and 15.0 are core);
 * - `second`   20 °C ≤ MAT ≤ 25 °C  (so 20.0 and 25.0 are second);
 * - `outside`  MAT ≥ 29 °C          (so 29.0 is outside, 28.99 is margin);
 * - `margin`   every other MAT < 29 °C (below 11, between 15 and 20, between 25 and 29);
 * - NaN        → no class (code {@link NICHE_NO_CLASS}).
 */

/** The niche classes, in code order (code = index). */
export const NICHE_CLASSES = ['core', 'second', 'margin', 'outside'] as const;
export type NicheClass = (typeof NICHE_CLASSES)[number];

/** Code of a cell whose MAT is unknown (NaN). */
export const NICHE_NO_CLASS = 255;

/** Class boundaries [°C] (docs/methods.md §11; Xu 2020; Lenton 2023). */
export const NICHE_BOUNDS = Object.freeze({
  coreLow: 11,
  coreHigh: 15,
  secondLow: 20,
  secondHigh: 25,
  outsideFrom: 29,
});

/**
 * The value used for the main mode of the niche [°C]: 13 °C, the middle of Xu 2020's 11–15 °C
 * major mode and their summary's "around ~13 °C".
 */
export const NICHE_MAIN_MODE_C = 13;

/** Half-width of the band around a boundary within which a class is uncertain [°C]. */
export const NICHE_UNCERTAINTY_C = 0.5;

/** Labels in plain words, for pages and tables. */
export const NICHE_LABELS: Readonly<Record<NicheClass, string>> = Object.freeze({
  core: 'Main band of lived-in climates (11–15 °C)',
  second: 'Second band of lived-in climates (20–25 °C)',
  margin: 'Lived-in, but outside both bands (below 29 °C)',
  outside: 'Hotter than almost any lived-in climate (29 °C and above)',
});

/** The caveat that goes with every niche figure. */
export const NICHE_CAVEAT =
  'Mean annual temperature here is the mean over a reanalysis grid box, not a value at a point: ' +
  'towns, valleys and coasts inside the box can be warmer or cooler. The niche bands come from ' +
  'studies (Xu et al. 2020; Lenton et al. 2023) that used other climate datasets and population ' +
  'maps, so a value within about 0.5 °C of a band edge (11, 15, 20, 25 or 29 °C) could fall on ' +
  'either side. The bands describe where people have mostly lived; they are not a limit on where ' +
  'people can live or work, and they are not occupational heat limits.';

/**
 * The niche class code of one MAT.
 * @param mat Mean annual temperature [°C]
 * @returns Index into {@link NICHE_CLASSES}, or {@link NICHE_NO_CLASS} for NaN
 */
export function nicheClassCode(mat: number): number {
  if (mat !== mat) return NICHE_NO_CLASS;
  const b = NICHE_BOUNDS;
  if (mat >= b.outsideFrom) return 3;
  if (mat >= b.coreLow && mat <= b.coreHigh) return 0;
  if (mat >= b.secondLow && mat <= b.secondHigh) return 1;
  return 2;
}

/**
 * The niche class of one MAT.
 * @param mat Mean annual temperature [°C]
 * @returns the class, or undefined for NaN
 */
export function classifyNiche(mat: number): NicheClass | undefined {
  const c = nicheClassCode(mat);
  return c === NICHE_NO_CLASS ? undefined : NICHE_CLASSES[c];
}

/**
 * Signed distance from the main mode.
 * @param mat Mean annual temperature [°C]
 * @returns MAT − 13 °C [°C]; positive = warmer than the main mode
 */
export function distanceToMainMode(mat: number): number {
  return mat - NICHE_MAIN_MODE_C;
}

/**
 * Whether a MAT lies within {@link NICHE_UNCERTAINTY_C} of any class boundary (inclusive).
 * @param mat Mean annual temperature [°C]
 */
export function nearNicheBoundary(mat: number): boolean {
  const b = NICHE_BOUNDS;
  for (const edge of [b.coreLow, b.coreHigh, b.secondLow, b.secondHigh, b.outsideFrom]) {
    if (Math.abs(mat - edge) <= NICHE_UNCERTAINTY_C) return true;
  }
  return false;
}

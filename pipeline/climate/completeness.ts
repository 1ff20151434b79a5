/**
 * When a year's value counts, and when enough years make a normal. In the spirit of the WMO
 * Guidelines on the Calculation of Climate Normals (WMO-No. 1203, 2017), as summarised in
 * docs/methods.md §10.3:
 * - a monthly value counts only when at most 10 days' worth of its hours are missing
 *   (10 d × 24 h = 240 h) — WMO-No. 1203's "≤ 10 missing days" for monthly values (from memory,
 *   per docs/methods.md §10.3; its second condition, "< 5 consecutive missing days", cannot be checked
 *   here because only hour counts reach this stage);
 * - a normal needs at least 80 % of the period's years (24 of 30) — WMO-No. 1203 (from memory,
 *   per docs/methods.md §10.3).
 * Years of the period that are absent from the stack count as missing.
 */
import { ClimateBadHourCounts, ClimateBadRule } from './errors.ts';

/** How much may be missing before a value, or a normal, is withheld. */
export interface CompletenessRule {
  /** Most hours a year's value may lack and still count [h]; 240 = 10 days for a monthly value. */
  maxMissingHours: number;
  /** Smallest share of the period's years that must count for a normal [1], in (0, 1]. */
  minYearShare: number;
}

/** The rule for monthly values: ≤ 240 missing hours, ≥ 80 % of years (WMO-No. 1203, from memory). */
export const MONTHLY_COMPLETENESS: CompletenessRule = Object.freeze({ maxMissingHours: 240, minYearShare: 0.8 });

/** Throws ClimateBadRule unless the rule is usable. */
export function checkRule(rule: CompletenessRule): void {
  if (!(Number.isInteger(rule.maxMissingHours) && rule.maxMissingHours >= 0)) {
    throw ClimateBadRule({ detail: `maxMissingHours ${rule.maxMissingHours} is not a whole number ≥ 0 [h]` }, { key: 'maxMissingHours' });
  }
  if (!(rule.minYearShare > 0 && rule.minYearShare <= 1)) {
    throw ClimateBadRule({ detail: `minYearShare ${rule.minYearShare} is not a fraction in (0, 1]` }, { key: 'minYearShare' });
  }
}

/**
 * Fewest years that make a normal over a period.
 * @param periodYears Length of the period [years], e.g. 30 for 1991–2020
 * @returns ⌈minYearShare · periodYears⌉ [years], e.g. 24 of 30 at 80 %
 */
export function minYearsForNormal(periodYears: number, rule: CompletenessRule = MONTHLY_COMPLETENESS): number {
  return Math.max(1, Math.ceil(rule.minYearShare * periodYears - 1e-9));
}

/**
 * Whether one year's value counts.
 * @param validHours Hours actually computed [h]
 * @param expectedHours Hours the period holds [h]
 */
export function yearCounts(validHours: number, expectedHours: number, rule: CompletenessRule = MONTHLY_COMPLETENESS): boolean {
  return expectedHours - validHours <= rule.maxMissingHours;
}

/**
 * Checks hour counts (0 ≤ valid ≤ expected, whole numbers) for a years × items layout and returns
 * a mask, 1 where the year counts for that item, 0 where too many hours are missing.
 * @param validHours Per year × item, hours computed [h]
 * @param expectedHours Per year × item, hours expected [h]
 */
export function completenessMask(
  validHours: ArrayLike<number>,
  expectedHours: ArrayLike<number>,
  nItems: number,
  rule: CompletenessRule = MONTHLY_COMPLETENESS,
): Uint8Array {
  checkRule(rule);
  const n = validHours.length;
  const mask = new Uint8Array(n);
  const max = rule.maxMissingHours;
  for (let k = 0; k < n; k++) {
    const v = validHours[k];
    const e = expectedHours[k];
    if (!(v >= 0 && v <= e && Number.isInteger(v) && Number.isInteger(e))) {
      throw ClimateBadHourCounts(
        { row: Math.floor(k / nItems) + 1, item: k % nItems, valid: v, expected: e },
        { variable: 'validHours', row: Math.floor(k / nItems) + 1 },
      );
    }
    mask[k] = e - v <= max ? 1 : 0;
  }
  return mask;
}

/**
 * Catalogued errors of the climate stage (normals across years, mean annual temperature against
 * the human climate niche). The climate stage does no I/O: these errors name the input array or
 * option (`variable`, `key`) that was wrong, and the lead adds the file when it has one.
 */
import { defineError } from '../model/errors.ts';

export const ClimateProbabilityOutOfRange = defineError<{ p: number }>({
  code: 'ClimateProbabilityOutOfRange',
  title: 'A quantile was asked for a probability outside 0–1',
  message: (p) => `quantile probability ${p.p} is not a number between 0 and 1`,
  hint: () => 'pass the probability as a fraction: 0.5 for the median, 0.9 for the 90th percentile',
});

export const ClimateBadHourCounts = defineError<{ row: number; item: number; valid: number; expected: number }>({
  code: 'ClimateBadHourCounts',
  title: 'The counts of valid and expected hours do not make sense',
  message: (p) =>
    `year row ${p.row} (1-based), item ${p.item}: ${p.valid} valid hours against ${p.expected} expected (need 0 ≤ valid ≤ expected, whole numbers)`,
  hint: () => 'pass, per year × item, the hours actually computed and the hours the period holds; valid can never exceed expected',
});

export const ClimateBadRule = defineError<{ detail: string }>({
  code: 'ClimateBadRule',
  title: 'The completeness rule is not valid',
  message: (p) => p.detail,
  hint: () => 'maxMissingHours is a whole number of hours ≥ 0; minYearShare is a fraction in (0, 1]',
});

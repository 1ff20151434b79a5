/**
 * Catalogued errors of the climate stage's year stacks and periods (year-stack.ts, normals.ts,
 * annual-mean.ts): an array of the wrong length, years out of order, a period outside the stack or
 * not a period. Kept apart from errors.ts (quantiles, completeness) so code that only takes
 * quantiles and completeness, such as the estimate page's first script, does not carry them.
 * Registered in pipeline/commands/catalogue.ts.
 */
import { defineError } from '../model/errors.ts';

export const ClimateShapeMismatch = defineError<{ what: string; expected: number; actual: number }>({
  code: 'ClimateShapeMismatch',
  title: 'An array has the wrong length for its years × items layout',
  message: (p) => `${p.what} holds ${p.actual} values; years × items needs ${p.expected}`,
  hint: () => 'lay the stack out year-major (value[year * nItems + item]) with one row per year of `years`',
});

export const ClimateYearsNotAscending = defineError<{ index: number; previous: number; year: number }>({
  code: 'ClimateYearsNotAscending',
  title: 'The years of a stack are not whole, strictly ascending calendar years',
  message: (p) => `year ${p.year} at row ${p.index} does not follow ${p.previous} (years must be integers, ascending, without repeats)`,
  hint: () => 'give one row per calendar year, oldest first, each year once',
});

export const ClimatePeriodNotInStack = defineError<{ period: string; first: number; last: number; years: string }>({
  code: 'ClimatePeriodNotInStack',
  title: 'A requested period has no year in the stack',
  message: (p) => `${p.period} ${p.first}–${p.last} shares no year with the stack (${p.years})`,
  hint: () => 'choose a baseline (and latest years) inside the years that were built, or build those years first',
});

export const ClimateBadPeriod = defineError<{ period: string; first: number; last: number }>({
  code: 'ClimateBadPeriod',
  title: 'A period of years is not valid',
  message: (p) => `${p.period} ${p.first}–${p.last} is not a pair of whole years with the first not after the last`,
  hint: () => 'write the period as [first, last] calendar years, e.g. [1991, 2020]',
});

/**
 * The input shape of the climate stage: one value per year and item, year-major.
 * An item is whatever the lead stacks: cell × month × workload class × statistic, flattened.
 * `values[y * nItems + i]` is item i in year `years[y]`; NaN where that year is missing.
 */
import { ClimateBadPeriod, ClimatePeriodNotInStack, ClimateShapeMismatch, ClimateYearsNotAscending } from './stack-errors.ts';

export interface YearStack {
  /** Calendar year of each row, whole and strictly ascending [year]. */
  years: ArrayLike<number>;
  /** values[y * nItems + i] [unit of the statistic, e.g. h], NaN where missing. */
  values: Float64Array;
  /** Items per year [count]. */
  nItems: number;
  /** Optional, per year × item: hours actually computed [h]. Needs `expectedHours`. */
  validHours?: ArrayLike<number>;
  /** Optional, per year × item: hours the period holds (e.g. 744 for January) [h]. */
  expectedHours?: ArrayLike<number>;
}

/** A closed period of calendar years, [first, last] [year]. */
export type YearPeriod = readonly [number, number];

/** Throws a catalogued error unless the stack's arrays agree with years × items. */
export function checkStack(stack: YearStack): void {
  const { years, values, nItems } = stack;
  if (!(Number.isInteger(nItems) && nItems >= 0)) {
    throw ClimateShapeMismatch({ what: 'nItems', expected: 0, actual: nItems }, { key: 'nItems' });
  }
  for (let y = 0; y < years.length; y++) {
    const yr = years[y];
    if (!Number.isInteger(yr) || (y > 0 && yr <= years[y - 1])) {
      throw ClimateYearsNotAscending({ index: y + 1, previous: y > 0 ? years[y - 1] : NaN, year: yr }, { variable: 'years', row: y + 1 });
    }
  }
  const expected = years.length * nItems;
  if (values.length !== expected) throw ClimateShapeMismatch({ what: 'values', expected, actual: values.length }, { variable: 'values' });
  if ((stack.validHours === undefined) !== (stack.expectedHours === undefined)) {
    throw ClimateShapeMismatch(
      { what: stack.validHours ? 'expectedHours (missing)' : 'validHours (missing)', expected, actual: 0 },
      { variable: stack.validHours ? 'expectedHours' : 'validHours' },
    );
  }
  if (stack.validHours && stack.validHours.length !== expected) {
    throw ClimateShapeMismatch({ what: 'validHours', expected, actual: stack.validHours.length }, { variable: 'validHours' });
  }
  if (stack.expectedHours && stack.expectedHours.length !== expected) {
    throw ClimateShapeMismatch({ what: 'expectedHours', expected, actual: stack.expectedHours.length }, { variable: 'expectedHours' });
  }
}

/**
 * The stack rows whose years fall in a period, and the period's length.
 * @param name Name of the period for messages, e.g. "baseline"
 * @returns rows (indices into `years`) and periodYears = last − first + 1 [years]
 */
export function periodRows(years: ArrayLike<number>, period: YearPeriod, name: string): { rows: number[]; periodYears: number } {
  const [first, last] = period;
  if (!(Number.isInteger(first) && Number.isInteger(last) && first <= last)) {
    throw ClimateBadPeriod({ period: name, first, last }, { key: name });
  }
  const rows: number[] = [];
  for (let y = 0; y < years.length; y++) if (years[y] >= first && years[y] <= last) rows.push(y);
  if (rows.length === 0) {
    const span = years.length ? `${years[0]}–${years[years.length - 1]}` : 'no years';
    throw ClimatePeriodNotInStack({ period: name, first, last, years: span }, { key: name });
  }
  return { rows, periodYears: last - first + 1 };
}

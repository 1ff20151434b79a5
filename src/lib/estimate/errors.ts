/**
 * Catalogued errors of the estimate calculator (the /estimate/ page): bad inputs from its form or
 * URL, and calculator data it cannot load. Each says what went wrong, where (the form field or URL
 * parameter as `key`, the file as `file`) and what to do. Pure: the browser shows `format()`-like
 * text from these. The work model's own errors (metabolic rate, clothing value, shift) are reused
 * from pipeline/work/errors.ts. Registered in pipeline/model/catalogue.ts.
 */
import { defineError } from '../../../pipeline/model/errors.ts';

export const EstimateRegionUnknown = defineError<{ id: string; known: string[] }>({
  code: 'EstimateRegionUnknown',
  title: 'The calculator has no region with this id',
  message: (p) => `no region "${p.id}"; regions of this atlas: ${p.known.join(', ') || 'none'}`,
  hint: () => 'pick a region from the list, or use ?region=<id> with an id from data/regions.geojson',
});

export const EstimateCellInvalid = defineError<{ value: string; problem: string }>({
  code: 'EstimateCellInvalid',
  title: 'The grid cell is not a land cell of this atlas',
  message: (p) => `cell "${p.value}": ${p.problem}`,
  hint: () =>
    'a cell id is the row-major grid index (row × number of columns + column) as in the per-cell tables (data/cell-tables); pick a land cell on the map, or give a latitude and longitude inside the atlas',
});

export const EstimatePointOutsideGrid = defineError<{ lat: number; lon: number; extent: string }>({
  code: 'EstimatePointOutsideGrid',
  title: 'The point lies outside the atlas grid',
  message: (p) => `${p.lat}° N, ${p.lon}° E is outside the grid (${p.extent})`,
  hint: () => 'give a latitude in ° N (south negative) and a longitude in ° E (west negative) inside the grid the atlas covers',
});

export const EstimateNumberInvalid = defineError<{ name: string; value: string; expected: string }>({
  code: 'EstimateNumberInvalid',
  title: 'A number in the calculator form is missing or out of range',
  message: (p) => `${p.name} is "${p.value}"; expected ${p.expected}`,
  hint: () => 'type a plain number (a dot for decimals) in the range given beside the field',
});

export const EstimateChoiceUnknown = defineError<{ name: string; value: string; known: string[] }>({
  code: 'EstimateChoiceUnknown',
  title: 'A choice in the calculator form is not one it offers',
  message: (p) => `${p.name} "${p.value}" is not one of: ${p.known.join(', ')}`,
  hint: () => 'pick one of the listed options (an old or edited link may carry a value this atlas does not have)',
});

export const EstimateMonthsEmpty = defineError<Record<string, never>>({
  code: 'EstimateMonthsEmpty',
  title: 'No work month is ticked',
  message: () => 'the estimate needs at least one month in which the crew works',
  hint: () => 'tick the months of the year in which work goes on',
});

export const EstimatePeriodInvalid = defineError<{ problem: string }>({
  code: 'EstimatePeriodInvalid',
  title: 'The project period is not a valid span of months',
  message: (p) => p.problem,
  hint: () => 'give the first and last month of the project as YYYY-MM (e.g. 2027-04 to 2028-03), last not before first, at most 20 years; or leave both empty for one year',
});

export const EstimateDataUnavailable = defineError<{ path: string; detail: string }>({
  code: 'EstimateDataUnavailable',
  title: 'The calculator could not load its histogram data',
  message: (p) => `${p.path}: ${p.detail}`,
  hint: () =>
    'the site must be served with its data/ folder (data/calculator/…); open the page through a web server such as `heathours preview`, not as a file, and rebuild the atlas if the file is missing',
});

export const EstimateYearsMismatch = defineError<{ path: string; expected: number; got: number }>({
  code: 'EstimateYearsMismatch',
  title: 'A calculator tile holds another number of years than its index',
  message: (p) => `${p.path} holds ${p.got} year(s); the index lists ${p.expected}`,
  hint: () => 'the data folder mixes files of two builds; publish data/calculator/ from one build only',
});

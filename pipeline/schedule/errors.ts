/**
 * Catalogued errors of the schedule stage (a job replayed on the published histograms) and of the
 * estimate's inputs shared by the /estimate/ page and `heathours estimate`: dates, quantities,
 * shifts, holidays, costs, a job that never finishes, a deadline that cannot be met, the place
 * (region, cell, point), the form's choices and the atlas data they read. Each names the option or
 * field (`key`), the file (and line), and says what to do.
 * Pure (no node: imports): the browser calculator shows the same errors. Registered in
 * pipeline/commands/catalogue.ts.
 */
import { defineError } from '../model/errors.ts';

export const ScheduleDateInvalid = defineError<{ name: string; value: string; problem: string }>({
  code: 'ScheduleDateInvalid',
  title: 'A date of the job is not a valid calendar date',
  message: (p) => `${p.name} "${p.value}": ${p.problem}`,
  hint: () => 'write dates as YYYY-MM-DD (e.g. 2027-03-01), a real calendar day between the years 1900 and 2200',
});

export const ScheduleNumberInvalid = defineError<{ name: string; value: string; expected: string }>({
  code: 'ScheduleNumberInvalid',
  title: 'A quantity, crew size, rate or cost of the job is missing or out of range',
  message: (p) => `${p.name} is "${p.value}"; expected ${p.expected}`,
  hint: () => 'type a plain number (a dot for decimals, no thousands separator or currency sign) inside the range given',
});

export const ScheduleShiftInvalid = defineError<{ value: string; problem: string }>({
  code: 'ScheduleShiftInvalid',
  title: 'A shift is not a span of local clock time',
  message: (p) => `shift "${p.value}": ${p.problem}`,
  hint: () =>
    'write a shift as HH:MM-HH:MM in local time (07:00-17:00; 22:00-06:00 ends the next morning); several shifts of one day must not overlap and together last at most 24 hours',
});

export const ScheduleDaysInvalid = defineError<{ value: string; problem: string }>({
  code: 'ScheduleDaysInvalid',
  title: 'The work days are not a list or range of weekdays',
  message: (p) => `days "${p.value}": ${p.problem}`,
  hint: () => 'give weekdays as mon, tue, wed, thu, fri, sat, sun: a range (mon-sat), a list (mon,wed,fri) or both (mon-thu,sat)',
});

export const ScheduleHolidayInvalid = defineError<{ line: number; value: string; problem: string }>({
  code: 'ScheduleHolidayInvalid',
  title: 'A line of the holiday list is not a date',
  message: (p) => `line ${p.line}, "${p.value}": ${p.problem}`,
  hint: () =>
    'list one non-working date per line as YYYY-MM-DD; text after the date (a name) is allowed after a comma or a space; lines starting with # are comments',
});

export const ScheduleTooManyPatterns = defineError<{ count: number; max: number }>({
  code: 'ScheduleTooManyPatterns',
  title: 'Too many shift patterns to compare',
  message: (p) => `${p.count} shift patterns given; at most ${p.max} are compared side by side`,
  hint: () => 'compare at most four patterns at a time (the job’s own pattern and three others)',
});

export const ScheduleNoWeatherYears = defineError<{ problem: string }>({
  code: 'ScheduleNoWeatherYears',
  title: 'No year of the record can be replayed',
  message: (p) => p.problem,
  hint: () => 'the atlas must hold at least one year with every month complete (at most 240 missing hours each); rebuild it with complete input years',
});

export const ScheduleNotFinished = defineError<{ maxYears: number; detail: string }>({
  code: 'ScheduleNotFinished',
  title: 'The job does not finish within the replay horizon',
  message: (p) => `the work is not done ${p.maxYears} years after the start (${p.detail})`,
  hint: () =>
    'check the quantity of work (crew-hours), the crew size, the shift and the work days; heat may also take every hour of the chosen shift: try cooler hours or rest in the shade',
});

export const ScheduleDeadlineUnreachable = defineError<{ deadline: string; problem: string }>({
  code: 'ScheduleDeadlineUnreachable',
  title: 'No crew size meets the deadline',
  message: (p) => `deadline ${p.deadline}: ${p.problem}`,
  hint: () => 'move the deadline later or the start earlier, add work days or shift hours, or split the job; the crew size searched is at most 100,000 workers',
});

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
  hint: () =>
    'give the first and last month of the project as YYYY-MM (e.g. 2027-04 to 2028-03), last not before first, at most 20 years; or leave both empty for one year',
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

export const EstimateAtlasNotFound = defineError<{ dir: string; missing: string }>({
  code: 'EstimateAtlasNotFound',
  title: 'The folder is not a built atlas with calculator data',
  message: (p) => `${p.dir}: no ${p.missing}`,
  hint: () =>
    'give --atlas the output folder of `heathours build` (the one holding data/manifest.json and data/calculator/index.json, e.g. dist) or its data/ folder',
});

export const EstimateAtlasInvalid = defineError<{ path: string; problems: string[] }>({
  code: 'EstimateAtlasInvalid',
  title: 'A file of the atlas is not what the estimate expects',
  message: (p) => `${p.path}: ${p.problems.join('; ')}`,
  hint: () => 'the atlas folder is damaged or from another version: rebuild it with `heathours build`, and publish data/ from one build only',
});

export const EstimateScenarioUnknown = defineError<{ value: string; known: string[] }>({
  code: 'EstimateScenarioUnknown',
  title: 'A scenario asked for is not one of the atlas',
  message: (p) => `scenario "${p.value}" is not published by this atlas${p.known.length === 0 ? ' (it has no scenarios)' : ''}`,
  hint: (p) =>
    p.known.length === 0
      ? 'leave the scenario out: this atlas was built without scenarios (the configuration\u2019s `scenarios:` list)'
      : `use one of: ${p.known.join(', ')}, or \`all\` for every one (scenarios are what-ifs, not forecasts)`,
});

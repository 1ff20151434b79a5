/**
 * The data dictionary (`data/data-dictionary.csv`): what every column and every code of the
 * published tables means, so a region table (`data/regions/<region-id>.csv`) or a cell table
 * (`data/cell-tables/rows-<first>-<last>.csv`) can be read without the manifest: a label, the unit and the unit in
 * words ("hours per worker per month or year"). The tables keep their columns and codes; this
 * file sits beside them. The site's labels of figures, statistics, acclimatization and exposure
 * come from here too, so a page and the dictionary say the same. Pure: settings in, rows out; the
 * CSV goes through the one writer (csv.ts).
 *
 * Columns of the dictionary: `table` (the file the row describes, `every table` for a code that
 * means the same wherever its column appears), `column`, `code` (empty for the column itself),
 * `label`, `unit` (as the tables write it), `unit_in_words`, `description`.
 */
import { csvLine } from '../formats/csv.ts';
import { REGION_TABLE_COLUMNS, trendUnit } from './region-table.ts';
import { CELL_TABLE_COLUMNS } from './cell-table.ts';
import { baselineYearCount, p90Description, p90Label } from './baseline-length.ts';

/** Where the dictionary is published, below the site root. */
export const DATA_DICTIONARY_PATH = 'data/data-dictionary.csv';

export const DATA_DICTIONARY_COLUMNS = ['table', 'column', 'code', 'label', 'unit', 'unit_in_words', 'description'] as const;

export type DictionaryRow = Record<(typeof DATA_DICTIONARY_COLUMNS)[number], string>;

const REGION_TABLE = 'regions/<region-id>.csv';
const CELL_TABLE = 'cell-tables/rows-<first>-<last>.csv';
const EVERY = 'every table';

/** Our words for a published figure: a short label, and its unit in words for a month (or year) value. */
export interface FigureWords {
  label: string;
  /** E.g. "hours per worker". */
  unitWords: string;
  /** How the `year` row is made from the months. */
  year: string;
}

/** The figures the pipeline publishes (pipeline/run/figures.ts), in our words. */
export const FIGURE_WORDS: Readonly<Record<string, FigureWords>> = {
  'hours-above-limit-shift': { label: 'Shift hours above the limit', unitWords: 'shift hours', year: 'sum of the months' },
  'hours-above-limit-all': { label: 'Hours above the limit, day and night', unitWords: 'hours', year: 'sum of the months' },
  'hours-lost-shift': { label: 'Shift hours lost to rest breaks, per worker', unitWords: 'hours per worker', year: 'sum of the months' },
  'capacity-loss-shift': { label: 'Work capacity lost (loss functions), per worker', unitWords: 'hours per worker', year: 'sum of the months' },
  'wbgt-mean': { label: 'Mean hourly WBGT', unitWords: 'degrees Celsius (WBGT)', year: 'mean of all hours of the year' },
  'wbgt-max': { label: 'Highest hourly WBGT', unitWords: 'degrees Celsius (WBGT)', year: 'highest of the year' },
  'air-temperature-mean': { label: 'Mean air temperature', unitWords: 'degrees Celsius', year: 'mean of all hours of the year' },
  // The workforce figures (config `workforce`, pipeline/regions/person-hours.ts).
  'person-hours-above-limit-shift': {
    label: "Shift person-hours above the limit, over the region's outdoor workers",
    unitWords: 'person-hours',
    year: 'sum of the months',
  },
  'person-hours-lost-shift': {
    label: "Shift person-hours lost to rest breaks, over the region's outdoor workers",
    unitWords: 'person-hours',
    year: 'sum of the months',
  },
  'full-time-equivalents-lost': {
    label: 'Full-time equivalents lost (person-hours lost / a year of the shift pattern)',
    unitWords: 'full-time equivalents',
    year: 'sum of the months',
  },
  'outdoor-work-time-lost': {
    label: "Share of the outdoor workers' shift time lost to rest breaks",
    unitWords: 'percent of the shift hours',
    year: "person-hours lost of the year over the year's shift hours of the outdoor workers",
  },
  'person-hours-lost-density': {
    label: 'Shift person-hours lost per km² of the grid cell',
    unitWords: 'person-hours per square kilometre',
    year: 'sum of the months',
  },
};

/** Codes of the workforce rows: the class column's `all`, the acclimatization and exposure columns' `by-shares`. */
const WORKFORCE_FIGURE_IDS = new Set([
  'person-hours-above-limit-shift',
  'person-hours-lost-shift',
  'full-time-equivalents-lost',
  'outdoor-work-time-lost',
  'person-hours-lost-density',
]);

/** A figure's label, or its id when it is not one of {@link FIGURE_WORDS}. */
export function figureWords(figure: string): FigureWords {
  return FIGURE_WORDS[figure] ?? { label: figure, unitWords: 'see the unit column', year: 'see the manifest' };
}

/**
 * The unit of a figure's value in words for a period: "hours per worker per month",
 * "shift hours per year", "degrees Celsius (WBGT)" (temperatures are not per period).
 */
export function valueUnitWords(figure: string, units: string, period: 'month' | 'year' | 'month or year'): string {
  const w = figureWords(figure).unitWords;
  return units === 'h' ? `${w} per ${period}` : w;
}

/** Units as the tables write them, in words. */
export const UNIT_WORDS: Readonly<Record<string, string>> = { h: 'hours', degC: 'degrees Celsius', '1': 'a fraction or a class code, no unit' };

/** Units of the workforce figures, in words (listed only when a figure has them). */
const WORKFORCE_UNIT_WORDS: Readonly<Record<string, string>> = {
  'person-h': 'person-hours (hours summed over people)',
  'person-h km-2': 'person-hours per square kilometre',
  FTE: 'full-time equivalents (one: the hours of a year of the shift pattern)',
  '%': 'percent',
};

export const ACCLIMATIZATION_WORDS: Readonly<Record<string, string>> = {
  acclimatized: 'Acclimatized workers (the higher limit, for workers used to the heat)',
  unacclimatized: 'Not acclimatized (the lower limit, for new or returning workers)',
};

export const EXPOSURE_WORDS: Readonly<Record<string, string>> = {
  sun: 'Working in the sun',
  shade: 'Working in the shade (the same weather without direct or diffuse sun)',
  shelter: 'Working under a shelter (a roof or canopy, the shelter a black surface at the air temperature, after Lemke & Kjellstrom 2012)',
};

export interface DictionaryInput {
  /** Published figures (id, the pipeline's label, units). */
  figures: ReadonlyArray<{ id: string; label: string; units: string }>;
  /** Workload classes of the build. */
  classes: ReadonlyArray<{ id: string; name: string; metabolicRate: number; description?: string }>;
  acclimatization: readonly string[];
  exposures: readonly string[];
  /** Loss functions of the capacity-loss figure (pipeline/reduce/layout.ts LOSS_VIEWS). */
  lossViews: ReadonlyArray<{ id: string; label: string }>;
  /** Statistic → the rule as the manifest states it. */
  statistics: Readonly<Record<string, string>>;
  baseline: readonly [number, number];
  latestYear: number;
  /** Years built, first–last (the `baseline` code of the trend rows); omitted: as the baseline. */
  years?: readonly [number, number];
}

const MONTHS = ['January', 'February', 'March', 'April', 'May', 'June', 'July', 'August', 'September', 'October', 'November', 'December'];

const row = (table: string, column: string, code: string, label: string, unit = '', unitInWords = '', description = ''): DictionaryRow => ({
  table,
  column,
  code,
  label,
  unit,
  unit_in_words: unitInWords,
  description,
});

/** A statistic's short label, with the number of baseline years `n` where it matters. */
export function statisticShortLabel(statistic: string, n: number): string {
  switch (statistic) {
    case 'mean':
      return `Baseline mean (${n} ${n === 1 ? 'year' : 'years'})`;
    case 'median':
      return `Baseline median (${n} ${n === 1 ? 'year' : 'years'})`;
    case 'p90':
      return p90Label(n);
    case 'min':
      return 'Lowest baseline year';
    case 'max':
      return 'Highest baseline year';
    case 'latest':
      return 'Latest year';
    case 'worst-cell-mean':
      return 'Highest cell mean';
    case 'trend':
      return 'Trend per decade';
    case 'trend-p':
      return 'p-value of the trend';
    default:
      return statistic;
  }
}

/** The statistic in a sentence, honest about the baseline's length for the P90. */
export function statisticWords(statistic: string, baseline: readonly [number, number], latestYear: number): string {
  const n = baselineYearCount(baseline);
  switch (statistic) {
    case 'mean':
      return `Mean of the baseline years ${baseline[0]}–${baseline[1]} (${n} years)`;
    case 'median':
      return `Median of the baseline years ${baseline[0]}–${baseline[1]} (${n} years)`;
    case 'p90':
      return p90Description(n, baseline);
    case 'min':
      return 'Lowest baseline year';
    case 'max':
      return 'Highest baseline year';
    case 'latest':
      return `The latest year built (${latestYear}), for comparison with the baseline`;
    case 'worst-cell-mean':
      return 'Highest baseline mean of any grid cell of the region';
    case 'trend':
      return 'How fast the annual value changed over the years built, per decade (whole year only; a trend of the past record, not a projection)';
    case 'trend-p':
      return 'How likely a trend at least this steady would be by chance if there were none (whole year only; small: a steady rise or fall)';
    default:
      return statistic;
  }
}

/** Every row of the dictionary (see the file comment). */
export function dataDictionaryRows(input: DictionaryInput): DictionaryRow[] {
  const [b0, b1] = input.baseline;
  const rows: DictionaryRow[] = [];
  const columnRows: Record<string, [string, string, string]> = {
    region_id: ['Region id', '', 'The region, as in data/regions.geojson (property id); its name is there too'],
    cell_id: ['Grid cell id', '', 'Row-major index of the grid cell: row × number of columns + column, rows from south to north'],
    lat: ['Latitude of the cell centre', '° N', 'degrees north'],
    lon: ['Longitude of the cell centre', '° E', 'degrees east (negative: west)'],
    period: ['Period', '', 'A month of the local calendar (01–12) or the whole year (year); codes below'],
    figure: ['Figure', '', 'What is counted or measured; codes below, each with its unit'],
    workload_class: ['Workload class', '', 'The work rate the limit is for (empty for figures without a class); codes below'],
    acclimatization: ['Acclimatization', '', 'Which limit: acclimatized or not (empty for figures without a class); codes below'],
    exposure: ['Exposure', '', 'Work in the sun or in the shade (empty for air temperature); codes below'],
    method: ['Method', '', 'limit: hours from the WBGT screening limit; otherwise the loss function of the capacity-loss figure; codes below'],
    statistic: ['Statistic across years', '', 'How the years are summarised; codes below'],
    value: ['Value', 'see unit', 'The statistic of the figure, in the unit of the row (unit column)'],
    mean: ['Baseline mean', 'see unit', statisticWords('mean', input.baseline, input.latestYear)],
    median: ['Baseline median', 'see unit', statisticWords('median', input.baseline, input.latestYear)],
    p90: ['90th-percentile year', 'see unit', statisticWords('p90', input.baseline, input.latestYear)],
    unit: ['Unit of the value', '', 'h or degC; codes below'],
    years_used: [
      'Years used',
      'years',
      'Baseline years that counted for this row (a year with more than 240 missing hours in the period does not count); 1 for the latest year; for trend and trend-p the years built that have a value (a trend needs 15)',
    ],
    baseline: [
      'Years of the statistic',
      '',
      'First–last year of the baseline, the latest year for the statistic latest, or the years built for trend and trend-p',
    ],
  };
  for (const c of REGION_TABLE_COLUMNS) {
    const [label, unit, d] = columnRows[c];
    rows.push(row(REGION_TABLE, c, '', label, unit, unit === 'see unit' ? 'as the unit column says' : unit === 'years' ? 'years' : '', d));
  }
  for (const c of CELL_TABLE_COLUMNS) {
    const [label, unit, d] = columnRows[c];
    rows.push(
      row(
        CELL_TABLE,
        c,
        '',
        label,
        unit,
        unit === 'see unit' ? 'as the unit column says' : unit === 'years' ? 'years' : unit === '° N' ? 'degrees north' : unit === '° E' ? 'degrees east' : '',
        d,
      ),
    );
  }
  MONTHS.forEach((m, i) =>
    rows.push(row(EVERY, 'period', String(i + 1).padStart(2, '0'), m, '', '', `The local calendar month (time zone of the atlas); hour figures per month`)),
  );
  rows.push(
    row(EVERY, 'period', 'year', 'Whole year', '', '', 'The local calendar year: hour figures summed over the months, temperatures as the figure says'),
  );
  for (const f of input.figures) {
    const w = figureWords(f.id);
    rows.push(row(EVERY, 'figure', f.id, w.label, f.units, valueUnitWords(f.id, f.units, 'month or year'), `${f.label}; the year row: ${w.year}`));
  }
  for (const c of input.classes) {
    rows.push(row(EVERY, 'workload_class', c.id, `${c.name} (${c.metabolicRate} W)`, 'W', 'watts of metabolic rate while working', c.description ?? ''));
  }
  const workforce = input.figures.some((f) => WORKFORCE_FIGURE_IDS.has(f.id));
  if (workforce)
    rows.push(
      row(
        EVERY,
        'workload_class',
        'all',
        'All outdoor work',
        '',
        '',
        "Every workload class together, each by its share of the region's people (workforce figures only)",
      ),
    );
  for (const a of input.acclimatization) rows.push(row(EVERY, 'acclimatization', a, ACCLIMATIZATION_WORDS[a] ?? a));
  for (const e of input.exposures) rows.push(row(EVERY, 'exposure', e, EXPOSURE_WORDS[e] ?? e));
  if (workforce) {
    const mixed = 'Mixed as the workforce shares say (acclimatized share, share in the sun; workforce figures only)';
    rows.push(row(EVERY, 'acclimatization', 'by-shares', 'Acclimatized and not, by the shares', '', '', mixed));
    rows.push(row(EVERY, 'exposure', 'by-shares', 'Sun and shade, by the shares', '', '', mixed));
  }
  rows.push(
    row(
      EVERY,
      'method',
      'limit',
      'WBGT screening limit of the workload class',
      '',
      '',
      'Hours above the limit and hours lost to the rest breaks the limit requires',
    ),
  );
  for (const v of input.lossViews)
    rows.push(row(EVERY, 'method', v.id, v.label, '', '', 'A loss function of work capacity against WBGT (capacity-loss figure only)'));
  const n = baselineYearCount(input.baseline);
  for (const s of Object.keys(input.statistics)) {
    // The P90 sentence is ours (it depends on the baseline's length); the others add the manifest's rule.
    const words = statisticWords(s, input.baseline, input.latestYear);
    rows.push(row(EVERY, 'statistic', s, statisticShortLabel(s, n), '', '', s === 'p90' ? words : `${words}: ${input.statistics[s]}`));
  }
  for (const [u, words] of Object.entries(UNIT_WORDS)) {
    if (u === '1' && !input.figures.some((f) => f.units === '1')) continue;
    rows.push(row(EVERY, 'unit', u, words, u, words));
  }
  for (const [u, words] of Object.entries(WORKFORCE_UNIT_WORDS)) {
    if (input.figures.some((f) => f.units === u)) rows.push(row(EVERY, 'unit', u, words, u, words));
  }
  // The trend rows of the region tables: each figure's unit per decade, and the p-value's 1.
  for (const u of [...new Set(input.figures.map((f) => f.units))]) {
    const words = `${UNIT_WORDS[u] ?? u} per decade`;
    rows.push(row(REGION_TABLE, 'unit', trendUnit(u), words, trendUnit(u), words, 'The statistic trend'));
  }
  if (!input.figures.some((f) => f.units === '1'))
    rows.push(row(REGION_TABLE, 'unit', '1', 'dimensionless', '1', 'a number without unit', 'The statistic trend-p (a probability, 0–1)'));
  rows.push(
    row(
      REGION_TABLE,
      'baseline',
      `${b0}-${b1}`,
      `The baseline ${b0}–${b1}`,
      '',
      '',
      `${baselineYearCount(input.baseline)} years; the statistics mean, median, p90, min, max and worst-cell-mean${(input.years ?? input.baseline)[0] === b0 && (input.years ?? input.baseline)[1] === b1 ? ', and trend and trend-p (the years built)' : ''}`,
    ),
  );
  rows.push(row(REGION_TABLE, 'baseline', String(input.latestYear), `The latest year ${input.latestYear}`, '', '', 'The statistic latest'));
  const built = input.years ?? input.baseline;
  if (built[0] !== b0 || built[1] !== b1)
    rows.push(row(REGION_TABLE, 'baseline', `${built[0]}-${built[1]}`, `The years built ${built[0]}–${built[1]}`, '', '', 'The statistics trend and trend-p'));
  return rows;
}

/**
 * The dictionary as CSV text (small: its size depends on the settings, not on the grid or the
 * regions), starting with a UTF-8 byte-order mark so spreadsheets read its °, – and × as UTF-8.
 */
export function dataDictionaryCsv(input: DictionaryInput): string {
  let out = '\ufeff' + csvLine([...DATA_DICTIONARY_COLUMNS]);
  for (const r of dataDictionaryRows(input)) out += csvLine(DATA_DICTIONARY_COLUMNS.map((c) => r[c]));
  return out;
}

/**
 * The workforce views of the region report and the home page (config `workforce`, issue 17):
 * person-hours with WBGT above the limit and person-hours lost [person-h], full-time equivalents
 * lost [FTE] and the share of the outdoor workers' shift time lost [%], each as the baseline mean
 * and the 90th-percentile year, read straight from the region's table (the pipeline's figures,
 * pipeline/regions/person-hours.ts; docs/methods.md for the hours per worker). Nothing is
 * recomputed here. And the one line that names the people raster (name, year, licence, invented)
 * wherever a figure made from it is shown. Pure.
 */
import { MONTH_PERIODS, YEAR_PERIOD, type RegionFigures } from './region-figures.ts';
import { periodName } from './months.ts';

export const FIGURE_PERSON_HOURS_ABOVE = 'person-hours-above-limit-shift';
export const FIGURE_PERSON_HOURS_LOST = 'person-hours-lost-shift';
export const FIGURE_FTE_LOST = 'full-time-equivalents-lost';
export const FIGURE_WORK_TIME_LOST = 'outdoor-work-time-lost';
/** The figures of the workforce views, in table order. */
export const WORKFORCE_FIGURES = [FIGURE_PERSON_HOURS_ABOVE, FIGURE_PERSON_HOURS_LOST, FIGURE_FTE_LOST, FIGURE_WORK_TIME_LOST] as const;
/** The combination of every class by its share (pipeline/regions/person-hours.ts `ALL_CLASSES`). */
export const ALL_CLASSES = 'all';
/** The acclimatization and exposure columns of workforce rows: mixed as the shares say. */
export const BY_SHARES = 'by-shares';

/** What names a people raster: the config's name, year and licence, and whether it is invented. */
export interface WorkforceSourceInfo {
  name: string;
  year: number;
  licence: string;
  invented: boolean;
}

/** The source line shown beside every workforce figure, e.g. "People: X (2020); licence: CC BY 4.0." */
export function workforceSourceLine(src: WorkforceSourceInfo): string {
  return `People: ${src.name} (${src.year})${src.invented ? ', INVENTED data' : ''}; licence: ${src.licence}.`;
}

/** One value column of a workforce table. */
export interface WorkforceColumn {
  /** Stable key, e.g. `lost-p90` (the header's `data-key`). */
  key: string;
  figure: (typeof WORKFORCE_FIGURES)[number];
  statistic: 'mean' | 'p90';
  /** Short head without the unit, e.g. "Person-hours lost, mean". */
  head: string;
  /** Unit as shown: `person-h`, `FTE`, `%`. */
  unit: string;
  /** Decimals shown (the data-value holds the table's value). */
  digits: number;
}

const FIGURES = [
  { id: FIGURE_PERSON_HOURS_ABOVE, short: 'above', words: 'Person-hours above the limit', unit: 'person-h', digits: 0 },
  { id: FIGURE_PERSON_HOURS_LOST, short: 'lost', words: 'Person-hours lost', unit: 'person-h', digits: 0 },
  { id: FIGURE_FTE_LOST, short: 'fte', words: 'Full-time equivalents lost', unit: 'FTE', digits: 1 },
  { id: FIGURE_WORK_TIME_LOST, short: 'share', words: 'Share of outdoor work time lost', unit: '%', digits: 2 },
] as const;

/** The columns: each figure as mean and as the P90 year (`p90Head` words the P90, e.g. "P90 of 4 years"). */
export function workforceColumns(p90Head: string): WorkforceColumn[] {
  return FIGURES.flatMap((f) =>
    (['mean', 'p90'] as const).map((s) => ({
      key: `${f.short}-${s}`,
      figure: f.id,
      statistic: s,
      head: `${f.words}, ${s === 'mean' ? 'mean' : p90Head}`,
      unit: f.unit,
      digits: f.digits,
    })),
  );
}

export interface WorkforceRow {
  /** Row key: a class id or `all` (by class), or a period `01`–`12` / `year` (by month). */
  key: string;
  name: string;
  /** One value per column, in the columns' units; NaN = no value. */
  values: number[];
}

function workforceValue(fig: RegionFigures, c: WorkforceColumn, period: string, combo: string): number {
  return fig.get({ figure: c.figure, period, workloadClass: combo, acclimatization: BY_SHARES, exposure: BY_SHARES, statistic: c.statistic });
}

/** Whether the region's table holds the workforce figures. */
export function hasWorkforceFigures(fig: RegionFigures): boolean {
  return fig.has({
    figure: FIGURE_PERSON_HOURS_LOST,
    period: YEAR_PERIOD,
    workloadClass: ALL_CLASSES,
    acclimatization: BY_SHARES,
    exposure: BY_SHARES,
    statistic: 'mean',
  });
}

/** The whole year per workload class, then all classes together. */
export function workforceByClass(
  fig: RegionFigures,
  classes: ReadonlyArray<{ id: string; name: string }>,
  columns: readonly WorkforceColumn[],
): WorkforceRow[] {
  return [...classes.map((c) => ({ key: c.id, name: c.name })), { key: ALL_CLASSES, name: 'All outdoor work' }].map((r) => ({
    ...r,
    values: columns.map((c) => workforceValue(fig, c, YEAR_PERIOD, r.key)),
  }));
}

/** The twelve months and the whole year for one class id or `all`. */
export function workforceByMonth(fig: RegionFigures, combo: string, columns: readonly WorkforceColumn[]): WorkforceRow[] {
  return [...MONTH_PERIODS, YEAR_PERIOD].map((period) => ({
    key: period,
    name: periodName(period),
    values: columns.map((c) => workforceValue(fig, c, period, combo)),
  }));
}

/** A column of the home page's workforce ranking (src/components/report/RankingTable.astro). */
export interface WorkforceRankingColumn {
  /** `people`, `outdoor-workers` or `figure.statistic` of all outdoor work. */
  key: string;
  label: string;
  group: string;
  short: string;
  unit: string;
  digits: number;
}

/**
 * The workforce ranking's columns: the people, then each figure of all outdoor work as mean and P90
 * year. The P90 head is short ("P90", so the ten columns fit a laptop's width); its label (the
 * select's option and the head's title) and the table's caption carry `p90Head`.
 */
export function workforceRankingColumns(p90Head: string): WorkforceRankingColumn[] {
  const people: WorkforceRankingColumn[] = [
    { key: 'people', label: 'People in the region', group: 'People', short: 'in the region', unit: 'people', digits: 0 },
    { key: 'outdoor-workers', label: 'People in outdoor work', group: 'People', short: 'in outdoor work', unit: 'people', digits: 0 },
  ];
  return [
    ...people,
    ...workforceColumns(p90Head).map((c) => {
      const group = c.head.slice(0, c.head.lastIndexOf(', '));
      const short = c.statistic === 'mean' ? 'mean' : 'P90';
      return {
        key: `${c.figure}.${c.statistic}`,
        label: `${group}, ${c.statistic === 'mean' ? 'mean' : p90Head}`,
        group,
        short,
        unit: c.unit,
        digits: c.digits,
      };
    }),
  ];
}

/** The key the workforce ranking is ranked by without JavaScript: person-hours lost, mean. */
export const WORKFORCE_RANKING_DEFAULT = `${FIGURE_PERSON_HOURS_LOST}.mean`;

/**
 * Looking up values in a region's tidy table (src/data/region-table.ts) by what they mean: figure,
 * period, workload class, acclimatization, exposure and statistic. Pure.
 */
import type { RegionTableRow } from '../../data/region-row.ts';

/** The figures the report shows (ids as in the manifest and the table's `figure` column). */
export const FIGURE_HOURS_ABOVE = 'hours-above-limit-shift';
export const FIGURE_HOURS_LOST = 'hours-lost-shift';
export const FIGURE_AIR_TEMPERATURE = 'air-temperature-mean';

/** The twelve month periods of the table, then the year. */
export const MONTH_PERIODS = ['01', '02', '03', '04', '05', '06', '07', '08', '09', '10', '11', '12'] as const;
export const YEAR_PERIOD = 'year';

/** What one value is. Empty strings for columns a figure does not use (e.g. air temperature). */
export interface FigureKey {
  figure: string;
  period: string;
  workloadClass?: string;
  acclimatization?: string;
  exposure?: string;
  statistic: string;
}

function keyOf(k: FigureKey): string {
  return `${k.figure}|${k.period}|${k.workloadClass ?? ''}|${k.acclimatization ?? ''}|${k.exposure ?? ''}|${k.statistic}`;
}

/** A region's table indexed for lookups. */
export interface RegionFigures {
  /** The value [h or °C], NaN when the table has no such row or an empty value. */
  get(k: FigureKey): number;
  /** Whether the table has a row for `k`. */
  has(k: FigureKey): boolean;
}

/** Whether a row of method `method` is a figure here: the `limit` method and blank methods. */
export function isFigureMethod(method: string): boolean {
  return method === 'limit' || method === '';
}

/**
 * The figures of one region's table grouped as the site's digest stores them (src/data/site-digest.ts):
 * one group per period, figure and statistic, holding `workloadClass|acclimatization|exposure`
 * → value [h or °C] (NaN for an empty value). A later row of the same key replaces an earlier one, as in {@link indexRegionTable}.
 */
export type FigureGroups = Map<string, Map<string, number>>;

/** Key of a group of {@link FigureGroups}. */
export function figureGroupKey(figure: string, period: string, statistic: string): string {
  return `${figure}|${period}|${statistic}`;
}

/** Key of a value inside a group of {@link FigureGroups}. */
export function figureMemberKey(workloadClass = '', acclimatization = '', exposure = ''): string {
  return `${workloadClass}|${acclimatization}|${exposure}`;
}

/** {@link RegionFigures} over figures already grouped: the same values as {@link indexRegionTable} of the same rows. */
export function groupedRegionFigures(groups: FigureGroups): RegionFigures {
  const group = (k: FigureKey) => groups.get(figureGroupKey(k.figure, k.period, k.statistic));
  return {
    get: (k) => group(k)?.get(figureMemberKey(k.workloadClass, k.acclimatization, k.exposure)) ?? NaN,
    has: (k) => group(k)?.has(figureMemberKey(k.workloadClass, k.acclimatization, k.exposure)) ?? false,
  };
}

/** What a row of a region's table is, as a key of {@link RegionFigures}. */
export function figureKeyOf(r: RegionTableRow): FigureKey {
  return {
    figure: r.figure,
    period: r.period,
    workloadClass: r.workloadClass,
    acclimatization: r.acclimatization,
    exposure: r.exposure,
    statistic: r.statistic,
  };
}

/** Indexes the rows of one region's table. Only the `limit` method and blank methods are figures here. */
export function indexRegionTable(rows: readonly RegionTableRow[]): RegionFigures {
  const map = new Map<string, number>();
  for (const r of rows) {
    if (!isFigureMethod(r.method)) continue;
    map.set(keyOf(figureKeyOf(r)), r.value);
  }
  return {
    get: (k) => map.get(keyOf(k)) ?? NaN,
    has: (k) => map.has(keyOf(k)),
  };
}

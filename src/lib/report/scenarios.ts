/**
 * The region report's scenario comparison: the record's baseline and each scenario side by side
 * for the worst months and the whole year (shift hours lost per worker, baseline mean, one
 * workload class, acclimatization and exposure). Pure: indexed tables in, a table model out.
 */
import { FIGURE_HOURS_ABOVE, FIGURE_HOURS_LOST, YEAR_PERIOD, type RegionFigures } from './region-figures.ts';
import { worstMonths } from './monthly.ts';

/** One scenario as the report shows it (from the manifest) with its indexed table. */
export interface ReportScenario {
  id: string;
  name: string;
  /** `uniform warming` or `change factors`. */
  kind: string;
  what: string;
  source: string;
  figures: RegionFigures;
}

export interface ScenarioComparisonRow {
  /** `01`–`12` or `year`. */
  period: string;
  name: string;
  /** Shift hours lost per worker [h]: the baseline first, then each scenario; NaN without a value. */
  lost: number[];
  /** Shift hours with WBGT above the limit per worker [h], same order. */
  above: number[];
}

export interface ScenarioComparison {
  /** `baseline`, then the scenario ids. */
  columns: string[];
  rows: ScenarioComparisonRow[];
  /** Whose worst months the rows are: the record's, or (when the record loses no hours) the last scenario's. */
  monthsFrom: 'baseline' | string;
}

/**
 * The comparison table: the (at most three) worst months by mean hours lost in the record, or in
 * the last scenario when the record has none, then the year.
 */
export function scenarioComparison(
  base: RegionFigures,
  scenarios: readonly ReportScenario[],
  workloadClass: string,
  acclimatization: string,
  exposure: string,
): ScenarioComparison {
  let months = worstMonths(base, workloadClass, acclimatization, exposure);
  let monthsFrom = 'baseline';
  if (months.length === 0 && scenarios.length > 0) {
    const last = scenarios[scenarios.length - 1];
    months = worstMonths(last.figures, workloadClass, acclimatization, exposure);
    monthsFrom = last.id;
  }
  const all = [base, ...scenarios.map((s) => s.figures)];
  const value = (f: RegionFigures, figure: string, period: string) => f.get({ figure, period, workloadClass, acclimatization, exposure, statistic: 'mean' });
  const row = (period: string, name: string): ScenarioComparisonRow => ({
    period,
    name,
    lost: all.map((f) => value(f, FIGURE_HOURS_LOST, period)),
    above: all.map((f) => value(f, FIGURE_HOURS_ABOVE, period)),
  });
  return {
    columns: ['baseline', ...scenarios.map((s) => s.id)],
    rows: [...months.sort((a, b) => a.period.localeCompare(b.period)).map((m) => row(m.period, m.name)), row(YEAR_PERIOD, 'Whole year')],
    monthsFrom,
  };
}

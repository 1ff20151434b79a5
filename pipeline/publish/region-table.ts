/**
 * The region table (`data/regions/<region-id>.csv`), tidy: one row per period (month 01–12 or
 * `year`) × figure × workload class × acclimatization × exposure × method × statistic. Values are
 * statistics across years of the region's area-weighted mean; `worst-cell-mean` is the highest
 * baseline mean of any cell of the region. Units are in the `unit` column.
 *
 * The whole year also has {@link TREND_STATISTICS} rows per combination, over every built year with
 * a value (docs/methods.md §10.5): `trend`, the Theil–Sen slope in the figure's unit per decade
 * (`h decade-1`), and `trend-p`, the two-sided Mann–Kendall p-value (unit `1`); `years_used` is
 * the number of years with a value and `baseline` the years built. Both are empty below
 * MIN_TREND_YEARS (15) years with a value.
 */
import type { RegionFigureNormals } from './figure-normals.ts';
import { PERIODS, ANNUAL } from '../reduce/figures.ts';
import { comboColumns } from './combo.ts';
import { csvLine, roundTo } from '../formats/csv.ts';

export const REGION_TABLE_COLUMNS = [
  'region_id',
  'period',
  'figure',
  'workload_class',
  'acclimatization',
  'exposure',
  'method',
  'statistic',
  'value',
  'unit',
  'years_used',
  'baseline',
] as const;

export const STATISTICS = ['mean', 'median', 'p90', 'min', 'max', 'latest', 'worst-cell-mean'] as const;
/** Statistics of the whole year only: the trend of the record and its p-value. */
export const TREND_STATISTICS = ['trend', 'trend-p'] as const;

/** The unit of a trend of a figure in `unit` [unit per decade], e.g. `h decade-1`. */
export const trendUnit = (unit: string): string => `${unit} decade-1`;
/** Significant digits of a p-value (a small p keeps its size: 9.5e-7, not 0). */
const P_SIGNIFICANT = 3;
const pValueText = (p: number): number => (Number.isFinite(p) ? Number(p.toPrecision(P_SIGNIFICANT)) : NaN);

/** Decimals per unit: hours to 0.01 h, temperatures to 0.01 °C, person-hours to 0.1, full-time equivalents to 0.001, shares to 0.001 %. */
const DIGITS: Record<string, number> = { h: 2, degC: 2, 'person-h': 1, 'person-h km-2': 3, FTE: 3, '%': 3 };

export function periodLabel(p: number): string {
  return p === ANNUAL ? 'year' : String(p + 1).padStart(2, '0');
}

/** The table of one region (its figures' normals hold that region alone: items period · nCombo + combo). */
export function regionTableCsv(
  regionId: string,
  figures: readonly RegionFigureNormals[],
  baseline: [number, number],
  latestYear: number,
  built?: readonly [number, number],
): string {
  let out = csvLine(REGION_TABLE_COLUMNS as unknown as string[]);
  const base = `${baseline[0]}-${baseline[1]}`;
  for (let p = 0; p < PERIODS; p++) {
    for (const fn of figures) {
      const def = fn.def;
      const nC = def.combos.length;
      const digits = DIGITS[def.units] ?? 3;
      for (let k = 0; k < nC; k++) {
        const i = p * nC + k;
        const cc = comboColumns(def.id, def.combos[k]);
        const r = fn.region;
        const stats: Record<(typeof STATISTICS)[number], number> = {
          mean: r.mean[i],
          median: r.median[i],
          p90: r.p90[i],
          min: r.min[i],
          max: r.max[i],
          latest: r.latest[i],
          'worst-cell-mean': fn.worstValue[i],
        };
        for (const s of STATISTICS) {
          out += csvLine([
            regionId,
            periodLabel(p),
            def.id,
            cc.workload_class,
            cc.acclimatization,
            cc.exposure,
            cc.method,
            s,
            roundTo(stats[s], digits),
            def.units,
            s === 'latest' ? 1 : r.yearsUsed[i],
            s === 'latest' ? String(latestYear) : base,
          ]);
        }
        const tr = fn.trend;
        if (tr && p === ANNUAL) {
          const span = built ? `${built[0]}-${built[1]}` : base;
          out += csvLine([
            regionId,
            'year',
            def.id,
            cc.workload_class,
            cc.acclimatization,
            cc.exposure,
            cc.method,
            'trend',
            roundTo(tr.slopePerDecade[k], digits),
            trendUnit(def.units),
            tr.years[k],
            span,
          ]);
          out += csvLine([
            regionId,
            'year',
            def.id,
            cc.workload_class,
            cc.acclimatization,
            cc.exposure,
            cc.method,
            'trend-p',
            pValueText(tr.pValue[k]),
            '1',
            tr.years[k],
            span,
          ]);
        }
      }
    }
  }
  return out;
}

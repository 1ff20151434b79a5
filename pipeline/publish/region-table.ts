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
import { csvField, csvLine, roundTo } from '../formats/csv.ts';
import type { FigureDef } from '../reduce/figures.ts';

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

/**
 * The fixed middle of every row of one figure (period, figure, workload class, acclimatization,
 * exposure, method, statistic, each as a CSV field with its comma after): made once per figure
 * and thread, so a region's rows only add their values. Index (period · nCombo + combo) ·
 * (statistics + 2) + statistic; the two after the statistics are `trend` and `trend-p`.
 */
const rowMiddles = new WeakMap<FigureDef, string[]>();

function middlesOf(def: FigureDef): string[] {
  let m = rowMiddles.get(def);
  if (m) return m;
  m = [];
  const stats = [...STATISTICS, ...TREND_STATISTICS];
  for (let p = 0; p < PERIODS; p++)
    for (const combo of def.combos) {
      const cc = comboColumns(def.id, combo);
      const keys = `${csvField(periodLabel(p))},${csvField(def.id)},${csvField(cc.workload_class)},${csvField(cc.acclimatization)},${csvField(cc.exposure)},${csvField(cc.method)},`;
      for (const s of stats) m.push(`${keys}${csvField(s)},`);
    }
  rowMiddles.set(def, m);
  return m;
}

/** Where `latest` is in {@link STATISTICS}: its row says 1 year used, the latest year as baseline. */
const LATEST = STATISTICS.indexOf('latest');

/** A number as a CSV field: empty when not finite (as csvField). */
const num = (v: number): string => (Number.isFinite(v) ? String(v) : '');

/**
 * Receives one row of a region's table: figure `f` of the list, period `p`, combination `k`, and
 * statistic `s` (an index of {@link STATISTICS}, then `trend` and `trend-p`); its value as the
 * table writes it (rounded; NaN written empty) [figure's unit] and its years_used (NaN written
 * empty) [years].
 */
export type RegionRowSink = (f: number, p: number, k: number, s: number, value: number, yearsUsed: number) => void;

/** The rows of a region's table in the table's order (period, figure, combination, statistic), to `sink`. */
export function regionRows(figures: readonly RegionFigureNormals[], sink: RegionRowSink): void {
  const nS = STATISTICS.length;
  for (let p = 0; p < PERIODS; p++) {
    for (let f = 0; f < figures.length; f++) {
      const fn = figures[f];
      const nC = fn.def.combos.length;
      const digits = DIGITS[fn.def.units] ?? 3;
      const r = fn.region;
      const columns = STATISTICS.map((st) => (st === 'worst-cell-mean' ? fn.worstValue : r[st]));
      for (let k = 0; k < nC; k++) {
        const i = p * nC + k;
        for (let s = 0; s < nS; s++) sink(f, p, k, s, roundTo(columns[s][i], digits), s === LATEST ? 1 : r.yearsUsed[i]);
        const tr = fn.trend;
        if (tr && p === ANNUAL) {
          sink(f, p, k, nS, roundTo(tr.slopePerDecade[k], digits), tr.years[k]);
          sink(f, p, k, nS + 1, pValueText(tr.pValue[k]), tr.years[k]);
        }
      }
    }
  }
}

/** The unit column of statistic `s` (as {@link RegionRowSink}) of a figure in `units`. */
export function rowUnit(units: string, s: number): string {
  return s < STATISTICS.length ? units : s === STATISTICS.length ? trendUnit(units) : '1';
}

/** The baseline column of statistic `s` (as {@link RegionRowSink}): the latest year, the years built (trends) or the baseline. */
export function rowBaseline(s: number, baseline: readonly [number, number], latestYear: number, built?: readonly [number, number]): string {
  if (s === LATEST) return String(latestYear);
  if (s >= STATISTICS.length && built) return `${built[0]}-${built[1]}`;
  return `${baseline[0]}-${baseline[1]}`;
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
  const rid = `${csvField(regionId)},`;
  const nS = STATISTICS.length + TREND_STATISTICS.length;
  // Per statistic: the columns after the value (unit, years used, baseline) but the years.
  const ends = Array.from({ length: nS }, (_, s) => `,${csvField(rowBaseline(s, baseline, latestYear, built))}\n`);
  const mids = figures.map((fn) => middlesOf(fn.def));
  const units = figures.map((fn) => Array.from({ length: nS }, (_, s) => `,${csvField(rowUnit(fn.def.units, s))},`));
  regionRows(figures, (f, p, k, s, value, yearsUsed) => {
    out += `${rid}${mids[f][(p * figures[f].def.combos.length + k) * nS + s]}${num(value)}${units[f][s]}${num(yearsUsed)}${ends[s]}`;
  });
  return out;
}

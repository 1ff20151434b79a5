/**
 * A region's table spread across months for spreadsheets: from the tidy rows of
 * `data/regions/<id>.csv` (region-table.ts: one row per period × figure × class ×
 * acclimatization × exposure × method × statistic) to one row per figure × workload class ×
 * acclimatization × exposure × method × statistic with the months (and the year) across, the unit
 * in every month's header. Figures in hours and figures in °C go to separate tables, so each
 * header carries one unit. Pure: the tidy text in, rows out; the CSV and workbook writers are
 * region-spreadsheets.ts.
 */
import { csvLine, splitCsvRecord } from '../formats/csv.ts';
import { REGION_TABLE_COLUMNS, STATISTICS, TREND_STATISTICS, regionRows, rowBaseline, rowUnit } from './region-table.ts';
import type { RegionFigureNormals } from './figure-normals.ts';
import type { FigureDef } from '../reduce/figures.ts';
import { comboColumns } from './combo.ts';

const MONTH_ABBR = ['Jan', 'Feb', 'Mar', 'Apr', 'May', 'Jun', 'Jul', 'Aug', 'Sep', 'Oct', 'Nov', 'Dec'];
const PERIODS = [...MONTH_ABBR.map((_, i) => String(i + 1).padStart(2, '0')), 'year'];

/** Units of the tidy table → words for the header. */
export const UNIT_WORDS: Readonly<Record<string, string>> = {
  h: 'h per worker',
  degC: '°C',
  'person-h': 'person-hours',
  'person-h km-2': 'person-hours per km²',
  FTE: 'full-time equivalents',
  '%': '% of outdoor work time',
};

/** Key columns of a wide row, in order. */
export const WIDE_KEY_COLUMNS = ['figure', 'figure_label', 'workload_class', 'acclimatization', 'exposure', 'method', 'statistic'] as const;

export interface WideTable {
  /** Unit of the tidy table (`h` or `degC`). */
  unit: string;
  header: string[];
  /** Key columns as text, then 13 values (NaN for an empty cell), then years used and baseline. */
  rows: Array<{ keys: string[]; values: number[]; yearsUsed: number; baseline: string }>;
}

/** The header of a wide table of `unit`. */
export function wideHeader(unit: string): string[] {
  const u = UNIT_WORDS[unit] ?? unit;
  return [...WIDE_KEY_COLUMNS, ...MONTH_ABBR.map((m) => `${m} [${u}]`), `Year [${u}]`, 'years_used', 'baseline'];
}

/**
 * The wide tables (one per unit, hours first) of one region's tidy CSV text. `labels` gives each
 * figure id its readable label. Rows keep the tidy table's order of first appearance. Throws a
 * plain Error on a header it does not know (the text comes from region-table.ts, not a user).
 */
export function regionWideTables(tidy: string, labels: ReadonlyMap<string, string>): WideTable[] {
  const lines = tidy.split('\n');
  const head = splitCsvRecord(lines[0]) ?? [];
  const col = (name: string) => {
    const i = head.indexOf(name);
    if (i < 0) throw new Error(`region table has no column ${name}`);
    return i;
  };
  // period, figure, workload_class, acclimatization, exposure, method, statistic, value, unit, years_used, baseline
  const [cPeriod, cFigure, cClass, cAccl, cExp, cMethod, cStat, cValue, cUnit, cYears, cBase] = REGION_TABLE_COLUMNS.slice(1).map(col);
  const tables = new Map<string, WideTable>();
  const index = new Map<string, WideTable['rows'][number]>();
  // The pipeline's own column order (region-table.ts): a row's key is then one slice of its line,
  // from the figure to the statistic, and only the first line of each row is split.
  const ownOrder =
    cPeriod === 1 &&
    cFigure === 2 &&
    cClass === 3 &&
    cAccl === 4 &&
    cExp === 5 &&
    cMethod === 6 &&
    cStat === 7 &&
    cValue === 8 &&
    cUnit === 9 &&
    cYears === 10 &&
    cBase === 11 &&
    head.length === 12;
  for (let l = 1; l < lines.length; l++) {
    const line = lines[l];
    if (line === '') continue;
    if (ownOrder && !line.includes('"')) {
      // Commas 1, 2, 7, 8, 9, 10, 11 (0-based fields: period starts after comma 0, figure after 1, …).
      const k0 = line.indexOf(',');
      const k1 = line.indexOf(',', k0 + 1);
      let k7 = k1;
      for (let i = 2; i <= 7 && k7 >= 0; i++) k7 = line.indexOf(',', k7 + 1);
      const k8 = k7 < 0 ? -1 : line.indexOf(',', k7 + 1);
      const k9 = k8 < 0 ? -1 : line.indexOf(',', k8 + 1);
      const k10 = k9 < 0 ? -1 : line.indexOf(',', k9 + 1);
      if (k0 >= 0 && k1 >= 0 && k10 >= 0 && line.indexOf(',', k10 + 1) < 0) {
        const unit = line.slice(k8 + 1, k9);
        const id = `${unit}|${line.slice(k1 + 1, k7)}`;
        const row = index.get(id);
        if (row) {
          const p = PERIODS.indexOf(line.slice(k0 + 1, k1));
          const value = line.slice(k7 + 1, k8);
          if (p >= 0) row.values[p] = value === '' ? NaN : Number(value);
          const y = Number(line.slice(k9 + 1, k10));
          if (Number.isFinite(y)) row.yearsUsed = Math.min(row.yearsUsed, y);
          continue;
        }
      }
    }
    // The pipeline writes these tables without quotes: split such a line directly (about 3× faster
    // over a region's 5,000 rows); a quoted line goes through the CSV parser.
    const f = line.includes('"') ? splitCsvRecord(line) : line.split(',');
    if (!f) continue;
    const unit = f[cUnit];
    let t = tables.get(unit);
    if (!t) {
      t = { unit, header: wideHeader(unit), rows: [] };
      tables.set(unit, t);
    }
    const keys = [f[cFigure], labels.get(f[cFigure]) ?? f[cFigure], f[cClass], f[cAccl], f[cExp], f[cMethod], f[cStat]];
    // The same key as the slice above: the figure to the statistic as the line has them.
    const id = `${unit}|${[f[cFigure], f[cClass], f[cAccl], f[cExp], f[cMethod], f[cStat]].join(',')}`;
    let row = index.get(id);
    if (!row) {
      row = { keys, values: new Array(PERIODS.length).fill(NaN), yearsUsed: Infinity, baseline: f[cBase] };
      index.set(id, row);
      t.rows.push(row);
    }
    const p = PERIODS.indexOf(f[cPeriod]);
    if (p >= 0) row.values[p] = f[cValue] === '' ? NaN : Number(f[cValue]);
    const y = Number(f[cYears]);
    if (Number.isFinite(y)) row.yearsUsed = Math.min(row.yearsUsed, y);
  }
  for (const t of tables.values()) for (const r of t.rows) if (!Number.isFinite(r.yearsUsed)) r.yearsUsed = NaN;
  return [...tables.values()].sort((a, b) => (a.unit === 'h' ? -1 : b.unit === 'h' ? 1 : a.unit.localeCompare(b.unit)));
}

/**
 * Per figure (and thread): each row's key as {@link regionWideTables} forms it from a table line
 * (unit, then the figure to the statistic), and its key columns, by combination · (statistics + 2)
 * + statistic (region-table.ts `regionRows`).
 */
const figureKeys = new WeakMap<ReadonlyMap<string, string>, WeakMap<FigureDef, Array<{ id: string; keys: string[] }>>>();

function keysOf(def: FigureDef, labels: ReadonlyMap<string, string>): Array<{ id: string; keys: string[] }> {
  let byDef = figureKeys.get(labels);
  if (!byDef) figureKeys.set(labels, (byDef = new WeakMap()));
  let m = byDef.get(def);
  if (m) return m;
  m = [];
  const stats = [...STATISTICS, ...TREND_STATISTICS];
  for (const combo of def.combos) {
    const cc = comboColumns(def.id, combo);
    stats.forEach((st, s) => {
      const cols = [def.id, cc.workload_class, cc.acclimatization, cc.exposure, cc.method, st];
      m!.push({ id: `${rowUnit(def.units, s)}|${cols.join(',')}`, keys: [def.id, labels.get(def.id) ?? def.id, ...cols.slice(1)] });
    });
  }
  byDef.set(def, m);
  return m;
}

/**
 * The wide tables of one region made from its figures, without writing and re-reading its tidy
 * table: the same tables {@link regionWideTables} reads from the text `regionTableCsv` writes of
 * the same figures (the values as the table rounds them, an empty years_used read as 0, as
 * `Number('')` does). Row keys are kept per label map and figure.
 */
export function regionWideTablesOf(
  figures: readonly RegionFigureNormals[],
  labels: ReadonlyMap<string, string>,
  baseline: readonly [number, number],
  latestYear: number,
  built?: readonly [number, number],
): WideTable[] {
  const nS = STATISTICS.length + TREND_STATISTICS.length;
  const tables = new Map<string, WideTable>();
  const index = new Map<string, WideTable['rows'][number]>();
  const keys = figures.map((fn) => keysOf(fn.def, labels));
  const bases = Array.from({ length: nS }, (_, s) => rowBaseline(s, baseline, latestYear, built));
  regionRows(figures, (f, p, k, s, value, yearsUsed) => {
    const key = keys[f][k * nS + s];
    let row = index.get(key.id);
    if (!row) {
      const unit = rowUnit(figures[f].def.units, s);
      let t = tables.get(unit);
      if (!t) {
        t = { unit, header: wideHeader(unit), rows: [] };
        tables.set(unit, t);
      }
      row = { keys: key.keys, values: new Array(PERIODS.length).fill(NaN), yearsUsed: Infinity, baseline: bases[s] };
      index.set(key.id, row);
      t.rows.push(row);
    }
    // As the text reads back: -0 is written 0.
    row.values[p] = Number.isFinite(value) ? value + 0 : NaN;
    row.yearsUsed = Math.min(row.yearsUsed, Number.isFinite(yearsUsed) ? yearsUsed : 0);
  });
  for (const t of tables.values()) for (const r of t.rows) if (!Number.isFinite(r.yearsUsed)) r.yearsUsed = NaN;
  return [...tables.values()].sort((a, b) => (a.unit === 'h' ? -1 : b.unit === 'h' ? 1 : a.unit.localeCompare(b.unit)));
}

/** The wide CSV text of one table (UTF-8 with a byte order mark: the header holds °C). */
export function wideCsv(t: WideTable): string {
  let out = '\uFEFF' + csvLine(t.header);
  for (const r of t.rows) out += csvLine([...r.keys, ...r.values, r.yearsUsed, r.baseline]);
  return out;
}

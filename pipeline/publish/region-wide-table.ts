/**
 * A region's table spread across months for spreadsheets: from the tidy rows of
 * `data/regions/<id>.csv` (region-table.ts: one row per period × figure × class ×
 * acclimatization × exposure × method × statistic) to one row per figure × workload class ×
 * acclimatization × exposure × method × statistic with the months (and the year) across, the unit
 * in every month's header. Figures in hours and figures in °C go to separate tables, so each
 * header carries one unit. Pure: the tidy text in, rows out; the CSV and workbook writers are
 * region-spreadsheets.ts.
 */
import { splitCsvRecord } from '../formats/csv.ts';
import { csvLine } from '../formats/csv.ts';

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
  const [cPeriod, cFigure, cClass, cAccl, cExp, cMethod, cStat, cValue, cUnit, cYears, cBase] = [
    'period', 'figure', 'workload_class', 'acclimatization', 'exposure', 'method', 'statistic', 'value', 'unit', 'years_used', 'baseline',
  ].map(col);
  const tables = new Map<string, WideTable>();
  const index = new Map<string, WideTable['rows'][number]>();
  for (let l = 1; l < lines.length; l++) {
    if (lines[l] === '') continue;
    // The pipeline writes these tables without quotes: split such a line directly (about 3× faster
    // over a region's 5,000 rows); a quoted line goes through the CSV parser.
    const f = lines[l].includes('"') ? splitCsvRecord(lines[l]) : lines[l].split(',');
    if (!f) continue;
    const unit = f[cUnit];
    let t = tables.get(unit);
    if (!t) {
      t = { unit, header: wideHeader(unit), rows: [] };
      tables.set(unit, t);
    }
    const keys = [f[cFigure], labels.get(f[cFigure]) ?? f[cFigure], f[cClass], f[cAccl], f[cExp], f[cMethod], f[cStat]];
    const id = `${unit}|${keys.join('|')}`;
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

/** The wide CSV text of one table (UTF-8 with a byte order mark: the header holds °C). */
export function wideCsv(t: WideTable): string {
  let out = '\uFEFF' + csvLine(t.header);
  for (const r of t.rows) out += csvLine([...r.keys, ...r.values, r.yearsUsed, r.baseline]);
  return out;
}

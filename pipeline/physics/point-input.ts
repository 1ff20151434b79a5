/**
 * The cells of one `heathours point` row (DESIGN.md §4 "point CSV columns") turned into a
 * {@link PointInput}, strictly: a number is a plain decimal (`12`, `-3.5`, `1.2e3`); an empty
 * cell, `NA` or `NaN` is a missing value (the column's default, or a row status); anything else
 * (`12abc`, `0x1F`, `1,5`, `Infinity`, `1e309`) is the catalogued `PointBadValue` naming the row
 * and column, never a silent NaN. `time_utc` is ISO 8601 (RFC 3339 profile, date and time
 * separated by `T` or a space) and is UTC: without a zone it is read as UTC, whatever the
 * machine's time zone; `Z` or a zero offset are accepted; any other offset contradicts the
 * column's name and is the catalogued `PointTimeNotUtc`. Pure.
 */
import { PointBadTime, PointBadValue, PointTimeNotUtc } from './errors.ts';
import type { PointInput } from './point-row.ts';

/** A plain decimal number (no hex, no separators, no `Infinity`). */
const DECIMAL = /^[+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?$/;
/** Words a spreadsheet or a statistics package writes for a missing value. */
const MISSING = /^(?:|na|nan|n\/a)$/i;
/** ISO 8601 date and time: YYYY-MM-DD[T ]hh:mm[:ss[.f]][Z|±hh[:]mm|±hh]. */
const STAMP = /^(\d{4})-(\d{2})-(\d{2})[T ](\d{2}):(\d{2})(?::(\d{2})(?:\.(\d{1,9}))?)?\s*(Z|[+-]\d{2}(?::?\d{2})?)?$/i;

/** Where a cell is, for errors. */
export interface CellPlace {
  path: string;
  /** Line of the record in the file (1-based). */
  row: number;
}

/** A numeric cell [unit of its column], NaN when missing. */
export function parseCellNumber(text: string | undefined, column: string, at: CellPlace): number {
  const t = (text ?? '').trim();
  if (MISSING.test(t)) return NaN;
  if (!DECIMAL.test(t)) throw PointBadValue({ column, value: t, expected: 'a decimal number' }, { file: at.path, row: at.row, key: column });
  const x = Number(t);
  if (!Number.isFinite(x)) throw PointBadValue({ column, value: t, expected: 'a finite decimal number' }, { file: at.path, row: at.row, key: column });
  return x;
}

const pad = (n: number) => String(n).padStart(2, '0');

/** A `time_utc` cell [ms since 1970-01-01 UTC]; NaN when the cell is empty. */
export function parseUtcStamp(text: string | undefined, at: CellPlace): number {
  const t = (text ?? '').trim();
  if (t === '') return NaN;
  const where = { file: at.path, row: at.row, key: 'time_utc' };
  const m = STAMP.exec(t);
  if (!m) throw PointBadTime({ value: t, detail: 'not an ISO 8601 date and time such as 2024-07-15T12:00Z' }, where);
  const [y, mo, d, h, mi] = [1, 2, 3, 4, 5].map((k) => Number(m[k]));
  const s = m[6] === undefined ? 0 : Number(m[6]);
  const frac = m[7] === undefined ? 0 : Number(`0.${m[7]}`);
  const ms = Date.UTC(y, mo - 1, d, h, mi, s) + Math.round(frac * 1000);
  const back = new Date(Date.UTC(y, mo - 1, d, h, mi, s));
  if (mo < 1 || mo > 12 || back.getUTCDate() !== d || back.getUTCMonth() !== mo - 1 || h > 23 || mi > 59 || s > 59) {
    throw PointBadTime({ value: t, detail: `${y}-${pad(mo)}-${pad(d)} ${pad(h)}:${pad(mi)} is not a date and time of the calendar` }, where);
  }
  const zone = m[8];
  if (zone !== undefined && !/^(?:Z|[+-]00(?::?00)?)$/i.test(zone)) throw PointTimeNotUtc({ value: t, offset: zone }, where);
  return ms;
}

/** The cells of one row, by column name (undefined: the column is absent). */
export type RowCells = (column: string) => string | undefined;

/** One row's inputs from its cells (defaults of DESIGN.md §4 for the optional columns). */
export function pointInputFromCells(cell: RowCells, at: CellPlace): PointInput {
  const num = (c: string, dflt: number) => {
    const x = parseCellNumber(cell(c), c, at);
    return Number.isNaN(x) ? dflt : x;
  };
  const flag = (c: string) => {
    const x = num(c, 0);
    if (x !== 0 && x !== 1) throw PointBadValue({ column: c, value: String(cell(c)).trim(), expected: '0 or 1' }, { file: at.path, row: at.row, key: c });
    return x === 1;
  };
  return {
    timeMs: parseUtcStamp(cell('time_utc'), at),
    avgMinutes: num('avg_minutes', 60),
    lat: num('lat', NaN),
    lon: num('lon', NaN),
    ta: num('ta_c', NaN),
    rh: num('rh_pct', NaN),
    td: num('td_c', NaN),
    pressure: num('pressure_hpa', NaN),
    wind: num('wind_ms', NaN),
    windHeight: num('wind_height_m', 10),
    urban: flag('urban'),
    dt: num('dt_c', 0),
    solar: num('solar_wm2', NaN),
    directFraction: num('direct_fraction', NaN),
    cosZenith: num('cos_zenith', NaN),
  };
}

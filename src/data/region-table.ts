/**
 * Typed access to a region's tidy table `data/regions/<region-id>.csv` (written by
 * pipeline/publish/region-table.ts): one row per period (month `01`–`12` or `year`) × figure ×
 * workload class × acclimatization × exposure × method × statistic, the value in the `unit`
 * column's unit ([h] or [°C] as `degC`). An empty value (no data) reads as NaN.
 * Failures are catalogued: SiteDataMissing, SiteDataUnreadable, SiteDataInvalid (file, row, column).
 */
import { existsSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { REGION_TABLE_COLUMNS } from '../../pipeline/publish/region-table.ts';
import { parseCsv } from './csv.ts';
import { siteDataDir } from './data-dir.ts';
import { SiteDataInvalid, SiteDataMissing, SiteDataUnreadable } from './errors.ts';

/** One row of a region table. */
export interface RegionTableRow {
  /** `01`–`12` (month) or `year`. */
  period: string;
  figure: string;
  workloadClass: string;
  acclimatization: string;
  exposure: string;
  method: string;
  statistic: string;
  /** The value in `unit` [h or °C]; NaN when the table has none. */
  value: number;
  /** `h` or `degC`. */
  unit: string;
  /** Years behind the statistic [count]. */
  yearsUsed: number;
  /** `2021-2022` (baseline) or the latest year. */
  baseline: string;
}

const PERIOD = /^(0[1-9]|1[0-2]|year)$/;

/** Path of a region's table inside a data folder. */
export function regionTablePath(dataDir: string, regionId: string): string {
  return join(dataDir, 'data', 'regions', `${regionId}.csv`);
}

/** Web path of a region's table below the site's base (no leading slash). */
export function regionTableHref(regionId: string): string {
  return `data/regions/${regionId}.csv`;
}

/**
 * Parses the text of a region table; `path` names it in errors and `regionId` must match every
 * row's `region_id`.
 */
export function parseRegionTable(text: string, path: string, regionId: string): RegionTableRow[] {
  let rows: string[][];
  try {
    rows = parseCsv(text);
  } catch (e) {
    throw SiteDataUnreadable({ path, detail: (e as Error).message }, { file: path });
  }
  const header = rows[0] ?? [];
  const want = REGION_TABLE_COLUMNS as readonly string[];
  if (header.length !== want.length || header.some((h, i) => h !== want[i])) {
    throw SiteDataInvalid({ path, problems: [`header is "${header.join(',')}", expected "${want.join(',')}"`] }, { file: path, key: 'row 1' });
  }
  const out: RegionTableRow[] = [];
  for (let r = 1; r < rows.length; r++) {
    const f = rows[r];
    const where = `row ${r + 1}`;
    const bad = (column: string, problem: string) => SiteDataInvalid({ path, problems: [`${where}, column ${column}: ${problem}`] }, { file: path, key: `${where}.${column}` });
    if (f.length !== want.length) throw bad('(all)', `${f.length} fields, expected ${want.length}`);
    if (f[0] !== regionId) throw bad('region_id', `"${f[0]}" is not the region "${regionId}" of this file`);
    if (!PERIOD.test(f[1])) throw bad('period', `"${f[1]}" is not 01-12 or year`);
    const value = f[8] === '' ? NaN : Number(f[8]);
    if (f[8] !== '' && !Number.isFinite(value)) throw bad('value', `"${f[8]}" is not a number`);
    const yearsUsed = Number(f[10]);
    if (!Number.isInteger(yearsUsed) || yearsUsed < 0) throw bad('years_used', `"${f[10]}" is not a whole number`);
    out.push({
      period: f[1],
      figure: f[2],
      workloadClass: f[3],
      acclimatization: f[4],
      exposure: f[5],
      method: f[6],
      statistic: f[7],
      value,
      unit: f[9],
      yearsUsed,
      baseline: f[11],
    });
  }
  return out;
}

/** Reads and checks the table of region `regionId` (default data folder: the build's). */
export function loadRegionTable(regionId: string, dataDir: string = siteDataDir()): RegionTableRow[] {
  const path = regionTablePath(dataDir, regionId);
  if (!existsSync(path)) throw SiteDataMissing({ path, what: `table of region "${regionId}" (data/regions/${regionId}.csv)` }, { file: path });
  return parseRegionTable(readFileSync(path, 'utf8'), path, regionId);
}

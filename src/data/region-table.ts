/**
 * Typed access to a region's tidy table `data/regions/<region-id>.csv` (written by
 * pipeline/publish/region-table.ts): one row per period (month `01`–`12` or `year`) × figure ×
 * workload class × acclimatization × exposure × method × statistic, the value in the `unit`
 * column's unit ([h] or [°C] as `degC`). An empty value (no data) reads as NaN.
 * Failures are catalogued: SiteDataMissing, SiteDataUnreadable, SiteDataInvalid (file, row, column).
 */
import { closeSync, existsSync, fstatSync, openSync, readFileSync, readSync } from 'node:fs';
import { join } from 'node:path';
import { REGION_TABLE_COLUMNS } from '../../pipeline/publish/region-table.ts';
import { parseCsv } from './csv.ts';
import { siteDataDir } from './data-dir.ts';
import { SiteDataInvalid, SiteDataMissing, SiteDataUnreadable } from './errors.ts';
import { gatheredRows } from './site-digest.ts';

export type { RegionTableRow, RowFilter } from './region-row.ts';
import type { RegionTableRow, RowFilter } from './region-row.ts';

const PERIOD = /^(0[1-9]|1[0-2]|year)$/;

/** Path of a region's table inside a data folder: the record's, or scenario `scenarioId`'s (data/scenarios/<id>/regions/). */
export function regionTablePath(dataDir: string, regionId: string, scenarioId?: string): string {
  return join(dataDir, 'data', ...(scenarioId ? ['scenarios', scenarioId] : []), 'regions', `${regionId}.csv`);
}

/** Web path of a region's table below the site's base (no leading slash). */
export function regionTableHref(regionId: string): string {
  return `data/regions/${regionId}.csv`;
}

/** Start of field `k` (0-based) of `line`, or −1. */
function fieldStart(line: string, k: number): number {
  let p = 0;
  for (let i = 0; i < k; i++) {
    p = line.indexOf(',', p);
    if (p < 0) return -1;
    p++;
  }
  return p;
}

/**
 * Parses the text of a region table; `path` names it in errors and `regionId` must match every
 * kept row's `region_id`. With `keep`, only the rows it accepts are split and checked (a report
 * page needs about a sixth of the rows; 1,000 pages would otherwise build millions of row objects).
 * Lines are split at commas; a line holding a quote goes through the full RFC 4180 reader.
 */
export function parseRegionTable(text: string, path: string, regionId: string, keep?: RowFilter): RegionTableRow[] {
  const want = REGION_TABLE_COLUMNS as readonly string[];
  let lineEnd = text.indexOf('\n');
  if (lineEnd < 0) lineEnd = text.length;
  const header = text.slice(0, lineEnd).replace(/\r$/, '').split(',');
  if (header.length !== want.length || header.some((h, i) => h !== want[i])) {
    throw SiteDataInvalid({ path, problems: [`header is "${header.join(',')}", expected "${want.join(',')}"`] }, { file: path, key: 'row 1' });
  }
  const out: RegionTableRow[] = [];
  let row = 1;
  let pos = lineEnd + 1;
  while (pos < text.length) {
    let end = text.indexOf('\n', pos);
    if (end < 0) end = text.length;
    let line = text.slice(pos, end);
    row++;
    if (line.endsWith('\r')) line = line.slice(0, -1);
    if (line.includes('"')) {
      // A quoted field may hold a line break: read the rest of the record with the full reader.
      let records: string[][];
      try {
        records = parseCsv(text.slice(pos));
      } catch (e) {
        throw SiteDataUnreadable({ path, detail: `row ${row}: ${(e as Error).message}` }, { file: path });
      }
      // Re-join: simplest and rare (the pipeline never quotes a field of these tables).
      for (const f of records) {
        if (f.length === 1 && f[0] === '') continue;
        const r = checkRow(f, row++, path, regionId, keep);
        if (r) out.push(r);
      }
      return out;
    }
    pos = end + 1;
    if (line === '') continue;
    if (keep) {
      const c1 = line.indexOf(',');
      const c2 = line.indexOf(',', c1 + 1);
      const c3 = line.indexOf(',', c2 + 1);
      const s7 = c3 < 0 ? -1 : fieldStart(line, 7);
      const e7 = s7 < 0 ? -1 : line.indexOf(',', s7);
      // A line too short for the filter is split and reported by checkRow below.
      if (e7 >= 0 && !keep(line.slice(c1 + 1, c2), line.slice(c2 + 1, c3), line.slice(s7, e7))) continue;
    }
    const r = checkRow(line.split(','), row, path, regionId, undefined);
    if (r) out.push(r);
  }
  return out;
}

function checkRow(f: string[], row: number, path: string, regionId: string, keep: RowFilter | undefined): RegionTableRow | undefined {
  const want = REGION_TABLE_COLUMNS as readonly string[];
  const where = `row ${row}`;
  const bad = (column: string, problem: string) =>
    SiteDataInvalid({ path, problems: [`${where}, column ${column}: ${problem}`] }, { file: path, key: `${where}.${column}` });
  if (f.length !== want.length) throw bad('(all)', `${f.length} fields, expected ${want.length}`);
  if (keep && !keep(f[1], f[2], f[7])) return undefined;
  if (f[0] !== regionId) throw bad('region_id', `"${f[0]}" is not the region "${regionId}" of this file`);
  if (!PERIOD.test(f[1])) throw bad('period', `"${f[1]}" is not 01-12 or year`);
  const value = f[8] === '' ? NaN : Number(f[8]);
  if (f[8] !== '' && !Number.isFinite(value)) throw bad('value', `"${f[8]}" is not a number`);
  const yearsUsed = Number(f[10]);
  if (!Number.isInteger(yearsUsed) || yearsUsed < 0) throw bad('years_used', `"${f[10]}" is not a whole number`);
  return {
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
  };
}

/**
 * Reads and checks the table of region `regionId` (default data folder: the build's); `keep` as in
 * {@link parseRegionTable}. A filter marked `withinDigest` is served from the rows the site stage
 * gathered before the build when there are (./site-digest.ts), without reading the table.
 */
export function loadRegionTable(regionId: string, dataDir: string = siteDataDir(), keep?: RowFilter, scenarioId?: string): RegionTableRow[] {
  const gathered = keep && gatheredRows(regionId, keep, scenarioId);
  if (gathered) return gathered;
  const path = regionTablePath(dataDir, regionId, scenarioId);
  const rel = scenarioId ? `data/scenarios/${scenarioId}/regions/${regionId}.csv` : `data/regions/${regionId}.csv`;
  if (!existsSync(path)) throw SiteDataMissing({ path, what: `table of region "${regionId}" (${rel})` }, { file: path });
  return parseRegionTable(readFileSync(path, 'utf8'), path, regionId, keep);
}

/**
 * The `year` rows of a region's table, reading only the end of the file when it can: the
 * pipeline writes the periods in order (months 01–12, then `year`), so the year rows are the last
 * thirteenth of the file. Falls back to the whole file when the tail does not start them.
 * `scenarioId`: the table of that what-if climate (data/scenarios/<id>/regions/).
 */
export function loadRegionYearRows(regionId: string, dataDir: string = siteDataDir(), keep?: RowFilter, scenarioId?: string): RegionTableRow[] {
  const path = regionTablePath(dataDir, regionId, scenarioId);
  const rel = scenarioId ? `data/scenarios/${scenarioId}/regions/${regionId}.csv` : `data/regions/${regionId}.csv`;
  if (!existsSync(path)) throw SiteDataMissing({ path, what: `table of region "${regionId}" (${rel})` }, { file: path });
  const yearOnly: RowFilter = (period, figure, statistic) => period === 'year' && (keep ? keep(period, figure, statistic) : true);
  const gathered = keep && gatheredRows(regionId, keep, scenarioId, true);
  if (gathered) return gathered;
  const fd = openSync(path, 'r');
  let head: string;
  let tail: string;
  try {
    const size = fstatSync(fd).size;
    const headBuf = Buffer.alloc(Math.min(size, 512));
    readSync(fd, headBuf, 0, headBuf.length, 0);
    head = headBuf.toString('utf8');
    const from = Math.max(0, Math.floor(size * 0.8));
    const tailBuf = Buffer.alloc(size - from);
    readSync(fd, tailBuf, 0, tailBuf.length, from);
    tail = tailBuf.toString('utf8');
  } finally {
    closeSync(fd);
  }
  const firstYear = tail.indexOf(`\n${regionId},year,`);
  const headerEnd = head.indexOf('\n');
  // The tail must hold the first year row, with a month row just before it.
  const before = firstYear >= 0 ? tail.lastIndexOf('\n', firstYear - 1) : -1;
  if (headerEnd < 0 || firstYear < 0 || before < 0 || !tail.startsWith(`${regionId},12,`, before + 1)) {
    return parseRegionTable(readFileSync(path, 'utf8'), path, regionId, yearOnly);
  }
  try {
    return parseRegionTable(head.slice(0, headerEnd + 1) + tail.slice(firstYear + 1), path, regionId, yearOnly);
  } catch (e) {
    // Row numbers of the tail are not the file's: read the whole file for an error that names the right row.
    parseRegionTable(readFileSync(path, 'utf8'), path, regionId, yearOnly);
    throw e;
  }
}

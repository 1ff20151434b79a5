/**
 * What the site stage gathers from the region tables before Astro renders a page
 * (pipeline/run/site-digest.ts), so that no page reads a region's whole table and no page reads
 * every region's: a region table is ~0.5 MB of text, read once here instead of by the report,
 * the summary, the home page and the map's values each. In the folder named by
 * `HEATHOURS_SITE_DIGEST_DIR`:
 * - `rows/<table>/<region-id>.json`: the rows of the region's table (`<table>` is `record` or a
 *   scenario's id) that {@link DIGEST_KEEP} accepts, in the table's order, each as
 *   `[period, figure, class, acclimatization, exposure, method, statistic, value|null, unit, years_used, baseline]`;
 * - `year-rows/<table>/<region-id>.json`: the same, only the rows of period `year` (the home page's
 *   annual figures of every region read these, a thirteenth of the rows);
 * - `figures/<table>/<region-id>.json`: the same rows as the report's figures (the `limit` method
 *   and blank methods, src/lib/report/region-figures.ts), grouped by period, figure and statistic,
 *   each group `[figure, period, statistic, ["class|acclimatization|exposure", …], [value|null, …]]`,
 *   so a report indexes a few hundred groups instead of a thousand rows;
 * - `values/index.json` and `values/<n>.f64`: each map layer's value per region, by the folder of
 *   the region tables and the layer's GeoTIFF path: a float64 (this machine's byte order) per
 *   region in the order of regions.geojson, NaN where none.
 * Unset (Astro's dev server, tests of a page's data alone), pages read the tables themselves; both
 * ways give the same rows and values (test/site/site-digest.test.ts).
 */
import { existsSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import {
  FIGURE_HOURS_ABOVE,
  FIGURE_HOURS_LOST,
  figureGroupKey,
  figureMemberKey,
  groupedRegionFigures,
  isFigureMethod,
  type FigureGroups,
  type RegionFigures,
} from '../lib/report/region-figures.ts';
import { WORKFORCE_FIGURES } from '../lib/report/workforce.ts';
import type { ManifestLayer } from './manifest-layers.ts';
import type { RegionTableRow, RowFilter } from './region-row.ts';

/** The environment variable naming the folder of the gathered rows and values. */
export const SITE_DIGEST_ENV = 'HEATHOURS_SITE_DIGEST_DIR';

/** The figures of the rows gathered: those a report shows (the others' values reach the pages as map layers). */
const DIGEST_FIGURES = new Set<string>([FIGURE_HOURS_ABOVE, FIGURE_HOURS_LOST, ...WORKFORCE_FIGURES]);
const DIGEST_STATISTICS = new Set(['mean', 'p90', 'trend', 'trend-p']);

/** The rows gathered: the report's figures and statistics. Every filter served from the gathered rows selects among these. */
export const DIGEST_KEEP: RowFilter = (_period, figure, statistic) => DIGEST_FIGURES.has(figure) && DIGEST_STATISTICS.has(statistic);

const within = new WeakSet<RowFilter>([DIGEST_KEEP]);

/**
 * Marks `keep` as selecting only rows {@link DIGEST_KEEP} accepts, so the gathered rows may serve
 * it; an unmarked filter always reads the table.
 */
export function withinDigest(keep: RowFilter): RowFilter {
  within.add(keep);
  return keep;
}

/** The folder of the gathered rows and values, or undefined when the build has none. */
export function siteDigestDir(): string | undefined {
  return process.env[SITE_DIGEST_ENV] || undefined;
}

/** Folder name of a table's rows: `record`, or the scenario's id. */
export function digestTableName(scenarioId?: string): string {
  return scenarioId ? `scenario-${scenarioId}` : 'record';
}

export type DigestRow = [string, string, string, string, string, string, string, number | null, string, number, string];

/** A gathered row as the table's reader gives it (null value → NaN). */
function rowOf(r: DigestRow): RegionTableRow {
  return {
    period: r[0],
    figure: r[1],
    workloadClass: r[2],
    acclimatization: r[3],
    exposure: r[4],
    method: r[5],
    statistic: r[6],
    value: r[7] === null ? NaN : r[7],
    unit: r[8],
    yearsUsed: r[9],
    baseline: r[10],
  };
}

/** A table row as gathered. */
export function digestRowOf(r: RegionTableRow): DigestRow {
  return [
    r.period,
    r.figure,
    r.workloadClass,
    r.acclimatization,
    r.exposure,
    r.method,
    r.statistic,
    Number.isNaN(r.value) ? null : r.value,
    r.unit,
    r.yearsUsed,
    r.baseline,
  ];
}

/**
 * The gathered rows of region `regionId`'s table (a scenario's with `scenarioId`) that `keep`
 * accepts (with `yearOnly`, only those of period `year`), or undefined when the build gathered
 * none or `keep` is not marked {@link withinDigest}.
 */
export function gatheredRows(regionId: string, keep: RowFilter, scenarioId?: string, yearOnly = false): RegionTableRow[] | undefined {
  const dir = siteDigestDir();
  if (dir === undefined || !within.has(keep)) return undefined;
  const path = join(dir, yearOnly ? 'year-rows' : 'rows', digestTableName(scenarioId), `${regionId}.json`);
  if (!existsSync(path)) return undefined;
  const out: RegionTableRow[] = [];
  for (const r of JSON.parse(readFileSync(path, 'utf8')) as DigestRow[]) if (keep(r[0], r[1], r[6])) out.push(rowOf(r));
  return out;
}

/** A group of the figures file: figure, period, statistic, member keys, values (null: empty). */
export type DigestFigureGroup = [string, string, string, string[], Array<number | null>];

/** The figures of `rows` (a table's rows in its order) grouped as the figures file stores them. */
export function digestFigureGroups(rows: readonly RegionTableRow[]): DigestFigureGroup[] {
  const groups = new Map<string, { head: [string, string, string]; members: Map<string, number> }>();
  for (const r of rows) {
    if (!isFigureMethod(r.method)) continue;
    const key = figureGroupKey(r.figure, r.period, r.statistic);
    let g = groups.get(key);
    if (!g) {
      g = { head: [r.figure, r.period, r.statistic], members: new Map() };
      groups.set(key, g);
    }
    g.members.set(figureMemberKey(r.workloadClass, r.acclimatization, r.exposure), r.value);
  }
  return [...groups.values()].map((g) => [...g.head, [...g.members.keys()], [...g.members.values()].map((v) => (Number.isNaN(v) ? null : v))]);
}

/**
 * The report's figures of region `regionId`'s table (a scenario's with `scenarioId`) among the
 * rows `keep` accepts, from the gathered figures; undefined when the build gathered none or
 * `keep` is not marked {@link withinDigest}. The same values as indexing {@link gatheredRows}.
 */
export function gatheredFigures(regionId: string, keep: RowFilter, scenarioId?: string): RegionFigures | undefined {
  const dir = siteDigestDir();
  if (dir === undefined || !within.has(keep)) return undefined;
  const path = join(dir, 'figures', digestTableName(scenarioId), `${regionId}.json`);
  if (!existsSync(path)) return undefined;
  const groups: FigureGroups = new Map();
  for (const [figure, period, statistic, members, values] of JSON.parse(readFileSync(path, 'utf8')) as DigestFigureGroup[]) {
    if (!keep(period, figure, statistic)) continue;
    const m = new Map<string, number>();
    for (let i = 0; i < members.length; i++) m.set(members[i], values[i] ?? NaN);
    groups.set(figureGroupKey(figure, period, statistic), m);
  }
  return groupedRegionFigures(groups);
}

/** Key of a layer's values in `values/index.json`. */
export function layerValuesKey(regionsDir: string, tif: string): string {
  return `${regionsDir}\n${tif}`;
}

/**
 * The gathered value per region of each of `layers` (tables in `regionsDir`, below the data
 * folder), or undefined when the build gathered them not all.
 */
export function loadGatheredLayerValues(regionsDir: string, layers: readonly ManifestLayer[]): Array<Array<number | null>> | undefined {
  const dir = siteDigestDir();
  if (dir === undefined) return undefined;
  const indexPath = join(dir, 'values', 'index.json');
  if (!existsSync(indexPath)) return undefined;
  const index = JSON.parse(readFileSync(indexPath, 'utf8')) as Record<string, string>;
  const files = layers.map((l) => index[layerValuesKey(regionsDir, l.tif)]);
  if (files.some((f) => f === undefined)) return undefined;
  return files.map((f) => {
    const bytes = readFileSync(join(dir, 'values', f));
    const v = new Float64Array(bytes.buffer.slice(bytes.byteOffset, bytes.byteOffset + bytes.byteLength));
    return Array.from(v, (x) => (Number.isNaN(x) ? null : x));
  });
}

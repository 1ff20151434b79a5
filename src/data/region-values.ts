/**
 * The value of a published map layer for each region, for the map page's region table: read at
 * build time from the region tables (`data/regions/<id>.csv`, the area-weighted mean over the
 * region's cells, pipeline/publish/region-table.ts) and, for mean annual temperature and the
 * niche class, from the region summaries (`data/regions/<id>.json`).
 */
import { join } from 'node:path';
import { existsSync, readFileSync } from 'node:fs';
import { z } from 'zod';
import { comboColumns } from '../../pipeline/publish/combo.ts';
import { REGION_TABLE_COLUMNS } from '../../pipeline/publish/region-table.ts';
import { NICHE_CLASSES } from '../../pipeline/climate/niche.ts';
import { parseCsvObjects } from '../lib/csv-parse.ts';
import { SiteDataInvalid, SiteDataMissing } from './errors.ts';
import { readValidatedJson } from './read-json.ts';
import type { ManifestLayer } from './manifest-layers.ts';
import { loadGatheredLayerValues } from './site-digest.ts';

const REGION_TABLE_KEYS = ['period', 'figure', 'workload_class', 'acclimatization', 'exposure', 'method', 'statistic', 'value'] as const;

const regionSummarySchema = z
  .object({
    id: z.string(),
    niche: z.object({ baselineMat: z.number().nullable(), baselineClass: z.enum(NICHE_CLASSES).nullable() }).passthrough(),
  })
  .passthrough();

function key(period: string, figure: string, cls: string, accl: string, exposure: string, method: string, statistic: string): string {
  return [period, figure, cls, accl, exposure, method, statistic].join('|');
}

/**
 * One region's table as a map from row key to value (NaN for an empty value), keeping only the
 * rows of `statistics` (a region table has seven statistics; the layers use one or two). Lines
 * without quotes are split directly (the pipeline writes no quotes in these tables); others go
 * through the CSV parser.
 */
function readRegionTable(path: string, statistics: ReadonlySet<string>): Map<string, number> {
  if (!existsSync(path)) throw SiteDataMissing({ path, what: 'region table' }, { file: path });
  return regionTableValues(readFileSync(path, 'utf8'), path, statistics);
}

/** {@link readRegionTable} of a table's text already read (`path` names it in errors). */
export function regionTableValues(text: string, path: string, statistics: ReadonlySet<string>): Map<string, number> {
  const nl = text.indexOf('\n');
  const header = (nl < 0 ? text : text.slice(0, nl)).replace(/\r$/, '');
  const cols = header.split(',');
  const at = Object.fromEntries(REGION_TABLE_KEYS.map((k) => [k, cols.indexOf(k)])) as Record<(typeof REGION_TABLE_KEYS)[number], number>;
  const missing = REGION_TABLE_KEYS.filter((k) => at[k] < 0);
  if (missing.length > 0) throw SiteDataInvalid({ path, problems: [`row 2: no column ${missing.join(', ')}`] }, { file: path, row: 2 });
  if (header.includes('"')) return readRegionTableSlow(path, text, statistics);
  if (header === REGION_TABLE_COLUMNS.join(',')) return regionTableValuesInOrder(text, nl, path, statistics);
  const out = new Map<string, number>();
  const lines = text.slice(nl + 1).split('\n');
  for (let i = 0; i < lines.length; i++) {
    const line = lines[i].replace(/\r$/, '');
    if (line === '') continue;
    if (line.includes('"')) return readRegionTableSlow(path, text, statistics);
    const c = line.split(',');
    if (c.length !== cols.length)
      throw SiteDataInvalid({ path, problems: [`row ${i + 2}: ${c.length} fields, the header has ${cols.length}`] }, { file: path, row: i + 2 });
    if (!statistics.has(c[at.statistic])) continue;
    const raw = c[at.value];
    const v = raw === '' ? NaN : Number(raw);
    if (Number.isNaN(v) && raw !== '')
      throw SiteDataInvalid({ path, problems: [`row ${i + 2}: value "${raw}" is not a number`] }, { file: path, row: i + 2, key: 'value' });
    out.set(key(c[at.period], c[at.figure], c[at.workload_class], c[at.acclimatization], c[at.exposure], c[at.method], c[at.statistic]), v);
  }
  return out;
}

/**
 * {@link regionTableValues} of a table in the pipeline's column order (pipeline/publish/
 * region-table.ts `REGION_TABLE_COLUMNS`): a line is split only when its statistic is wanted,
 * and its key (period to statistic, fields 1–7) is one slice of it; the same checks, the same
 * map (about 3× faster on a region's 5,000 rows, of which the layers want two statistics of seven).
 */
function regionTableValuesInOrder(text: string, nl: number, path: string, statistics: ReadonlySet<string>): Map<string, number> {
  if (text.includes('"')) return readRegionTableSlow(path, text, statistics);
  const nCols = REGION_TABLE_COLUMNS.length;
  const wanted = [...statistics];
  const out = new Map<string, number>();
  const len = text.length;
  let pos = nl < 0 ? len : nl + 1;
  for (let row = 2; pos < len; row++) {
    let end = text.indexOf('\n', pos);
    if (end < 0) end = len;
    const lineEnd = end > pos && text.charCodeAt(end - 1) === 13 ? end - 1 : end;
    const from = pos;
    pos = end + 1;
    if (lineEnd === from) continue;
    // The commas of the line: c[k] ends field k; every line must have nCols − 1 of them.
    let fields = 1;
    let c0 = -1;
    let c6 = -1;
    let c7 = -1;
    let c8 = -1;
    for (let c = text.indexOf(',', from); c >= 0 && c < lineEnd; c = text.indexOf(',', c + 1)) {
      if (fields === 1) c0 = c;
      else if (fields === 7) c6 = c;
      else if (fields === 8) c7 = c;
      else if (fields === 9) c8 = c;
      fields++;
    }
    if (fields !== nCols) throw SiteDataInvalid({ path, problems: [`row ${row}: ${fields} fields, the header has ${nCols}`] }, { file: path, row });
    let kept = false;
    for (const st of wanted) if (c7 - c6 - 1 === st.length && text.startsWith(st, c6 + 1)) kept = true;
    if (!kept) continue;
    const raw = text.slice(c7 + 1, c8);
    const v = raw === '' ? NaN : Number(raw);
    if (Number.isNaN(v) && raw !== '')
      throw SiteDataInvalid({ path, problems: [`row ${row}: value "${raw}" is not a number`] }, { file: path, row, key: 'value' });
    out.set(text.slice(c0 + 1, c7).replaceAll(',', '|'), v);
  }
  return out;
}

/** The general path (quoted fields), with the same checks. */
function readRegionTableSlow(path: string, text: string, statistics: ReadonlySet<string>): Map<string, number> {
  const rows = parseCsvObjects(text);
  const out = new Map<string, number>();
  rows.forEach((r, i) => {
    const missing = REGION_TABLE_KEYS.filter((k) => r[k] === undefined);
    if (missing.length > 0) throw SiteDataInvalid({ path, problems: [`row ${i + 2}: no column ${missing.join(', ')}`] }, { file: path, row: i + 2 });
    if (!statistics.has(r.statistic)) return;
    const v = r.value === '' ? NaN : Number(r.value);
    if (Number.isNaN(v) && r.value !== '')
      throw SiteDataInvalid({ path, problems: [`row ${i + 2}: value "${r.value}" is not a number`] }, { file: path, row: i + 2, key: 'value' });
    out.set(key(r.period, r.figure, r.workload_class, r.acclimatization, r.exposure, r.method, r.statistic), v);
  });
  return out;
}

/**
 * For each layer, the value per region (in `regionIds` order) [units of the layer]; null where
 * the region has no value. Niche-class layers give the class code (index in NICHE_CLASSES).
 * Reads one region's files at a time.
 * @param regionsDir folder of the region tables and summaries below `dataDir`: the record's
 *   `data/regions`, or a scenario's `data/scenarios/<id>/regions`
 */
export function regionLayerValues(
  dataDir: string,
  regionIds: string[],
  layers: ManifestLayer[],
  regionsDir = 'data/regions',
): Record<string, Array<number | null>> {
  const out: Record<string, Array<number | null>> = Object.fromEntries(layers.map((l) => [l.id, new Array<number | null>(regionIds.length).fill(null)]));
  // The values the site stage gathered before the build (data/site-digest.ts), else the tables.
  const gathered = loadGatheredLayerValues(regionsDir, layers);
  if (gathered?.every((v) => v.length === regionIds.length)) {
    layers.forEach((l, li) => {
      out[l.id] = gathered[li];
    });
    return out;
  }
  const reader = regionValuesReader(layers);
  regionIds.forEach((id, r) => {
    const table = readRegionTable(join(dataDir, regionsDir, `${id}.csv`), reader.statistics);
    reader.values(table, readRegionSummary(dataDir, regionsDir, id)).forEach((v, li) => {
      out[layers[li].id][r] = v;
    });
  });
  return out;
}

/** A region's summary (data/regions/<id>.json), as far as the layer values need it. */
export function readRegionSummary(dataDir: string, regionsDir: string, id: string): z.infer<typeof regionSummarySchema> {
  return readValidatedJson(join(dataDir, regionsDir, `${id}.json`), regionSummarySchema, `region summary (${regionsDir}/${id}.json)`);
}

/**
 * How one region's value of each of `layers` is found: the statistics of its table to keep, and
 * the values [units of each layer] (null where none) from that table and the region's summary.
 */
export function regionValuesReader(layers: readonly ManifestLayer[]): {
  statistics: ReadonlySet<string>;
  /** Each layer's key in the table (`period|figure|class|acclimatization|exposure|method|statistic`), '' for a layer from the summary. */
  keys: readonly string[];
  values: (table: Map<string, number>, summary: z.infer<typeof regionSummarySchema>) => Array<number | null>;
  /** {@link values} from each layer's table value already looked up (`byLayer[li]`, NaN where none) [units of each layer]. */
  valuesOf: (byLayer: Float64Array, summary: z.infer<typeof regionSummarySchema>) => Array<number | null>;
} {
  const keys = layers.map((layer) => {
    if (layer.figure === 'mean-annual-temperature' || layer.figure === 'niche-class') return '';
    const cc = comboColumns(layer.figure, layer.combo);
    return key(layer.period, layer.figure, cc.workload_class, cc.acclimatization, cc.exposure, cc.method, layer.statistic);
  });
  const pick = (tableValue: (li: number) => number | undefined, summary: z.infer<typeof regionSummarySchema>) =>
    layers.map((layer, li) => {
      let v: number | null | undefined;
      if (layer.figure === 'mean-annual-temperature') v = summary.niche.baselineMat;
      else if (layer.figure === 'niche-class') {
        const c = summary.niche.baselineClass;
        v = c === null ? null : NICHE_CLASSES.indexOf(c);
      } else v = tableValue(li);
      return v === undefined || v === null || !Number.isFinite(v) ? null : v;
    });
  return {
    statistics: new Set(layers.map((l) => l.statistic)),
    keys,
    values: (table, summary) => pick((li) => table.get(keys[li]), summary),
    valuesOf: (byLayer, summary) => pick((li) => byLayer[li], summary),
  };
}

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
import { NICHE_CLASSES } from '../../pipeline/climate/niche.ts';
import { parseCsvObjects } from '../lib/csv-parse.ts';
import { SiteDataInvalid, SiteDataMissing } from './errors.ts';
import { readValidatedJson } from './read-json.ts';
import type { ManifestLayer } from './manifest-layers.ts';

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

/** One region's table as a map from row key to value (NaN for an empty value). */
function readRegionTable(path: string): Map<string, number> {
  if (!existsSync(path)) throw SiteDataMissing({ path, what: 'region table' }, { file: path });
  const rows = parseCsvObjects(readFileSync(path, 'utf8'));
  const out = new Map<string, number>();
  rows.forEach((r, i) => {
    const missing = REGION_TABLE_KEYS.filter((k) => r[k] === undefined);
    if (missing.length > 0) throw SiteDataInvalid({ path, problems: [`row ${i + 2}: no column ${missing.join(', ')}`] }, { file: path, row: i + 2 });
    const v = r.value === '' ? NaN : Number(r.value);
    if (Number.isNaN(v) && r.value !== '') throw SiteDataInvalid({ path, problems: [`row ${i + 2}: value "${r.value}" is not a number`] }, { file: path, row: i + 2, key: 'value' });
    out.set(key(r.period, r.figure, r.workload_class, r.acclimatization, r.exposure, r.method, r.statistic), v);
  });
  return out;
}

/**
 * For each layer, the value per region (in `regionIds` order) [units of the layer]; null where
 * the region has no value. Niche-class layers give the class code (index in NICHE_CLASSES).
 */
export function regionLayerValues(dataDir: string, regionIds: string[], layers: ManifestLayer[]): Record<string, Array<number | null>> {
  const tables = regionIds.map((id) => readRegionTable(join(dataDir, 'data', 'regions', `${id}.csv`)));
  const summaries = regionIds.map((id) =>
    readValidatedJson(join(dataDir, 'data', 'regions', `${id}.json`), regionSummarySchema, `region summary (data/regions/${id}.json)`),
  );
  const out: Record<string, Array<number | null>> = {};
  for (const layer of layers) {
    out[layer.id] = regionIds.map((_, r) => {
      let v: number | null | undefined;
      if (layer.figure === 'mean-annual-temperature') v = summaries[r].niche.baselineMat;
      else if (layer.figure === 'niche-class') {
        const c = summaries[r].niche.baselineClass;
        v = c === null ? null : NICHE_CLASSES.indexOf(c);
      } else {
        const cc = comboColumns(layer.figure, layer.combo);
        v = tables[r].get(key(layer.period, layer.figure, cc.workload_class, cc.acclimatization, cc.exposure, cc.method, layer.statistic));
      }
      return v === undefined || v === null || !Number.isFinite(v) ? null : v;
    });
  }
  return out;
}

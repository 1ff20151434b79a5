/**
 * Gathers, for a slice of regions, what the pages need from their tables (./site-digest.ts says
 * what and where): each table read once, its report rows written to `rows/<table>/<id>.json`,
 * and each map layer's value of the region returned to the caller, which writes them per layer
 * (pipeline/run/site-digest.ts). Runs in the site stage's worker threads for large atlases.
 * Damaged tables end in the same catalogued errors the pages would give (region-table.ts,
 * region-values.ts).
 */
import { existsSync, mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import { isAscii } from 'node:buffer';
import { join } from 'node:path';
import type { ManifestLayer } from './manifest-layers.ts';
import { parseRegionTable, regionTablePath } from './region-table.ts';
import { readRegionSummary, regionTableValues, regionValuesReader } from './region-values.ts';
import { SiteDataMissing } from './errors.ts';
import { DIGEST_KEEP, digestRowOf, digestTableName } from './site-digest.ts';

/** One kind of region table: the record's, or a scenario's. */
export interface DigestTable {
  /** The scenario's id; absent for the record. */
  scenarioId?: string;
  /** Folder of the tables and summaries below the data folder: `data/regions` or `data/scenarios/<id>/regions`. */
  regionsDir: string;
  /** The map layers whose values come from these tables (the manifest's, or the scenario's). */
  layers: ManifestLayer[];
}

/**
 * Gathers regions `ids` of every table in `tables`: writes their rows under `digestDir` and
 * returns, per table, the value of each layer for each region of the slice, layer after layer
 * (`[layer · ids.length + region]`, NaN where none) [units of each layer].
 */
export function gatherRegionSlice(dataDir: string, digestDir: string, tables: readonly DigestTable[], ids: readonly string[]): Float64Array[] {
  return tables.map((t) => {
    const dir = join(digestDir, 'rows', digestTableName(t.scenarioId));
    mkdirSync(dir, { recursive: true });
    const reader = regionValuesReader(t.layers);
    const values = new Float64Array(t.layers.length * ids.length).fill(NaN);
    ids.forEach((id, r) => {
      const path = regionTablePath(dataDir, id, t.scenarioId);
      if (!existsSync(path)) {
        const rel = t.scenarioId ? `data/scenarios/${t.scenarioId}/regions/${id}.csv` : `data/regions/${id}.csv`;
        throw SiteDataMissing({ path, what: `table of region "${id}" (${rel})` }, { file: path });
      }
      // The pipeline writes these tables in ASCII: decoded as Latin-1 they are the same text, read
      // faster than as UTF-8 (a file with other bytes is decoded as UTF-8).
      const bytes = readFileSync(path);
      const text = bytes.toString(isAscii(bytes) ? 'latin1' : 'utf8');
      const rows = parseRegionTable(text, path, id, DIGEST_KEEP);
      writeFileSync(join(dir, `${id}.json`), JSON.stringify(rows.map(digestRowOf)));
      if (t.layers.length > 0) {
        const v = reader.values(regionTableValues(text, path, reader.statistics), readRegionSummary(dataDir, t.regionsDir, id));
        for (let li = 0; li < v.length; li++) values[li * ids.length + r] = v[li] ?? NaN;
      }
    });
    return values;
  });
}

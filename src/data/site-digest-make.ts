/**
 * Gathers, for a slice of regions, what the pages need from their tables (./site-digest.ts says
 * what and where): each table read once, its report rows written to `rows/<table>/<id>.json`,
 * and each map layer's value of the region returned to the caller, which writes them per layer
 * (pipeline/run/site-digest.ts). Runs in the site stage's worker threads for large atlases.
 * Damaged tables end in the same catalogued errors the pages would give (region-table.ts,
 * region-values.ts).
 */
import { closeSync, fstatSync, mkdirSync, openSync, readSync, writeFileSync } from 'node:fs';
import { isAscii } from 'node:buffer';
import { join } from 'node:path';
import type { ManifestLayer } from './manifest-layers.ts';
import { parseRegionTable, regionTablePath } from './region-table.ts';
import { readRegionSummary, regionTableValues, regionValuesReader } from './region-values.ts';
import { SiteDataMissing } from './errors.ts';
import { DIGEST_KEEP, digestFigureGroups, digestRowOf, digestTableName } from './site-digest.ts';
import { scanRegionTable, WantedKeys } from './region-table-scan.ts';

type RegionSummary = ReturnType<typeof readRegionSummary>;

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
    const figuresDir = join(digestDir, 'figures', digestTableName(t.scenarioId));
    const yearDir = join(digestDir, 'year-rows', digestTableName(t.scenarioId));
    mkdirSync(dir, { recursive: true });
    mkdirSync(yearDir, { recursive: true });
    mkdirSync(figuresDir, { recursive: true });
    const reader = regionValuesReader(t.layers);
    const wanted = new WantedKeys(reader.keys);
    const values = new Float64Array(t.layers.length * ids.length).fill(NaN);
    ids.forEach((id, r) => {
      const path = regionTablePath(dataDir, id, t.scenarioId);
      const length = readTable(path, () => {
        const rel = t.scenarioId ? `data/scenarios/${t.scenarioId}/regions/${id}.csv` : `data/regions/${id}.csv`;
        return SiteDataMissing({ path, what: `table of region "${id}" (${rel})` }, { file: path });
      });
      const scan = scanRegionTable(kept, length, id, DIGEST_KEEP, wanted);
      let rows = scan?.rows;
      let valuesOf = scan ? (summary: RegionSummary) => reader.valuesOf(scan.values, summary) : undefined;
      if (!rows || !valuesOf) {
        // Not plainly the pipeline's table: the careful readers, whose errors name the row. The
        // pipeline writes ASCII: decoded as Latin-1 it is the same text, read faster than as UTF-8.
        const bytes = kept.subarray(0, length);
        const text = bytes.toString(isAscii(bytes) ? 'latin1' : 'utf8');
        rows = parseRegionTable(text, path, id, DIGEST_KEEP);
        const table = regionTableValues(text, path, reader.statistics);
        valuesOf = (summary: RegionSummary) => reader.values(table, summary);
      }
      writeFileSync(join(dir, `${id}.json`), JSON.stringify(rows.map(digestRowOf)));
      writeFileSync(join(yearDir, `${id}.json`), JSON.stringify(rows.filter((r) => r.period === 'year').map(digestRowOf)));
      writeFileSync(join(figuresDir, `${id}.json`), JSON.stringify(digestFigureGroups(rows)));
      if (t.layers.length > 0) {
        const v = valuesOf(readRegionSummary(dataDir, t.regionsDir, id));
        for (let li = 0; li < v.length; li++) values[li * ids.length + r] = v[li] ?? NaN;
      }
    });
    return values;
  });
}

/** The buffer tables are read into, kept from one table to the next (grown when a table is larger) [bytes]. */
let kept = Buffer.allocUnsafe(1 << 20);

/** Reads the file at `path` into {@link kept}; its length [bytes]. A file that is not there ends in `missing()`. */
function readTable(path: string, missing: () => Error): number {
  let fd: number;
  try {
    fd = openSync(path, 'r');
  } catch {
    throw missing();
  }
  try {
    const size = fstatSync(fd).size;
    if (size > kept.length) kept = Buffer.allocUnsafe(Math.max(size, kept.length * 2));
    let n = 0;
    while (n < size) {
      const got = readSync(fd, kept, n, size - n, n);
      if (got === 0) break;
      n += got;
    }
    return n;
  } finally {
    closeSync(fd);
  }
}

/**
 * Typed access to the calculator's histogram tiles: `data/calculator/index.json` and
 * `data/calculator/<region-id>.bin` (format and decoder in pipeline/publish/histogram-tiles.ts):
 * per year, month, local hour and exposure, the region's area-weighted hours of WBGT in each bin
 * of pipeline/work/wbgt-bins.ts [h]. The report pages read them at build time for the
 * month × hour table of typical WBGT (baseline years, one exposure, pooled).
 */
import { existsSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { z } from 'zod';
import { HISTOGRAM_TILE_VERSION } from '../../pipeline/publish/histogram-tiles.ts';
import { EXPOSURE_INDEX, HIST_LEN, HOURS, MONTHS, N_EXPOSURES } from '../../pipeline/reduce/layout.ts';
import { WBGT_BIN_EDGES } from '../../pipeline/work/wbgt-bins.ts';
import { siteDataDir } from './data-dir.ts';
import { SiteDataInvalid, SiteDataMissing, SiteDataUnreadable } from './errors.ts';
import { readValidatedJson } from './read-json.ts';

export const histogramIndexSchema = z.object({
  version: z.literal(HISTOGRAM_TILE_VERSION),
  scale: z.number().positive(),
  years: z.array(z.number().int()).min(1),
  baseline: z.tuple([z.number().int(), z.number().int()]),
  bins: z.object({
    edges: z
      .array(z.number())
      .refine((e) => e.length === WBGT_BIN_EDGES.length && e.every((v, i) => v === WBGT_BIN_EDGES[i]), 'bin edges differ from pipeline/work/wbgt-bins.ts'),
    openEnds: z.literal(true),
  }),
  regions: z.array(z.object({ id: z.string().min(1), name: z.string(), path: z.string().min(1) })),
});

export type HistogramIndex = z.infer<typeof histogramIndexSchema>;

/** A region's hours per WBGT bin, pooled over the baseline years, for one exposure. */
export interface PooledHistograms {
  /** The years pooled [year]. */
  years: number[];
  exposure: 'sun' | 'shade';
  /** Month × local hour × bin [h] (pipeline/reduce/layout.ts order without the exposure axis). */
  counts: Float64Array;
}

/** Path of the tile index inside a data folder. */
export function histogramIndexPath(dataDir: string): string {
  return join(dataDir, 'data', 'calculator', 'index.json');
}

/** Reads the tile index. */
export function loadHistogramIndex(dataDir: string = siteDataDir()): HistogramIndex {
  return readValidatedJson(histogramIndexPath(dataDir), histogramIndexSchema, 'calculator index (data/calculator/index.json)');
}

/**
 * Reads the tile of region `regionId` and adds up, per month × local hour × bin, the hours of the
 * baseline years for one exposure. Walks the format of pipeline/publish/histogram-tiles.ts
 * (per year, month, hour, exposure: uint8 first bin, uint8 bin count, that many uint16 hours × scale)
 * without decoding the other years and exposure into arrays: a report page needs a sixth of it.
 */
export function loadPooledHistograms(
  regionId: string,
  dataDir: string = siteDataDir(),
  index: HistogramIndex = loadHistogramIndex(dataDir),
  exposure: 'sun' | 'shade' = 'sun',
): PooledHistograms {
  const indexPath = histogramIndexPath(dataDir);
  const entry = index.regions.find((r) => r.id === regionId);
  if (!entry) throw SiteDataInvalid({ path: indexPath, problems: [`regions: no entry for region "${regionId}"`] }, { file: indexPath, key: 'regions' });
  const path = join(dataDir, entry.path);
  if (!existsSync(path)) throw SiteDataMissing({ path, what: `histogram tile of region "${regionId}" (${entry.path})` }, { file: path });
  const bytes = new Uint8Array(readFileSync(path));
  const [b0, b1] = index.baseline;
  const wanted = EXPOSURE_INDEX[exposure];
  const counts = new Float64Array(MONTHS * HOURS * HIST_LEN);
  const scale = index.scale;
  const years: number[] = [];
  let p = 0;
  const broken = (detail: string) => SiteDataUnreadable({ path, detail }, { file: path });
  for (const year of index.years) {
    const use = year >= b0 && year <= b1;
    if (use) years.push(year);
    for (let s = 0; s < MONTHS * HOURS * N_EXPOSURES; s++) {
      if (p + 2 > bytes.length) throw broken(`the tile ends inside year ${year} (byte ${p} of ${bytes.length}); expected ${index.years.length} years`);
      const first = bytes[p];
      const n = bytes[p + 1];
      p += 2;
      if (first + n > HIST_LEN) throw broken(`bins ${first}–${first + n - 1} of year ${year} lie beyond the ${HIST_LEN} bins`);
      if (p + 2 * n > bytes.length) throw broken(`the tile ends inside year ${year} (byte ${p} of ${bytes.length}); expected ${index.years.length} years`);
      if (use && s % N_EXPOSURES === wanted) {
        const base = ((s - wanted) / N_EXPOSURES) * HIST_LEN + first;
        for (let b = 0; b < n; b++) counts[base + b] += (bytes[p + 2 * b] | (bytes[p + 2 * b + 1] << 8)) / scale;
      }
      p += 2 * n;
    }
  }
  if (p !== bytes.length) throw broken(`${bytes.length - p} bytes after the last of ${index.years.length} years`);
  return { years, exposure, counts };
}

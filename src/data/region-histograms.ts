/**
 * Typed access to the calculator's histogram tiles: `data/calculator/index.json` and
 * `data/calculator/<region-id>.bin` (format and decoder in pipeline/publish/histogram-tiles.ts):
 * per year, month, local hour and exposure, the region's area-weighted hours of WBGT in each bin
 * of pipeline/work/wbgt-bins.ts [h]. The report pages read them at build time for the
 * month × hour table of typical WBGT.
 */
import { existsSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { z } from 'zod';
import { HISTOGRAM_TILE_VERSION, decodeHistogramTile } from '../../pipeline/publish/histogram-tiles.ts';
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

/** A region's decoded tiles. */
export interface RegionHistograms {
  /** Years of the tiles, in file order [year]. */
  years: number[];
  /** Baseline of the normals [first, last year]. */
  baseline: [number, number];
  /** Per year: month × local hour × exposure × bin [h] (pipeline/reduce/layout.ts order). */
  perYear: Float64Array[];
}

/** Path of the tile index inside a data folder. */
export function histogramIndexPath(dataDir: string): string {
  return join(dataDir, 'data', 'calculator', 'index.json');
}

/** Reads the tile index. */
export function loadHistogramIndex(dataDir: string = siteDataDir()): HistogramIndex {
  return readValidatedJson(histogramIndexPath(dataDir), histogramIndexSchema, 'calculator index (data/calculator/index.json)');
}

/** Reads and decodes the tile of region `regionId`. */
export function loadRegionHistograms(regionId: string, dataDir: string = siteDataDir(), index: HistogramIndex = loadHistogramIndex(dataDir)): RegionHistograms {
  const indexPath = histogramIndexPath(dataDir);
  const entry = index.regions.find((r) => r.id === regionId);
  if (!entry) throw SiteDataInvalid({ path: indexPath, problems: [`regions: no entry for region "${regionId}"`] }, { file: indexPath, key: 'regions' });
  const path = join(dataDir, entry.path);
  if (!existsSync(path)) throw SiteDataMissing({ path, what: `histogram tile of region "${regionId}" (${entry.path})` }, { file: path });
  let perYear: Float64Array[];
  try {
    perYear = decodeHistogramTile(new Uint8Array(readFileSync(path)), index.years.length);
  } catch (e) {
    throw SiteDataUnreadable({ path, detail: (e as Error).message }, { file: path });
  }
  return { years: index.years, baseline: index.baseline, perYear };
}

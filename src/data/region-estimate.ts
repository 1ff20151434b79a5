/**
 * The estimate page's figures for a region with the atlas's settings, against the report's
 * (src/lib/report/estimate-difference.ts), read at build time: the calculator's context once per
 * data folder, the region's tile, the region table. Null when the atlas publishes no calculator
 * index (the report then says nothing about the estimate page).
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { loadEstimateContext } from './estimate.ts';
import { siteDataDir } from './data-dir.ts';
import { SiteDataMissing } from './errors.ts';
import { regionTileHistograms } from '../../pipeline/schedule/tiles.ts';
import { estimateDifference, type EstimateDifference } from '../lib/report/estimate-difference.ts';
import type { RegionFigures } from '../lib/report/region-figures.ts';

let cached: { dir: string; ctx: ReturnType<typeof loadEstimateContext>; byRegion: Map<string, EstimateDifference | null> } | undefined;

/** The comparison for one region, computed once per build (the report and its summary both show it). */
export function loadEstimateDifference(regionId: string, figures: RegionFigures, dataDir: string = siteDataDir()): EstimateDifference | null {
  if (cached?.dir !== dataDir) cached = { dir: dataDir, ctx: loadEstimateContext(dataDir), byRegion: new Map() };
  const known = cached.byRegion.get(regionId);
  if (known !== undefined) return known;
  const result = computeDifference(regionId, figures, dataDir, cached.ctx);
  cached.byRegion.set(regionId, result);
  return result;
}

function computeDifference(
  regionId: string,
  figures: RegionFigures,
  dataDir: string,
  loaded: ReturnType<typeof loadEstimateContext>,
): EstimateDifference | null {
  if (!loaded) return null;
  const entry = loaded.ctx.regions.find((r) => r.id === regionId);
  if (!entry) return null;
  const path = join(dataDir, entry.path);
  let bytes: Uint8Array;
  try {
    bytes = new Uint8Array(readFileSync(path));
  } catch {
    throw SiteDataMissing({ path, what: `histogram tile of region "${regionId}" (${entry.path})` }, { file: path });
  }
  return estimateDifference(regionId, regionTileHistograms(bytes, entry.path, loaded.ctx), loaded.ctx, figures);
}

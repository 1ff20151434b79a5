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

/**
 * Most comparisons kept per build [count]. The report and its summary both show a region's
 * comparison, and a build renders every report before any summary, so the cache saves the second
 * tile read (~8 ms CPU per region on the demo) only while it holds every region. It keeps only
 * what the pages show (`EstimateNote`, ~0.2 kB a region instead of ~1 kB with the twelve months)
 * and is bounded so memory does not grow without limit (at most ~3 MB); past the bound the
 * oldest entry is dropped and recomputed when asked again (same inputs, same result).
 */
export const ESTIMATE_CACHE_LIMIT = 16_384;

/** What the region pages show of a comparison (components/report/EstimateDifferenceNote.astro). */
export type EstimateNote = Pick<EstimateDifference, 'workloadClass' | 'acclimatization' | 'exposure' | 'largest' | 'largestShare'>;

type Loaded = NonNullable<ReturnType<typeof loadEstimateContext>>;
type RegionEntry = Loaded['ctx']['regions'][number];

let cached:
  | { dir: string; ctx: ReturnType<typeof loadEstimateContext>; entries: Map<string, RegionEntry>; byRegion: Map<string, EstimateNote | null> }
  | undefined;

/** The comparison for one region, computed once while the bounded cache holds it (the report and its summary both show it). */
export function loadEstimateDifference(regionId: string, figures: RegionFigures, dataDir: string = siteDataDir()): EstimateNote | null {
  if (cached?.dir !== dataDir) {
    const ctx = loadEstimateContext(dataDir);
    const entries = new Map<string, RegionEntry>();
    for (const r of ctx?.ctx.regions ?? []) if (!entries.has(r.id)) entries.set(r.id, r);
    cached = { dir: dataDir, ctx, entries, byRegion: new Map() };
  }
  const known = cached.byRegion.get(regionId);
  if (known !== undefined) return known;
  const full = computeDifference(regionId, figures, dataDir, cached.ctx, cached.entries.get(regionId));
  const result: EstimateNote | null = full && {
    workloadClass: full.workloadClass,
    acclimatization: full.acclimatization,
    exposure: full.exposure,
    largest: full.largest,
    largestShare: full.largestShare,
  };
  if (cached.byRegion.size >= ESTIMATE_CACHE_LIMIT) {
    // Map keeps insertion order: the first key is the oldest.
    const oldest = cached.byRegion.keys().next().value;
    if (oldest !== undefined) cached.byRegion.delete(oldest);
  }
  cached.byRegion.set(regionId, result);
  return result;
}

/** Comparisons held now [count] (for tests: never above ESTIMATE_CACHE_LIMIT). */
export function estimateCacheSize(): number {
  return cached?.byRegion.size ?? 0;
}

function computeDifference(
  regionId: string,
  figures: RegionFigures,
  dataDir: string,
  loaded: ReturnType<typeof loadEstimateContext>,
  entry: RegionEntry | undefined,
): EstimateDifference | null {
  if (!loaded || !entry) return null;
  const path = join(dataDir, entry.path);
  let bytes: Uint8Array;
  try {
    bytes = new Uint8Array(readFileSync(path));
  } catch {
    throw SiteDataMissing({ path, what: `histogram tile of region "${regionId}" (${entry.path})` }, { file: path });
  }
  scratch = regionTileHistograms(bytes, entry.path, loaded.ctx, scratch);
  return estimateDifference(regionId, scratch, loaded.ctx, figures);
}

/** The histograms of the last tile read, reused for the next (the comparison keeps none of them). */
let scratch: Float64Array[] | undefined;

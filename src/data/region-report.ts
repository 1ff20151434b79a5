/**
 * Everything one region report page shows, read at build time: the manifest (work settings,
 * classes, layers), the region's table indexed by meaning, its summary (niche), and the typical
 * WBGT per month × local hour from its histogram tile; with a workforce raster, the workforce
 * figures (person-hours, full-time equivalents, share of outdoor work time lost). The pure pieces live in src/lib/report/.
 */
import { loadAtlasManifest, type AtlasManifest } from './atlas-manifest.ts';
import { loadRegionDetail, type RegionDetail } from './region-detail.ts';
import { loadHistogramIndex, loadPooledHistograms, type HistogramIndex } from './region-histograms.ts';
import { loadRegionTable } from './region-table.ts';
import { siteDataDir } from './data-dir.ts';
import { FIGURE_HOURS_ABOVE, FIGURE_HOURS_LOST, indexRegionTable, type RegionFigures } from '../lib/report/region-figures.ts';

import { typicalWbgtMatrix, type HourMatrix } from '../lib/report/hour-matrix.ts';
import { DIGEST_KEEP, gatheredFigures, withinDigest } from './site-digest.ts';
import type { RowFilter } from './region-row.ts';
import type { ReportScenario } from '../lib/report/scenarios.ts';

export interface RegionReport {
  id: string;
  name: string;
  manifest: AtlasManifest;
  detail: RegionDetail;
  figures: RegionFigures;
  /** Median WBGT in the sun per month × local hour over the baseline years [°C]. */
  matrix: HourMatrix;
  /** The scenarios of the manifest with this region's table of each (empty without scenarios). */
  scenarios: ReportScenario[];
  /** What every scenario is and is not (the manifest's caveat); empty without scenarios. */
  scenarioCaveat: string;
}

/** The figures and statistics of the table a report shows (the niche comes from the region's JSON): those the site stage gathers. */
const keep = DIGEST_KEEP;
/** A scenario's table: its means only (the side-by-side comparison). */
const keepScenario = withinDigest((period, figure, statistic) => DIGEST_KEEP(period, figure, statistic) && statistic === 'mean');

/** The figures of a region's table among the rows `keep` accepts: gathered by the site stage when it did, else read from the table. */
function loadFigures(regionId: string, dataDir: string, keep: RowFilter, scenarioId?: string): RegionFigures {
  return gatheredFigures(regionId, keep, scenarioId) ?? indexRegionTable(loadRegionTable(regionId, dataDir, keep, scenarioId));
}

let indexCache: { dir: string; index: HistogramIndex } | undefined;

/** What a region's one-page summary shows: the manifest, the region's summary and its table (no hour matrix, no scenarios). */
export type RegionSummaryData = Pick<RegionReport, 'id' | 'name' | 'manifest' | 'detail' | 'figures'>;

/** The figures and statistics the one-page summary shows (and the estimate comparison reads): means and P90 of hours above and lost. */
const SUMMARY_FIGURES = new Set<string>([FIGURE_HOURS_ABOVE, FIGURE_HOURS_LOST]);
const keepSummary = withinDigest((_period, figure, statistic) => SUMMARY_FIGURES.has(figure) && (statistic === 'mean' || statistic === 'p90'));

/**
 * Loads what the one-page summary of region `regionId` shows: unlike {@link loadRegionReport} it
 * reads neither the calculator tile (the hour matrix) nor the scenarios' tables, and keeps only the
 * rows of hours above the limit and hours lost (mean, P90).
 */
export function loadRegionSummary(regionId: string, dataDir: string = siteDataDir()): RegionSummaryData {
  const manifest = loadAtlasManifest(dataDir);
  const detail = loadRegionDetail(regionId, dataDir);
  const figures = loadFigures(regionId, dataDir, keepSummary);
  return { id: regionId, name: detail.name, manifest, detail, figures };
}

/** Loads the report of region `regionId` from `dataDir` (default: the build's data folder). */
export function loadRegionReport(regionId: string, dataDir: string = siteDataDir()): RegionReport {
  const manifest = loadAtlasManifest(dataDir);
  const detail = loadRegionDetail(regionId, dataDir);
  const figures = loadFigures(regionId, dataDir, keep);
  const scenarios: ReportScenario[] = (manifest.scenarios ?? []).map((s) => ({
    id: s.id,
    name: s.name,
    kind: s.words.kind,
    what: s.words.what,
    source: s.words.source,
    figures: loadFigures(regionId, dataDir, keepScenario, s.id),
  }));
  if (indexCache?.dir !== dataDir) indexCache = { dir: dataDir, index: loadHistogramIndex(dataDir) };
  const matrix = typicalWbgtMatrix(loadPooledHistograms(regionId, dataDir, indexCache.index, 'sun'));
  return { id: regionId, name: detail.name, manifest, detail, figures, matrix, scenarios, scenarioCaveat: manifest.scenarioCaveat ?? '' };
}

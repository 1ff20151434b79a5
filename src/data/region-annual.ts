/**
 * The annual figures of every region for the home page: the baseline mean of shift hours lost
 * per year [h per worker] for each workload class × acclimatization × exposure, read from each
 * region's table (data/regions/<id>.csv, the `year` rows of `hours-lost-shift`); with a workforce
 * raster, also the workforce figures of all outdoor work together (mean and P90 year) and the
 * region's people (data/regions/<id>.json `workforce`).
 */
import { loadRegionYearRows } from './region-table.ts';
import { siteDataDir } from './data-dir.ts';
import { loadRegionDetail } from './region-detail.ts';
import { withinDigest } from './site-digest.ts';
import { FIGURE_HOURS_LOST, YEAR_PERIOD } from '../lib/report/region-figures.ts';
import { ALL_CLASSES, WORKFORCE_FIGURES } from '../lib/report/workforce.ts';

export interface RegionAnnual {
  id: string;
  name: string;
  /** `class.acclimatization.exposure` → baseline mean [h per worker per year]; missing = no value. */
  hoursLost: Map<string, number>;
  /**
   * With a workforce raster: `figure.statistic` of all outdoor work (`person-hours-lost-shift.p90`)
   * → value per year [person-h, FTE or %], plus `people` and `outdoor-workers` [people].
   */
  workforce?: Map<string, number>;
}

const WORKFORCE = new Set<string>(WORKFORCE_FIGURES);

/** Key of an evaluation, as in the manifest's combos. */
export function comboKey(workloadClass: string, acclimatization: string, exposure: string): string {
  return `${workloadClass}.${acclimatization}.${exposure}`;
}

/**
 * Reads the annual hours lost of each region; `withWorkforce` adds the workforce figures;
 * `scenarioId` reads that what-if climate's tables (data/scenarios/<id>/regions/) instead of the record's.
 */
export function loadRegionAnnuals(
  regions: ReadonlyArray<{ id: string; name: string }>,
  dataDir: string = siteDataDir(),
  withWorkforce = false,
  scenarioId?: string,
): RegionAnnual[] {
  return regions.map((r) => {
    const hoursLost = new Map<string, number>();
    const workforce = withWorkforce ? new Map<string, number>() : undefined;
    // Hours lost (mean) and the workforce figures (mean, P90): among the rows the site stage gathers.
    const keep = withinDigest(
      (period, figure, statistic) =>
        period === YEAR_PERIOD &&
        ((figure === FIGURE_HOURS_LOST && statistic === 'mean') ||
          (workforce !== undefined && WORKFORCE.has(figure) && (statistic === 'mean' || statistic === 'p90'))),
    );
    for (const row of loadRegionYearRows(r.id, dataDir, keep, scenarioId)) {
      if (row.period !== YEAR_PERIOD) continue;
      if (row.figure === FIGURE_HOURS_LOST && row.statistic === 'mean') {
        hoursLost.set(comboKey(row.workloadClass, row.acclimatization, row.exposure), row.value);
      } else if (workforce && WORKFORCE.has(row.figure) && row.workloadClass === ALL_CLASSES) {
        workforce.set(`${row.figure}.${row.statistic}`, row.value);
      }
    }
    if (workforce) {
      const wf = loadRegionDetail(r.id, dataDir).workforce;
      workforce.set('people', wf?.people ?? NaN);
      workforce.set('outdoor-workers', wf?.outdoorWorkers ?? NaN);
    }
    return { id: r.id, name: r.name, hoursLost, ...(workforce ? { workforce } : {}) };
  });
}

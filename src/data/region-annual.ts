/**
 * The annual figures of every region for the home page: the baseline mean of shift hours lost
 * per year [h per worker] for each workload class × acclimatization × exposure, read from each
 * region's table (data/regions/<id>.csv, the `year` rows of `hours-lost-shift`).
 */
import { loadRegionYearRows } from './region-table.ts';
import { siteDataDir } from './data-dir.ts';
import { FIGURE_HOURS_LOST, YEAR_PERIOD } from '../lib/report/region-figures.ts';

export interface RegionAnnual {
  id: string;
  name: string;
  /** `class.acclimatization.exposure` → baseline mean [h per worker per year]; missing = no value. */
  hoursLost: Map<string, number>;
}

/** Key of an evaluation, as in the manifest's combos. */
export function comboKey(workloadClass: string, acclimatization: string, exposure: string): string {
  return `${workloadClass}.${acclimatization}.${exposure}`;
}

/** Reads the annual hours lost of each region. */
export function loadRegionAnnuals(regions: ReadonlyArray<{ id: string; name: string }>, dataDir: string = siteDataDir()): RegionAnnual[] {
  return regions.map((r) => {
    const hoursLost = new Map<string, number>();
    for (const row of loadRegionYearRows(r.id, dataDir, (period, figure, statistic) => period === YEAR_PERIOD && figure === FIGURE_HOURS_LOST && statistic === 'mean')) {
      if (row.period === YEAR_PERIOD && row.figure === FIGURE_HOURS_LOST && row.statistic === 'mean') {
        hoursLost.set(comboKey(row.workloadClass, row.acclimatization, row.exposure), row.value);
      }
    }
    return { id: r.id, name: r.name, hoursLost };
  });
}

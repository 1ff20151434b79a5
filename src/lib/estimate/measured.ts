/**
 * How far the monthly table may be from the region tables with the atlas's own settings (region
 * tiles, default shift), as a share of the month's shift hours: measured by
 * test/site/estimate-logic.test.ts on the invented small test atlas (which fails above them) and
 * stated on the estimate page. Hours above the limit and hours lost, mean and P90 year.
 */
export const REGION_TABLE_TOLERANCE = { aboveMean: 0.012, aboveP90: 0.019, lostMean: 0.006, lostP90: 0.011 } as const;

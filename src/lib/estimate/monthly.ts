/**
 * One year's monthly figures for one worker from a histogram tile: shift hours, hours above the
 * limit and hours lost to rest breaks, per calendar month.
 *
 * For each month m and local hour h the slot's WBGT histogram (sun or shade, by exposure) goes
 * through the work model's own `estimateFromHistogram` (pipeline/work/histogram-estimate.ts: hours
 * spread evenly within a 0.25 °C bin, the bin holding the threshold split linearly, f at the
 * middle of the part above it) and is scaled by the slot's shift share (shift-shares.ts):
 *
 *   above(y, m) = Σ_h share(y, m, h) · hoursAbove(hist(y, m, h))       [h]
 *   lost(y, m)  = Σ_h share(y, m, h) · hoursLost(hist(y, m, h))        [h]
 *   shift(y, m) = Σ_h share(y, m, h) · hours(hist(y, m, h))            [h]
 *
 * Breaks in the shade while working in the sun pair each sun bin with a shade WBGT by quantile
 * (pipeline/schedule/rest-pairing.ts). The slot figures are pipeline/schedule/slot-figures.ts, the
 * same the schedule replay uses.
 */
import { SLOT_HOURS, SLOT_MONTHS, slotFigures, type SlotSettings } from '../../../pipeline/schedule/slot-figures.ts';
import type { YearShiftShares } from './shift-shares.ts';

export type { RestChoice } from '../../../pipeline/schedule/slot-figures.ts';

/** One year's figures, per month (index 0 = January). */
export interface MonthlyYear {
  year: number;
  /** Hours of data in the month, all hours of the day [h]. */
  validHours: Float64Array;
  /** Hours the month holds (days × 24) [h]. */
  expectedHours: Float64Array;
  /** Hours of data inside the shift [h]. */
  shiftHours: Float64Array;
  /** Hours above the limit inside the shift, per worker [h]. */
  above: Float64Array;
  /** Hours lost to rest breaks inside the shift, per worker [h]. */
  lost: Float64Array;
}

/** What the figures depend on besides the histogram (pipeline/schedule/slot-figures.ts). */
export type MonthlySettings = SlotSettings;

/**
 * Monthly figures of one year from `hist` (months × hours × exposures × bins [h], the tile layout
 * of pipeline/publish/histogram-tiles.ts and point-tile-codec.ts) and that year's shift shares.
 * Catalogued error from pipeline/work: LimitOutsideHistogram (threshold below 5 °C or above 45 °C).
 */
export function monthlyFigures(hist: Float64Array, shares: YearShiftShares, s: MonthlySettings): MonthlyYear {
  const year = shares.year;
  const out: MonthlyYear = {
    year,
    validHours: new Float64Array(SLOT_MONTHS),
    expectedHours: Float64Array.from({ length: SLOT_MONTHS }, (_, m) => 24 * new Date(Date.UTC(year, m + 1, 0)).getUTCDate()),
    shiftHours: new Float64Array(SLOT_MONTHS),
    above: new Float64Array(SLOT_MONTHS),
    lost: new Float64Array(SLOT_MONTHS),
  };
  const f = slotFigures(hist, s, shares.share);
  for (let m = 0; m < SLOT_MONTHS; m++) {
    for (let h = 0; h < SLOT_HOURS; h++) {
      const k = m * SLOT_HOURS + h;
      out.validHours[m] += f.valid[k];
      const share = shares.share[k];
      if (share === 0) continue;
      out.shiftHours[m] += share * f.hours[k];
      out.above[m] += share * f.above[k];
      out.lost[m] += share * f.lost[k];
    }
  }
  return out;
}

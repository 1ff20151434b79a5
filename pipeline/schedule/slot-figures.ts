/**
 * One weather year of a place, slot by slot: for each month × local hour (288 slots), the hours
 * the published histogram holds, and of those the expected hours above the WBGT screening limit
 * and hours lost to rest breaks, for one work setting. The estimate's monthly table scales these
 * by each slot's share of shift hours; the schedule replay turns them into rates per worked hour.
 *
 * Per slot the WBGT histogram (sun or shade, by exposure; tile layout of
 * pipeline/publish/histogram-tiles.ts and point-tile-codec.ts: month × hour × exposure × bin) goes
 * through the work model's own `estimateFromHistogram` (pipeline/work/histogram-estimate.ts:
 * hours spread evenly within a 0.25 °C bin, the bin holding the threshold split linearly, f at
 * the middle of the part above it). Breaks in the shade while working in the sun pair each sun
 * bin with a shade WBGT by quantile (rest-pairing.ts).
 */
import { estimateFromHistogram } from '../work/histogram-estimate.ts';
import { WBGT_BIN_EDGES, WBGT_HISTOGRAM_LENGTH } from '../work/wbgt-bins.ts';
import type { WorkKernel } from '../work/work-fraction.ts';
import type { Exposure } from '../work/work-settings.ts';
import { lostRestingInShade } from './rest-pairing.ts';

/** Months × local hours × exposures (sun, shade) of the histogram layout. */
export const SLOT_MONTHS = 12;
export const SLOT_HOURS = 24;
export const SLOT_EXPOSURES = 2;
/** Month × hour slots of a year. */
export const YEAR_SLOTS = SLOT_MONTHS * SLOT_HOURS;
/** Values of one year's histogram: slots × exposures × bins. */
export const YEAR_HISTOGRAM_SIZE = YEAR_SLOTS * SLOT_EXPOSURES * WBGT_HISTOGRAM_LENGTH;

/** Where breaks are taken: where the work is, in the shade (rest-pairing.ts), or at a fixed measured WBGT [°C]. */
export type RestChoice = { kind: 'same-place' } | { kind: 'shade' } | { kind: 'fixed'; wbgt: number };

/** What the figures depend on besides the histogram. */
export interface SlotSettings {
  kernel: WorkKernel;
  exposure: Exposure;
  rest: RestChoice;
}

/** One year's slots: `[m * 24 + h]`, m = 0 for January, h the local hour starting then. */
export interface SlotFigures {
  /** Hours of data in the slot, all days [h], from the sun histogram (the completeness count). */
  valid: Float64Array;
  /** Hours in the histogram of the exposure worked in, all days [h] (the same hours; region tiles round each to 0.01 h). */
  hours: Float64Array;
  /** Expected hours above the limit, all days, per worker [h]. */
  above: Float64Array;
  /** Expected hours lost to rest breaks, all days, per worker [h]. */
  lost: Float64Array;
}

/**
 * The slot figures of one year from `hist` ({@link YEAR_HISTOGRAM_SIZE} values [h]). `need`
 * (optional, per slot) skips the work-model evaluation of slots whose value is 0 there.
 * Catalogued error from pipeline/work: LimitOutsideHistogram (threshold below 5 °C or above 45 °C).
 */
export function slotFigures(hist: Float64Array, s: SlotSettings, need?: ArrayLike<number>): SlotFigures {
  const out: SlotFigures = {
    valid: new Float64Array(YEAR_SLOTS),
    hours: new Float64Array(YEAR_SLOTS),
    above: new Float64Array(YEAR_SLOTS),
    lost: new Float64Array(YEAR_SLOTS),
  };
  const x = s.exposure === 'sun' ? 0 : 1;
  const paired = s.rest.kind === 'shade' && x === 0;
  const fixed = s.rest.kind === 'fixed' ? s.rest.wbgt : null;
  const L = WBGT_HISTOGRAM_LENGTH;
  for (let slot = 0; slot < YEAR_SLOTS; slot++) {
    const sunOff = slot * SLOT_EXPOSURES * L;
    const off = sunOff + x * L;
    let valid = 0;
    let hours = 0;
    for (let j = 0; j < L; j++) {
      valid += hist[sunOff + j];
      hours += hist[off + j];
    }
    out.valid[slot] = valid;
    out.hours[slot] = hours;
    if (need !== undefined && need[slot] === 0) continue;
    const e = estimateFromHistogram(WBGT_BIN_EDGES, hist.subarray(off, off + L), s.kernel, fixed);
    out.above[slot] = e.hoursAbove;
    out.lost[slot] = paired ? lostRestingInShade(hist, off, sunOff + L, s.kernel, e.hours) : e.hoursLost;
  }
  return out;
}

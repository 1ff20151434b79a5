/**
 * The layout of one shard's partial: which figures are counted per cell and month, in which
 * order, and the histogram bins. Every count is an integer so that partials merge exactly, in any
 * order (DESIGN.md §3): hours are whole hours, hours lost are milli-hours, temperature sums are
 * centi-degrees held in Float64 (exact below 2^53).
 *
 * Index order of the per-evaluation arrays: `((cell * 12 + month) * nEval + e)`, with `e` the index
 * into `ResolvedWork.evaluations` (class × acclimatization × exposure, pipeline/work/work-settings.ts).
 */
import { WBGT_BIN_EDGES, WBGT_HISTOGRAM_LENGTH, wbgtBinIndex } from '../work/wbgt-bins.ts';
import type { KjellstromIntensity } from '../work/capacity-loss.ts';

/** Months per year; month index 0 = January (local time of the atlas). */
export const MONTHS = 12;
/** Local hours of the day. */
export const HOURS = 24;
/**
 * Exposures of the WBGT histograms (and the first two of every partial's per-exposure counts):
 * 0 = sun, 1 = shade. A build that counts the shelter exposure adds it as index 2 of the
 * per-cell counts (sums, maxima, capacity loss; `ShardPartial.exposures`), not to the histograms.
 */
export const EXPOSURE_INDEX = { sun: 0, shade: 1 } as const;
export const N_EXPOSURES = 2;

/** Milli-hours per hour: hours lost are counted in these integer units. */
export const MILLI = 1000;
/** Centi-degrees per degree: temperature sums and maxima are counted in these. */
export const CENTI = 100;

/**
 * The capacity-loss views counted per exposure (docs/methods.md §9): Kjellstrom et al. 2018 at 200,
 * 300 and 400 W, and Dunne et al. 2013 (heavy work). Order of the loss index `l`.
 */
export const LOSS_VIEWS: ReadonlyArray<{ id: string; label: string; intensity?: KjellstromIntensity }> = [
  { id: 'kjellstrom-200w', label: 'Capacity loss, Kjellstrom et al. 2018, 200 W', intensity: 200 },
  { id: 'kjellstrom-300w', label: 'Capacity loss, Kjellstrom et al. 2018, 300 W', intensity: 300 },
  { id: 'kjellstrom-400w', label: 'Capacity loss, Kjellstrom et al. 2018, 400 W', intensity: 400 },
  { id: 'dunne-heavy', label: 'Capacity loss, Dunne et al. 2013, heavy work' },
];
export const N_LOSS = LOSS_VIEWS.length;

/**
 * Histogram bins of the partials: the work model's layout (pipeline/work/wbgt-bins.ts), 0.25 °C
 * bins from 5 to 45 °C plus the two open end bins. With them the calculator's estimate for a
 * small region's month of shift hours stays within 1 % of the hours of the hourly computation
 * (test/reduce/accumulator.test.ts); 0.5 °C bins missed that budget for single cells.
 */
export const HIST_EDGES: Float64Array = WBGT_BIN_EDGES;
/** Length of one histogram: closed bins + two open bins. */
export const HIST_LEN = WBGT_HISTOGRAM_LENGTH;

/** Histogram index of a WBGT value [°C]: 0 below 5 °C, HIST_LEN − 1 at or above 45 °C, −1 for NaN. */
export const histIndex = wbgtBinIndex;

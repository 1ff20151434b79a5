/**
 * The WBGT bin layout we recommend for histograms of hourly WBGT (e.g. per month × local hour, for
 * the browser calculator): 0.25 °C bins from 5 °C to 45 °C, plus one open bin below 5 °C and one
 * open bin at or above 45 °C.
 *
 * Why this range: the lowest measured-WBGT threshold the work model produces is the limit minus
 * the clothing adjustment; the lowest limits are about 18 °C (ISO 7243:1989, unacclimatized, very
 * high work, still air) and the largest tabulated clothing value with hood is 12 °C-WBGT, so 5 °C
 * keeps every threshold inside the bins (histogram-estimate.ts refuses thresholds outside). At
 * 45 °C the same-place work fraction is 0 for every class and any rest rate above 12 W (the limit
 * curves fall to 45 °C near 10 W), so nothing is lost by an open top bin there. A bin 0.25 °C wide keeps the estimate within a small fraction of an hour per month of
 * the hourly answer (test/work/histogram-estimate.test.ts).
 *
 * Counts layout: `counts.length = edges.length + 1`; `counts[0]` holds values below `edges[0]`,
 * `counts[j]` (1 ≤ j ≤ edges.length − 1) holds [edges[j−1], edges[j]), and the last entry holds
 * values ≥ the last edge. NaN values are not counted.
 */

/** Lower edge of the first closed bin [°C]. */
export const WBGT_BIN_LOWER = 5;
/** Bin width [°C]. */
export const WBGT_BIN_WIDTH = 0.25;
/** Number of closed bins (5 to 45 °C). */
export const WBGT_BIN_COUNT = 160;
/** Upper edge of the last closed bin [°C]. */
export const WBGT_BIN_UPPER = WBGT_BIN_LOWER + WBGT_BIN_COUNT * WBGT_BIN_WIDTH;
/** Length of a counts array in this layout (closed bins + two open end bins). */
export const WBGT_HISTOGRAM_LENGTH = WBGT_BIN_COUNT + 2;

/** The bin edges [°C]: 161 values 5, 5.25, …, 45 (exact in binary floating point). */
export const WBGT_BIN_EDGES: Float64Array = Float64Array.from({ length: WBGT_BIN_COUNT + 1 }, (_, i) => WBGT_BIN_LOWER + i * WBGT_BIN_WIDTH);

/** Index into a counts array for a WBGT value [°C]: 0 below 5 °C, 161 at or above 45 °C, −1 for NaN. */
export function wbgtBinIndex(wbgt: number): number {
  if (wbgt !== wbgt) return -1;
  if (wbgt < WBGT_BIN_LOWER) return 0;
  if (wbgt >= WBGT_BIN_UPPER) return WBGT_BIN_COUNT + 1;
  return 1 + Math.floor((wbgt - WBGT_BIN_LOWER) / WBGT_BIN_WIDTH);
}

/**
 * Adds hourly WBGT values [°C] into `counts` (length {@link WBGT_HISTOGRAM_LENGTH}); when `mask` is
 * given only entries with mask[i] = 1 are added (e.g. in-shift hours). No allocation.
 */
export function addToWbgtHistogram(counts: Uint32Array | Float64Array, wbgt: Float32Array | Float64Array, mask: Uint8Array | null = null): void {
  for (let i = 0; i < wbgt.length; i++) {
    if (mask !== null && mask[i] !== 1) continue;
    const j = wbgtBinIndex(wbgt[i]);
    if (j >= 0) counts[j]++;
  }
}

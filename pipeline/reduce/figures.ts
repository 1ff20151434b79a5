/**
 * From merged yearly counts to per-year figures: the numbers the atlas publishes, per cell, month
 * (0–11, and 12 = the whole year) and combination (evaluation, exposure or loss view). Pure:
 * counts in, Float64Arrays out.
 */
import type { YearCounts } from './merge.ts';
import { CENTI, LOSS_VIEWS, MILLI, MONTHS, N_LOSS } from './layout.ts';

/** Months plus the whole year: index 12 is the annual figure. */
export const PERIODS = MONTHS + 1;
export const ANNUAL = MONTHS;

/** How a figure's annual value is made from its months. */
type Annual = 'sum' | 'hour-weighted-mean' | 'max';

export interface FigureDef {
  /** Stable id used in file names and CSV rows, e.g. `hours-lost-shift`. */
  id: string;
  /** Plain description for tables and the methods page. */
  label: string;
  /** Units of the values. */
  units: string;
  /** Labels of the combinations (evaluation keys, exposures or loss views). */
  combos: string[];
  annual: Annual;
}

/**
 * One figure's values in one year: values[(cell * PERIODS + period) * nCombo + combo], NaN where
 * the cell's period does not count (more than `maxMissingHours` of its hours missing, the
 * completeness rule of pipeline/climate/completeness.ts) or has no value.
 */
export interface YearFigure {
  def: FigureDef;
  values: Float64Array;
}

/**
 * The figures of a build: `evalKeys` its evaluations, `exposures` the exposures it counts
 * (ShardPartial.exposures; sun and shade, and the shelter when built).
 */
export function figureDefs(evalKeys: string[], exposures: readonly string[] = ['sun', 'shade']): FigureDef[] {
  const loss = exposures.flatMap((x) => LOSS_VIEWS.map((l) => `${l.id}.${x}`));
  return [
    { id: 'hours-above-limit-shift', label: 'Shift hours with WBGT above the limit', units: 'h', combos: evalKeys, annual: 'sum' },
    { id: 'hours-above-limit-all', label: 'Hours (day and night) with WBGT above the limit', units: 'h', combos: evalKeys, annual: 'sum' },
    { id: 'hours-lost-shift', label: 'Shift hours lost to the rest breaks the limit requires, per worker', units: 'h', combos: evalKeys, annual: 'sum' },
    { id: 'capacity-loss-shift', label: 'Shift hours of work capacity lost (loss functions)', units: 'h', combos: loss, annual: 'sum' },
    { id: 'wbgt-mean', label: 'Mean hourly WBGT', units: 'degC', combos: [...exposures], annual: 'hour-weighted-mean' },
    { id: 'wbgt-max', label: 'Highest hourly WBGT', units: 'degC', combos: [...exposures], annual: 'max' },
    { id: 'air-temperature-mean', label: 'Mean air temperature', units: 'degC', combos: ['air'], annual: 'hour-weighted-mean' },
  ];
}

/**
 * The figures of one merged year, masked by completeness: a period's value is NaN when its
 * expected hours exceed its valid hours by more than `maxMissingHours` [h] (the annual period too).
 * @param yc merged counts of one year over some cells
 * @param maxMissingHours most hours a period may lack and still count [h]
 */
export function yearFigures(yc: YearCounts, maxMissingHours: number): YearFigure[] {
  const nCells = yc.cells.length;
  const nE = yc.evalKeys.length;
  const nX = yc.exposures.length;
  return figureDefs(yc.evalKeys, yc.exposures).map((def) => {
    const nC = def.combos.length;
    const v = new Float64Array(nCells * PERIODS * nC).fill(NaN);
    const valid = new Float64Array(PERIODS);
    const expected = new Float64Array(PERIODS);
    for (let c = 0; c < nCells; c++) {
      let validYear = 0;
      let expectedYear = 0;
      for (let m = 0; m < MONTHS; m++) {
        const cm = c * MONTHS + m;
        const hoursValid = def.id === 'air-temperature-mean' ? yc.airHours[cm] : yc.validHours[cm];
        valid[m] = hoursValid;
        expected[m] = yc.expectedHours[m];
        validYear += hoursValid;
        expectedYear += yc.expectedHours[m];
        for (let k = 0; k < nC; k++) v[(c * PERIODS + m) * nC + k] = monthValue(def.id, yc, cm, k, nE, nX, hoursValid);
      }
      valid[ANNUAL] = validYear;
      expected[ANNUAL] = expectedYear;
      for (let k = 0; k < nC; k++) {
        let acc = def.annual === 'max' ? -Infinity : 0;
        let w = 0;
        for (let m = 0; m < MONTHS; m++) {
          const x = v[(c * PERIODS + m) * nC + k];
          if (def.annual === 'sum') acc += x;
          else if (def.annual === 'max') acc = x > acc ? x : acc;
          else if (x === x) {
            acc += x * valid[m];
            w += valid[m];
          }
        }
        v[(c * PERIODS + ANNUAL) * nC + k] = def.annual === 'hour-weighted-mean' ? (w > 0 ? acc / w : NaN) : acc === -Infinity ? NaN : acc;
      }
      // A period that misses too many hours does not count, for the cell and for its regions.
      for (let p = 0; p < PERIODS; p++) {
        if (expected[p] - valid[p] <= maxMissingHours) continue;
        for (let k = 0; k < nC; k++) v[(c * PERIODS + p) * nC + k] = NaN;
      }
    }
    return { def, values: v };
  });
}

function monthValue(id: string, yc: YearCounts, cm: number, k: number, nE: number, nX: number, hours: number): number {
  switch (id) {
    case 'hours-above-limit-shift':
      return yc.aboveShift[cm * nE + k];
    case 'hours-above-limit-all':
      return yc.aboveAll[cm * nE + k];
    case 'hours-lost-shift':
      return yc.lostShift[cm * nE + k] / MILLI;
    case 'capacity-loss-shift': {
      const x = Math.floor(k / N_LOSS);
      const l = k % N_LOSS;
      return yc.capacityLoss[(cm * nX + x) * N_LOSS + l] / MILLI;
    }
    case 'wbgt-mean':
      return hours > 0 ? yc.wbgtSum[cm * nX + k] / hours / CENTI : NaN;
    case 'wbgt-max':
      return hours > 0 ? yc.wbgtMax[cm * nX + k] / CENTI : NaN;
    case 'air-temperature-mean':
      return hours > 0 ? yc.airSum[cm] / hours / CENTI : NaN;
    default:
      throw new Error(`unknown figure ${id}`);
  }
}

/**
 * Shift hours per cell and period of one merged year (the hours of the shift pattern that were
 * computed), masked by completeness as {@link yearFigures} masks its figures: values[c · PERIODS + p] [h].
 * The yardstick of the share of work time lost (pipeline/regions/person-hours.ts).
 */
export function shiftHourValues(yc: YearCounts, maxMissingHours: number): Float64Array {
  const nCells = yc.cells.length;
  const v = new Float64Array(nCells * PERIODS);
  for (let c = 0; c < nCells; c++) {
    let year = 0;
    let valid = 0;
    let expected = 0;
    for (let m = 0; m < MONTHS; m++) {
      const cm = c * MONTHS + m;
      const h = yc.shiftHours[cm];
      v[c * PERIODS + m] = h;
      year += h;
      valid += yc.validHours[cm];
      expected += yc.expectedHours[m];
      if (yc.expectedHours[m] - yc.validHours[cm] > maxMissingHours) v[c * PERIODS + m] = NaN;
    }
    v[c * PERIODS + ANNUAL] = expected - valid > maxMissingHours ? NaN : year;
  }
  return v;
}

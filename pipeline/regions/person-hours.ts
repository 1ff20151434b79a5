/**
 * Hours lost weighted by people: person-hours, full-time equivalents and the share of outdoor work
 * time lost (issue 17). Our definitions, on the usual pattern of national estimates that weight
 * hours per worker by the number of workers (common practice, no source):
 *
 *   person-hours(region, class) = P · Σ_e w_{c,e} · h̄_e
 *     P    people of the region: Σ over its land cells of people(cell) · share of the cell inside it
 *     w_{c,e}  class c's weight of evaluation e: share_c · (a or 1 − a) · (s or 1 − s) (workforce-shares.ts)
 *     h̄_e  hours per worker of evaluation e, the people-weighted mean over the region's cells
 *          (Σ_cell p_cell · h_{cell,e} / Σ p_cell, p_cell = people(cell) · share of the cell inside)
 *   so person-hours = Σ_cell p_cell · Σ_e w_{c,e} · h_{cell,e}: people × share × hours per worker.
 *   full-time equivalents = person-hours lost / H_year, H_year the hours of a year of the shift
 *     pattern (pipeline/work/shifts.ts annualShiftHours);
 *   share of outdoor work time lost = person-hours lost / (P · share_c · h̄_shift) · 100 %,
 *     h̄_shift the people-weighted mean of the shift hours in the period.
 * Per grid cell the map shows person-hours lost per km² of the cell:
 *   people(cell) · Σ_e w_{profile(cell),e} · h_{cell,e} / A(cell).
 *
 * Pure: arrays in, arrays out. Periods are the 12 months and the year (reduce/figures.ts).
 */
import { PERIODS, type FigureDef } from '../reduce/figures.ts';
import type { ShareProfile } from './workforce-shares.ts';

/** The combination of the per-cell figure and of the all-classes rows: every class, by the shares. */
export const ALL_CLASSES = 'all';

/** Id of the per-cell figure: person-hours lost per km² of the cell. */
export const PERSON_HOURS_DENSITY = 'person-hours-lost-density';

/** The per-cell figure (mapped, in the region tables as an area-weighted mean). */
export function personHoursDensityDef(): FigureDef {
  return {
    id: PERSON_HOURS_DENSITY,
    label:
      'Shift person-hours lost to the rest breaks the limit requires, per km² of the grid cell (people of the workforce raster × outdoor-work shares × hours per worker)',
    units: 'person-h km-2',
    combos: [ALL_CLASSES],
    annual: 'sum',
  };
}

/** The region figures: combinations are the classes, then `all`. */
export function workforceRegionDefs(classIds: readonly string[]): FigureDef[] {
  const combos = [...classIds, ALL_CLASSES];
  return [
    {
      id: 'person-hours-above-limit-shift',
      label: "Shift person-hours with WBGT above the limit, over the region's outdoor workers",
      units: 'person-h',
      combos,
      annual: 'sum',
    },
    {
      id: 'person-hours-lost-shift',
      label: "Shift person-hours lost to the rest breaks the limit requires, over the region's outdoor workers",
      units: 'person-h',
      combos,
      annual: 'sum',
    },
    {
      id: 'full-time-equivalents-lost',
      label: 'Full-time equivalents lost: person-hours lost / the hours of a year of the shift pattern',
      units: 'FTE',
      combos,
      annual: 'sum',
    },
    { id: 'outdoor-work-time-lost', label: "Share of the outdoor workers' shift time lost to rest breaks", units: '%', combos, annual: 'sum' },
  ];
}

/**
 * Person-hours lost per km² of each cell, per period.
 * @param lost hours lost per worker, per cell × period × evaluation: lost[(c · PERIODS + p) · nEval + e] [h], NaN = no value
 * @param people people assigned to each cell [people]
 * @param profile each cell's share profile (index into `weights`), −1 = none (no value)
 * @param weights per profile, per evaluation: the weights w_e (nProfiles × nEval) [1]
 * @param areaKm2 each cell's area [km²]
 * @returns per cell × period [person-h km⁻²], NaN without a value
 */
export function personHoursDensity(
  lost: Float64Array,
  nEval: number,
  people: Float64Array,
  profile: Int32Array,
  weights: Float64Array,
  areaKm2: Float64Array,
): Float64Array {
  const nCells = people.length;
  const out = new Float64Array(nCells * PERIODS).fill(NaN);
  for (let c = 0; c < nCells; c++) {
    const pr = profile[c];
    if (pr < 0) continue;
    const w0 = pr * nEval;
    const scale = people[c] / areaKm2[c];
    for (let p = 0; p < PERIODS; p++) {
      const row = (c * PERIODS + p) * nEval;
      let h = 0;
      for (let e = 0; e < nEval; e++) {
        const w = weights[w0 + e];
        if (w > 0) h += w * lost[row + e];
      }
      out[c * PERIODS + p] = scale * h;
    }
  }
  return out;
}

/** A region's people-weighted hours per worker, per year, from the merge bands' sums. */
export interface RegionWorkforceHours {
  nYears: number;
  nEval: number;
  /** Hours above the limit and hours lost per worker, per year × period × evaluation [h], NaN = no value. */
  above: Float64Array;
  lost: Float64Array;
  /** Shift hours per worker, per year × period [h], NaN = no value. */
  shift: Float64Array;
}

/**
 * The region's workforce figures per year, in the order and combinations of
 * {@link workforceRegionDefs}: values[(y · PERIODS + p) · nCombo + k] per figure.
 * @param people the region's people P [people]
 * @param profile the region's share profile
 * @param annualHours hours of a year of the shift pattern [h]
 */
export function regionWorkforceYears(hours: RegionWorkforceHours, people: number, profile: ShareProfile, annualHours: number): Float64Array[] {
  const { nYears, nEval } = hours;
  const nC = profile.classes.length;
  const nK = nC + 1;
  const n = nYears * PERIODS * nK;
  const above = new Float64Array(n);
  const lost = new Float64Array(n);
  const fte = new Float64Array(n);
  const share = new Float64Array(n);
  // Σ_e w·h over the evaluations with weight, NaN when one of them has no value.
  const mix = (h: Float64Array, w: Float64Array, row: number) => {
    let s = 0;
    for (let e = 0; e < nEval; e++) if (w[e] > 0) s += w[e] * h[row + e];
    return s;
  };
  for (let y = 0; y < nYears; y++) {
    for (let p = 0; p < PERIODS; p++) {
      const row = (y * PERIODS + p) * nEval;
      const shiftHours = hours.shift[y * PERIODS + p];
      const at = (y * PERIODS + p) * nK;
      let sumAbove = 0;
      let sumLost = 0;
      for (let c = 0; c <= nC; c++) {
        const w = c < nC ? profile.classEvalWeights[c] : profile.evalWeights;
        const a = c < nC ? people * mix(hours.above, w, row) : sumAbove;
        const l = c < nC ? people * mix(hours.lost, w, row) : sumLost;
        if (c < nC) {
          sumAbove += a;
          sumLost += l;
        }
        const workers = people * (c < nC ? profile.classes[c].share : profile.total);
        above[at + c] = a;
        lost[at + c] = l;
        fte[at + c] = l / annualHours;
        share[at + c] = workers > 0 && shiftHours > 0 ? (100 * l) / (workers * shiftHours) : NaN;
      }
    }
  }
  return [above, lost, fte, share];
}

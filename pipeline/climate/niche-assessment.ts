/**
 * Per cell: MAT over the baseline and over the latest years, the niche class of each, their
 * distance to the main mode (13 °C), the shift between them, and whether each is near a
 * boundary (docs/methods.md §11). MAT over a period is the mean of the annual means of the years that
 * count; a period needs ⌈minYearShare · length⌉ such years (80 % by default, WMO-No. 1203 spirit,
 * from memory). Lenton et al. (2023) average MAT over 20-year intervals; a baseline of 20–30
 * years matches that, a short "latest" period (e.g. 5 years) is noisier and is labelled so.
 */
import { MONTHLY_COMPLETENESS, type CompletenessRule } from './completeness.ts';
import { computeNormals } from './normals.ts';
import { distanceToMainMode, nearNicheBoundary, nicheClassCode } from './niche.ts';
import type { YearPeriod } from './year-stack.ts';

export interface NicheInput {
  /** Calendar year of each row, strictly ascending [year]. */
  years: ArrayLike<number>;
  /** Annual mean temperature per year × cell, year-major [°C]; NaN where the year is incomplete. */
  annualMean: Float64Array;
  nCells: number;
  /** Baseline period, e.g. [1991, 2020] [year]. */
  baseline: YearPeriod;
  /** The latest years to compare, e.g. [2020, 2024] [year]. */
  latest: YearPeriod;
  /** Only `minYearShare` is used here; default 0.8. */
  rule?: CompletenessRule;
}

/** One array entry per cell. Class arrays hold codes into NICHE_CLASSES (255 = none). */
export interface NicheAssessment {
  /** MAT over the baseline [°C]. */
  baselineMat: Float64Array;
  /** MAT over the latest years [°C]. */
  latestMat: Float64Array;
  /** latestMat − baselineMat [°C]. */
  shift: Float64Array;
  baselineClass: Uint8Array;
  latestClass: Uint8Array;
  /** MAT − 13 °C for each period [°C]. */
  baselineDistance: Float64Array;
  latestDistance: Float64Array;
  /** 1 where the MAT lies within 0.5 °C of a class boundary [flag]. */
  baselineNearBoundary: Uint8Array;
  latestNearBoundary: Uint8Array;
  /** Years that counted in each period [years]. */
  baselineYears: Uint16Array;
  latestYears: Uint16Array;
}

/** MAT against the niche for every cell, baseline and latest years. */
export function assessNiche(input: NicheInput): NicheAssessment {
  const rule = input.rule ?? MONTHLY_COMPLETENESS;
  const stack = { years: input.years, values: input.annualMean, nItems: input.nCells };
  const base = computeNormals(stack, { baseline: input.baseline, rule });
  const late = computeNormals(stack, { baseline: input.latest, rule });
  const n = input.nCells;
  const shift = new Float64Array(n);
  const baselineClass = new Uint8Array(n);
  const latestClass = new Uint8Array(n);
  const baselineDistance = new Float64Array(n);
  const latestDistance = new Float64Array(n);
  const baselineNearBoundary = new Uint8Array(n);
  const latestNearBoundary = new Uint8Array(n);
  for (let c = 0; c < n; c++) {
    const a = base.mean[c];
    const b = late.mean[c];
    shift[c] = b - a;
    baselineClass[c] = nicheClassCode(a);
    latestClass[c] = nicheClassCode(b);
    baselineDistance[c] = distanceToMainMode(a);
    latestDistance[c] = distanceToMainMode(b);
    baselineNearBoundary[c] = nearNicheBoundary(a) ? 1 : 0;
    latestNearBoundary[c] = nearNicheBoundary(b) ? 1 : 0;
  }
  return {
    baselineMat: base.mean,
    latestMat: late.mean,
    shift,
    baselineClass,
    latestClass,
    baselineDistance,
    latestDistance,
    baselineNearBoundary,
    latestNearBoundary,
    baselineYears: base.yearsUsed,
    latestYears: late.yearsUsed,
  };
}

/**
 * Screening limits of WBGT as a function of the time-weighted metabolic rate, two models:
 *
 * - `curve-2017`: continuous curves, M in W, 1-hour time-weighted averages
 *   (docs/methods.md §8.2–§8.3; NIOSH 2016 REL/RAL, same form in ISO 7243:2017):
 *   acclimatized `L = 56.7 − 11.5·log10 M`, unacclimatized `L = 59.9 − 14.1·log10 M`.
 * - `table-1989`: the ISO 7243:1989 reference values per metabolic-rate class (docs/methods.md §8.3),
 *   with or without perceptible air movement for classes 3 and 4. Our rule (documented in the
 *   README): each table value belongs to its class's typical rate (115 / 180 / 300 / 415 / 520 W,
 *   docs/methods.md §8.1), the limit is linear in M between those rates, and flat below 115 W and above
 *   520 W. At the five typical rates this gives exactly the table; between them it avoids the
 *   jumps of a class step, so the work fraction (work-fraction.ts) varies smoothly.
 */

/** Which limit model. */
/** Largest metabolic rate accepted [W]; above this a value is treated as a mistake (e.g. kcal/h). */
export const MAX_METABOLIC_RATE_W = 1000;

export type LimitModelId = 'curve-2017' | 'table-1989';
/** Acclimatization state of the workers. */
export type Acclimatization = 'acclimatized' | 'unacclimatized';

export const LIMIT_MODELS: readonly LimitModelId[] = ['curve-2017', 'table-1989'];
export const ACCLIMATIZATION_STATES: readonly Acclimatization[] = ['acclimatized', 'unacclimatized'];

/** A limit: model, acclimatization, and (table only) whether there is perceptible air movement. */
export interface LimitChoice {
  model: LimitModelId;
  acclimatization: Acclimatization;
  /** Only for `table-1989`: use the "air movement" column for classes 3 and 4. Default false. */
  airMovement?: boolean;
}

/**
 * Coefficients of `L = intercept − slope·log10(M)` [°C-WBGT, M in W] (docs/methods.md §8.2;
 * NIOSH 2016-106 REL and RAL).
 */
export const LIMIT_CURVE_2017: Readonly<Record<Acclimatization, { intercept: number; slope: number }>> = {
  acclimatized: { intercept: 56.7, slope: 11.5 },
  unacclimatized: { intercept: 59.9, slope: 14.1 },
};

/**
 * Continuous limit curve [°C-WBGT] at time-weighted metabolic rate `metabolicRate` [W]
 * (docs/methods.md §8.2; NIOSH 2016 REL/RAL; ISO 7243:2017 form).
 */
export function limitCurve2017(metabolicRate: number, acclimatization: Acclimatization): number {
  const c = LIMIT_CURVE_2017[acclimatization];
  return c.intercept - c.slope * Math.log10(metabolicRate);
}

/** Typical rates of ISO classes 0–4 [W] at which the 1989 table values are placed (docs/methods.md §8.1). */
export const TABLE_1989_RATES: readonly number[] = [115, 180, 300, 415, 520];

/**
 * ISO 7243:1989 reference WBGT values [°C] for classes 0–4 (docs/methods.md §8.3, from the ISO 7243:1989
 * table as reproduced in an instrument manual, read). `still` = no perceptible air movement,
 * `moving` = perceptible air movement (differs for classes 3 and 4 only).
 */
export const TABLE_1989_LIMITS: Readonly<Record<Acclimatization, { still: readonly number[]; moving: readonly number[] }>> = {
  acclimatized: { still: [33, 30, 28, 25, 23], moving: [33, 30, 28, 26, 25] },
  unacclimatized: { still: [32, 29, 26, 22, 18], moving: [32, 29, 26, 23, 20] },
};

/** The knots of the 1989 table model: rates [W] and limits [°C-WBGT]. */
export function table1989Knots(acclimatization: Acclimatization, airMovement = false): { rates: readonly number[]; limits: readonly number[] } {
  const t = TABLE_1989_LIMITS[acclimatization];
  return { rates: TABLE_1989_RATES, limits: airMovement ? t.moving : t.still };
}

/**
 * ISO 7243:1989 table model [°C-WBGT] at metabolic rate `metabolicRate` [W]: linear between the
 * class typical rates, flat outside 115–520 W (our rule, see file comment; values docs/methods.md §8.3).
 */
export function limitTable1989(metabolicRate: number, acclimatization: Acclimatization, airMovement = false): number {
  const { rates, limits } = table1989Knots(acclimatization, airMovement);
  return piecewiseLinear(rates, limits, metabolicRate);
}

/** Limit [°C-WBGT] at metabolic rate `metabolicRate` [W] for any model. */
export function limitWbgt(metabolicRate: number, choice: LimitChoice): number {
  return choice.model === 'curve-2017'
    ? limitCurve2017(metabolicRate, choice.acclimatization)
    : limitTable1989(metabolicRate, choice.acclimatization, choice.airMovement ?? false);
}

/** Linear interpolation in increasing `xs`, held flat outside [xs[0], xs[n−1]]. */
export function piecewiseLinear(xs: readonly number[], ys: readonly number[], x: number): number {
  const n = xs.length;
  if (x <= xs[0]) return ys[0];
  if (x >= xs[n - 1]) return ys[n - 1];
  let i = 1;
  while (xs[i] < x) i++;
  const t = (x - xs[i - 1]) / (xs[i] - xs[i - 1]);
  return ys[i - 1] + t * (ys[i] - ys[i - 1]);
}

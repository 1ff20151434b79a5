/**
 * The delta change method: a what-if climate made from the record by shifting every hour of a
 * month by that month's change at the cell (docs/methods.md §16). The record's day-to-day and
 * hour-to-hour weather is kept; only the monthly means change. Applied to the hourly fields
 * before the WBGT physics; pure, arrays in place.
 *
 * Per hour of local month m at a cell with changes ΔT, Δh, Δs (pipeline/scenario/cell-change.ts):
 * - air temperature: T' = T + ΔT;
 * - humidity, `relative`: RH' = RH + Δh/100 (RH = e_s(T_d)/e_s(T) with T_d ≤ T; Δh in percentage
 *   points, 0 when the file has none: RH kept), then e' = RH'·e_s(T') and T_d' = e_s⁻¹(e'):
 *   in the Magnus form of Buck (1981), with g(x) = b·x/(x + c), ln RH = g(T_d) − g(T) and
 *   T_d' = c·z/(b − z), z = ln RH' + g(T') (docs/methods.md §3.1, eq. 16.2), the one Buck table of constants.ts;
 * - humidity, `specific`: q' = q·(1 + Δh), q = ε·e/(p − (1 − ε)·e) with the model's vapour pressure
 *   e = f_w·e_s(T_d) (Δh = 0: q kept), e' = q'·p/(ε + (1 − ε)·q'), T_d' = e_s⁻¹(e'/f_w);
 * - either way RH' above 1 (supersaturation) is clamped to 1 and below {@link SCENARIO_RH_FLOOR}
 *   to that floor, and each clamp is counted (never silent);
 * - solar radiation, global and direct: S' = S·(1 + Δs), so the direct fraction is kept;
 * - pressure and wind unchanged.
 * A cell-month with ΔT = 0 and Δh = 0 keeps its temperature and dew point exactly (they are not
 * recomputed), and Δs = 0 keeps the radiation exactly: a zero change gives the record itself.
 */
import { BUCK_1981, EPSILON_WATER_AIR, MOIST_AIR_FACTOR, SCENARIO_RH_FLOOR } from './constants.ts';

const { a: A, b: B, c: C } = BUCK_1981;
const EPS = EPSILON_WATER_AIR;
const LN_FLOOR = Math.log(SCENARIO_RH_FLOOR);

/** How a scenario's humidity change is given (pipeline/read/change-file.ts). */
export type HumidityChange = 'relative' | 'specific';

/** Clamps made while applying changes [cell-hours]: relative humidity above 100 % and below the floor. */
export interface ChangeCounts {
  humidityClampedHigh: number;
  humidityClampedLow: number;
}

export function emptyChangeCounts(): ChangeCounts {
  return { humidityClampedHigh: 0, humidityClampedLow: 0 };
}

export function addChangeCounts(a: ChangeCounts, b: ChangeCounts): ChangeCounts {
  a.humidityClampedHigh += b.humidityClampedHigh;
  a.humidityClampedLow += b.humidityClampedLow;
  return a;
}

/** g(x) = b·x/(x + c), the exponent of the Buck (1981) Magnus form [–]. @param x temperature [°C] */
function g(x: number): number {
  return (B * x) / (x + C);
}

/** Dew point from z = ln(e/(f_w·a)) [°C] (inverse of the Magnus form). */
function dewFromZ(z: number): number {
  return (C * z) / (B - z);
}

/**
 * The dew point after a change with relative humidity as the humidity quantity [°C]; clamps are
 * counted in `counts` (index 0: above 100 %, 1: below the floor).
 * @param t air temperature before [°C]; @param td dew point before [°C] (taken as at most t)
 * @param tNew air temperature after [°C]; @param dRh change of relative humidity [percentage points]
 */
export function dewPointAfterRelativeChange(t: number, td: number, tNew: number, dRh: number, counts: Float64Array): number {
  const lnRh = g(td < t ? td : t) - g(t);
  let z: number;
  if (dRh === 0) z = lnRh + g(tNew);
  else {
    let rh = Math.exp(lnRh) + dRh / 100;
    if (rh > 1) {
      rh = 1;
      counts[0]++;
    } else if (rh < SCENARIO_RH_FLOOR) {
      rh = SCENARIO_RH_FLOOR;
      counts[1]++;
    }
    z = Math.log(rh) + g(tNew);
  }
  return dewFromZ(z);
}

/**
 * The dew point after a change with specific humidity as the humidity quantity [°C]; clamps are
 * counted in `counts` as for {@link dewPointAfterRelativeChange}.
 * @param t, td, tNew as there [°C]; @param p surface pressure [hPa] (kept)
 * @param dq relative change of specific humidity, q'/q − 1 [–], above −1
 */
export function dewPointAfterSpecificChange(t: number, td: number, tNew: number, dq: number, p: number, counts: Float64Array): number {
  const tdIn = td < t ? td : t;
  // ln(e'/(f_w·a)) = z'; e = f_w·a·exp(g(T_d)).
  let z: number;
  if (dq === 0) z = g(tdIn);
  else {
    const e = MOIST_AIR_FACTOR * A * Math.exp(g(tdIn));
    const q = (EPS * e) / (p - (1 - EPS) * e);
    const q2 = q * (1 + dq);
    const e2 = (q2 * p) / (EPS + (1 - EPS) * q2);
    z = Math.log(e2 / (MOIST_AIR_FACTOR * A));
  }
  const zSat = g(tNew);
  if (z > zSat) {
    z = zSat;
    counts[0]++;
  } else if (z - zSat < LN_FLOOR) {
    z = zSat + LN_FLOOR;
    counts[1]++;
  } else if (dq === 0) return tdIn;
  return dewFromZ(z);
}

/** The hourly fields a change is applied to, time-major over `nCells` cells: `x[t · nCells + k]`. */
export interface ChangeFields {
  airTemperature: Float32Array;
  dewPointTemperature: Float32Array;
  surfacePressure: Float32Array;
  solarGlobal: Float32Array;
  solarDirect?: Float32Array;
}

/** Monthly changes per month × cell (pipeline/scenario/cell-change.ts). */
export interface MonthlyChanges {
  nCells: number;
  temperature: Float64Array;
  humidityKind: HumidityChange;
  humidity: Float64Array | null;
  solar: Float64Array | null;
}

/**
 * Applies monthly changes to `nHours` hours of `nCells` cells in place.
 * @param month local month of each hour (1–12) [–]
 * @param change the changes; cell k of the arrays is cell `offset + k` of `change`
 * @param counts clamps are added here
 */
export function applyMonthlyChange(
  f: ChangeFields,
  nCells: number,
  nHours: number,
  month: ArrayLike<number>,
  change: MonthlyChanges,
  offset: number,
  counts: ChangeCounts,
): void {
  const { airTemperature: air, dewPointTemperature: dew, surfacePressure: sp, solarGlobal: sg, solarDirect: sd } = f;
  const nc = change.nCells;
  const dT = change.temperature;
  const dH = change.humidity;
  const dS = change.solar;
  const specific = change.humidityKind === 'specific';
  const clamp = new Float64Array(2);
  for (let t = 0; t < nHours; t++) {
    const m0 = (month[t] - 1) * nc + offset;
    const row = t * nCells;
    for (let k = 0; k < nCells; k++) {
      const i = row + k;
      const ci = m0 + k;
      if (dS !== null) {
        const s = dS[ci];
        if (s !== 0) {
          sg[i] *= 1 + s;
          if (sd !== undefined) sd[i] *= 1 + s;
        }
      }
      const dt = dT[ci];
      const dh = dH !== null ? dH[ci] : 0;
      if (dt === 0 && dh === 0) continue;
      const ta = air[i];
      const td = dew[i];
      const tNew = ta + dt;
      air[i] = tNew;
      if (ta !== ta || td !== td) continue;
      dew[i] = specific ? dewPointAfterSpecificChange(ta, td, tNew, dh, sp[i], clamp) : dewPointAfterRelativeChange(ta, td, tNew, dh, clamp);
    }
  }
  counts.humidityClampedHigh += clamp[0];
  counts.humidityClampedLow += clamp[1];
}

/**
 * Tables of the wick balance's temperature-only factors, for speed. Each factor of the natural
 * wet-bulb balance that depends on temperature alone is tabulated once per process at 0.25 K
 * steps over 150–400 K with its analytic derivative, and read back by cubic Hermite
 * interpolation (relative error below 1e−8, checked in test/physics/property-tables.test.ts):
 * - `e_s(T)` [hPa]: Buck 1981 × 1.004 (METHODS.md §1.1);
 * - `Z(T) = (ΔH(T)/RATIO)·(Pr/Sc(T))^0.56` [K] (METHODS.md §3.2.2, §3.2.5; Sc = C·T^−0.834/Ω(T));
 * - `W(T) = (T·Ω(T))^−0.4` [K^−0.4], so that `h_w = C_w·W(T)` (METHODS.md §3.2.3).
 * Outside the table the exact formulas are used.
 */
import { RATIO, WICK_EXPONENT, MOIST_AIR_FACTOR, PRANDTL, R_AIR, M_AIR, M_H2O, SIGMA_LJ_AIR, EPS_K_AIR } from './constants.ts';

export const TABLE_T_MIN = 150;
export const TABLE_STEP = 0.25;
export const TABLE_N = 1001;
const INV_STEP = 1 / TABLE_STEP;

export const OMEGA_A = 1.048 + (0.034 * 2.9) / 0.4;
export const OMEGA_B = 0.034 / (0.4 * EPS_K_AIR);
export const C_MU = (2.6693e-6 * Math.sqrt(M_AIR)) / (SIGMA_LJ_AIR * SIGMA_LJ_AIR);
const TCRIT = 132 * 647.3;
const K_D =
  3.64e-4 * Math.pow(1 / Math.sqrt(TCRIT), 2.334) * Math.pow(36.4 * 218, 1 / 3) * Math.pow(TCRIT, 5 / 12) *
  Math.sqrt(1 / M_AIR + 1 / M_H2O) * 1013.25 * 1e-4;
const C_SC = (C_MU * R_AIR) / (100 * K_D);
const SC_EXP = 0.834;
const PR_SC = Math.pow(PRANDTL / C_SC, WICK_EXPONENT);
const ES_A = 6.1121 * MOIST_AIR_FACTOR;

/** e_s(T) [hPa] and d e_s/dT [hPa K⁻¹], exact. */
export function esExact(T: number): number {
  return ES_A * Math.exp((17.502 * (T - 273.15)) / (T - 32.18));
}
function esDeriv(T: number): number {
  return (esExact(T) * 17.502 * 240.97) / ((T - 32.18) * (T - 32.18));
}
/** Z(T) [K], exact. */
export function zExact(T: number): number {
  const omega = OMEGA_A - OMEGA_B * T;
  return ((1665134.5 + 2370 * T) / RATIO) * PR_SC * Math.exp(WICK_EXPONENT * (SC_EXP * Math.log(T) + Math.log(omega)));
}
function zDeriv(T: number): number {
  const omega = OMEGA_A - OMEGA_B * T;
  return zExact(T) * (2370 / (1665134.5 + 2370 * T) + WICK_EXPONENT * (SC_EXP / T - OMEGA_B / omega));
}
/** W(T) [K^−0.4], exact. */
export function wExact(T: number): number {
  return Math.exp(-0.4 * Math.log(T * (OMEGA_A - OMEGA_B * T)));
}
function wDeriv(T: number): number {
  const omega = OMEGA_A - OMEGA_B * T;
  return wExact(T) * -0.4 * (1 / T - OMEGA_B / omega);
}

function build(f: (t: number) => number, d: (t: number) => number): Float64Array {
  const tab = new Float64Array(2 * TABLE_N);
  for (let k = 0; k < TABLE_N; k++) {
    const T = TABLE_T_MIN + k * TABLE_STEP;
    tab[2 * k] = f(T);
    tab[2 * k + 1] = d(T) * TABLE_STEP;
  }
  return tab;
}

export const ES_TABLE = build(esExact, esDeriv);
export const Z_TABLE = build(zExact, zDeriv);
export const W_TABLE = build(wExact, wDeriv);

/**
 * Cubic Hermite read of a table at T [K]: value into `out[slot]`, derivative [per K] into
 * `out[slot + 1]`. Returns false outside the table (the caller then uses the exact formula).
 */
export function lookup(tab: Float64Array, T: number, out: Float64Array, slot: number): boolean {
  const u = (T - TABLE_T_MIN) * INV_STEP;
  if (!(u >= 0 && u < TABLE_N - 1)) return false;
  const k = u | 0;
  const t = u - k;
  const j = 2 * k;
  const f0 = tab[j];
  const m0 = tab[j + 1];
  const f1 = tab[j + 2];
  const m1 = tab[j + 3];
  const t2 = t * t;
  const t3 = t2 * t;
  out[slot + 1] = ((6 * t2 - 6 * t) * (f0 - f1) + (3 * t2 - 4 * t + 1) * m0 + (3 * t2 - 2 * t) * m1) * INV_STEP;
  out[slot] = (2 * t3 - 3 * t2 + 1) * f0 + (t3 - 2 * t2 + t) * m0 + (-2 * t3 + 3 * t2) * f1 + (t3 - t2) * m1;
  return true;
}

/** Exact forms with derivatives, for T outside the table. */
export const exact = { es: esExact, esDeriv, z: zExact, zDeriv, w: wExact, wDeriv };

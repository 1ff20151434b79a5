/**
 * Tables of the wick balance's temperature-only factors, for speed. Each factor of the natural
 * wet-bulb balance that depends on temperature alone is tabulated once per process at 0.25 K
 * steps over 150–400 K with its analytic derivative, and read back by cubic Hermite
 * interpolation (relative error below 1e−8, checked in test/physics/property-tables.test.ts):
 * - `e_s(T)` [hPa]: Buck 1981 × 1.004 (docs/methods.md §3.1);
 * - `Z(T) = (ΔH(T)/RATIO)·(Pr/Sc(T))^0.56` [K] (docs/methods.md §6.3, §6.6; Sc = C·T^−0.834/Ω(T));
 * - `W(T) = (T·Ω(T))^−0.4` [K^−0.4], so that `h_w = C_w·W(T)` (docs/methods.md §6.4).
 * Outside the table the exact formulas are used.
 *
 * The solver reads pairs of factors at one temperature from interleaved tables ({@link lookup2}):
 * Z with V = 1/W for the wick, the two parts of h_g for the globe, and e_s with the sky
 * emissivity at the dew point; and `(u·P)^0.6` of the wick coefficient from {@link pow12}.
 */
import {
  RATIO,
  WICK_EXPONENT,
  MOIST_AIR_FACTOR,
  PRANDTL,
  R_AIR,
  M_AIR,
  M_H2O,
  SIGMA_LJ_AIR,
  EPS_K_AIR,
  CP_AIR,
  D_GLOBE,
  BUCK_1981,
  KELVIN,
} from './constants.ts';

export const TABLE_T_MIN = 150;
export const TABLE_STEP = 0.25;
export const TABLE_N = 1001;
const INV_STEP = 1 / TABLE_STEP;

export const OMEGA_A = 1.048 + (0.034 * 2.9) / 0.4;
export const OMEGA_B = 0.034 / (0.4 * EPS_K_AIR);
export const C_MU = (2.6693e-6 * Math.sqrt(M_AIR)) / (SIGMA_LJ_AIR * SIGMA_LJ_AIR);
const TCRIT = 132 * 647.3;
const K_D =
  3.64e-4 * Math.pow(1 / Math.sqrt(TCRIT), 2.334) * Math.pow(36.4 * 218, 1 / 3) * Math.pow(TCRIT, 5 / 12) * Math.sqrt(1 / M_AIR + 1 / M_H2O) * 1013.25 * 1e-4;
const C_SC = (C_MU * R_AIR) / (100 * K_D);
const SC_EXP = 0.834;
const PR_SC = Math.pow(PRANDTL / C_SC, WICK_EXPONENT);
const ES_A = BUCK_1981.a * MOIST_AIR_FACTOR;
const ES_B = BUCK_1981.b;
/**
 * Buck's form in kelvin: `b·(T − 273.15)/(T − T_c)` with T_c = 273.15 − c [K] (32.18 K); the
 * solver's e_s derivatives use the same offset ({@link BUCK_T_OFFSET_K}).
 */
export const BUCK_T_OFFSET_K = KELVIN - BUCK_1981.c;
const ES_BC = BUCK_1981.b * BUCK_1981.c;

/** e_s(T) [hPa] and d e_s/dT [hPa K⁻¹], exact. */
export function esExact(T: number): number {
  return ES_A * Math.exp((ES_B * (T - KELVIN)) / (T - BUCK_T_OFFSET_K));
}
function esDeriv(T: number): number {
  return (esExact(T) * ES_BC) / ((T - BUCK_T_OFFSET_K) * (T - BUCK_T_OFFSET_K));
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

/**
 * Two functions of T interleaved per node (`[f, f'·h, g, g'·h]`), read together by
 * {@link lookup2}: where a balance needs two factors at the same temperature, one index serves both.
 */
function build2(f: (t: number) => number, df: (t: number) => number, g: (t: number) => number, dg: (t: number) => number): Float64Array {
  const tab = new Float64Array(4 * TABLE_N);
  for (let k = 0; k < TABLE_N; k++) {
    const T = TABLE_T_MIN + k * TABLE_STEP;
    tab[4 * k] = f(T);
    tab[4 * k + 1] = df(T) * TABLE_STEP;
    tab[4 * k + 2] = g(T);
    tab[4 * k + 3] = dg(T) * TABLE_STEP;
  }
  return tab;
}

/** `V(T) = 1/W(T) = (T·Ω(T))^0.4` [K^0.4], so that `1/h_w = V(T)/C_w` (docs/methods.md §6.4). */
export function vExact(T: number): number {
  return Math.exp(0.4 * Math.log(T * (OMEGA_A - OMEGA_B * T)));
}
function vDeriv(T: number): number {
  const omega = OMEGA_A - OMEGA_B * T;
  return vExact(T) * 0.4 * (1 / T - OMEGA_B / omega);
}

/** Cₖ/D_g with Cₖ = c_p + 1.25·R_air [J kg⁻¹ K⁻¹ m⁻¹] (k = Cₖ·μ, docs/methods.md §6.3). */
const CK_DG = (CP_AIR + 1.25 * R_AIR) / D_GLOBE;
/**
 * Globe heat-transfer factors: `h_g(T) = M(T) + c_g·R(T)` with `M = 2·(Cₖ/D_g)·μ(T)` (the Nu = 2
 * term) and `R = (Cₖ/D_g)/√(√T·Ω(T))` (the 0.6·Re^½·Pr^⅓ term without its per-cell factor c_g)
 * [W m⁻² K⁻¹ per unit factor] (docs/methods.md §6.3–§6.4).
 */
export function globeMExact(T: number): number {
  return (2 * CK_DG * C_MU * Math.sqrt(T)) / (OMEGA_A - OMEGA_B * T);
}
function globeMDeriv(T: number): number {
  return globeMExact(T) * (0.5 / T + OMEGA_B / (OMEGA_A - OMEGA_B * T));
}
export function globeRExact(T: number): number {
  return CK_DG / Math.sqrt(Math.sqrt(T) * (OMEGA_A - OMEGA_B * T));
}
function globeRDeriv(T: number): number {
  return globeRExact(T) * -0.5 * (0.5 / T - OMEGA_B / (OMEGA_A - OMEGA_B * T));
}

/** ε_a(T_d) = 0.575·e_s(T_d)^0.143 [–] (docs/methods.md §6.3) with e_s Buck 1981 × 1.004. */
export function emissivityExact(T: number): number {
  return 0.575 * Math.exp(0.143 * Math.log(esExact(T)));
}
function emissivityDeriv(T: number): number {
  return 0.143 * emissivityExact(T) * (esDeriv(T) / esExact(T));
}

/** `[Z, Z', V, V']` at the film temperature (wick balance). */
export const ZV_TABLE = build2(zExact, zDeriv, vExact, vDeriv);
/** `[M, M', R, R']` at the film temperature (globe balance). */
export const GLOBE_TABLE = build2(globeMExact, globeMDeriv, globeRExact, globeRDeriv);
/** `[e_s, e_s', ε_a, ε_a']` at the dew point (the cell's humidity and sky emissivity). */
export const DEW_TABLE = build2(esExact, esDeriv, emissivityExact, emissivityDeriv);

/**
 * Cubic Hermite read of a two-function table (`ZV_TABLE`, `GLOBE_TABLE`, `DEW_TABLE`) at T [K]:
 * f, f' [per K], g, g' [per K] into `out[slot … slot + 3]`. Returns false outside the table (the
 * caller then uses the exact forms).
 */
export function lookup2(tab: Float64Array, T: number, out: Float64Array, slot: number): boolean {
  const u = (T - TABLE_T_MIN) * INV_STEP;
  if (!(u >= 0 && u < TABLE_N - 1)) return false;
  const k = u | 0;
  const t = u - k;
  const j = 4 * k;
  const t2 = t * t;
  const t3 = t2 * t;
  // Hermite basis and its derivative, shared by both functions.
  const h00 = 2 * t3 - 3 * t2 + 1;
  const h10 = t3 - 2 * t2 + t;
  const h01 = 1 - h00;
  const h11 = t3 - t2;
  const d00 = (6 * t2 - 6 * t) * INV_STEP;
  const d10 = (3 * t2 - 4 * t + 1) * INV_STEP;
  const d11 = (3 * t2 - 2 * t) * INV_STEP;
  const f0 = tab[j];
  const fm0 = tab[j + 1];
  const g0 = tab[j + 2];
  const gm0 = tab[j + 3];
  const f1 = tab[j + 4];
  const fm1 = tab[j + 5];
  const g1 = tab[j + 6];
  const gm1 = tab[j + 7];
  out[slot] = h00 * f0 + h10 * fm0 + h01 * f1 + h11 * fm1;
  out[slot + 1] = d00 * (f0 - f1) + d10 * fm0 + d11 * fm1;
  out[slot + 2] = h00 * g0 + h10 * gm0 + h01 * g1 + h11 * gm1;
  out[slot + 3] = d00 * (g0 - g1) + d10 * gm0 + d11 * gm1;
  return true;
}

/** Exact forms of the two-function tables, same layout as {@link lookup2}. */
export function exact2(tab: Float64Array, T: number, out: Float64Array, slot: number): void {
  if (tab === ZV_TABLE) {
    out[slot] = zExact(T);
    out[slot + 1] = zDeriv(T);
    out[slot + 2] = vExact(T);
    out[slot + 3] = vDeriv(T);
  } else if (tab === GLOBE_TABLE) {
    out[slot] = globeMExact(T);
    out[slot + 1] = globeMDeriv(T);
    out[slot + 2] = globeRExact(T);
    out[slot + 3] = globeRDeriv(T);
  } else {
    out[slot] = esExact(T);
    out[slot + 1] = esDeriv(T);
    out[slot + 2] = emissivityExact(T);
    out[slot + 3] = emissivityDeriv(T);
  }
}

/**
 * `Y(y) = y^1.2` [–] on y = √(u·P) ∈ [0, 400] at 0.125 steps (u·P in m s⁻¹·hPa), so the wick's
 * `(u·P)^0.6 = Y(√(u·P))` costs a table read instead of a power (relative error < 1e−11 for
 * y ≥ 6, i.e. everywhere the 0.13 m s⁻¹ floor and P ≥ 300 hPa allow).
 */
export const Y_STEP = 0.125;
export const Y_N = 3201;
export const POW12_TABLE = (() => {
  const tab = new Float64Array(2 * Y_N);
  for (let k = 0; k < Y_N; k++) {
    const y = k * Y_STEP;
    tab[2 * k] = y > 0 ? Math.exp(1.2 * Math.log(y)) : 0;
    tab[2 * k + 1] = y > 0 ? 1.2 * Math.exp(0.2 * Math.log(y)) * Y_STEP : 0;
  }
  return tab;
})();

/** `y^1.2` [–] for y ≥ 0 (table read inside [6, 400], exact outside). */
export function pow12(y: number): number {
  const u = y * (1 / Y_STEP);
  if (!(u >= 48 && u < Y_N - 1)) return Math.exp(1.2 * Math.log(y));
  const k = u | 0;
  const t = u - k;
  const j = 2 * k;
  const tab = POW12_TABLE;
  const t2 = t * t;
  const t3 = t2 * t;
  return (2 * t3 - 3 * t2 + 1) * tab[j] + (t3 - 2 * t2 + t) * tab[j + 1] + (3 * t2 - 2 * t3) * tab[j + 2] + (t3 - t2) * tab[j + 3];
}

/** Exact forms with derivatives, for T outside the table. */
export const exact = { es: esExact, esDeriv, z: zExact, zDeriv, w: wExact, wDeriv };

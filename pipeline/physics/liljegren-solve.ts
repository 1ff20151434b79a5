/**
 * The globe and wick energy balances of the Liljegren et al. 2008 model (METHODS.md §3.2.4,
 * §3.2.5), solved to the exact root by safeguarded Newton iteration with analytic derivatives.
 *
 * The reference code stops a damped fixed-point loop at a 0.02 K step and so sits up to
 * ~0.015 °C above the root; here the same equations are solved until the Newton step is below
 * {@link ROOT_TOLERANCE_K}, after which the error is of the order of that step squared.
 *
 * Everything that does not change between iterations is computed once per cell in
 * {@link prepareCell}: the air temperature's fourth power, the long-wave and solar loads, and
 * the per-cell factors of the heat- and mass-transfer coefficients. With the properties of
 * METHODS.md §3.2.2 they reduce, at the film temperature T [K], to
 * - `μ = cμ·√T/Ω(T)`, `Ω = 1.2945 − 8.7629e−4·T` (Ω as §3.2.2, rearranged);
 * - globe `h_g = (k/D_g)·Nu = (c_k/D_g)·(2μ + 0.6·Pr^0.3333·√(u·100P·D_g/R_air)·√(μ/T))`;
 * - wick `h_w = C_w·(T·Ω)^−0.4` (Re^0.6·μ collapses to a power of T·Ω);
 * - `(Pr/Sc)^0.56 = C_s·(T^0.834·Ω)^0.56` (pressure cancels in Sc).
 * A test pins these against the readable forms in `air-properties.ts`.
 */
import { ES_TABLE, Z_TABLE, W_TABLE, lookup, exact } from './property-tables.ts';
import {
  STEFAN_BOLTZMANN as SB, CP_AIR, R_AIR, M_AIR, M_H2O, PRANDTL, RATIO, EMIS_WICK, ALB_WICK, D_WICK, L_WICK,
  EMIS_GLOBE, ALB_GLOBE, D_GLOBE, EMIS_SFC, ALB_SFC, MIN_SPEED, WICK_EXPONENT, MOIST_AIR_FACTOR, KELVIN,
  SIGMA_LJ_AIR, EPS_K_AIR, CZA_MIN,
} from './constants.ts';

/** Newton stops when a step is smaller than this [K]. */
export const ROOT_TOLERANCE_K = 1e-3;
/** Largest number of iterations per solve before giving up (NaN, counted) [–]. */
export const MAX_ITERATIONS = 50;

// Property constants (METHODS.md §3.2.2), hoisted once per process.
const C_MU = (2.6693e-6 * Math.sqrt(M_AIR)) / (SIGMA_LJ_AIR * SIGMA_LJ_AIR);
const OMEGA_A = 1.048 + (0.034 * 2.9) / 0.4;
const OMEGA_B = 0.034 / (0.4 * EPS_K_AIR);
const C_K = CP_AIR + 1.25 * R_AIR;
/** D_v = K_D·T^2.334/P [m² s⁻¹] with T [K], P [hPa]. */
const TCRIT = 132 * 647.3;
const K_D =
  3.64e-4 * Math.pow(1 / Math.sqrt(TCRIT), 2.334) * Math.pow(36.4 * 218, 1 / 3) * Math.pow(TCRIT, 5 / 12) *
  Math.sqrt(1 / M_AIR + 1 / M_H2O) * 1013.25 * 1e-4;
/** Sc = C_SC·T^−0.834/Ω. */
const C_SC = (C_MU * R_AIR) / (100 * K_D);
const SC_EXP = 2.334 - 1.5; // 0.834
/** (Pr/Sc)^a = PR_SC·exp(a·(0.834·ln T + ln Ω)). */
const PR_SC = Math.pow(PRANDTL / C_SC, WICK_EXPONENT);
const PR_G = 0.6 * Math.pow(PRANDTL, 0.3333);
const PR_W = 0.281 * Math.pow(PRANDTL, 0.44);
const ES_A = 6.1121 * MOIST_AIR_FACTOR;
const ES_B = 17.502;
const ES_C = 273.15 - 32.18; // 240.97
const INV_EG_SB = 1 / (EMIS_GLOBE * SB);
const EW_SB = EMIS_WICK * SB;
const CAP = D_WICK / (4 * L_WICK);
/** Scratch for table reads: e_s, e_s', Z, Z', W, W'. */
const LK = new Float64Array(6);

/** Per-cell values hoisted out of the iterations (all SI, temperatures [K]). */
export class CellState {
  /** Air temperature [K] and its fourth power [K⁴]. */
  ta = 0;
  ta4 = 0;
  /** Dew point [K]. */
  td = 0;
  /** Pressure [hPa]. */
  p = 0;
  /** Vapour pressure of the air [hPa]. */
  ea = 0;
  /** Atmospheric emissivity [–]. */
  emisAtm = 0;
  /** ½(ε_a·Ta⁴ + ε_sfc·Tsfc⁴) with Tsfc = Ta [K⁴]. */
  lrad = 0;
  /** Globe solar load S/(2ε_gσ)(1−α_g)[…] [K⁴]. */
  qg = 0;
  /** Wick solar gain (1−α_w)S[…] [W m⁻²]. */
  qw = 0;
  /** √(u·100P·D_g/R_air)·0.6·Pr^0.3333 [–·(kg m⁻¹ s⁻¹ K⁻¹)^−½ absorbed]. */
  cg = 0;
  /** Wick h factor C_w [W m⁻² K⁻¹ (K)^0.4]. */
  cw = 0;
  /** Slope dG/dTw [–] and 1/h_w [m² K W⁻¹] at the last wet-bulb iterate (for a next first guess). */
  lastSlope = 1;
  lastInvHw = 0;
  /** Iterations of the last solve [–]. */
  iterations = 0;
}

/**
 * Fills `s` for one cell. Inputs: air temperature and dew point [°C] (dew point already ≤ air),
 * pressure [hPa], 2 m wind [m s⁻¹], solar used [W m⁻²], direct fraction [–], cos zenith [–].
 * Below cos z = 0.00873 the beam is treated as diffuse (METHODS.md §3.2.6).
 */
export function prepareCell(s: CellState, taC: number, tdC: number, p: number, u2: number, solar: number, fdirIn: number, cz: number): void {
  const ta = taC + KELVIN;
  s.ta = ta;
  const ta2 = ta * ta;
  s.ta4 = ta2 * ta2;
  s.td = tdC + KELVIN;
  s.p = p;
  const ea = ES_A * Math.exp((ES_B * tdC) / (tdC + 240.97));
  s.ea = ea;
  s.emisAtm = 0.575 * Math.exp(0.143 * Math.log(ea));
  s.lrad = 0.5 * (s.emisAtm + EMIS_SFC) * s.ta4;
  let qg = 0;
  let qw = 0;
  if (solar > 0) {
    const fdir = cz >= CZA_MIN ? fdirIn : 0;
    const beamG = fdir > 0 ? fdir * (1 / (2 * cz) - 1) : 0;
    qg = ((solar * (1 - ALB_GLOBE)) / (2 * EMIS_GLOBE * SB)) * (beamG + 1 + ALB_SFC);
    const tanOverPi = fdir > 0 ? Math.sqrt(Math.max(0, 1 - cz * cz)) / cz / Math.PI : 0;
    qw = (1 - ALB_WICK) * solar * ((1 - fdir) * (1 + CAP) + fdir * (tanOverPi + CAP) + ALB_SFC);
  }
  s.qg = qg;
  s.qw = qw;
  const u = u2 > MIN_SPEED ? u2 : MIN_SPEED;
  const kre = (u * 100 * p) / R_AIR;
  s.cg = PR_G * Math.sqrt(kre * D_GLOBE * C_MU);
  // h_w = (c_k/D_w)·PR_W·μ·Re^0.6, μ·Re^0.6 = C_MU^0.4·(kre·D_w)^0.6·(T·Ω)^−0.4.
  s.cw = (C_K / D_WICK) * PR_W * Math.pow(C_MU, 0.4) * Math.pow(kre * D_WICK, 0.6);
}

/**
 * Globe temperature [K]: the root of
 * `F(Tg) = Tg⁴ − ½(ε_a Ta⁴ + ε_sfc Ta⁴) + h_g(T_ref)/(ε_g σ)·(Tg − Ta) − Q_g`, T_ref = (Tg + Ta)/2
 * (METHODS.md §3.2.4). `withSun` false drops Q_g (shade). Starts from `x0` [K]; NaN if no convergence.
 */
export function solveGlobe(s: CellState, withSun: boolean, x0: number): number {
  const ta = s.ta;
  const c = s.lrad + (withSun ? s.qg : 0);
  const cg = s.cg;
  let x = x0;
  let lo = -Infinity;
  let hi = Infinity;
  for (let it = 1; it <= MAX_ITERATIONS; it++) {
    const t = 0.5 * (x + ta);
    const omega = OMEGA_A - OMEGA_B * t;
    const sqrtT = Math.sqrt(t);
    const mu = (C_MU * sqrtT) / omega;
    // √(μ/T)·√C_MU⁻¹ folded into cg: √(μ/T) = √(C_MU/(√T·Ω)); cg holds √C_MU, so use 1/√(√T·Ω).
    const r = 1 / Math.sqrt(sqrtT * omega);
    const hg = (C_K / D_GLOBE) * (2 * mu + cg * r);
    const dLnMu = 0.5 / t + OMEGA_B / omega;
    const dLnR = -0.5 * (0.5 / t - OMEGA_B / omega);
    const dhg = (C_K / D_GLOBE) * (2 * mu * dLnMu + cg * r * dLnR);
    const x2 = x * x;
    const dx = x - ta;
    const f = x2 * x2 - c + hg * INV_EG_SB * dx;
    const fp = 4 * x2 * x + (hg + 0.5 * dhg * dx) * INV_EG_SB;
    if (f < 0) lo = x;
    else hi = x;
    let xn = x - f / fp;
    if (!(fp > 0) || !(xn >= lo && xn <= hi)) {
      if (lo > -Infinity && hi < Infinity) xn = 0.5 * (lo + hi);
      else xn = f < 0 ? x + 10 : x - 10;
    }
    const step = xn - x;
    x = xn;
    if (step < ROOT_TOLERANCE_K && step > -ROOT_TOLERANCE_K) {
      s.iterations = it;
      return x;
    }
  }
  s.iterations = MAX_ITERATIONS;
  return NaN;
}

/**
 * Natural wet-bulb temperature [K] (`radiative` true; METHODS.md §3.2.5), or the psychrometric
 * wet bulb of the model (`radiative` false: no radiation term): the root of
 * `G(Tw) = Tw − Ta + (ΔH/RATIO)·(e_w − e_a)/(P − e_w)·(Pr/Sc)^0.56 − ΔF/h_w`,
 * `ΔF = σ ε_w (½(ε_a Ta⁴ + ε_sfc Ta⁴) − Tw⁴) + Q_w`, properties at T_ref = (Tw + Ta)/2.
 * `withSun` false drops Q_w (shade). Starts from `x0` [K]; NaN if no convergence.
 */
export function solveWetBulb(s: CellState, radiative: boolean, withSun: boolean, x0: number): number {
  const ta = s.ta;
  const p = s.p;
  const ea = s.ea;
  const lrad = s.lrad;
  const qw = withSun ? s.qw : 0;
  const invCw = 1 / s.cw;
  const L = LK;
  let x = x0;
  let lo = -Infinity;
  let hi = Infinity;
  for (let it = 1; it <= MAX_ITERATIONS; it++) {
    const t = 0.5 * (x + ta);
    if (!lookup(ES_TABLE, x, L, 0)) { L[0] = exact.es(x); L[1] = exact.esDeriv(x); }
    if (!lookup(Z_TABLE, t, L, 2)) { L[2] = exact.z(t); L[3] = exact.zDeriv(t); }
    const ew = L[0];
    const den = p - ew;
    let g: number;
    let gp: number;
    if (den <= 0) {
      g = Infinity;
      gp = NaN;
    } else {
      const dew = L[1];
      const q = (ew - ea) / den;
      const dq = (dew * (p - ea)) / (den * den);
      const z = L[2];
      const e1 = z * q;
      g = x - ta + e1;
      gp = 1 + 0.5 * L[3] * q + z * dq;
      if (radiative) {
        if (!lookup(W_TABLE, t, L, 4)) { L[4] = exact.w(t); L[5] = exact.wDeriv(t); }
        // 1/h_w = 1/(C_w·W(T)); d(1/h_w)/dx = −½·W'/(C_w·W²).
        const invHw = invCw / L[4];
        const dInvHw = -0.5 * L[5] * invHw / L[4];
        const x2 = x * x;
        const df = EW_SB * (lrad - x2 * x2) + qw;
        const ddf = -4 * EW_SB * x2 * x;
        g -= df * invHw;
        gp -= ddf * invHw + df * dInvHw;
      }
    }
    if (g < 0) lo = x;
    else hi = x;
    let xn = x - g / gp;
    if (!(gp > 0) || !(xn >= lo && xn <= hi)) {
      if (lo > -Infinity && hi < Infinity) xn = 0.5 * (lo + hi);
      else xn = g < 0 ? x + 10 : x - 10;
    }
    const step = xn - x;
    x = xn;
    s.lastSlope = gp;
    s.lastInvHw = radiative ? invCw / L[4] : 0;
    if (step < ROOT_TOLERANCE_K && step > -ROOT_TOLERANCE_K) {
      s.iterations = it;
      return x;
    }
  }
  s.iterations = MAX_ITERATIONS;
  return NaN;
}

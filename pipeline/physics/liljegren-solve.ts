/**
 * The globe and wick energy balances of the Liljegren et al. 2008 model (docs/methods.md §6.5,
 * §6.6), solved to the exact root by safeguarded Newton iteration with analytic derivatives.
 *
 * The reference code stops a damped fixed-point loop at a 0.02 K step and so sits up to
 * ~0.015 °C above the root; here the same equations are solved until a Newton step is below
 * {@link ROOT_TOLERANCE_K}. Newton's error after a step δ is about (|f''|/2|f'|)·δ², and
 * |f''/f'| stays below 0.05 K⁻¹ for both balances over the accepted inputs, so a last step under
 * 3e−3 K leaves under ~2e−7 K (test/physics/solver.test.ts checks 1e−5 K against bisection on
 * the readable forms; the worst seen is ~3e−8 K).
 *
 * First guesses (so most solves need one or two evaluations): the shade globe from a quadratic
 * model of its balance at the air temperature (h_g at T_a is computed once per cell and shared);
 * the sun globe from a quadratic step off the shade root (the two balances differ only by the
 * solar load); the shade wick from a quadratic model at the dew point (where e_w = e_a, so the
 * vapour term vanishes and e_s'(T_d) is known from the cell's humidity); the sun wick from a
 * quadratic step off the shade wick root. Where the solar load is zero, sun equals shade and is
 * not solved again.
 *
 * Everything that does not change between iterations is computed once per cell in
 * {@link prepareCell}: the air temperature's fourth power, the long-wave and solar loads, and
 * the per-cell factors of the heat- and mass-transfer coefficients. With the properties of
 * docs/methods.md §6.3 they reduce, at the film temperature T [K], to
 * - `μ = cμ·√T/Ω(T)`, `Ω = 1.2945 − 8.7629e−4·T` (Ω of docs/methods.md eq. 6.3, rearranged);
 * - globe `h_g = (k/D_g)·Nu = (c_k/D_g)·(2μ + 0.6·Pr^0.3333·√(u·100P·D_g/R_air)·√(μ/T))`;
 * - wick `h_w = C_w·(T·Ω)^−0.4` (Re^0.6·μ collapses to a power of T·Ω);
 * - `(Pr/Sc)^0.56 = C_s·(T^0.834·Ω)^0.56` (pressure cancels in Sc).
 * A test pins these against the readable forms in `air-properties.ts`.
 */
import { ES_TABLE, ZV_TABLE, GLOBE_TABLE, DEW_TABLE, lookup, lookup2, exact2, exact, pow12, BUCK_T_OFFSET_K } from './property-tables.ts';
import {
  STEFAN_BOLTZMANN as SB,
  CP_AIR,
  R_AIR,
  M_AIR,
  PRANDTL,
  EMIS_WICK,
  ALB_WICK,
  D_WICK,
  L_WICK,
  EMIS_GLOBE,
  ALB_GLOBE,
  D_GLOBE,
  EMIS_SFC,
  ALB_SFC,
  MIN_SPEED,
  KELVIN,
  SIGMA_LJ_AIR,
  CZA_MIN,
  EMIS_SHELTER,
} from './constants.ts';

/** Newton stops when a step is smaller than this [K] (remaining error ~2e−7 K, see above). */
export const ROOT_TOLERANCE_K = 3e-3;
/** Largest number of iterations per solve before giving up (NaN, counted) [–]. */
export const MAX_ITERATIONS = 50;

// Property constants (docs/methods.md §6.3), hoisted once per process.
const C_MU = (2.6693e-6 * Math.sqrt(M_AIR)) / (SIGMA_LJ_AIR * SIGMA_LJ_AIR);
const C_K = CP_AIR + 1.25 * R_AIR;
const PR_G = 0.6 * Math.pow(PRANDTL, 0.3333);
const PR_W = 0.281 * Math.pow(PRANDTL, 0.44);
/** cg = CG0·√(u·P): √(u·100P·D_g·C_μ/R_air)·0.6·Pr^0.3333 [SI, see {@link CellState.cg}]. */
const CG0 = PR_G * Math.sqrt((100 * D_GLOBE * C_MU) / R_AIR);
/** cw = CW0·(u·P)^0.6 = CW0·pow12(√(u·P)): (c_k/D_w)·0.281·Pr^0.44·C_μ^0.4·(100·D_w/R_air)^0.6. */
export const CW0 = (C_K / D_WICK) * PR_W * Math.exp(0.4 * Math.log(C_MU) + 0.6 * Math.log((100 * D_WICK) / R_AIR));
const INV_EG_SB = 1 / (EMIS_GLOBE * SB);

/**
 * The globe diameter's two factors in the globe balance. The tables of `property-tables.ts` and
 * {@link CG0} hold h_g for the reference diameter D_ref = {@link D_GLOBE}; for a diameter D,
 * `h_g(D) = (D_ref/D)·(M(T) + c_g·√(D/D_ref)·R(T))` (the Nu = 2 term scales with 1/D, the
 * Reynolds term with 1/√D: the sphere correlation of Bird, Stewart & Lightfoot). So `cg0`
 * replaces CG0 and `invEgSb` = (D_ref/D)/(ε_g σ) replaces {@link INV_EG_SB}. At D = D_ref both are
 * exactly the reference factors (the results are the same to the bit).
 */
export interface GlobeFactors {
  /** Globe diameter [m]. */
  diameter: number;
  /** CG0·√(D/D_ref) [see {@link CG0}]. */
  cg0: number;
  /** (D_ref/D)/(ε_g·σ) [K⁴ per W m⁻² K⁻¹·K]. */
  invEgSb: number;
}

/** {@link GlobeFactors} for a globe diameter [m] (checked by the caller: {@link GLOBE_DIAMETER_RANGE}). */
export function globeFactors(diameter: number): GlobeFactors {
  return { diameter, cg0: CG0 * Math.sqrt(diameter / D_GLOBE), invEgSb: (D_GLOBE / diameter) * INV_EG_SB };
}

/** Globe diameters accepted [m]: from a 1-inch globe to twice the 150 mm standard globe. */
export const GLOBE_DIAMETER_RANGE = [0.025, 0.3] as const;
/** (1 − α_g)/(2ε_gσ) [K⁴ per W m⁻²] (docs/methods.md §6.5). */
export const QG_K = (1 - ALB_GLOBE) / (2 * EMIS_GLOBE * SB);
export const INV_PI = 1 / Math.PI;
export const EW_SB = EMIS_WICK * SB;
export const CAP = D_WICK / (4 * L_WICK);
/** Scratch for table reads: e_s, e_s', Z, Z', W, W'. */
const LK = new Float64Array(6);

/**
 * Per-cell values hoisted out of the iterations (all SI, temperatures [K]).
 *
 * Doubles cross the kernel's calls through these fields, not as arguments or return values: a
 * call V8 does not inline passes numbers boxed, i.e. one small heap allocation per number per call.
 */
export class CellState {
  /** Raw inputs of the cell (set by the kernel, read by {@link prepareFields}): air temperature and dew point [°C], 2 m wind [m s⁻¹], solar [W m⁻²], direct fraction [–], cos zenith [–]. */
  taC = 0;
  tdC = 0;
  u2 = 0;
  solar = 0;
  fdirIn = 0;
  cz = 0;
  /** Start [K] in, root [K] out, of {@link globeRoot} / {@link wetBulbRoot}. */
  x = 0;
  /** Newton stops at a step below this [K]. */
  tol = ROOT_TOLERANCE_K;
  /** Air temperature [K] and its fourth power [K⁴]. */
  ta = 0;
  ta4 = 0;
  /** Dew point [K]. */
  td = 0;
  /** Pressure [hPa]. */
  p = 0;
  /** Vapour pressure of the air [hPa] and d e_s/dT at the dew point [hPa K⁻¹]. */
  ea = 0;
  desTd = 0;
  /** Atmospheric emissivity [–]. */
  emisAtm = 0;
  /** ½(ε_a·Ta⁴ + ε_sfc·Tsfc⁴) with Tsfc = Ta [K⁴]. */
  lrad = 0;
  /** Globe solar load S/(2ε_gσ)(1−α_g)[…] [K⁴]. */
  qg = 0;
  /** Wick solar gain (1−α_w)S[…] [W m⁻²]. */
  qw = 0;
  /** √(u·100P·D_g/R_air)·0.6·Pr^0.3333·√C_μ [(kg m⁻¹ s⁻¹)^½ K^¼ absorbed], h_g = (c_k/D_g)(2μ + cg/√(√T·Ω)). */
  cg = 0;
  /** Wick h factor C_w [W m⁻² K⁻¹ (K)^0.4]: h_w = C_w·(T·Ω)^−0.4; and 1/C_w. */
  cw = 0;
  invCw = 0;
  /** h_g at the film temperature T_a [W m⁻² K⁻¹] and its derivative in the film temperature [W m⁻² K⁻²]. */
  hg0 = 0;
  dhg0 = 0;
  /** Globe: slope dF/dTg [K³] and curvature estimate [K²] at the last iterate (for the sun guess). */
  globeSlope = 1;
  globeCurv = 0;
  /** Wick: curvature estimate [K⁻¹] at the last shade iterate. */
  lastCurv = 0;
  /** Third-derivative estimate dG³/dTw³ [K⁻²] at the last shade iterate. */
  lastCurv3 = 0;
  /** Wick at the shade root: slope dG/dTw [–], 1/h_w [m² K W⁻¹] and its derivative (for the sun and shelter guesses). */
  shadeSlope = 1;
  shadeInvHw = 0;
  shadeDInvHw = 0;
  /** Iterations (function evaluations) of the last solve [–]. */
  iterations = 0;
  /** Globe factors of the diameter in use ({@link globeFactors}); default the reference 2-inch globe. */
  cg0 = CG0;
  invEgSb = INV_EG_SB;
  /** Long-wave load under a shelter at the air temperature: ½(ε_shelter + ε_sfc)·Ta⁴ [K⁴]. */
  lradShelter = 0;
  /** Roots of {@link solveCell} [K]: globe and natural wet bulb in the shade, the sun and the shelter (NaN if not converged or not asked). */
  tgShade = NaN;
  twShade = NaN;
  tgSun = NaN;
  twSun = NaN;
  tgShelter = NaN;
  twShelter = NaN;
}

/** Sets the globe diameter [m] a {@link CellState} solves for (the factors of {@link globeFactors}). */
export function setGlobe(s: CellState, g: GlobeFactors): void {
  s.cg0 = g.cg0;
  s.invEgSb = g.invEgSb;
}

/** Where the globe and wick are: open sky in the shade (0), open sky in the sun (1), under a shelter at the air temperature (2). */
export type ExposureCode = 0 | 1 | 2;

/** Scratch for the globe factors M, M', R, R' (property-tables.ts). */
const GK = new Float64Array(4);

/**
 * h_g [W m⁻² K⁻¹] at film temperature t [K] for a cell factor cg, `h_g = M(t) + cg·R(t)` (tables);
 * also writes dh_g/dt [W m⁻² K⁻²] into GK[1].
 */
function globeH(t: number, cg: number): number {
  const G = GK;
  if (!lookup2(GLOBE_TABLE, t, G, 0)) exact2(GLOBE_TABLE, t, G, 0);
  G[1] += cg * G[3];
  return G[0] + cg * G[2];
}

/**
 * Fills `s` for one cell. Inputs: air temperature and dew point [°C] (dew point already ≤ air),
 * pressure [hPa], 2 m wind [m s⁻¹], solar used [W m⁻²], direct fraction [–], cos zenith [–].
 * Below cos z = 0.00873 the beam is treated as diffuse (docs/methods.md §4.3).
 */
export function prepareCell(s: CellState, taC: number, tdC: number, p: number, u2: number, solar: number, fdirIn: number, cz: number): void {
  s.taC = taC;
  s.tdC = tdC;
  s.p = p;
  s.u2 = u2;
  s.solar = solar;
  s.fdirIn = fdirIn;
  s.cz = cz;
  prepareFields(s);
}

/** {@link prepareCell} on the raw inputs already in `s` (taC, tdC, p, u2, solar, fdirIn, cz). */
function prepareFields(s: CellState): void {
  const taC = s.taC;
  const tdC = s.tdC;
  const p = s.p;
  const u2 = s.u2;
  const solar = s.solar;
  const fdirIn = s.fdirIn;
  const cz = s.cz;
  const ta = taC + KELVIN;
  s.ta = ta;
  const ta2 = ta * ta;
  s.ta4 = ta2 * ta2;
  s.td = tdC + KELVIN;
  // e_a = e_s(T_d), e_s'(T_d) and ε_a(T_d) from one table read (property-tables.ts).
  const L = LK;
  if (!lookup2(DEW_TABLE, s.td, L, 0)) exact2(DEW_TABLE, s.td, L, 0);
  s.ea = L[0];
  s.desTd = L[1];
  s.emisAtm = L[2];
  s.lrad = 0.5 * (s.emisAtm + EMIS_SFC) * s.ta4;
  s.lradShelter = 0.5 * (EMIS_SHELTER + EMIS_SFC) * s.ta4;
  let qg = 0;
  let qw = 0;
  if (solar > 0) {
    const fdir = cz >= CZA_MIN ? fdirIn : 0;
    let beamG = 0;
    let tanOverPi = 0;
    if (fdir > 0) {
      const icz = 1 / cz;
      beamG = fdir * (0.5 * icz - 1);
      tanOverPi = Math.sqrt(Math.max(0, 1 - cz * cz)) * icz * INV_PI;
    }
    qg = solar * QG_K * (beamG + 1 + ALB_SFC);
    qw = (1 - ALB_WICK) * solar * ((1 - fdir) * (1 + CAP) + fdir * (tanOverPi + CAP) + ALB_SFC);
  }
  s.qg = qg;
  s.qw = qw;
  const up = (u2 > MIN_SPEED ? u2 : MIN_SPEED) * p;
  const y = Math.sqrt(up);
  s.cg = s.cg0 * y;
  s.cw = CW0 * pow12(y);
  s.invCw = 1 / s.cw;
  s.hg0 = globeH(ta, s.cg);
  s.dhg0 = GK[1];
}

/**
 * A quadratic step: the δ solving f + f'·δ + ½f''·δ² = 0 nearest 0 (f' > 0), or the Newton step
 * when the quadratic has no real root.
 */
function quadraticStep(f: number, fp: number, fpp: number): number {
  const disc = fp * fp - 2 * fpp * f;
  return disc > 0 ? (-2 * f) / (fp + Math.sqrt(disc)) : -f / fp;
}

/** First guess for the shade globe [K] into `s.x`: quadratic model of F at Tg = Ta (h_g(Ta) shared). */
function globeShadeGuess(s: CellState): void {
  globeGuessAtAir(s, s.lrad);
}

/**
 * First guess for the globe [K] into `s.x` from a quadratic model of its balance at Tg = Ta with
 * long-wave load `lw` [K⁴] and no solar: the open-sky shade ({@link globeShadeGuess}) or the
 * shelter (`s.lradShelter`).
 */
function globeGuessAtAir(s: CellState, lw: number): void {
  const ta = s.ta;
  const k = s.invEgSb;
  const fp = 4 * ta * ta * ta + s.hg0 * k;
  const fpp = 12 * ta * ta + s.dhg0 * k;
  s.x = ta + quadraticStep(s.ta4 - lw, fp, fpp);
}

/** First guess for the sun globe [K] into `s.x`, from the shade root in `s.x` (call right after that solve). */
function globeSunGuess(s: CellState): void {
  const x = s.x;
  const fp = s.globeSlope;
  const fpp = s.globeCurv;
  let d = quadraticStep(-s.qg, fp, fpp);
  // One Newton step on the cubic model, F''' ≈ 24·Tg from the Tg⁴ term (no table read).
  const pc = -s.qg + d * (fp + d * (0.5 * fpp + d * 4 * x));
  const pd = fp + d * (fpp + 12 * x * d);
  if (pd > 0) d -= pc / pd;
  s.x = x + d;
}

/**
 * Globe temperature [K] in place: the root of
 * `F(Tg) = Tg⁴ − L + h_g(T_ref)/(ε_g σ)·(Tg − Ta) − Q_g`, T_ref = (Tg + Ta)/2 (docs/methods.md §6.5),
 * with the long-wave load L = ½(ε_a + ε_sfc)·Ta⁴ under the open sky and ½(ε_shelter + ε_sfc)·Ta⁴
 * under a shelter, and the solar load Q_g in the sun only. Starts at `s.x`, leaves the root in
 * `s.x` [K]; returns the iterations, or 0 if it did not converge (then `s.x` is NaN).
 */
export function globeRoot(s: CellState, exposure: ExposureCode): number {
  const x0 = s.x;
  const tol = s.tol;
  const ta = s.ta;
  const c = exposure === 2 ? s.lradShelter : s.lrad + (exposure === 1 ? s.qg : 0);
  const cg = s.cg;
  const k = s.invEgSb;
  let x = x0;
  let lo = -Infinity;
  let hi = Infinity;
  for (let it = 1; it <= MAX_ITERATIONS; it++) {
    const hg = globeH(0.5 * (x + ta), cg);
    const dhg = GK[1];
    const x2 = x * x;
    const dx = x - ta;
    const f = x2 * x2 - c + hg * k * dx;
    const fp = 4 * x2 * x + (hg + 0.5 * dhg * dx) * k;
    if (f < 0) lo = x;
    else hi = x;
    let xn = x - f / fp;
    let newton = true;
    if (!(fp > 0) || !(xn >= lo && xn <= hi)) {
      newton = false;
      if (lo > -Infinity && hi < Infinity) xn = 0.5 * (lo + hi);
      else xn = f < 0 ? x + 10 : x - 10;
    }
    const step = xn - x;
    x = xn;
    if (newton && step < tol && step > -tol) {
      s.iterations = it;
      s.globeSlope = fp;
      s.globeCurv = 12 * x2 + dhg * k;
      s.x = x;
      return it;
    }
  }
  s.iterations = MAX_ITERATIONS;
  s.x = NaN;
  return 0;
}

/**
 * First guess for the shade natural wet bulb [K] (`radiative` true) or the psychrometric wet
 * bulb (false): quadratic model of G at Tw = Td, where e_w = e_a, so G(Td) needs no e_s read and
 * G'(Td), G''(Td) follow from e_s'(Td) (docs/methods.md §3.1 derivatives of Buck's form).
 */
function wetBulbShadeGuess(s: CellState, radiative: boolean): void {
  const x = s.td;
  s.x = x;
  const ta = s.ta;
  const t = 0.5 * (x + ta);
  const L = LK;
  if (!lookup2(ZV_TABLE, t, L, 2)) exact2(ZV_TABLE, t, L, 2);
  const den = s.p - s.ea;
  if (!(den > 0)) return;
  const de = s.desTd;
  // Buck's form: with L1 = d ln e_s/dT and w = T − T_c (BUCK_T_OFFSET_K), e_s'' = e_s'·(L1 − 2/w) and
  // e_s''' = e_s'·(L1² − 6·L1/w + 6/w²).
  const l1 = de / s.ea;
  const iw = 1 / (x - BUCK_T_OFFSET_K);
  const dde = de * (l1 - 2 * iw);
  const ddde = de * (l1 * l1 - 6 * l1 * iw + 6 * iw * iw);
  const z = L[2];
  const iden = 1 / den;
  const dq = de * iden;
  const ddq = (dde + 2 * de * dq) * iden;
  const dddq = (ddde + 6 * dq * (dde + de * dq)) * iden;
  let g = x - ta;
  let gp = 1 + z * dq;
  let gpp = z * ddq + L[3] * dq;
  let gppp = z * dddq + 1.5 * L[3] * ddq;
  if (radiative) {
    // 1/h_w = V(T)/C_w, d(1/h_w)/dx = ½·V'(T)/C_w.
    const invHw = s.invCw * L[4];
    const dInvHw = 0.5 * s.invCw * L[5];
    const x2 = x * x;
    const df = EW_SB * (s.lrad - x2 * x2);
    const ddf = -4 * EW_SB * x2 * x;
    g -= df * invHw;
    gp -= ddf * invHw + df * dInvHw;
    gpp += 12 * EW_SB * x2 * invHw - 2 * ddf * dInvHw;
    gppp += 24 * EW_SB * x * invHw;
  }
  if (!(gp > 0)) return;
  // Quadratic root, then one Newton step on the cubic model (no table read).
  let d = quadraticStep(g, gp, gpp);
  const pc = g + d * (gp + d * (0.5 * gpp + d * (gppp / 6)));
  const pd = gp + d * (gpp + 0.5 * d * gppp);
  if (pd > 0) d -= pc / pd;
  s.x = x + d;
}

/**
 * First guess for the natural wet bulb with an extra radiative load `q` [W m⁻²] on the wick, from
 * the shade root `x` [K] and the slope and curvatures the shade solve left in `s` (a quadratic step
 * and one Newton step on the cubic model, no table read): the sun (q = Q_w) and the shelter
 * (q = σ·ε_w·(L_shelter − L), the shelter's extra long-wave) into `s.x`.
 */
function wetBulbGuessFromShade(s: CellState, x: number, q: number): void {
  const gp = s.shadeSlope - q * s.shadeDInvHw;
  const g = -q * s.shadeInvHw;
  const fp = gp > 0 ? gp : s.shadeSlope;
  const fpp = s.lastCurv;
  const fppp = s.lastCurv3;
  let d = quadraticStep(g, fp, fpp);
  const pc = g + d * (fp + d * (0.5 * fpp + d * (fppp / 6)));
  const pd = fp + d * (fpp + 0.5 * d * fppp);
  if (pd > 0) d -= pc / pd;
  s.x = x + d;
}

/**
 * Natural wet-bulb temperature [K] in place (`radiative` true; docs/methods.md §6.6), or the
 * psychrometric wet bulb of the model (`radiative` false: no radiation term): the root of
 * `G(Tw) = Tw − Ta + (ΔH/RATIO)·(e_w − e_a)/(P − e_w)·(Pr/Sc)^0.56 − ΔF/h_w`,
 * `ΔF = σ ε_w (L − Tw⁴) + Q_w`, properties at T_ref = (Tw + Ta)/2, with the long-wave load L of
 * the open sky or of the shelter ({@link globeRoot}) and the solar load Q_w in the sun only.
 * Starts at `s.x`, leaves the root in `s.x` [K]; returns the iterations, or 0 if it did not
 * converge (then `s.x` is NaN). After a shade solve it keeps the slope and curvatures for
 * {@link wetBulbGuessFromShade}.
 */
export function wetBulbRoot(s: CellState, radiative: boolean, exposure: ExposureCode): number {
  const x0 = s.x;
  const tol = s.tol;
  const ta = s.ta;
  const p = s.p;
  const ea = s.ea;
  const lrad = exposure === 2 ? s.lradShelter : s.lrad;
  const qw = exposure === 1 ? s.qw : 0;
  const invCw = s.invCw;
  const pea = p - ea;
  const L = LK;
  let x = x0;
  let lo = -Infinity;
  let hi = Infinity;
  for (let it = 1; it <= MAX_ITERATIONS; it++) {
    const t = 0.5 * (x + ta);
    if (!lookup(ES_TABLE, x, L, 0)) {
      L[0] = exact.es(x);
      L[1] = exact.esDeriv(x);
    }
    if (!lookup2(ZV_TABLE, t, L, 2)) exact2(ZV_TABLE, t, L, 2);
    const ew = L[0];
    const den = p - ew;
    let g: number;
    let gp: number;
    let invHw = 0;
    let dInvHw = 0;
    let dq = 0;
    if (den <= 0) {
      g = Infinity;
      gp = NaN;
    } else {
      const dew = L[1];
      const rden = 1 / den;
      const q = (ew - ea) * rden;
      dq = dew * pea * rden * rden;
      const z = L[2];
      g = x - ta + z * q;
      gp = 1 + 0.5 * L[3] * q + z * dq;
      if (radiative) {
        // 1/h_w = V(T)/C_w; d(1/h_w)/dx = ½·V'(T)/C_w.
        invHw = invCw * L[4];
        dInvHw = 0.5 * invCw * L[5];
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
    let newton = true;
    if (!(gp > 0) || !(xn >= lo && xn <= hi)) {
      newton = false;
      if (lo > -Infinity && hi < Infinity) xn = 0.5 * (lo + hi);
      else xn = g < 0 ? x + 10 : x - 10;
    }
    const step = xn - x;
    x = xn;
    if (newton && step < tol && step > -tol) {
      s.iterations = it;
      // Slope and curvature estimates for the sun and shelter guesses (after a shade solve): the
      // vapour term's e_s'' (dominant) and the T⁴ term.
      if (exposure === 0) {
        s.shadeSlope = gp;
        s.shadeInvHw = invHw;
        s.shadeDInvHw = dInvHw;
        const de = L[1];
        const l1 = de / L[0];
        const iw = 1 / (x - BUCK_T_OFFSET_K);
        const dde = de * (l1 - 2 * iw);
        const ddde = de * (l1 * l1 - 6 * l1 * iw + 6 * iw * iw);
        const rden = 1 / den;
        const ddq = pea * rden * rden * (dde + 2 * de * de * rden);
        const dddq = pea * rden * rden * (ddde + 6 * de * rden * (dde + de * de * rden));
        s.lastCurv = L[2] * ddq + (radiative ? 12 * EW_SB * x * x * invHw : 0);
        s.lastCurv3 = L[2] * dddq + 1.5 * L[3] * ddq + (radiative ? 24 * EW_SB * x * invHw : 0);
      }
      s.x = x;
      return it;
    }
  }
  s.iterations = MAX_ITERATIONS;
  s.x = NaN;
  return 0;
}

/**
 * The readable form of what the kernel does for one cell (`kernel.ts` runs the same operations in
 * one function, and test/physics/kernel-vs-solver.test.ts holds them equal): after
 * {@link prepareCell}, the globe and natural wet-bulb roots in the shade, in the sun (solved only
 * where the solar load is positive, else equal to the shade roots) and, when `shelter` is true,
 * under a shelter at the air temperature, into `s.tgShade` … `s.twShelter` [K] (NaN where a solve
 * did not converge).
 */
export function solveCell(s: CellState, shelter: boolean): void {
  s.tgSun = s.tgShelter = s.twSun = s.twShelter = NaN;
  globeShadeGuess(s);
  globeRoot(s, 0);
  const tgShade = s.x;
  s.tgShade = s.tgSun = tgShade;
  if (s.qg > 0 && tgShade === tgShade) {
    globeSunGuess(s);
    globeRoot(s, 1);
    s.tgSun = s.x;
  }
  if (shelter) {
    globeGuessAtAir(s, s.lradShelter);
    globeRoot(s, 2);
    s.tgShelter = s.x;
  }
  wetBulbShadeGuess(s, true);
  wetBulbRoot(s, true, 0);
  const twShade = s.x;
  s.twShade = s.twSun = twShade;
  if (s.qw > 0 && twShade === twShade) {
    wetBulbGuessFromShade(s, twShade, s.qw);
    wetBulbRoot(s, true, 1);
    s.twSun = s.x;
  }
  if (shelter && twShade === twShade) {
    wetBulbGuessFromShade(s, twShade, EW_SB * (s.lradShelter - s.lrad));
    wetBulbRoot(s, true, 2);
    s.twShelter = s.x;
  }
}

/** The model's psychrometric wet bulb [K] (the wick balance without radiation) after {@link prepareCell}; NaN if not converged. */
export function psychrometricWetBulb(s: CellState): number {
  wetBulbShadeGuess(s, false);
  wetBulbRoot(s, false, 0);
  return s.x;
}

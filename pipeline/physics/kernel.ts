/**
 * The WBGT kernel: per cell-hour, globe and natural wet-bulb temperatures in sun and shade by
 * the Liljegren et al. 2008 model (docs/methods.md §6), solved to the exact root, and
 * `WBGT = 0.7·Tnw + 0.2·Tg + 0.1·Ta` (ISO 7243, docs/methods.md §6.1). Shade is the same model with
 * solar set to zero (long-wave exchange kept), weighted the same way.
 *
 * Typed arrays in, typed arrays out, no allocation per cell. Inputs out of range get a status
 * code ({@link STATUS}) and NaN outputs; a solve that does not converge gives NaN and is counted.
 * Dew points above the air temperature are clamped to it and counted.
 */
import {
  CellState,
  prepareCell,
  psychrometricWetBulb,
  ROOT_TOLERANCE_K,
  MAX_ITERATIONS,
  CW0,
  QG_K,
  INV_PI,
  EW_SB,
  CAP,
  globeFactors,
  type GlobeFactors,
} from './liljegren-solve.ts';
import {
  ES_TABLE,
  ZV_TABLE,
  GLOBE_TABLE,
  DEW_TABLE,
  POW12_TABLE,
  TABLE_T_MIN,
  TABLE_STEP,
  TABLE_N,
  Y_STEP,
  Y_N,
  exact,
  exact2,
  BUCK_T_OFFSET_K,
} from './property-tables.ts';
import { INPUT_LIMITS, STATUS } from './status.ts';
import { wasmKernel, wasmKernelRange, type WasmInputs } from './wbgt-wasm.ts';
import { KELVIN, EMIS_SFC, ALB_SFC, ALB_WICK, CZA_MIN, MIN_SPEED, D_GLOBE, EMIS_SHELTER } from './constants.ts';

type Num = Float32Array | Float64Array;

export interface WbgtInputs {
  /** Air temperature [°C]. */
  airTemperature: ArrayLike<number>;
  /** Dew point temperature [°C]. */
  dewPointTemperature: ArrayLike<number>;
  /** Surface pressure [hPa]. */
  surfacePressure: ArrayLike<number>;
  /** Wind speed at 2 m [m s⁻¹]. */
  wind2m: ArrayLike<number>;
  /** Solar irradiance after the cap, global horizontal [W m⁻²]. */
  solar: ArrayLike<number>;
  /** Cosine of the zenith for the beam geometry [–]. */
  cosZenith: ArrayLike<number>;
  /** Direct-beam fraction [–]. */
  directFraction: ArrayLike<number>;
}

export interface WbgtOutputs {
  /** WBGT in sun [°C]. */
  wbgtSun: Num;
  /** WBGT in shade [°C]. */
  wbgtShade: Num;
  /** Globe temperature in sun [°C]. */
  globeSun?: Num;
  /** Natural wet-bulb temperature in sun [°C]. */
  wetBulbSun?: Num;
  /** Globe temperature in shade [°C]. */
  globeShade?: Num;
  /** Natural wet-bulb temperature in shade [°C]. */
  wetBulbShade?: Num;
  /**
   * Under a shelter at the air temperature (roof, canopy; no solar, the globe and wick see the
   * shelter instead of the sky): WBGT, globe and natural wet bulb [°C]. Computed only when
   * `wbgtShelter` is given.
   */
  wbgtShelter?: Num;
  globeShelter?: Num;
  wetBulbShelter?: Num;
  /** Psychrometric wet bulb of the model [°C] (computed only when given). */
  psychrometric?: Num;
  /**
   * Status per cell-hour ({@link STATUS}). A non-zero value already present on entry (e.g. set
   * by the geometry step) is kept and the cell skipped.
   */
  status: Uint8Array;
}

/** What the kernel did, for logs and reports. */
export interface KernelCounts {
  cells: number;
  ok: number;
  /** Cell-hours rejected for inputs (any status other than ok / not converged). */
  rejected: number;
  notConverged: number;
  dewPointClamped: number;
  /**
   * Sum of iterations (function evaluations) per solve over the cells solved [–]; divide by
   * `solved` for the mean per cell-hour. Sun solves are skipped (0 iterations) where the solar
   * load is zero, since sun then equals shade.
   */
  iterations: {
    globeSun: number;
    wetBulbSun: number;
    globeShade: number;
    wetBulbShade: number;
    globeShelter: number;
    wetBulbShelter: number;
    psychrometric: number;
  };
  solved: number;
}

export function emptyCounts(): KernelCounts {
  return {
    cells: 0,
    ok: 0,
    rejected: 0,
    notConverged: 0,
    dewPointClamped: 0,
    solved: 0,
    iterations: { globeSun: 0, wetBulbSun: 0, globeShade: 0, wetBulbShade: 0, globeShelter: 0, wetBulbShelter: 0, psychrometric: 0 },
  };
}

/** Adds `b` into `a` (for merging worker counts). */
export function addCounts(a: KernelCounts, b: KernelCounts): KernelCounts {
  a.cells += b.cells;
  a.ok += b.ok;
  a.rejected += b.rejected;
  a.notConverged += b.notConverged;
  a.dewPointClamped += b.dewPointClamped;
  a.solved += b.solved;
  for (const k of Object.keys(a.iterations) as (keyof KernelCounts['iterations'])[]) a.iterations[k] += b.iterations[k];
  return a;
}

/** Checks one cell-hour's inputs; returns a status code (0 = usable). */
export function checkInputs(ta: number, td: number, p: number, u: number, s: number, cz: number, f: number): number {
  if (Number.isNaN(ta) || Number.isNaN(td) || Number.isNaN(p) || Number.isNaN(u) || Number.isNaN(s) || Number.isNaN(cz) || Number.isNaN(f)) {
    return STATUS.missingInput;
  }
  const L = INPUT_LIMITS;
  if (!(ta >= L.airTemperatureC[0] && ta <= L.airTemperatureC[1])) return STATUS.airTemperatureOutOfRange;
  if (!(td >= L.dewPointMinC)) return STATUS.humidityOutOfRange;
  if (!(p >= L.pressureHpa[0] && p <= L.pressureHpa[1])) return STATUS.pressureOutOfRange;
  if (!(u >= L.windMs[0] && u <= L.windMs[1])) return STATUS.windOutOfRange;
  if (!(s >= L.solarWm2[0] && s <= L.solarWm2[1])) return STATUS.solarOutOfRange;
  if (!(cz >= -1 && cz <= 1)) return STATUS.cosZenithOutOfRange;
  if (!(f >= 0 && f <= 1)) return STATUS.directFractionOutOfRange;
  return STATUS.ok;
}

const cell = new CellState();
/** The reference implementation's 2-inch globe ({@link D_GLOBE}): the default of {@link wbgtKernel}. */
export const REFERENCE_GLOBE: GlobeFactors = globeFactors(D_GLOBE);
const TA_MIN = INPUT_LIMITS.airTemperatureC[0];
const TA_MAX = INPUT_LIMITS.airTemperatureC[1];
const TD_MIN = INPUT_LIMITS.dewPointMinC;
const P_MIN = INPUT_LIMITS.pressureHpa[0];
const P_MAX = INPUT_LIMITS.pressureHpa[1];
const U_MIN = INPUT_LIMITS.windMs[0];
const U_MAX = INPUT_LIMITS.windMs[1];
const S_MIN = INPUT_LIMITS.solarWm2[0];
const S_MAX = INPUT_LIMITS.solarWm2[1];
/** Table grid (property-tables.ts): first node [K], nodes per K [K⁻¹], last usable index [–]. */
const T0 = TABLE_T_MIN;
const INV_STEP = 1 / TABLE_STEP;
const TN1 = TABLE_N - 1;
const Y_INV = 1 / Y_STEP;
const YN1 = Y_N - 1;
/** Scratch for the exact forms outside the tables (rare). */
const XS = new Float64Array(4);

/**
 * Runs the kernel on cell-hours [start, end) of the arrays. Returns counts for that range.
 *
 * The per-cell path is one function on local variables: the cell setup (`prepareFields`), the
 * four first guesses and the two Newton loops of `liljegren-solve.ts`, with the table reads of
 * `property-tables.ts` (`lookup`, `lookup2`, `pow12`) written out. Same formulas, same order of
 * operations, so the results are the same to the bit; the split functions stay the readable
 * form (and serve the psychrometric output). Why: V8 inlines only part of the split calls (its
 * inlining budget), and every number passed to or returned from a call that is not inlined is
 * boxed (one heap allocation each). Each balance's loop runs twice, shade then sun, so the code
 * is there once.
 * The shelter pass (when asked) is the shade balance with the long-wave load of a black shelter
 * at the air temperature: its globe starts from the quadratic model at Tg = Ta, its wick from the
 * shade root with the shelter's extra long-wave as a load (like the sun's solar load).
 * @param inputs per cell-hour inputs (units on {@link WbgtInputs})
 * @param outputs per cell-hour outputs [°C] and status
 * @param globe globe diameter factors ({@link globeFactors}); default the reference 2-inch globe
 * @param choice the implementation ({@link KernelChoice}); default `auto`
 */
export function wbgtKernel(
  inputs: WbgtInputs,
  outputs: WbgtOutputs,
  end: number,
  start = 0,
  globe: GlobeFactors = REFERENCE_GLOBE,
  choice: KernelChoice = 'auto',
): KernelCounts {
  const wasm =
    choice === 'auto' && end - start >= WASM_MIN_CELLS && outputs.wbgtShelter === undefined && outputs.psychrometric === undefined && typedInputs(inputs)
      ? wasmKernel()
      : null;
  if (wasm === null) return wbgtKernelJs(inputs, outputs, end, start, globe);
  const counts = emptyCounts();
  // The cells the module hands back go through the JavaScript kernel, one at a time.
  const w = wasmKernelRange(wasm, inputs as WasmInputs, outputs, start, end, globe, (i) => addCounts(counts, wbgtKernelJs(inputs, outputs, i + 1, i, globe)));
  counts.cells = end - start;
  counts.ok += w.ok;
  counts.solved += w.ok;
  counts.dewPointClamped += w.clamped;
  const it = counts.iterations;
  it.globeSun += w.itGlobeSun;
  it.wetBulbSun += w.itWetBulbSun;
  it.globeShade += w.itGlobeShade;
  it.wetBulbShade += w.itWetBulbShade;
  return counts;
}

/**
 * Which implementation {@link wbgtKernel} runs: `auto`, the WebAssembly module (./wbgt-wasm.ts)
 * where the runtime has WebAssembly SIMD and the call fits it (typed inputs, no shelter or
 * psychrometric output, 8 cells or more), else the JavaScript kernel; `js`, the JavaScript
 * kernel only (the benchmarks' before figure, and the tests' reference). Both give the same
 * doubles (test/physics/wasm-kernel.test.ts).
 */
export type KernelChoice = 'auto' | 'js';

/** Below this many cells the module's chunk copies are not worth it [–] (one `point` row). */
const WASM_MIN_CELLS = 8;

function typedInputs(a: WbgtInputs): boolean {
  const t = (x: ArrayLike<number>) => x instanceof Float32Array || x instanceof Float64Array;
  return t(a.airTemperature) && t(a.dewPointTemperature) && t(a.surfacePressure) && t(a.wind2m) && t(a.solar) && t(a.cosZenith) && t(a.directFraction);
}

/**
 * The JavaScript kernel: every case (shelter, psychrometric, rejected inputs, safeguarded
 * steps). {@link wbgtKernel} runs the WebAssembly module of ./wbgt-wasm.ts where it can and this
 * for the rest; the two give the same doubles. Same arguments and result as {@link wbgtKernel}.
 */
export function wbgtKernelJs(inputs: WbgtInputs, outputs: WbgtOutputs, end: number, start = 0, globe: GlobeFactors = REFERENCE_GLOBE): KernelCounts {
  const { airTemperature: TA, dewPointTemperature: TD, surfacePressure: P, wind2m: U, solar: S, cosZenith: CZ, directFraction: FD } = inputs;
  const { wbgtSun, wbgtShade, globeSun, wetBulbSun, globeShade, wetBulbShade, psychrometric, status } = outputs;
  const { wbgtShelter, globeShelter, wetBulbShelter } = outputs;
  const shelter = wbgtShelter !== undefined;
  const CG = globe.cg0;
  const INV_EG_SB = globe.invEgSb;
  const DT = DEW_TABLE;
  const GT = GLOBE_TABLE;
  const ZT = ZV_TABLE;
  const ET = ES_TABLE;
  const YT = POW12_TABLE;
  const tol = ROOT_TOLERANCE_K;
  // Counters as locals (written to the counts object once at the end).
  let rejected = 0;
  let notConverged = 0;
  let clamped = 0;
  let solved = 0;
  let ok = 0;
  let itGs = 0;
  let itGd = 0;
  let itWs = 0;
  let itWd = 0;
  let itGh = 0;
  let itWh = 0;
  let itPsy = 0;
  for (let i = start; i < end; i++) {
    let code = status[i];
    const ta = TA[i];
    let td = TD[i];
    const p = P[i];
    const u = U[i];
    const sol = S[i];
    const cz = CZ[i];
    const fd = FD[i];
    // One combined range test (NaN fails it); the reason is looked up only for a bad cell.
    if (
      code !== 0 ||
      !(
        ta >= TA_MIN &&
        ta <= TA_MAX &&
        td >= TD_MIN &&
        p >= P_MIN &&
        p <= P_MAX &&
        u >= U_MIN &&
        u <= U_MAX &&
        sol >= S_MIN &&
        sol <= S_MAX &&
        cz >= -1 &&
        cz <= 1 &&
        fd >= 0 &&
        fd <= 1
      )
    ) {
      if (code === 0) code = checkInputs(ta, td, p, u, sol, cz, fd);
      status[i] = code;
      rejected++;
      writeNaN(outputs, i);
      continue;
    }
    if (td > ta) {
      td = ta;
      clamped++;
    }
    solved++;

    // --- Cell setup (liljegren-solve.ts prepareFields). ---
    const taK = ta + KELVIN;
    const ta2 = taK * taK;
    const ta4 = ta2 * ta2;
    const tdK = td + KELVIN;
    // e_a = e_s(T_d), e_s'(T_d), ε_a(T_d): one read of DEW_TABLE (lookup2).
    let ea: number;
    let desTd: number;
    let emisAtm: number;
    {
      const uu = (tdK - T0) * INV_STEP;
      if (uu >= 0 && uu < TN1) {
        const k = uu | 0;
        const t = uu - k;
        const j = 4 * k;
        const t2 = t * t;
        const t3 = t2 * t;
        const h00 = 2 * t3 - 3 * t2 + 1;
        const h10 = t3 - 2 * t2 + t;
        const h01 = 1 - h00;
        const h11 = t3 - t2;
        const d00 = (6 * t2 - 6 * t) * INV_STEP;
        const d10 = (3 * t2 - 4 * t + 1) * INV_STEP;
        const d11 = (3 * t2 - 2 * t) * INV_STEP;
        ea = h00 * DT[j] + h10 * DT[j + 1] + h01 * DT[j + 4] + h11 * DT[j + 5];
        desTd = d00 * (DT[j] - DT[j + 4]) + d10 * DT[j + 1] + d11 * DT[j + 5];
        emisAtm = h00 * DT[j + 2] + h10 * DT[j + 3] + h01 * DT[j + 6] + h11 * DT[j + 7];
      } else {
        exact2(DT, tdK, XS, 0);
        ea = XS[0];
        desTd = XS[1];
        emisAtm = XS[2];
      }
    }
    const lrad = 0.5 * (emisAtm + EMIS_SFC) * ta4;
    const lradShelter = 0.5 * (EMIS_SHELTER + EMIS_SFC) * ta4;
    let qg = 0;
    let qw = 0;
    if (sol > 0) {
      const fdir = cz >= CZA_MIN ? fd : 0;
      let beamG = 0;
      let tanOverPi = 0;
      if (fdir > 0) {
        const icz = 1 / cz;
        beamG = fdir * (0.5 * icz - 1);
        tanOverPi = Math.sqrt(Math.max(0, 1 - cz * cz)) * icz * INV_PI;
      }
      qg = sol * QG_K * (beamG + 1 + ALB_SFC);
      qw = (1 - ALB_WICK) * sol * ((1 - fdir) * (1 + CAP) + fdir * (tanOverPi + CAP) + ALB_SFC);
    }
    const y = Math.sqrt((u > MIN_SPEED ? u : MIN_SPEED) * p);
    const cg = CG * y;
    // (u·P)^0.6 = y^1.2 (pow12).
    let y12: number;
    {
      const uy = y * Y_INV;
      if (!(uy >= 48 && uy < YN1)) y12 = Math.exp(1.2 * Math.log(y));
      else {
        const k = uy | 0;
        const t = uy - k;
        const j = 2 * k;
        const t2 = t * t;
        const t3 = t2 * t;
        y12 = (2 * t3 - 3 * t2 + 1) * YT[j] + (t3 - 2 * t2 + t) * YT[j + 1] + (3 * t2 - 2 * t3) * YT[j + 2] + (t3 - t2) * YT[j + 3];
      }
    }
    const invCw = 1 / (CW0 * y12);

    // --- Globe: shade, then sun (globeShadeGuess, globeRoot, globeSunGuess). ---
    let tgShade = NaN;
    let tgSun = NaN;
    let tgShelter = NaN;
    {
      // h_g and dh_g/dT at the film temperature T_a (globeH).
      let hg0: number;
      let dhg0: number;
      {
        const uu = (taK - T0) * INV_STEP;
        if (uu >= 0 && uu < TN1) {
          const k = uu | 0;
          const t = uu - k;
          const j = 4 * k;
          const t2 = t * t;
          const t3 = t2 * t;
          const h00 = 2 * t3 - 3 * t2 + 1;
          const h10 = t3 - 2 * t2 + t;
          const h01 = 1 - h00;
          const h11 = t3 - t2;
          const d00 = (6 * t2 - 6 * t) * INV_STEP;
          const d10 = (3 * t2 - 4 * t + 1) * INV_STEP;
          const d11 = (3 * t2 - 2 * t) * INV_STEP;
          const m = h00 * GT[j] + h10 * GT[j + 1] + h01 * GT[j + 4] + h11 * GT[j + 5];
          const dm = d00 * (GT[j] - GT[j + 4]) + d10 * GT[j + 1] + d11 * GT[j + 5];
          const r = h00 * GT[j + 2] + h10 * GT[j + 3] + h01 * GT[j + 6] + h11 * GT[j + 7];
          const dr = d00 * (GT[j + 2] - GT[j + 6]) + d10 * GT[j + 3] + d11 * GT[j + 7];
          hg0 = m + cg * r;
          dhg0 = dm + cg * dr;
        } else {
          exact2(GT, taK, XS, 0);
          hg0 = XS[0] + cg * XS[2];
          dhg0 = XS[1] + cg * XS[3];
        }
      }
      const fp0 = 4 * taK * taK * taK + hg0 * INV_EG_SB;
      const fpp0 = 12 * taK * taK + dhg0 * INV_EG_SB;
      const f0 = ta4 - lrad;
      const disc0 = fp0 * fp0 - 2 * fpp0 * f0;
      let x = taK + (disc0 > 0 ? (-2 * f0) / (fp0 + Math.sqrt(disc0)) : -f0 / fp0);
      let c = lrad;
      // Passes: 0 shade, 1 sun (only with a solar load), 2 shelter (only when asked).
      for (let pass = 0; ; ) {
        let lo = -Infinity;
        let hi = Infinity;
        let root = NaN;
        let its = 0;
        let slope = 1;
        let curv = 0;
        for (let it = 1; it <= MAX_ITERATIONS; it++) {
          const film = 0.5 * (x + taK);
          let hg: number;
          let dhg: number;
          const uu = (film - T0) * INV_STEP;
          if (uu >= 0 && uu < TN1) {
            const k = uu | 0;
            const t = uu - k;
            const j = 4 * k;
            const t2 = t * t;
            const t3 = t2 * t;
            const h00 = 2 * t3 - 3 * t2 + 1;
            const h10 = t3 - 2 * t2 + t;
            const h01 = 1 - h00;
            const h11 = t3 - t2;
            const d00 = (6 * t2 - 6 * t) * INV_STEP;
            const d10 = (3 * t2 - 4 * t + 1) * INV_STEP;
            const d11 = (3 * t2 - 2 * t) * INV_STEP;
            const m = h00 * GT[j] + h10 * GT[j + 1] + h01 * GT[j + 4] + h11 * GT[j + 5];
            const dm = d00 * (GT[j] - GT[j + 4]) + d10 * GT[j + 1] + d11 * GT[j + 5];
            const r = h00 * GT[j + 2] + h10 * GT[j + 3] + h01 * GT[j + 6] + h11 * GT[j + 7];
            const dr = d00 * (GT[j + 2] - GT[j + 6]) + d10 * GT[j + 3] + d11 * GT[j + 7];
            hg = m + cg * r;
            dhg = dm + cg * dr;
          } else {
            exact2(GT, film, XS, 0);
            hg = XS[0] + cg * XS[2];
            dhg = XS[1] + cg * XS[3];
          }
          const x2 = x * x;
          const dx = x - taK;
          const f = x2 * x2 - c + hg * INV_EG_SB * dx;
          const fp = 4 * x2 * x + (hg + 0.5 * dhg * dx) * INV_EG_SB;
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
            its = it;
            slope = fp;
            curv = 12 * x2 + dhg * INV_EG_SB;
            root = x;
            break;
          }
        }
        if (pass === 0) {
          itGd += its;
          tgShade = root;
          tgSun = root;
        } else if (pass === 1) {
          itGs += its;
          tgSun = root;
        } else {
          itGh += its;
          tgShelter = root;
          break;
        }
        if (pass === 0 && qg > 0 && root === root) {
          // Sun guess: quadratic step off the shade root, then one Newton step on the cubic
          // model, third derivative ≈ 24·Tg (globeSunGuess).
          const fq = -qg;
          const disc = slope * slope - 2 * curv * fq;
          let d = disc > 0 ? (-2 * fq) / (slope + Math.sqrt(disc)) : -fq / slope;
          const pc = fq + d * (slope + d * (0.5 * curv + d * 4 * root));
          const pd = slope + d * (curv + 12 * root * d);
          if (pd > 0) d -= pc / pd;
          x = root + d;
          c = lrad + qg;
          pass = 1;
        } else if (shelter) {
          // Shelter guess: the quadratic model at Tg = Ta with the shelter's load (globeGuessAtAir).
          const fs = ta4 - lradShelter;
          const discS = fp0 * fp0 - 2 * fpp0 * fs;
          x = taK + (discS > 0 ? (-2 * fs) / (fp0 + Math.sqrt(discS)) : -fs / fp0);
          c = lradShelter;
          pass = 2;
        } else break;
      }
    }

    // --- Natural wet bulb: shade, then sun (wetBulbShadeGuess, wetBulbRoot, wetBulbSunGuess). ---
    let twShade = NaN;
    let twSun = NaN;
    let twShelter = NaN;
    {
      const pea = p - ea;
      // Shade guess: quadratic + cubic model of G at Tw = Td, where e_w = e_a.
      let x = tdK;
      {
        const film = 0.5 * (tdK + taK);
        let z: number;
        let zp: number;
        let v: number;
        let vp: number;
        const uu = (film - T0) * INV_STEP;
        if (uu >= 0 && uu < TN1) {
          const k = uu | 0;
          const t = uu - k;
          const j = 4 * k;
          const t2 = t * t;
          const t3 = t2 * t;
          const h00 = 2 * t3 - 3 * t2 + 1;
          const h10 = t3 - 2 * t2 + t;
          const h01 = 1 - h00;
          const h11 = t3 - t2;
          const d00 = (6 * t2 - 6 * t) * INV_STEP;
          const d10 = (3 * t2 - 4 * t + 1) * INV_STEP;
          const d11 = (3 * t2 - 2 * t) * INV_STEP;
          z = h00 * ZT[j] + h10 * ZT[j + 1] + h01 * ZT[j + 4] + h11 * ZT[j + 5];
          zp = d00 * (ZT[j] - ZT[j + 4]) + d10 * ZT[j + 1] + d11 * ZT[j + 5];
          v = h00 * ZT[j + 2] + h10 * ZT[j + 3] + h01 * ZT[j + 6] + h11 * ZT[j + 7];
          vp = d00 * (ZT[j + 2] - ZT[j + 6]) + d10 * ZT[j + 3] + d11 * ZT[j + 7];
        } else {
          exact2(ZT, film, XS, 0);
          z = XS[0];
          zp = XS[1];
          v = XS[2];
          vp = XS[3];
        }
        if (pea > 0) {
          const de = desTd;
          const l1 = de / ea;
          const iw = 1 / (tdK - BUCK_T_OFFSET_K);
          const dde = de * (l1 - 2 * iw);
          const ddde = de * (l1 * l1 - 6 * l1 * iw + 6 * iw * iw);
          const iden = 1 / pea;
          const dq = de * iden;
          const ddq = (dde + 2 * de * dq) * iden;
          const dddq = (ddde + 6 * dq * (dde + de * dq)) * iden;
          let g = tdK - taK;
          let gp = 1 + z * dq;
          let gpp = z * ddq + zp * dq;
          let gppp = z * dddq + 1.5 * zp * ddq;
          const invHw = invCw * v;
          const dInvHw = 0.5 * invCw * vp;
          const x2 = tdK * tdK;
          const df = EW_SB * (lrad - x2 * x2);
          const ddf = -4 * EW_SB * x2 * tdK;
          g -= df * invHw;
          gp -= ddf * invHw + df * dInvHw;
          gpp += 12 * EW_SB * x2 * invHw - 2 * ddf * dInvHw;
          gppp += 24 * EW_SB * tdK * invHw;
          if (gp > 0) {
            const disc = gp * gp - 2 * gpp * g;
            let d = disc > 0 ? (-2 * g) / (gp + Math.sqrt(disc)) : -g / gp;
            const pc = g + d * (gp + d * (0.5 * gpp + d * (gppp / 6)));
            const pd = gp + d * (gpp + 0.5 * d * gppp);
            if (pd > 0) d -= pc / pd;
            x = tdK + d;
          }
        }
      }
      let q = 0;
      let lw = lrad;
      // Shade root's slope, 1/h_w and its derivative, curvatures (for the sun and shelter guesses).
      let slope0 = 1;
      let invHw0 = 0;
      let dInvHw0 = 0;
      let curv = 0;
      let curv3 = 0;
      let shadeRoot = NaN;
      // Passes: 0 shade, 1 sun (only with a solar load), 2 shelter (only when asked).
      for (let pass = 0; ; ) {
        let lo = -Infinity;
        let hi = Infinity;
        let root = NaN;
        let its = 0;
        for (let it = 1; it <= MAX_ITERATIONS; it++) {
          const film = 0.5 * (x + taK);
          // e_s(x) and e_s'(x) (lookup on ES_TABLE).
          let ew: number;
          let dew: number;
          {
            const uu = (x - T0) * INV_STEP;
            if (uu >= 0 && uu < TN1) {
              const k = uu | 0;
              const t = uu - k;
              const j = 2 * k;
              const f0 = ET[j];
              const m0 = ET[j + 1];
              const f1 = ET[j + 2];
              const m1 = ET[j + 3];
              const t2 = t * t;
              const t3 = t2 * t;
              dew = ((6 * t2 - 6 * t) * (f0 - f1) + (3 * t2 - 4 * t + 1) * m0 + (3 * t2 - 2 * t) * m1) * INV_STEP;
              ew = (2 * t3 - 3 * t2 + 1) * f0 + (t3 - 2 * t2 + t) * m0 + (-2 * t3 + 3 * t2) * f1 + (t3 - t2) * m1;
            } else {
              ew = exact.es(x);
              dew = exact.esDeriv(x);
            }
          }
          // Z, Z', V, V' at the film temperature (lookup2 on ZV_TABLE).
          let z: number;
          let zp: number;
          let v: number;
          let vp: number;
          {
            const uu = (film - T0) * INV_STEP;
            if (uu >= 0 && uu < TN1) {
              const k = uu | 0;
              const t = uu - k;
              const j = 4 * k;
              const t2 = t * t;
              const t3 = t2 * t;
              const h00 = 2 * t3 - 3 * t2 + 1;
              const h10 = t3 - 2 * t2 + t;
              const h01 = 1 - h00;
              const h11 = t3 - t2;
              const d00 = (6 * t2 - 6 * t) * INV_STEP;
              const d10 = (3 * t2 - 4 * t + 1) * INV_STEP;
              const d11 = (3 * t2 - 2 * t) * INV_STEP;
              z = h00 * ZT[j] + h10 * ZT[j + 1] + h01 * ZT[j + 4] + h11 * ZT[j + 5];
              zp = d00 * (ZT[j] - ZT[j + 4]) + d10 * ZT[j + 1] + d11 * ZT[j + 5];
              v = h00 * ZT[j + 2] + h10 * ZT[j + 3] + h01 * ZT[j + 6] + h11 * ZT[j + 7];
              vp = d00 * (ZT[j + 2] - ZT[j + 6]) + d10 * ZT[j + 3] + d11 * ZT[j + 7];
            } else {
              exact2(ZT, film, XS, 0);
              z = XS[0];
              zp = XS[1];
              v = XS[2];
              vp = XS[3];
            }
          }
          const den = p - ew;
          let g: number;
          let gp: number;
          let invHw = 0;
          let dInvHw = 0;
          if (den <= 0) {
            g = Infinity;
            gp = NaN;
          } else {
            const rden = 1 / den;
            const qv = (ew - ea) * rden;
            const dq = dew * pea * rden * rden;
            g = x - taK + z * qv;
            gp = 1 + 0.5 * zp * qv + z * dq;
            invHw = invCw * v;
            dInvHw = 0.5 * invCw * vp;
            const x2 = x * x;
            const df = EW_SB * (lw - x2 * x2) + q;
            const ddf = -4 * EW_SB * x2 * x;
            g -= df * invHw;
            gp -= ddf * invHw + df * dInvHw;
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
            its = it;
            if (pass === 0) {
              slope0 = gp;
              invHw0 = invHw;
              dInvHw0 = dInvHw;
              // Curvature estimates for the sun guess (wetBulbRoot after a shade solve).
              const de = dew;
              const l1 = de / ew;
              const iw = 1 / (x - BUCK_T_OFFSET_K);
              const dde = de * (l1 - 2 * iw);
              const ddde = de * (l1 * l1 - 6 * l1 * iw + 6 * iw * iw);
              const rden = 1 / den;
              const ddq = pea * rden * rden * (dde + 2 * de * de * rden);
              const dddq = pea * rden * rden * (ddde + 6 * de * rden * (dde + de * de * rden));
              curv = z * ddq + 12 * EW_SB * x * x * invHw;
              curv3 = z * dddq + 1.5 * zp * ddq + 24 * EW_SB * x * invHw;
            }
            root = x;
            break;
          }
        }
        if (pass === 0) {
          itWd += its;
          twShade = root;
          twSun = root;
          shadeRoot = root;
          if (!(root === root)) break;
        } else if (pass === 1) {
          itWs += its;
          twSun = root;
        } else {
          itWh += its;
          twShelter = root;
          break;
        }
        // Next pass: the sun (a solar load) after the shade, then the shelter when asked. Both
        // start from the shade root with their extra load (wetBulbGuessFromShade).
        let load: number;
        if (pass === 0 && qw > 0) {
          load = qw;
          q = qw;
          pass = 1;
        } else if (shelter) {
          load = EW_SB * (lradShelter - lrad);
          q = 0;
          lw = lradShelter;
          pass = 2;
        } else break;
        const gps = slope0 - load * dInvHw0;
        const gs = -load * invHw0;
        const fp = gps > 0 ? gps : slope0;
        const disc = fp * fp - 2 * curv * gs;
        let d = disc > 0 ? (-2 * gs) / (fp + Math.sqrt(disc)) : -gs / fp;
        const pc = gs + d * (fp + d * (0.5 * curv + d * (curv3 / 6)));
        const pd = fp + d * (curv + 0.5 * d * curv3);
        if (pd > 0) d -= pc / pd;
        x = shadeRoot + d;
      }
    }
    let tpsy = 0;
    if (psychrometric) {
      // Rare path (the point command's extra column): the split functions on a CellState.
      const s = cell;
      prepareCell(s, ta, td, p, u, sol, fd, cz);
      tpsy = psychrometricWetBulb(s);
      itPsy += s.iterations;
    }
    if (!(tgSun === tgSun) || !(tgShade === tgShade) || (shelter && !(tgShelter === tgShelter))) code = STATUS.globeNotConverged;
    else if (!(twSun === twSun) || !(twShade === twShade) || !(tpsy === tpsy) || (shelter && !(twShelter === twShelter))) code = STATUS.wetBulbNotConverged;
    if (code !== 0) {
      status[i] = code;
      notConverged++;
      writeNaN(outputs, i);
      continue;
    }
    const gS = tgSun - KELVIN;
    const wS = twSun - KELVIN;
    const gD = tgShade - KELVIN;
    const wD = twShade - KELVIN;
    wbgtSun[i] = 0.7 * wS + 0.2 * gS + 0.1 * ta;
    wbgtShade[i] = 0.7 * wD + 0.2 * gD + 0.1 * ta;
    if (globeSun) globeSun[i] = gS;
    if (wetBulbSun) wetBulbSun[i] = wS;
    if (globeShade) globeShade[i] = gD;
    if (wetBulbShade) wetBulbShade[i] = wD;
    if (psychrometric) psychrometric[i] = tpsy - KELVIN;
    if (shelter) {
      const gH = tgShelter - KELVIN;
      const wH = twShelter - KELVIN;
      wbgtShelter[i] = 0.7 * wH + 0.2 * gH + 0.1 * ta;
      if (globeShelter) globeShelter[i] = gH;
      if (wetBulbShelter) wetBulbShelter[i] = wH;
    }
    ok++;
  }
  const counts = emptyCounts();
  counts.cells = end > start ? end - start : 0;
  counts.ok = ok;
  counts.rejected = rejected;
  counts.notConverged = notConverged;
  counts.dewPointClamped = clamped;
  counts.solved = solved;
  const it = counts.iterations;
  it.globeSun = itGs;
  it.globeShade = itGd;
  it.wetBulbSun = itWs;
  it.wetBulbShade = itWd;
  it.globeShelter = itGh;
  it.wetBulbShelter = itWh;
  it.psychrometric = itPsy;
  return counts;
}

function writeNaN(o: WbgtOutputs, i: number): void {
  o.wbgtSun[i] = NaN;
  o.wbgtShade[i] = NaN;
  if (o.globeSun) o.globeSun[i] = NaN;
  if (o.wetBulbSun) o.wetBulbSun[i] = NaN;
  if (o.globeShade) o.globeShade[i] = NaN;
  if (o.wetBulbShade) o.wetBulbShade[i] = NaN;
  if (o.psychrometric) o.psychrometric[i] = NaN;
  if (o.wbgtShelter) o.wbgtShelter[i] = NaN;
  if (o.globeShelter) o.globeShelter[i] = NaN;
  if (o.wetBulbShelter) o.wetBulbShelter[i] = NaN;
}

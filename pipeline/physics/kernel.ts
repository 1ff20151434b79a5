/**
 * The WBGT kernel: per cell-hour, globe and natural wet-bulb temperatures in sun and shade by
 * the Liljegren et al. 2008 model (METHODS.md §3.2), solved to the exact root, and
 * `WBGT = 0.7·Tnw + 0.2·Tg + 0.1·Ta` (ISO 7243, METHODS.md §3.1). Shade is the same model with
 * solar set to zero (long-wave exchange kept), weighted the same way.
 *
 * Typed arrays in, typed arrays out, no allocation per cell. Inputs out of range get a status
 * code ({@link STATUS}) and NaN outputs; a solve that does not converge gives NaN and is counted.
 * Dew points above the air temperature are clamped to it and counted.
 */
import {
  CellState, prepareFields, globeRoot, wetBulbRoot, globeShadeGuess, globeSunGuess, wetBulbShadeGuess, wetBulbSunGuess,
} from './liljegren-solve.ts';
import { INPUT_LIMITS, STATUS } from './status.ts';
import { KELVIN } from './constants.ts';

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
  iterations: { globeSun: number; wetBulbSun: number; globeShade: number; wetBulbShade: number; psychrometric: number };
  solved: number;
}

export function emptyCounts(): KernelCounts {
  return {
    cells: 0, ok: 0, rejected: 0, notConverged: 0, dewPointClamped: 0, solved: 0,
    iterations: { globeSun: 0, wetBulbSun: 0, globeShade: 0, wetBulbShade: 0, psychrometric: 0 },
  };
}

/** Adds `b` into `a` (for merging worker counts). */
export function addCounts(a: KernelCounts, b: KernelCounts): KernelCounts {
  a.cells += b.cells; a.ok += b.ok; a.rejected += b.rejected; a.notConverged += b.notConverged;
  a.dewPointClamped += b.dewPointClamped; a.solved += b.solved;
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
const TA_MIN = INPUT_LIMITS.airTemperatureC[0];
const TA_MAX = INPUT_LIMITS.airTemperatureC[1];
const TD_MIN = INPUT_LIMITS.dewPointMinC;
const P_MIN = INPUT_LIMITS.pressureHpa[0];
const P_MAX = INPUT_LIMITS.pressureHpa[1];
const U_MIN = INPUT_LIMITS.windMs[0];
const U_MAX = INPUT_LIMITS.windMs[1];
const S_MIN = INPUT_LIMITS.solarWm2[0];
const S_MAX = INPUT_LIMITS.solarWm2[1];

/**
 * Runs the kernel on cell-hours [start, end) of the arrays. Returns counts for that range.
 * @param inputs per cell-hour inputs (units on {@link WbgtInputs})
 * @param outputs per cell-hour outputs [°C] and status
 */
export function wbgtKernel(inputs: WbgtInputs, outputs: WbgtOutputs, end: number, start = 0): KernelCounts {
  const { airTemperature: TA, dewPointTemperature: TD, surfacePressure: P, wind2m: U, solar: S, cosZenith: CZ, directFraction: FD } = inputs;
  const { wbgtSun, wbgtShade, globeSun, wetBulbSun, globeShade, wetBulbShade, psychrometric, status } = outputs;
  const s = cell;
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
    if (code !== 0 || !(ta >= TA_MIN && ta <= TA_MAX && td >= TD_MIN && p >= P_MIN && p <= P_MAX && u >= U_MIN && u <= U_MAX &&
      sol >= S_MIN && sol <= S_MAX && cz >= -1 && cz <= 1 && fd >= 0 && fd <= 1)) {
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
    // Inputs go through the cell's fields (no boxed number arguments, see CellState).
    s.taC = ta;
    s.tdC = td;
    s.p = p;
    s.u2 = u;
    s.solar = sol;
    s.fdirIn = fd;
    s.cz = cz;
    prepareFields(s);
    solved++;
    // Shade first; the sun solves start one quadratic step off the shade roots, and where there
    // is no solar load the sun balances are the shade balances (same root, not solved again).
    globeShadeGuess(s);
    itGd += globeRoot(s, false);
    const tgShade = s.x;
    let tgSun = tgShade;
    if (s.qg > 0 && tgShade === tgShade) {
      globeSunGuess(s);
      itGs += globeRoot(s, true);
      tgSun = s.x;
    }
    wetBulbShadeGuess(s, true);
    itWd += wetBulbRoot(s, true, false);
    const twShade = s.x;
    let twSun = twShade;
    if (s.qw > 0 && twShade === twShade) {
      wetBulbSunGuess(s);
      itWs += wetBulbRoot(s, true, true);
      twSun = s.x;
    }
    let tpsy = 0;
    if (psychrometric) {
      wetBulbShadeGuess(s, false);
      itPsy += wetBulbRoot(s, false, false);
      tpsy = s.x;
    }
    if (!(tgSun === tgSun) || !(tgShade === tgShade)) code = STATUS.globeNotConverged;
    else if (!(twSun === twSun) || !(twShade === twShade) || !(tpsy === tpsy)) code = STATUS.wetBulbNotConverged;
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
}

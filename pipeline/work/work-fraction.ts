/**
 * Allowable work fraction per hour, from the 1-hour time-weighted metabolic rate and WBGT
 * (docs/methods.md §8.6; ACGIH/NIOSH/ISO time-weighted-average method). A worker works a fraction f of
 * the hour at M_w and rests the rest of it at M_r; the hour is acceptable when
 *
 *   f·WBGT_w + (1 − f)·WBGT_r  ≤  L(f·M_w + (1 − f)·M_r)          (WBGT values effective: + CAV)
 *
 * and f is the largest fraction in [0, 1] that satisfies it. Hours lost = 1 − f.
 *
 * - Rest in the same place (WBGT_r = WBGT_w), curve model: closed form (docs/methods.md §8.6)
 *   `M_lim = 10^((a − WBGT_eff)/b)`, `f = (M_lim − M_r)/(M_w − M_r)` clipped to [0, 1]
 *   (a, b from limit-curves.ts; `10^x` computed as `exp(x·ln 10)`).
 * - Rest at another WBGT (e.g. in shade while working in sun), curve model: the left side minus
 *   the right side, g(f), is increasing and concave in f (log of a linear function), so Newton's
 *   method started left of the root (at the same-place fraction) climbs monotonically to it
 *   without overshooting; we stop when a step is below 1e-5: with quadratic convergence the error
 *   left is about 1e-10 (measured against a run to 1e-15), far below Float32 resolution.
 *   A rest place hotter than the work place is not used: WBGT_r is taken as min(WBGT_r, WBGT_w).
 * - 1989 table model: L is piecewise linear in M (limit-curves.ts), so g is piecewise linear in f
 *   and the root is found exactly, segment by segment.
 *
 * "Above the limit" means WBGT_w + CAV > L(M_w); an hour exactly at the limit is not above it and
 * has f = 1. So an hour is above the limit exactly when f < 1 (the reduction may count "above"
 * from f instead of a second pass). Missing inputs (NaN) give f = NaN and are never "above".
 */
import { ClothingAdjustmentOutOfRange, MetabolicRateOutOfRange, RestRateNotBelowWork, WorkParameterInvalid } from './errors.ts';
import { LIMIT_CURVE_2017, LIMIT_MODELS, ACCLIMATIZATION_STATES, limitWbgt, table1989Knots, type LimitChoice } from './limit-curves.ts';
import { MAX_METABOLIC_RATE_W } from './limit-curves.ts';
import { MAX_CAV } from './clothing.ts';

const LN10 = Math.LN10;
/** Largest float32 below 1 (1 − 2⁻²⁴): an hour above the limit never stores f = 1 in a Float32Array. */
const F32_BELOW_ONE = 1 - 2 ** -24;

/** What a work-fraction evaluation needs besides the WBGT. */
export interface WorkFractionParams {
  /** Metabolic rate while working [W]. */
  workRate: number;
  /** Metabolic rate while resting [W] (115 W usual). */
  restRate: number;
  /** Limit model and acclimatization. */
  limit: LimitChoice;
  /** Clothing adjustment value [°C-WBGT], added to work and rest WBGT alike (same clothes). Default 0. */
  clothingAdjustment?: number;
}

/** Precomputed constants for one class × limit × clothing, made by {@link prepareWorkKernel}. */
export interface WorkKernel {
  readonly params: Readonly<Required<WorkFractionParams>>;
  /** Limit at the work rate, L(M_w) [°C-WBGT]. */
  readonly limitWork: number;
  /** Limit at the rest rate, L(M_r) [°C-WBGT]. */
  readonly limitRest: number;
  /** Measured WBGT above which an hour is above the limit: L(M_w) − CAV [°C]. */
  readonly threshold: number;
  /** True for the continuous curve model. */
  readonly curve: boolean;
  /** Internal: curve constants and table knots; not part of the contract. */
  readonly k: KernelConstants;
}

interface KernelConstants {
  workRate: number;
  restRate: number;
  deltaRate: number;
  cav: number;
  intercept: number;
  slope: number;
  /** ln10 / slope and intercept·ln10/slope: `M_lim = exp(c0 − c1·WBGT)`. */
  c0: number;
  c1: number;
  /** slope·ΔM/ln10, for g'(f). */
  dLogCoef: number;
  /** Table model: breakpoints in f (from 0 to 1) and the limit at each [°C-WBGT]. */
  knotF: Float64Array;
  knotL: Float64Array;
}

/**
 * Validates the parameters and precomputes the constants of one evaluation setting. Catalogued
 * errors: MetabolicRateOutOfRange, RestRateNotBelowWork, ClothingAdjustmentOutOfRange,
 * WorkParameterInvalid (unknown limit model or acclimatization).
 */
export function prepareWorkKernel(params: WorkFractionParams): WorkKernel {
  const { workRate, restRate, limit } = params;
  const cav = params.clothingAdjustment ?? 0;
  for (const [id, v] of [
    ['work rate', workRate],
    ['rest rate', restRate],
  ] as const) {
    if (!Number.isFinite(v) || v <= 0 || v > MAX_METABOLIC_RATE_W) throw MetabolicRateOutOfRange({ id, value: v });
  }
  if (restRate >= workRate) throw RestRateNotBelowWork({ id: 'work rate', rest: restRate, work: workRate });
  if (!Number.isFinite(cav) || cav < 0 || cav > MAX_CAV) throw ClothingAdjustmentOutOfRange({ value: cav });
  if (!LIMIT_MODELS.includes(limit.model)) {
    throw WorkParameterInvalid({ name: 'limit.model', value: String(limit.model), expected: LIMIT_MODELS.join(' or ') });
  }
  if (!ACCLIMATIZATION_STATES.includes(limit.acclimatization)) {
    throw WorkParameterInvalid({ name: 'limit.acclimatization', value: String(limit.acclimatization), expected: ACCLIMATIZATION_STATES.join(' or ') });
  }
  const airMovement = limit.airMovement ?? false;
  const curve = limit.model === 'curve-2017';
  const coef = LIMIT_CURVE_2017[limit.acclimatization];
  const deltaRate = workRate - restRate;
  let knotF = new Float64Array(0);
  let knotL = new Float64Array(0);
  if (!curve) {
    const { rates } = table1989Knots(limit.acclimatization, airMovement);
    const fs = [0];
    for (const m of rates) if (m > restRate && m < workRate) fs.push((m - restRate) / deltaRate);
    fs.push(1);
    knotF = Float64Array.from(fs);
    knotL = Float64Array.from(fs, (f) => limitWbgt(restRate + f * deltaRate, { ...limit, airMovement }));
  }
  const limitWork = limitWbgt(workRate, { ...limit, airMovement });
  const limitRest = limitWbgt(restRate, { ...limit, airMovement });
  return {
    params: { workRate, restRate, limit: { ...limit, airMovement }, clothingAdjustment: cav },
    limitWork,
    limitRest,
    threshold: limitWork - cav,
    curve,
    k: {
      workRate,
      restRate,
      deltaRate,
      cav,
      intercept: coef.intercept,
      slope: coef.slope,
      c0: (coef.intercept * LN10) / coef.slope,
      c1: LN10 / coef.slope,
      dLogCoef: (coef.slope * deltaRate) / LN10,
      knotF,
      knotL,
    },
  };
}

/**
 * Allowable work fraction of the hour [0–1] for measured WBGT at work `wbgtWork` [°C] and at the
 * rest place `wbgtRest` [°C] (null = rest in the same place). Clothing is added inside.
 */
export function allowableWorkFraction(wbgtWork: number, wbgtRest: number | null, kernel: WorkKernel): number {
  return kernel.curve
    ? fractionCurve(kernel, wbgtWork + kernel.k.cav, wbgtRest === null ? null : wbgtRest + kernel.k.cav)
    : fractionTable(kernel, wbgtWork + kernel.k.cav, wbgtRest === null ? null : wbgtRest + kernel.k.cav);
}

/** Whether the hour is above the limit: WBGT_w + CAV > L(M_w) (equality is not above; NaN is not above). */
export function isAboveLimit(wbgtWork: number, kernel: WorkKernel): boolean {
  return wbgtWork + kernel.k.cav > kernel.limitWork;
}

/**
 * Array kernel: `out[i]` = allowable work fraction [0–1] for `wbgtWork[i]` [°C] with rest at
 * `wbgtRest[i]` [°C] (or in the same place when `wbgtRest` is null), for i < out.length.
 * No allocation. NaN in → NaN out. An hour above the limit stores at most 1 − 2⁻²⁴, so
 * `out[i] < 1` ⇔ above the limit holds in Float32 too.
 */
export function workFractionInto(out: Float32Array, wbgtWork: Float32Array, wbgtRest: Float32Array | null, kernel: WorkKernel): Float32Array {
  const n = out.length;
  checkLengths(n, wbgtWork, wbgtRest);
  const cav = kernel.k.cav;
  if (kernel.curve && wbgtRest === null) {
    // Hot loop of the common case, inlined: rest in the same place, curve model.
    const { c0, c1, restRate, deltaRate } = kernel.k;
    const lw = kernel.limitWork;
    const inv = 1 / deltaRate;
    for (let i = 0; i < n; i++) {
      const w = wbgtWork[i] + cav;
      if (w <= lw) out[i] = 1;
      else if (w !== w) out[i] = NaN;
      else {
        const f = (Math.exp(c0 - c1 * w) - restRate) * inv;
        out[i] = f <= 0 ? 0 : f < F32_BELOW_ONE ? f : F32_BELOW_ONE;
      }
    }
    return out;
  }
  for (let i = 0; i < n; i++) {
    const w = wbgtWork[i] + cav;
    const f = kernel.curve ? fractionCurve(kernel, w, wbgtRest![i] + cav) : fractionTable(kernel, w, wbgtRest === null ? null : wbgtRest[i] + cav);
    out[i] = f < F32_BELOW_ONE || f === 1 || f !== f ? f : F32_BELOW_ONE;
  }
  return out;
}

/**
 * Array kernel: `out[i]` = 1 when `wbgtWork[i]` + CAV > L(M_w), else 0 (NaN → 0), for i < out.length.
 * No allocation.
 */
export function aboveLimitInto(out: Uint8Array, wbgtWork: Float32Array, kernel: WorkKernel): Uint8Array {
  const n = out.length;
  checkLengths(n, wbgtWork, null);
  const t = kernel.limitWork;
  const cav = kernel.k.cav;
  for (let i = 0; i < n; i++) out[i] = wbgtWork[i] + cav > t ? 1 : 0;
  return out;
}

function checkLengths(n: number, a: Float32Array, b: Float32Array | null): void {
  if (a.length < n || (b !== null && b.length < n)) {
    throw WorkParameterInvalid({
      name: 'input length',
      value: `${a.length}${b ? ` / ${b.length}` : ''}`,
      expected: `at least out.length = ${n} values`,
    });
  }
}

/** Curve model, effective WBGT at work `w` and at rest `r` (null = same place) [°C-WBGT]. */
function fractionCurve(kernel: WorkKernel, w: number, r: number | null): number {
  const k = kernel.k;
  if (w <= kernel.limitWork) return 1;
  if (w !== w) return NaN;
  if (r === null || r >= w) {
    const f = (Math.exp(k.c0 - k.c1 * w) - k.restRate) / k.deltaRate;
    return f > 0 ? f : 0;
  }
  if (r !== r) return NaN;
  if (r >= kernel.limitRest) return 0;
  // Newton on g(f) = r + f·(w − r) − a + b·log10(M_r + f·ΔM), increasing and concave. Start at the
  // same-place fraction f₀ (or 0): there g(f₀) = (1 − f₀)·(r − w) ≤ 0, i.e. left of the root, so
  // the iterates climb monotonically to it.
  const dw = w - r;
  const base = r - k.intercept;
  const f0 = (Math.exp(k.c0 - k.c1 * w) - k.restRate) / k.deltaRate;
  let f = f0 > 0 ? f0 : 0;
  for (let it = 0; it < 40; it++) {
    const m = k.restRate + f * k.deltaRate;
    const g = base + f * dw + (k.slope * Math.log(m)) / LN10;
    const dg = dw + k.dLogCoef / m;
    const step = -g / dg;
    f += step;
    if (step < 1e-5) break;
  }
  return f < 0 ? 0 : f > 1 ? 1 : f;
}

/** Table model: exact root of the piecewise-linear g(f), largest f with g ≤ 0. */
function fractionTable(kernel: WorkKernel, w: number, r: number | null): number {
  if (w <= kernel.limitWork) return 1;
  if (w !== w) return NaN;
  const rest = r === null || r >= w ? w : r;
  if (rest !== rest) return NaN;
  const { knotF, knotL } = kernel.k;
  const dw = w - rest;
  let gPrev = rest - knotL[0];
  if (gPrev > 0) return 0;
  for (let j = 1; j < knotF.length; j++) {
    const g = rest + knotF[j] * dw - knotL[j];
    if (g > 0) return knotF[j - 1] + (-gPrev * (knotF[j] - knotF[j - 1])) / (g - gPrev);
    gPrev = g;
  }
  return 1;
}

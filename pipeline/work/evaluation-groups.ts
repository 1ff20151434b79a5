/**
 * Evaluations grouped for the hot loop of the reduction. With the continuous limit curves and
 * rest in the same place, the allowable work fraction of every workload class follows from one
 * number per hour, the metabolic rate the limit allows at the hour's effective WBGT
 * (docs/methods.md §8.6): `M_lim = 10^((a − WBGT_eff)/b)`, then `f = (M_lim − M_r)/(M_w − M_r)`
 * clipped to [0, 1]. Evaluations that share acclimatization, exposure and clothing therefore
 * share one exponential per hour. Same formula and constants as work-fraction.ts (its kernel
 * constants c0, c1 are reused, not restated); tests check the two agree.
 */
import type { Exposure, WorkEvaluation } from './work-settings.ts';

/** Evaluations sharing acclimatization, exposure and clothing. */
export interface EvaluationGroup {
  exposure: Exposure;
  /** Clothing adjustment [°C-WBGT]. */
  cav: number;
  /** `M_lim = exp(c0 − c1·WBGT_eff)` [W]. */
  c0: number;
  c1: number;
  /** Lowest limit of the members, L(M_w) [°C-WBGT]: below it no member is above its limit. */
  lowestLimit: number;
  /** Index of each member in the evaluation list. */
  members: Int32Array;
  /** Per member: limit at the work rate [°C-WBGT], rest rate [W], 1/(M_w − M_r) [1/W]. */
  limitWork: Float64Array;
  restRate: Float64Array;
  invDelta: Float64Array;
}

/**
 * Groups the evaluations, or returns null when any of them needs the general solver (the 1989
 * table model, or rest at another place's WBGT): then use work-fraction.ts per evaluation.
 */
export function groupEvaluations(evaluations: readonly WorkEvaluation[]): EvaluationGroup[] | null {
  if (evaluations.some((e) => !e.kernel.curve || e.restWbgt !== null)) return null;
  const groups = new Map<string, number[]>();
  evaluations.forEach((e, i) => {
    const k = e.kernel;
    const key = `${e.exposure}|${k.k.cav}|${k.k.c0}|${k.k.c1}`;
    groups.set(key, [...(groups.get(key) ?? []), i]);
  });
  return [...groups.values()].map((idx) => {
    const first = evaluations[idx[0]];
    const limitWork = Float64Array.from(idx, (i) => evaluations[i].kernel.limitWork);
    return {
      exposure: first.exposure,
      cav: first.kernel.k.cav,
      c0: first.kernel.k.c0,
      c1: first.kernel.k.c1,
      lowestLimit: Math.min(...limitWork),
      members: Int32Array.from(idx),
      limitWork,
      restRate: Float64Array.from(idx, (i) => evaluations[i].kernel.k.restRate),
      invDelta: Float64Array.from(idx, (i) => 1 / evaluations[i].kernel.k.deltaRate),
    };
  });
}

/** The metabolic rate the limit allows at effective WBGT `wbgtEff` [°C-WBGT] → [W]. */
export function allowedMetabolicRate(g: EvaluationGroup, wbgtEff: number): number {
  return Math.exp(g.c0 - g.c1 * wbgtEff);
}

/** Allowable work fraction [0–1] of member `j` when the limit allows `mLim` [W] (and the hour is above its limit). */
export function memberWorkFraction(g: EvaluationGroup, j: number, mLim: number): number {
  const f = (mLim - g.restRate[j]) * g.invDelta[j];
  return f > 0 ? f : 0;
}

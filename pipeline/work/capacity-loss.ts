/**
 * Capacity-loss functions from the climate-impact literature: a second view beside the limit
 * method (work-fraction.ts). They give the share of an hour's work capacity lost at a given WBGT;
 * they are population-level estimates, not work/rest advice. Each carries its source.
 *
 * - Kjellstrom et al. (2018), Int J Biometeorol, doi 10.1007/s00484-017-1407-0: cumulative normal
 *   `loss = ½·[1 + erf((WBGT − μ)/(σ·√2))]` with μ/σ per work intensity (docs/methods.md §9.1; values as
 *   read in two independent public research codes; the paper was not read).
 * - Dunne, Stouffer & John (2013), Nature Climate Change 3:563–566: heavy work,
 *   `capacity[%] = 100 − 25·max(0, WBGT − 25)^(2/3)`, clipped to [0, 100] (docs/methods.md §9.2).
 *
 * All WBGT values are [°C]; losses are fractions of the hour [0–1].
 *
 * Clothing: the functions relate capacity to the WBGT around workers in ordinary light work
 * clothes (Bröde et al. 2018, Int J Biometeorol 62:331–345, of the same group, assume "light work
 * clothes (0.6 clo)" [read in the abstract]; Dunne et al. 2013 build on NIOSH/military work–rest
 * guidance for workers in ordinary work clothes or uniform [from memory]). A clothing adjustment
 * value is, by its definition (ACGIH, ISO 7243), the WBGT increment that makes an ensemble count
 * like those clothes, so the pipeline feeds the functions the effective WBGT, WBGT + CAV
 * (pipeline/reduce/accumulator.ts `lossCav`, the `offset` of the array kernels below). With work
 * clothes (CAV 0) that is the bare WBGT.
 */
import { WorkParameterInvalid } from './errors.ts';
import { normalCdf, normalCdfFast } from './erf.ts';

/** Work intensities of Kjellstrom et al. (2018) [W]. */
export type KjellstromIntensity = 200 | 300 | 400;

/** μ and σ [°C WBGT] per intensity (docs/methods.md §9.1, Kjellstrom et al. 2018). */
export const KJELLSTROM_2018: Readonly<Record<KjellstromIntensity, { mean: number; sd: number }>> = {
  200: { mean: 35.53, sd: 3.94 },
  300: { mean: 33.49, sd: 3.94 },
  400: { mean: 32.47, sd: 4.16 },
};

/** Source label for tables and the site. */
export const KJELLSTROM_2018_SOURCE = 'Kjellstrom et al. 2018, Int J Biometeorol, doi:10.1007/s00484-017-1407-0';
export const DUNNE_2013_SOURCE = 'Dunne, Stouffer & John 2013, Nature Climate Change 3:563–566';

function params(intensity: number): { mean: number; sd: number } {
  const p = KJELLSTROM_2018[intensity as KjellstromIntensity];
  if (!p) throw WorkParameterInvalid({ name: 'intensity', value: String(intensity), expected: '200, 300 or 400 [W]' });
  return p;
}

/**
 * Fraction of work capacity lost [0–1] at WBGT `wbgt` [°C] for intensity 200 / 300 / 400 W
 * (Kjellstrom et al. 2018; docs/methods.md §9.1). NaN → NaN.
 */
export function kjellstrom2018Loss(wbgt: number, intensity: KjellstromIntensity): number {
  const { mean, sd } = params(intensity);
  return normalCdf((wbgt - mean) / sd);
}

/**
 * Array kernel of {@link kjellstrom2018Loss}: `out[i]` = loss [0–1] at `wbgt[i]` + `offset` [°C]
 * (offset e.g. a clothing adjustment, default 0), for i < out.length. Uses the tabulated Φ
 * (erf.ts, error < 1e-9). No allocation.
 */
export function kjellstrom2018LossInto(out: Float32Array, wbgt: Float32Array, intensity: KjellstromIntensity, offset = 0): Float32Array {
  const { mean, sd } = params(intensity);
  checkLength(out, wbgt);
  const inv = 1 / sd;
  const shift = offset - mean;
  for (let i = 0; i < out.length; i++) out[i] = normalCdfFast((wbgt[i] + shift) * inv);
  return out;
}

/**
 * Fraction of work capacity lost [0–1] for heavy work at WBGT `wbgt` [°C]
 * (Dunne et al. 2013; docs/methods.md §9.2): 0 up to 25 °C, 1 from about 33 °C. NaN → NaN.
 */
export function dunne2013Loss(wbgt: number): number {
  if (wbgt !== wbgt) return NaN;
  if (wbgt <= 25) return 0;
  const c = Math.cbrt(wbgt - 25); // (WBGT − 25)^(2/3) = cbrt(WBGT − 25)², exact at 33 °C
  const capacityPct = 100 - 25 * c * c;
  return capacityPct <= 0 ? 1 : 1 - capacityPct / 100;
}

/** Array kernel of {@link dunne2013Loss}: `out[i]` = loss at `wbgt[i]` + `offset` [°C]. No allocation. */
export function dunne2013LossInto(out: Float32Array, wbgt: Float32Array, offset = 0): Float32Array {
  checkLength(out, wbgt);
  for (let i = 0; i < out.length; i++) out[i] = dunne2013Loss(wbgt[i] + offset);
  return out;
}

function checkLength(out: Float32Array, wbgt: Float32Array): void {
  if (wbgt.length < out.length) {
    throw WorkParameterInvalid({ name: 'input length', value: String(wbgt.length), expected: `at least out.length = ${out.length} values` });
  }
}

/** A capacity-loss function prepared for hot loops (constants hoisted). */
export interface PreparedLoss {
  kind: 'kjellstrom-2018' | 'dunne-2013';
  /** Kjellstrom μ [°C] and 1/σ [1/°C]; unused for Dunne. */
  mean: number;
  invSd: number;
}

/** Kjellstrom et al. 2018 at `intensity` [W], or Dunne et al. 2013 when `intensity` is undefined. */
export function prepareLoss(intensity?: KjellstromIntensity): PreparedLoss {
  if (intensity === undefined) return { kind: 'dunne-2013', mean: NaN, invSd: NaN };
  const { mean, sd } = params(intensity);
  return { kind: 'kjellstrom-2018', mean, invSd: 1 / sd };
}

/** Loss [0–1] at WBGT `wbgt` [°C] for a prepared function; same values as the array kernels above. */
export function lossPrepared(wbgt: number, p: PreparedLoss): number {
  return p.kind === 'kjellstrom-2018' ? normalCdfFast((wbgt - p.mean) * p.invSd) : dunne2013Loss(wbgt);
}

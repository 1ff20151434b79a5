/**
 * A "nice" colour domain picked from data, so a layer's key reads in round numbers and several
 * layers (e.g. the twelve months) can share one scale: pass all of them at once.
 */
import { scaleLinear } from 'd3-scale';
import { LayerNoData } from './errors.ts';

export interface NiceDomainOptions {
  /** Start the domain at 0 (counts, hours, fractions); default true. */
  fromZero?: boolean;
  /**
   * Lower and upper percentiles [%] the domain spans instead of min and max, so a few extreme
   * cells do not wash out the rest; e.g. [2, 98]. Linear interpolation between order statistics
   * (Hyndman & Fan 1996 type 7, docs/methods.md §10.1). Default [0, 100].
   */
  percentiles?: [number, number];
  /** An upper bound the domain never exceeds, e.g. 744 h in a month or 1 for a fraction [units]. */
  cap?: number;
}

/** Type-7 quantile of sorted finite values (docs/methods.md §10.1: h = (n − 1) p + 1). */
function quantileSorted(sorted: Float64Array, p: number): number {
  const h = (sorted.length - 1) * p;
  const lo = Math.floor(h);
  const hi = Math.min(lo + 1, sorted.length - 1);
  return sorted[lo] + (h - lo) * (sorted[hi] - sorted[lo]);
}

/**
 * A domain [min, max] with min < max covering the finite values of all `layers` [their units],
 * rounded outwards to round numbers with d3-scale's `nice()`. NaN cells are ignored. All-equal
 * data (e.g. zero hours everywhere) get a unit-wide domain. Throws LayerNoData when no layer has a
 * finite value.
 */
export function niceDomain(layers: ArrayLike<number> | ArrayLike<number>[], opts: NiceDomainOptions = {}): [number, number] {
  const list: ArrayLike<number>[] = Array.isArray(layers) && typeof layers[0] !== 'number' ? (layers as ArrayLike<number>[]) : [layers as ArrayLike<number>];
  let count = 0;
  let total = 0;
  for (const a of list) {
    total += a.length;
    for (let i = 0; i < a.length; i++) if (Number.isFinite(a[i])) count++;
  }
  if (count === 0) throw LayerNoData({ count: total }, { variable: 'values' });
  const finite = new Float64Array(count);
  let k = 0;
  for (const a of list) for (let i = 0; i < a.length; i++) if (Number.isFinite(a[i])) finite[k++] = a[i];
  finite.sort();
  const [pLo, pHi] = opts.percentiles ?? [0, 100];
  let lo = quantileSorted(finite, pLo / 100);
  let hi = quantileSorted(finite, pHi / 100);
  if (opts.fromZero ?? true) {
    lo = Math.min(0, lo);
    hi = Math.max(0, hi);
  }
  if (lo === hi) hi = lo + 1;
  const [niceLo, niceHi0] = scaleLinear().domain([lo, hi]).nice().domain() as [number, number];
  const niceHi = opts.cap !== undefined && niceHi0 > opts.cap && opts.cap > niceLo ? opts.cap : niceHi0;
  return [niceLo, niceHi];
}

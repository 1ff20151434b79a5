/**
 * Mapping a file's latitude/longitude axes onto the pipeline's one convention
 * (pipeline/model/grid.ts): latitude ascending; longitude ascending in [-180, 180), except that
 * a regional grid crossing the antimeridian keeps continuous longitudes starting west of it
 * (and may run past 180). Longitudes in 0..360 or past 360 are wrapped first. Source longitudes may wrap in any order. The result tells,
 * for each canonical row and column, which source row and column it comes from.
 */
import { NetcdfGridUnsupported } from './errors.ts';

export interface AxisMap {
  /** Canonical coordinates, ascending [°]. */
  values: Float64Array;
  /** Source index of each canonical index. */
  source: Int32Array;
}

/** Wraps a longitude into [-180, 180) [° E]. */
export function wrapLongitude(lon: number): number {
  const w = ((((lon + 180) % 360) + 360) % 360) - 180;
  return w === 180 ? -180 : w;
}

function strictlyMonotonic(x: ArrayLike<number>): 1 | -1 | 0 {
  if (x.length < 2) return 1;
  const up = x[1] > x[0];
  for (let i = 1; i < x.length; i++) {
    const d = x[i] - x[i - 1];
    if (!(up ? d > 0 : d < 0)) return 0;
  }
  return up ? 1 : -1;
}

/** Latitude [° N] in ascending order, flipping a descending axis. */
export function normalizeLatitude(lat: ArrayLike<number>, where: string): AxisMap {
  const dir = strictlyMonotonic(lat);
  if (dir === 0) throw NetcdfGridUnsupported({ detail: `${where}: latitude is not strictly monotonic` }, { file: where });
  const n = lat.length;
  const values = new Float64Array(n);
  const source = new Int32Array(n);
  for (let i = 0; i < n; i++) {
    const s = dir === 1 ? i : n - 1 - i;
    values[i] = lat[s];
    source[i] = s;
  }
  if (values[0] < -90.0001 || values[n - 1] > 90.0001) throw NetcdfGridUnsupported({ detail: `${where}: latitude runs outside -90 … 90` }, { file: where });
  return { values, source };
}

/** Longitude [° E] in the canonical convention (see the file comment). */
export function normalizeLongitude(lon: ArrayLike<number>, where: string): AxisMap {
  const n = lon.length;
  // Source order may wrap (e.g. 359.5, 359.75, 0, 0.25); only repeated points are refused.
  const pairs = Array.from({ length: n }, (_, i) => ({ w: wrapLongitude(lon[i]), s: i }));
  pairs.sort((a, b) => a.w - b.w);
  for (let i = 1; i < n; i++) {
    if (Math.abs(pairs[i].w - pairs[i - 1].w) < 1e-9) {
      throw NetcdfGridUnsupported(
        { detail: `${where}: longitude ${pairs[i].w} appears twice after wrapping (a grid that repeats its first column at +360?)` },
        { file: where },
      );
    }
  }
  let cut = -1; // rotate so that the canonical axis starts after the widest gap
  if (n > 1) {
    let maxGap = 0;
    for (let i = 0; i + 1 < n; i++) {
      const g = pairs[i + 1].w - pairs[i].w;
      if (g > maxGap) {
        maxGap = g;
        cut = i;
      }
    }
    const wrapGap = pairs[0].w + 360 - pairs[n - 1].w;
    if (wrapGap >= maxGap - 1e-9) cut = -1;
  }
  const values = new Float64Array(n);
  const source = new Int32Array(n);
  for (let i = 0; i < n; i++) {
    const p = pairs[(cut + 1 + i) % n];
    values[i] = cut >= 0 && i >= n - 1 - cut ? p.w + 360 : p.w;
    source[i] = p.s;
  }
  return { values, source };
}

/** Runs of consecutive canonical indices whose source indices also step by +1. */
export interface IndexRun {
  /** First canonical index (relative to the window asked for). */
  to: number;
  /** First source index. */
  from: number;
  length: number;
}

/** Splits canonical indices [i0, i1) into runs that are contiguous in the source. */
export function sourceRuns(source: Int32Array, i0: number, i1: number): IndexRun[] {
  const runs: IndexRun[] = [];
  let i = i0;
  while (i < i1) {
    let j = i + 1;
    while (j < i1 && source[j] === source[j - 1] + 1) j++;
    runs.push({ to: i - i0, from: source[i], length: j - i });
    i = j;
  }
  return runs;
}

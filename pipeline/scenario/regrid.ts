/**
 * Change factors from a change file's grid onto the atlas's cells: bilinear interpolation between
 * the four source points around each cell centre (linear in latitude, then in longitude, in
 * degrees: a field linear in both is reproduced exactly), with stated rules where the four points
 * are not all there. Pure: coordinates and values in, weights and values out.
 *
 * Rules (ours; bilinear interpolation itself is common practice, no source):
 * - Edges. A cell centre beyond the outermost source points but within half a grid step of them
 *   (inside the outermost source cells) takes the edge row or column (constant outwards). Farther
 *   out, the file does not cover the atlas: catalogued ChangeGridNotCovering. A file whose
 *   longitudes go round the globe (the gap across its seam no wider than its widest step)
 *   interpolates across the seam; longitudes are compared modulo 360°.
 * - Coasts and masked points. Where some of the four points have no value (a land-only file at
 *   the coast, a masked point), the weights of those that have one are renormalised to sum to 1;
 *   if those weights are all zero (the cell sits on or along a missing point), the plain mean of
 *   the points with a value among the four is taken; if none of the four has a value, there is no
 *   change for the cell: catalogued ChangeValueMissing.
 */
import { ChangeGridInvalid, ChangeGridNotCovering } from './errors.ts';

/** Tolerance on coordinates [°]. */
const EPS = 1e-9;

/** A rectilinear source grid in the pipeline's convention: ascending latitude and longitude [°]. */
export interface SourceGrid {
  lat: Float64Array;
  lon: Float64Array;
}

/** Bilinear weights of n target points: the source rows y0, y1 and columns x0, x1, and the weights of y1 and x1. */
export interface BilinearWeights {
  n: number;
  y0: Int32Array;
  y1: Int32Array;
  x0: Int32Array;
  x1: Int32Array;
  /** Weight of row y1 (1 − wy for y0) and of column x1 (1 − wx for x0) [–]. */
  wy: Float64Array;
  wx: Float64Array;
}

/** First index i of an ascending array with a[i] > x (binary search). */
function upper(a: Float64Array, x: number): number {
  let lo = 0;
  let hi = a.length;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if (a[mid] <= x) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}

/** Position of `p` on an ascending axis: bracketing indices and the weight of the upper one, or null beyond the edge margin. */
function bracket(a: Float64Array, p: number): [number, number, number] | null {
  const n = a.length;
  const h0 = (a[1] - a[0]) / 2;
  const h1 = (a[n - 1] - a[n - 2]) / 2;
  if (p < a[0] - h0 - EPS || p > a[n - 1] + h1 + EPS) return null;
  if (p <= a[0]) return [0, 0, 0];
  if (p >= a[n - 1]) return [n - 1, n - 1, 0];
  const i = upper(a, p) - 1;
  return [i, i + 1, (p - a[i]) / (a[i + 1] - a[i])];
}

/** Whether a longitude axis goes round the globe: the gap across its seam is no wider than its widest step. */
export function isGlobalLongitude(lon: Float64Array): boolean {
  const n = lon.length;
  if (n < 2) return false;
  let widest = 0;
  for (let i = 1; i < n; i++) widest = Math.max(widest, lon[i] - lon[i - 1]);
  const gap = lon[0] + 360 - lon[n - 1];
  return gap > EPS && gap <= widest * (1 + 1e-6) + EPS;
}

/** The extent a source grid covers, in words: its outermost points and half a step beyond. */
export function describeExtent(src: SourceGrid): string {
  const f = (x: number) => String(Math.round(x * 1e4) / 1e4);
  const { lat, lon } = src;
  const la = [lat[0] - (lat[1] - lat[0]) / 2, lat[lat.length - 1] + (lat[lat.length - 1] - lat[lat.length - 2]) / 2];
  const lo = isGlobalLongitude(lon)
    ? 'every longitude'
    : `${f(lon[0] - (lon[1] - lon[0]) / 2)}° to ${f(lon[lon.length - 1] + (lon[lon.length - 1] - lon[lon.length - 2]) / 2)}° E`;
  return `${f(la[0])}° to ${f(la[1])}° N, ${lo}`;
}

/**
 * Bilinear weights of target points (cell centres) on a source grid; catalogued errors for a grid
 * of fewer than 2 × 2 points and for a point the grid does not cover.
 * @param lat target latitudes [° N]; @param lon target longitudes [° E] (any range)
 * @param file the change file's name, for messages
 */
export function bilinearWeights(src: SourceGrid, lat: ArrayLike<number>, lon: ArrayLike<number>, file: string): BilinearWeights {
  if (src.lat.length < 2 || src.lon.length < 2) {
    throw ChangeGridInvalid({ file, detail: `its grid has ${src.lat.length} latitude(s) × ${src.lon.length} longitude(s)` }, { file });
  }
  const n = lat.length;
  const w: BilinearWeights = {
    n,
    y0: new Int32Array(n),
    y1: new Int32Array(n),
    x0: new Int32Array(n),
    x1: new Int32Array(n),
    wy: new Float64Array(n),
    wx: new Float64Array(n),
  };
  const sl = src.lon;
  const nl = sl.length;
  const global = isGlobalLongitude(sl);
  const gap = sl[0] + 360 - sl[nl - 1];
  const notCovered = (k: number) =>
    ChangeGridNotCovering({ file, lat: Math.round(lat[k] * 1e4) / 1e4, lon: Math.round(lon[k] * 1e4) / 1e4, extent: describeExtent(src) }, { file });
  for (let k = 0; k < n; k++) {
    const by = bracket(src.lat, lat[k]);
    if (by === null) throw notCovered(k);
    [w.y0[k], w.y1[k], w.wy[k]] = by;
    if (global) {
      const q = sl[0] + ((((lon[k] - sl[0]) % 360) + 360) % 360);
      if (q <= sl[nl - 1] + EPS) {
        const bx = bracket(sl, Math.min(q, sl[nl - 1]))!;
        [w.x0[k], w.x1[k], w.wx[k]] = bx;
      } else {
        w.x0[k] = nl - 1;
        w.x1[k] = 0;
        w.wx[k] = Math.min(1, (q - sl[nl - 1]) / gap);
      }
      continue;
    }
    const bx = bracket(sl, lon[k]) ?? bracket(sl, lon[k] - 360) ?? bracket(sl, lon[k] + 360);
    if (bx === null) throw notCovered(k);
    [w.x0[k], w.x1[k], w.wx[k]] = bx;
  }
  return w;
}

/** The source rows [r0, r1) the weights read. */
export function rowsNeeded(w: BilinearWeights): [number, number] {
  let r0 = Infinity;
  let r1 = -Infinity;
  for (let k = 0; k < w.n; k++) {
    r0 = Math.min(r0, w.y0[k], w.y1[k]);
    r1 = Math.max(r1, w.y0[k] + 1, w.y1[k] + 1);
  }
  return w.n === 0 ? [0, 0] : [r0, r1];
}

/**
 * Interpolates 12 months of a source field onto the target points with the coast rule (file comment).
 * @param values source rows [r0, r0 + nRows) for every month: `values[(m · nRows + r − r0) · nLon + x]`, NaN = no value
 * @param out per month × point: `out[m · n + k]`; NaN where none of the four points has a value
 * @returns the first (point, month) without a value, or null
 */
export function interpolateMonths(
  w: BilinearWeights,
  values: Float64Array,
  r0: number,
  nRows: number,
  nLon: number,
  out: Float64Array,
): { point: number; month: number } | null {
  let missing: { point: number; month: number } | null = null;
  for (let m = 0; m < 12; m++) {
    const base = m * nRows;
    for (let k = 0; k < w.n; k++) {
      const ry0 = (base + w.y0[k] - r0) * nLon;
      const ry1 = (base + w.y1[k] - r0) * nLon;
      const wy = w.wy[k];
      const wx = w.wx[k];
      const v = [values[ry0 + w.x0[k]], values[ry0 + w.x1[k]], values[ry1 + w.x0[k]], values[ry1 + w.x1[k]]];
      const wt = [(1 - wy) * (1 - wx), (1 - wy) * wx, wy * (1 - wx), wy * wx];
      let s = 0;
      let sw = 0;
      let plain = 0;
      let valid = 0;
      for (let i = 0; i < 4; i++) {
        const x = v[i];
        if (x !== x) continue;
        s += wt[i] * x;
        sw += wt[i];
        plain += x;
        valid++;
      }
      const r = sw > 0 ? (sw === 1 ? s : s / sw) : valid > 0 ? plain / valid : NaN;
      out[m * w.n + k] = r;
      if (r !== r && missing === null) missing = { point: k, month: m };
    }
  }
  return missing;
}

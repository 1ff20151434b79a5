/**
 * Sutherland–Hodgman clipping of a polygon ring against one axis-aligned half-plane
 * (Sutherland & Hodgman 1974, "Reentrant polygon clipping", Commun. ACM 17(1):32–42, citation from memory). Two passes
 * clip to a latitude band, two more to a longitude column, i.e. to a grid cell. Against a convex
 * clip region the output of a concave ring may contain zero-width bridges along the clip edge;
 * they add no area, so the output's signed area is exactly that of the true intersection.
 */

/** A growable pair of scratch buffers for clipping. */
export class ClipBuffer {
  data: Float64Array;
  constructor(corners = 64) {
    this.data = new Float64Array(2 * corners);
  }
  ensure(corners: number): Float64Array {
    if (this.data.length < 2 * corners) this.data = new Float64Array(2 * Math.max(corners, this.data.length));
    return this.data;
  }
}

/**
 * Clips a flat ring to one side of `axis = bound`.
 * @param src Flat ring [x0, y0, x1, y1, …] (x = lon [° E], y = lat [° N])
 * @param n Corners of src [count]
 * @param axis 0 clips on x (longitude), 1 on y (latitude)
 * @param bound The clip line [°]
 * @param keepAbove true keeps coordinate ≥ bound, false keeps ≤ bound
 * @param out Buffer to write the clipped ring into
 * @returns Corners written to out.data [count]
 */
export function clipHalfPlane(src: Float64Array, n: number, axis: 0 | 1, bound: number, keepAbove: boolean, out: ClipBuffer): number {
  const dst = out.ensure(2 * n + 2);
  const other = 1 - axis;
  let m = 0;
  let pa = src[2 * (n - 1) + axis];
  let po = src[2 * (n - 1) + other];
  let pin = keepAbove ? pa >= bound : pa <= bound;
  for (let i = 0; i < n; i++) {
    const ca = src[2 * i + axis];
    const co = src[2 * i + other];
    const cin = keepAbove ? ca >= bound : ca <= bound;
    if (cin !== pin) {
      const t = (bound - pa) / (ca - pa);
      dst[2 * m + axis] = bound;
      dst[2 * m + other] = po + t * (co - po);
      m++;
    }
    if (cin) {
      dst[2 * m + axis] = ca;
      dst[2 * m + other] = co;
      m++;
    }
    pa = ca;
    po = co;
    pin = cin;
  }
  return m;
}

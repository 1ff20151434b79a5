/**
 * Areas on the sphere of polygons whose edges are straight in longitude/latitude (RFC 7946 §3.1.1).
 *
 * Area = ∬ cos φ dλ dφ over the polygon (λ, φ in radians). By Green's theorem this is the ring
 * integral ∮ −sin φ dλ (counter-clockwise positive). Along a straight edge from (λ1, φ1) to
 * (λ2, φ2), λ is linear in φ, so the edge contributes
 *   (Δλ/Δφ)·(cos φ2 − cos φ1) = −Δλ · sin φm · sin(h)/h,  φm = (φ1 + φ2)/2, h = Δφ/2,
 * written in the second form so that nearly east–west edges lose no precision (h → 0 gives
 * −Δλ·sin φ). For a grid cell this gives Δλ·(sin φ2 − sin φ1), the usual cell area on a sphere
 * (common practice). Exact for these edges: no projection, no densifying.
 */

/** Mean Earth radius R1 = (2a + b)/3 of GRS 80 [km] (Moritz 2000, "Geodetic Reference System 1980"; value from memory). */
export const EARTH_RADIUS_KM = 6371.0088;

const RAD = Math.PI / 180;

/**
 * Signed area of a flat ring on the unit sphere [sr]; positive when counter-clockwise.
 * @param ring Flat open ring [lon0, lat0, lon1, lat1, …] [° E, ° N]
 * @param n Corners to use [count]; default all
 */
export function ringAreaSr(ring: ArrayLike<number>, n: number = ring.length / 2): number {
  let s = 0;
  let px = ring[2 * (n - 1)] * RAD;
  let py = ring[2 * (n - 1) + 1] * RAD;
  for (let i = 0; i < n; i++) {
    const x = ring[2 * i] * RAD;
    const y = ring[2 * i + 1] * RAD;
    const dx = x - px;
    if (dx !== 0) {
      const h = (y - py) / 2;
      const sinc = h === 0 ? 1 : Math.sin(h) / h;
      s -= dx * Math.sin((y + py) / 2) * sinc;
    }
    px = x;
    py = y;
  }
  return s;
}

/**
 * Area of a lon/lat rectangle on the unit sphere [sr]: Δλ·(sin φ2 − sin φ1).
 * @param west,east Longitudes [° E] @param south,north Latitudes [° N]
 */
export function rectangleAreaSr(west: number, east: number, south: number, north: number): number {
  return (east - west) * RAD * (Math.sin(north * RAD) - Math.sin(south * RAD));
}

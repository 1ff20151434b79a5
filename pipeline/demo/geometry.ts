/**
 * Plane geometry on [lon, lat] rings for the invented territory: point in polygon, distance to a
 * ring, ring area and segment crossings. Distances use a local equirectangular projection, good
 * to well under 1 % over the few hundred kilometres of the territory.
 */
import { ringContains } from '../regions/ring-contains.ts';

/** A vertex [° E, ° N]. */
export type LonLat = [number, number];

/** Mean length of one degree of latitude [km] (WGS 84 mean over latitude; common practice). */
export const KM_PER_DEG_LAT = 110.95;

/** Whether (lon, lat) [°] lies inside the ring: the project's one point-in-polygon test. */
export function pointInRing(lon: number, lat: number, ring: readonly LonLat[]): boolean {
  return ringContains(ring, lon, lat);
}

/** Distance from a point to the nearest edge of a ring [km] (local equirectangular projection). */
export function distanceToRingKm(lon: number, lat: number, ring: readonly LonLat[]): number {
  const kx = KM_PER_DEG_LAT * Math.cos((lat * Math.PI) / 180);
  const ky = KM_PER_DEG_LAT;
  let best = Infinity;
  for (let i = 0, j = ring.length - 1; i < ring.length; j = i++) {
    const ax = (ring[j][0] - lon) * kx;
    const ay = (ring[j][1] - lat) * ky;
    const bx = (ring[i][0] - lon) * kx;
    const by = (ring[i][1] - lat) * ky;
    const dx = bx - ax;
    const dy = by - ay;
    const len2 = dx * dx + dy * dy;
    const t = len2 > 0 ? Math.max(0, Math.min(1, -(ax * dx + ay * dy) / len2)) : 0;
    const px = ax + t * dx;
    const py = ay + t * dy;
    const d = Math.sqrt(px * px + py * py);
    if (d < best) best = d;
  }
  return best;
}

/** Signed area of a ring by the shoelace formula [deg²]; positive when counter-clockwise. */
export function ringSignedArea(ring: readonly LonLat[]): number {
  let s = 0;
  for (let i = 0, j = ring.length - 1; i < ring.length; j = i++) s += ring[j][0] * ring[i][1] - ring[i][0] * ring[j][1];
  return s / 2;
}

/** True when segments ab and cd properly cross (touching at end points does not count). */
export function segmentsCross(a: LonLat, b: LonLat, c: LonLat, d: LonLat): boolean {
  const o = (p: LonLat, q: LonLat, r: LonLat) => Math.sign((q[0] - p[0]) * (r[1] - p[1]) - (q[1] - p[1]) * (r[0] - p[0]));
  const o1 = o(a, b, c);
  const o2 = o(a, b, d);
  const o3 = o(c, d, a);
  const o4 = o(c, d, b);
  return o1 * o2 < 0 && o3 * o4 < 0;
}

/** True when no two non-adjacent edges of the (open) ring cross and no vertex repeats. */
export function ringIsSimple(ring: readonly LonLat[]): boolean {
  const n = ring.length;
  const seen = new Set(ring.map((p) => `${p[0]},${p[1]}`));
  if (seen.size !== n) return false;
  for (let i = 0; i < n; i++) {
    for (let j = i + 2; j < n; j++) {
      if (i === 0 && j === n - 1) continue;
      if (segmentsCross(ring[i], ring[(i + 1) % n], ring[j], ring[(j + 1) % n])) return false;
    }
  }
  return true;
}

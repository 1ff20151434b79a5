/**
 * Checks one GeoJSON linear ring and turns it into the pipeline's form (region.ts): positions are
 * pairs of finite numbers, at least 4 positions, closed (RFC 7946 §3.1.6), latitudes in −90…90 and
 * longitudes in −360…360 (wider than RFC 7946's −180…180 so a ring may run continuously across
 * the antimeridian, e.g. 175…185); then the closing position and repeated neighbours are dropped
 * and longitudes are made continuous. A ring that gains 360° of longitude goes around a pole and
 * is refused.
 */
import type { ErrorWhere } from '../model/errors.ts';
import { RegionAroundPole, RegionBadPosition, RegionCoordinateOutOfRange, RegionRingDegenerate, RegionRingNotClosed, RegionRingTooShort } from './errors.ts';

/**
 * Twice the signed planar area of a flat ring in lon/lat (shoelace formula) [°²];
 * positive when counter-clockwise (east = x, north = y).
 */
export function planarSignedArea2(ring: Float64Array): number {
  const n = ring.length / 2;
  let s = 0;
  for (let i = 0, j = n - 1; i < n; j = i++) s += ring[2 * j] * ring[2 * i + 1] - ring[2 * i] * ring[2 * j + 1];
  return s;
}

/**
 * Validates a ring and returns it flat, open, continuous in longitude.
 * @param coords The ring as written: an array of [lon, lat] positions [° E, ° N]
 * @param region Region label for messages
 * @param where File and key of the ring
 */
export function prepareRing(coords: unknown, region: string, where: ErrorWhere): Float64Array {
  if (!Array.isArray(coords)) throw RegionBadPosition({ region, position: 0, value: JSON.stringify(coords) ?? 'undefined' }, where);
  const n = coords.length;
  for (let i = 0; i < n; i++) {
    const p = coords[i] as unknown;
    if (!Array.isArray(p) || p.length < 2 || typeof p[0] !== 'number' || typeof p[1] !== 'number' || !Number.isFinite(p[0]) || !Number.isFinite(p[1])) {
      throw RegionBadPosition({ region, position: i, value: JSON.stringify(p) ?? 'undefined' }, where);
    }
  }
  const pos = coords as number[][];
  if (n < 4) throw RegionRingTooShort({ region, positions: n }, where);
  const first = pos[0];
  const last = pos[n - 1];
  if (first[0] !== last[0] || first[1] !== last[1]) {
    throw RegionRingNotClosed({ region, first: `[${first[0]}, ${first[1]}]`, last: `[${last[0]}, ${last[1]}]` }, where);
  }
  for (let i = 0; i < n; i++) {
    const [lon, lat] = pos[i];
    if (!(lat >= -90 && lat <= 90 && lon >= -360 && lon <= 360)) throw RegionCoordinateOutOfRange({ region, position: i, lon, lat }, where);
  }
  // Continuous longitudes over the closed ring, dropping repeated neighbours.
  const out: number[] = [];
  let prevLon = first[0];
  let prevLat = first[1];
  out.push(prevLon, prevLat);
  for (let i = 1; i < n; i++) {
    let lon = pos[i][0];
    while (lon - prevLon > 180) lon -= 360;
    while (lon - prevLon < -180) lon += 360;
    const lat = pos[i][1];
    if (lon === prevLon && lat === prevLat) continue;
    out.push(lon, lat);
    prevLon = lon;
    prevLat = lat;
  }
  // The last kept position is the closing one (unless it repeated its neighbour): it must come back to the start.
  let m = out.length / 2;
  // Its raw value equals the first position, so after unwrapping it differs from it by a multiple of 360°.
  if (m > 1 && out[2 * m - 1] === first[1] && Math.abs(out[2 * m - 2] - first[0]) > 1e-9) throw RegionAroundPole({ region }, where);
  if (m > 1 && out[2 * m - 2] === first[0] && out[2 * m - 1] === first[1]) {
    out.length -= 2;
    m--;
  }
  const ring = new Float64Array(out);
  if (m < 3 || allOnOneLine(ring)) throw RegionRingDegenerate({ region }, where);
  return ring;
}

/** Whether every corner of a flat ring lies on the line through its first two corners. */
function allOnOneLine(ring: Float64Array): boolean {
  const ax = ring[0],
    ay = ring[1],
    bx = ring[2],
    by = ring[3];
  for (let i = 4; i < ring.length; i += 2) {
    if ((bx - ax) * (ring[i + 1] - ay) - (by - ay) * (ring[i] - ax) !== 0) return false;
  }
  return true;
}

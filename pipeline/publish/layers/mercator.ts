/**
 * Spherical (Web) Mercator, the projection MapLibre stretches an `image` source in
 * (STACK.md gotcha 5). Formulas: Snyder (1987), Map Projections — A Working Manual, USGS PP 1395,
 * eq. (7-2) y = R ln tan(π/4 + φ/2) and its inverse eq. (7-4) φ = π/2 − 2 atan(e^(−y/R)), here with R = 1.
 */

/** Latitude limit of Web Mercator, where y = π (a square world) [° N]: 2 atan(e^π) − 90 °. */
export const MERCATOR_MAX_LAT = (2 * Math.atan(Math.exp(Math.PI)) * 180) / Math.PI - 90;

const RAD = Math.PI / 180;

/** Mercator y on the unit sphere of a latitude [° N] → [rad of longitude at the equator]. */
export function mercatorY(latDeg: number): number {
  return Math.log(Math.tan(Math.PI / 4 + (latDeg * RAD) / 2));
}

/** Latitude of a Mercator y on the unit sphere [rad] → [° N]. */
export function mercatorLat(y: number): number {
  return (Math.PI / 2 - 2 * Math.atan(Math.exp(-y))) / RAD;
}

/** A latitude clamped to the Web Mercator limit [° N]. */
export function clampMercatorLat(latDeg: number): number {
  return Math.max(-MERCATOR_MAX_LAT, Math.min(MERCATOR_MAX_LAT, latDeg));
}

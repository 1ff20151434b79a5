/**
 * Even-odd point-in-ring test in the plane (longitude, latitude [°]): whether (x, y) lies inside
 * the closed or open ring of [x, y] positions (W. R. Franklin's crossing rule, common practice).
 * Pure and small: used at build time (lib/basemap.ts) and in the browser (the map's region lookup).
 */
export function ringContains(ring: ReadonlyArray<ArrayLike<number>>, x: number, y: number): boolean {
  let inside = false;
  for (let i = 0, j = ring.length - 1; i < ring.length; j = i++) {
    const xi = ring[i][0];
    const yi = ring[i][1];
    const xj = ring[j][0];
    const yj = ring[j][1];
    if (yi > y !== yj > y && x < ((xj - xi) * (y - yi)) / (yj - yi) + xi) inside = !inside;
  }
  return inside;
}

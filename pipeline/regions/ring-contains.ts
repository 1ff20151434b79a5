/**
 * Even-odd point-in-ring test in the plane (longitude, latitude [°]): whether (x, y) lies inside
 * the closed or open ring of [x, y] positions (W. R. Franklin's crossing rule, common practice).
 * The one point-in-polygon test of the project: region validation (parse-regions.ts), the demo's
 * invented territory, the base map (src/lib/basemap.ts) and, in the browser, the map's region lookup.
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

/** The same test for a flat ring `[x0, y0, x1, y1, …]` (the parsed regions' form). */
export function flatRingContains(ring: Float64Array, x: number, y: number): boolean {
  const pairs: Array<[number, number]> = [];
  for (let i = 0; i + 1 < ring.length; i += 2) pairs.push([ring[i], ring[i + 1]]);
  return ringContains(pairs, x, y);
}

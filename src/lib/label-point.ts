/**
 * Where to write a region's name on a map: a point inside the region (never in a hole or outside
 * a bent outline, where a centroid can fall). Our method: in the polygon with the largest outer
 * ring, cut horizontal lines at 15 latitudes across it, take the interior segments of each (the
 * crossings with every ring, sorted, in pairs: the even-odd rule of pipeline/regions/ring-contains.ts), and return
 * the middle of the longest segment. Pure; works in longitude, latitude [°] (small regions).
 */
import type { MultiPolygon, Polygon, Position } from 'geojson';

function ringArea(ring: readonly Position[]): number {
  let a = 0;
  for (let i = 0, j = ring.length - 1; i < ring.length; j = i++) a += (ring[j][0] + ring[i][0]) * (ring[j][1] - ring[i][1]);
  return Math.abs(a / 2);
}

/** x where each ring edge crosses latitude y (edges half-open in y, as the even-odd rule counts them). */
function crossings(rings: readonly (readonly Position[])[], y: number): number[] {
  const xs: number[] = [];
  for (const ring of rings) {
    for (let i = 0, j = ring.length - 1; i < ring.length; j = i++) {
      const [xi, yi] = ring[i];
      const [xj, yj] = ring[j];
      if (yi > y !== yj > y) xs.push(((xj - xi) * (y - yi)) / (yj - yi) + xi);
    }
  }
  return xs.sort((a, b) => a - b);
}

/** A point [° E, ° N] inside `geometry` for its label (see the file comment). */
export function labelPoint(geometry: Polygon | MultiPolygon): [number, number] {
  const polygons = geometry.type === 'Polygon' ? [geometry.coordinates] : geometry.coordinates;
  const poly = polygons.reduce((best, p) => (ringArea(p[0]) > ringArea(best[0]) ? p : best));
  const ys = poly[0].map((p) => p[1]);
  const [s, n] = [Math.min(...ys), Math.max(...ys)];
  let best: [number, number] = [poly[0][0][0], poly[0][0][1]];
  let bestLength = -1;
  const lines = 15;
  for (let k = 1; k <= lines; k++) {
    // Lines sit off the simple fractions, so they miss the vertices of outlines drawn on a grid.
    const y = s + ((n - s) * (k + 0.0731)) / (lines + 1);
    const xs = crossings(poly, y);
    for (let i = 0; i + 1 < xs.length; i += 2) {
      // Prefer lines near the middle: a segment counts less the farther its line is from it.
      const weight = 1 - (0.5 * Math.abs(k - (lines + 1) / 2)) / ((lines + 1) / 2);
      const length = (xs[i + 1] - xs[i]) * weight;
      if (length > bestLength) {
        bestLength = length;
        best = [(xs[i] + xs[i + 1]) / 2, y];
      }
    }
  }
  return best;
}

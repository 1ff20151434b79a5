/**
 * Which region holds a point, and which is nearest when none does: for the cell panel's link to
 * a region report. Outlines are the regions' GeoJSON polygons [° E, ° N] (holes allowed);
 * "holds" is the even-odd rule on the plane (lon, lat); distances are to the nearest outline
 * edge on a local equirectangular plane (x scaled by cos latitude), good to a fraction of a per
 * cent over the few hundred km that matter here, with 111.195 km per degree (mean Earth radius
 * 6371.0088 km, IUGG, from memory). Pure.
 */
import type { MultiPolygon, Polygon, Position } from 'geojson';
import { ringContains } from '../../../../pipeline/regions/ring-contains.ts';

export const KM_PER_DEGREE = (6371.0088 * Math.PI) / 180;

export interface RegionShape {
  id: string;
  geometry: Polygon | MultiPolygon;
}

function polygons(g: Polygon | MultiPolygon): Position[][][] {
  return g.type === 'Polygon' ? [g.coordinates] : g.coordinates;
}

/** Whether the outline holds the point (inside an outer ring and outside its holes). */
export function outlineHolds(g: Polygon | MultiPolygon, [lon, lat]: [number, number]): boolean {
  return polygons(g).some((rings) => rings.reduce((inside, ring) => (ringContains(ring, lon, lat) ? !inside : inside), false));
}

/** Distance from the point to the nearest edge of the outline [km]. */
export function distanceToOutlineKm(g: Polygon | MultiPolygon, [lon, lat]: [number, number]): number {
  const k = Math.cos((lat * Math.PI) / 180);
  let best = Infinity;
  for (const rings of polygons(g)) {
    for (const ring of rings) {
      for (let i = 0; i + 1 < ring.length; i++) {
        const ax = (ring[i][0] - lon) * k;
        const ay = ring[i][1] - lat;
        const bx = (ring[i + 1][0] - lon) * k;
        const by = ring[i + 1][1] - lat;
        const dx = bx - ax;
        const dy = by - ay;
        const len2 = dx * dx + dy * dy;
        const t = len2 > 0 ? Math.max(0, Math.min(1, -(ax * dx + ay * dy) / len2)) : 0;
        best = Math.min(best, Math.hypot(ax + t * dx, ay + t * dy));
      }
    }
  }
  return best * KM_PER_DEGREE;
}

/** Regions holding the point (in the given order); when none does, the nearest one and its distance. */
export function regionsForPoint(regions: RegionShape[], point: [number, number]): { holding: string[]; nearest?: { id: string; km: number } } {
  const holding = regions.filter((r) => outlineHolds(r.geometry, point)).map((r) => r.id);
  if (holding.length > 0 || regions.length === 0) return { holding };
  let nearest = { id: regions[0].id, km: Infinity };
  for (const r of regions) {
    const km = distanceToOutlineKm(r.geometry, point);
    if (km < nearest.km) nearest = { id: r.id, km };
  }
  return { holding, nearest };
}

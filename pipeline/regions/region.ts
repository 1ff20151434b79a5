/**
 * A region as the pipeline uses it, after parsing and validation (parse-regions.ts).
 *
 * Edges are straight lines in longitude/latitude, as RFC 7946 §3.1.1 defines GeoJSON edges
 * ("straight lines in Cartesian coordinates"), not great circles. Longitudes of each ring are
 * made continuous: no step between neighbouring corners exceeds 180°, so a ring written in
 * −180…180 across the antimeridian (179 → −179) becomes 179 → 181. The rings of one polygon share
 * one 360° offset. Winding order is not required (RFC 7946 advises but does not require it).
 */

/** One polygon: an outer ring and its holes. */
export interface RegionPolygon {
  /**
   * rings[0] is the outer ring, rings[1…] are holes. Each ring is flat
   * [lon0, lat0, lon1, lat1, …] [° E, ° N], with the closing position dropped, no repeated
   * neighbours, longitudes continuous (may lie outside −180…180).
   */
  rings: Float64Array[];
  /** Bounding box of the outer ring, [west, south, east, north] [° E, ° N]. */
  bbox: [number, number, number, number];
}

export interface Region {
  /** Unique slug, e.g. "north-coast". */
  id: string;
  /** Name to show on pages. */
  name: string;
  /** The file it came from (for messages). */
  file: string;
  /** Index of its Feature in the file (0 for a lone Feature). */
  feature: number;
  polygons: RegionPolygon[];
  /** All properties of the Feature, as written. */
  properties: Record<string, unknown>;
}

/** A region's name for messages: `"north-coast" (feature 2)`. */
export function regionLabel(id: string | undefined, feature: number): string {
  return id ? `"${id}" (feature ${feature})` : `feature ${feature}`;
}

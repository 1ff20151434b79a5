/**
 * Parses and validates a region GeoJSON file (RFC 7946): a Feature or a FeatureCollection of
 * Features whose geometry is a Polygon or MultiPolygon and whose properties hold `id` (a unique
 * lower-case slug) and `name`. Every failure is a catalogued error naming the file and feature.
 * Checks: JSON and GeoJSON structure, geometry type, id and name, each ring (ring-prep.ts), edges
 * that cross (segment-intersection.ts), holes inside their outer ring and not inside each other.
 */
import type { ErrorWhere } from '../model/errors.ts';
import {
  RegionBadId,
  RegionDuplicateId,
  RegionHoleOutside,
  RegionMissingId,
  RegionMissingName,
  RegionNoFeatures,
  RegionNotGeoJson,
  RegionSelfIntersecting,
  RegionWrongGeometry,
} from './errors.ts';
import { regionLabel, type Region, type RegionPolygon } from './region.ts';
import { prepareRing } from './ring-prep.ts';
import { findEdgeContact } from './segment-intersection.ts';
import { flatRingContains } from './ring-contains.ts';

/** Lower-case letters and digits in dash-separated words. */
export const REGION_ID_PATTERN = /^[a-z0-9]+(?:-[a-z0-9]+)*$/;

const isObject = (v: unknown): v is Record<string, unknown> => typeof v === 'object' && v !== null && !Array.isArray(v);

/**
 * Parses the text of a region file.
 * @param text File contents (UTF-8 JSON)
 * @param file Path or name of the file, for messages
 */
export function parseRegionFile(text: string, file: string): Region[] {
  let json: unknown;
  try {
    json = JSON.parse(text);
  } catch (e) {
    throw RegionNotGeoJson({ detail: `not valid JSON: ${(e as Error).message}` }, { file });
  }
  return parseRegionGeoJson(json, file);
}

/** Validates an already-parsed GeoJSON value (see {@link parseRegionFile}). */
export function parseRegionGeoJson(json: unknown, file: string): Region[] {
  if (!isObject(json) || typeof json.type !== 'string') {
    throw RegionNotGeoJson({ detail: 'the top level is not a GeoJSON object with a "type"' }, { file });
  }
  let features: unknown[];
  if (json.type === 'FeatureCollection') {
    if (!Array.isArray(json.features)) throw RegionNotGeoJson({ detail: 'a FeatureCollection without a "features" array' }, { file, key: 'features' });
    features = json.features;
    if (features.length === 0) throw RegionNoFeatures({}, { file, key: 'features' });
  } else if (json.type === 'Feature') {
    features = [json];
  } else if (json.type === 'Polygon' || json.type === 'MultiPolygon') {
    throw RegionNotGeoJson({ detail: `a bare ${json.type} geometry: it has no properties to carry the region's id and name` }, { file });
  } else {
    throw RegionNotGeoJson({ detail: `top-level type "${json.type}" is not Feature or FeatureCollection` }, { file, key: 'type' });
  }
  const regions = features.map((f, i) => parseFeature(f, i, file, json.type === 'FeatureCollection' ? `features[${i}]` : ''));
  checkUniqueRegionIds(regions);
  return regions;
}

function parseFeature(f: unknown, index: number, file: string, keyBase: string): Region {
  const at = (k: string): ErrorWhere => ({ file, key: [keyBase, k].filter(Boolean).join('.') || undefined });
  if (!isObject(f) || f.type !== 'Feature') throw RegionNotGeoJson({ detail: `feature ${index} is not a GeoJSON Feature` }, at(''));
  const props = isObject(f.properties) ? f.properties : {};
  const id = props.id;
  if (typeof id !== 'string' || id.length === 0) throw RegionMissingId({ feature: index }, at('properties.id'));
  if (!REGION_ID_PATTERN.test(id)) throw RegionBadId({ id }, at('properties.id'));
  const label = regionLabel(id, index);
  if (typeof props.name !== 'string' || props.name.trim() === '') throw RegionMissingName({ region: label }, at('properties.name'));
  const g = f.geometry;
  if (!isObject(g) || typeof g.type !== 'string') throw RegionWrongGeometry({ region: label, type: g === null ? 'null' : 'missing' }, at('geometry'));
  let polys: unknown[];
  if (g.type === 'Polygon') polys = [g.coordinates];
  else if (g.type === 'MultiPolygon') {
    if (!Array.isArray(g.coordinates) || g.coordinates.length === 0) {
      throw RegionNotGeoJson({ detail: `region ${label}: a MultiPolygon needs a non-empty coordinates array` }, at('geometry.coordinates'));
    }
    polys = g.coordinates;
  } else throw RegionWrongGeometry({ region: label, type: g.type }, at('geometry.type'));
  const polygons = polys.map((p, pi) => {
    const key = g.type === 'Polygon' ? 'geometry.coordinates' : `geometry.coordinates[${pi}]`;
    return preparePolygon(p, label, file, [keyBase, key].filter(Boolean).join('.'));
  });
  return { id, name: props.name, file, feature: index, polygons, properties: { ...props } };
}

function preparePolygon(p: unknown, region: string, file: string, key: string): RegionPolygon {
  if (!Array.isArray(p) || p.length === 0) throw RegionNotGeoJson({ detail: `region ${region}: a polygon needs an array of rings` }, { file, key });
  const rings = p.map((r, ri) => prepareRing(r, region, { file, key: `${key}[${ri}]` }));
  const outer = rings[0];
  const bbox = ringBbox(outer);
  // Holes get the 360° offset that puts them nearest the outer ring.
  const cx = (bbox[0] + bbox[2]) / 2;
  for (let h = 1; h < rings.length; h++) {
    const hb = ringBbox(rings[h]);
    const shift = 360 * Math.round((cx - (hb[0] + hb[2]) / 2) / 360);
    if (shift !== 0) for (let i = 0; i < rings[h].length; i += 2) rings[h][i] += shift;
  }
  const contact = findEdgeContact(rings);
  if (contact) {
    const what = (r: number) => (r === 0 ? 'the outer ring' : `hole ${r}`);
    const detail =
      contact.ringA === contact.ringB
        ? `edges ${Math.min(contact.edgeA, contact.edgeB)} and ${Math.max(contact.edgeA, contact.edgeB)} of ${what(contact.ringA)} cross or touch near [${fmt(contact.lon)}, ${fmt(contact.lat)}]`
        : `${what(Math.min(contact.ringA, contact.ringB))} and ${what(Math.max(contact.ringA, contact.ringB))} cross near [${fmt(contact.lon)}, ${fmt(contact.lat)}]`;
    throw RegionSelfIntersecting({ region, detail }, { file, key });
  }
  for (let h = 1; h < rings.length; h++) {
    // No edges cross, so one corner of the hole decides; corners on the outer boundary are allowed (touching).
    const corner = interiorCorner(rings[h], outer);
    if (corner !== undefined && !flatRingContains(outer, rings[h][2 * corner], rings[h][2 * corner + 1])) {
      throw RegionHoleOutside({ region, detail: `hole ${h} lies outside the outer ring` }, { file, key: `${key}[${h}]` });
    }
    for (let o = 1; o < rings.length; o++) {
      if (o === h) continue;
      const c = interiorCorner(rings[h], rings[o]);
      if (c !== undefined && flatRingContains(rings[o], rings[h][2 * c], rings[h][2 * c + 1])) {
        throw RegionHoleOutside({ region, detail: `hole ${h} lies inside hole ${o}` }, { file, key: `${key}[${h}]` });
      }
    }
  }
  return { rings, bbox };
}

/** Index of a corner of `ring` that is not a corner of `other` (undefined if all are shared). */
function interiorCorner(ring: Float64Array, other: Float64Array): number | undefined {
  outer: for (let i = 0; i < ring.length / 2; i++) {
    for (let j = 0; j < other.length / 2; j++) {
      if (ring[2 * i] === other[2 * j] && ring[2 * i + 1] === other[2 * j + 1]) continue outer;
    }
    return i;
  }
  return undefined;
}

/** [west, south, east, north] of a flat ring [° E, ° N]. */
export function ringBbox(ring: Float64Array): [number, number, number, number] {
  let w = Infinity,
    s = Infinity,
    e = -Infinity,
    n = -Infinity;
  for (let i = 0; i < ring.length; i += 2) {
    w = Math.min(w, ring[i]);
    e = Math.max(e, ring[i]);
    s = Math.min(s, ring[i + 1]);
    n = Math.max(n, ring[i + 1]);
  }
  return [w, s, e, n];
}

const fmt = (v: number) => (Math.round(v * 1e6) / 1e6).toString();

/**
 * Throws RegionDuplicateId if two regions (in one file or across files) share an id.
 * @param regions Regions of one or many files
 */
export function checkUniqueRegionIds(regions: readonly Region[]): void {
  const seen = new Map<string, Region>();
  for (const r of regions) {
    const prev = seen.get(r.id);
    if (prev) {
      const name = (x: Region) => `${x.file} feature ${x.feature}`;
      throw RegionDuplicateId({ id: r.id, first: name(prev), second: name(r) }, { file: r.file, key: `features[${r.feature}].properties.id` });
    }
    seen.set(r.id, r);
  }
}

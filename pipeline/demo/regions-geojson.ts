/**
 * The district GeoJSON files of the demo (content/regions/*.geojson), made from the one
 * definition of the territory in ./territory.ts. One file per district, each a GeoJSON Feature
 * (RFC 7946: coordinates [° E, ° N] in −180..180, exterior ring counter-clockwise) with
 * properties `id`, `name`, and labels saying the district and its data are invented.
 */
import type { Feature, Polygon } from 'geojson';
import { DISTRICTS, TERRITORY_NAME } from './territory.ts';

/** The GeoJSON Feature of each district. */
export function districtFeatures(): Array<Feature<Polygon>> {
  return DISTRICTS.map((d) => ({
    type: 'Feature',
    properties: {
      id: d.id,
      name: d.name,
      territory: TERRITORY_NAME,
      zone: d.kind,
      note: 'invented district of an invented territory; its demo data are synthetic (not real)',
    },
    geometry: { type: 'Polygon', coordinates: [d.ring.map(([x, y]) => [x, y])] },
  }));
}

/** File name → file text of every district file, as committed under content/regions/. */
export function regionFiles(): Map<string, string> {
  const out = new Map<string, string>();
  for (const f of districtFeatures()) out.set(`${f.properties!.id}.geojson`, `${JSON.stringify(f, null, 1)}\n`);
  return out;
}

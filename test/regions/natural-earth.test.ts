import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import { feature } from 'topojson-client';
import { geoArea } from 'd3-geo';
import type { Topology, GeometryCollection } from 'topojson-specification';
import type { Feature, FeatureCollection, Geometry } from 'geojson';
import { regionCellWeights } from '../../pipeline/regions/cell-weights.ts';
import { parseRegionGeoJson } from '../../pipeline/regions/parse-regions.ts';
import { HeathoursError } from '../../pipeline/model/errors.ts';
import { EARTH_RADIUS_KM } from '../../pipeline/regions/spherical-area.ts';
import { grid } from './helpers.ts';

// Outside reference data: Natural Earth 1:50m country outlines as packaged by world-atlas 2.0.2 (a general-purpose
// open dataset); outside reference code: d3-geo 3.1.2 geoArea. Neither is part of heathours.
const require = createRequire(import.meta.url);
const topo = JSON.parse(readFileSync(require.resolve('world-atlas/countries-50m.json'), 'utf8')) as Topology<{
  countries: GeometryCollection<{ name: string }>;
}>;
const countries = (feature(topo, topo.objects.countries) as FeatureCollection<Geometry, { name: string }>).features;
const asRegion = (f: Feature<Geometry, { name: string }>, i: number) =>
  parseRegionGeoJson({ type: 'Feature', properties: { id: `c-${i}`, name: f.properties.name }, geometry: f.geometry }, 'countries-50m.json')[0];
const d3Sr = (f: Feature) => {
  const a = geoArea(f);
  return a > 2 * Math.PI ? 4 * Math.PI - a : a; // d3 winds the other way round from RFC 7946
};

describe('real outlines: Natural Earth 50 m countries (world-atlas 2.0.2)', () => {
  it('all 240 countries but Antarctica validate, Antarctica is refused as RegionAroundPole, and areas agree with d3-geo within 0.1 %', () => {
    let ok = 0;
    const refused: string[] = [];
    let worst = 0;
    countries.forEach((f, i) => {
      try {
        const r = asRegion(f, i);
        ok++;
        const ours = regionCellWeights(r, grid(-89.5, 180, -179.5, 360)).regionArea / EARTH_RADIUS_KM ** 2;
        // Our edges are straight in lon/lat, d3's are great circles: at 1:50m they differ by well under 0.1 %.
        worst = Math.max(worst, Math.abs(ours - d3Sr(f)) / d3Sr(f));
      } catch (e) {
        expect(e).toBeInstanceOf(HeathoursError);
        refused.push(`${f.properties.name}: ${(e as HeathoursError).code}`);
      }
    });
    expect(countries).toHaveLength(241);
    expect(refused).toEqual(['Antarctica: RegionAroundPole']);
    expect(ok).toBe(240);
    expect(worst).toBeLessThan(1e-3);
  });

  it('Fiji and Russia, which cross the antimeridian, are fully covered by grids in −180…180 and in 0…360', () => {
    for (const name of ['Fiji', 'Russia']) {
      const i = countries.findIndex((f) => f.properties.name === name);
      const r = asRegion(countries[i], i);
      for (const g of [grid(-89.5, 180, -179.5, 360), grid(-89.5, 180, 0.5, 360)]) {
        const w = regionCellWeights(r, g);
        expect(w.coveredFraction).toBeCloseTo(1, 9);
        expect(Math.abs(w.area.reduce((s, x) => s + x, 0) - w.regionArea) / w.regionArea).toBeLessThan(1e-9);
      }
    }
  });
});

/**
 * The offline base map's geometry. Checked against d3-geo's spherical `geoContains` on the
 * original world-atlas 2.0.2 (Natural Earth 1:110m) features: our antimeridian-cut planar
 * polygons must classify points as land or sea the same way.
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { geoContains } from 'd3-geo';
import { feature } from 'topojson-client';
import type { Topology, GeometryObject } from 'topojson-specification';
import type { Position } from 'geojson';
import { bordersFromTopology, landFromTopology, splitAtAntimeridian } from '../../src/lib/basemap.ts';
import { PROJECT_ROOT } from './browser.ts';

const landTopo = JSON.parse(readFileSync(join(PROJECT_ROOT, 'node_modules/world-atlas/land-110m.json'), 'utf8')) as Topology;
const countriesTopo = JSON.parse(readFileSync(join(PROJECT_ROOT, 'node_modules/world-atlas/countries-110m.json'), 'utf8')) as Topology;

function inRing(ring: Position[], [x, y]: Position): boolean {
  let inside = false;
  for (let i = 0, j = ring.length - 1; i < ring.length; j = i++) {
    const [xi, yi] = ring[i];
    const [xj, yj] = ring[j];
    if (yi > y !== yj > y && x < ((xj - xi) * (y - yi)) / (yj - yi) + xi) inside = !inside;
  }
  return inside;
}

describe('landFromTopology', () => {
  const land = landFromTopology(landTopo);
  const polygons = land.features[0].geometry.coordinates;

  it('has no ring step longer than 180° of longitude, so MapLibre never draws across the map', () => {
    for (const poly of polygons)
      for (const ring of poly)
        for (let i = 1; i < ring.length; i++) {
          expect(Math.abs(ring[i][0] - ring[i - 1][0])).toBeLessThanOrEqual(180);
        }
  });

  it('keeps every coordinate within ±180° E and the Web Mercator latitude limit', () => {
    for (const poly of polygons)
      for (const ring of poly)
        for (const [x, y] of ring) {
          expect(Math.abs(x)).toBeLessThanOrEqual(180);
          expect(Math.abs(y)).toBeLessThanOrEqual(85.06);
        }
  });

  it('classifies a 5° grid of points as land or sea as d3-geo does on the original outlines (≥ 99.5 % agree)', () => {
    const original = feature(landTopo, landTopo.objects.land as GeometryObject);
    let agree = 0;
    let total = 0;
    for (let lat = -80; lat <= 80; lat += 5) {
      for (let lon = -177.5; lon < 180; lon += 5) {
        const planar = polygons.some((poly) => inRing(poly[0], [lon, lat]) && !poly.slice(1).some((h) => inRing(h, [lon, lat])));
        if (planar === geoContains(original, [lon, lat])) agree += 1;
        total += 1;
      }
    }
    expect(agree / total).toBeGreaterThanOrEqual(0.995);
  });

  it('keeps the polygons that cross ±180° on the right side: Fiji, Chukotka and Antarctica are land (from memory: their coordinates)', () => {
    const isLand = (p: Position) => polygons.some((poly) => inRing(poly[0], p) && !poly.slice(1).some((h) => inRing(h, p)));
    expect(isLand([178.0, -17.8])).toBe(true); // Viti Levu, Fiji
    expect(isLand([175.0, 67.0])).toBe(true); // Chukotka, east of 180° going west
    expect(isLand([-175.0, 66.5])).toBe(true); // Chukotka west of the antimeridian
    expect(isLand([0, -80])).toBe(true); // Antarctic interior
    expect(isLand([-170, 0])).toBe(false); // central Pacific
  });
});

describe('bordersFromTopology and splitAtAntimeridian', () => {
  it('splits a line where it wraps from +179° to −179°', () => {
    expect(
      splitAtAntimeridian([
        [170, 0],
        [179, 1],
        [-179, 2],
        [-170, 3],
      ]),
    ).toEqual([
      [
        [170, 0],
        [179, 1],
      ],
      [
        [-179, 2],
        [-170, 3],
      ],
    ]);
    expect(
      splitAtAntimeridian([
        [0, 0],
        [10, 0],
      ]),
    ).toEqual([
      [
        [0, 0],
        [10, 0],
      ],
    ]);
  });

  it('leaves no border step longer than 180° of longitude', () => {
    const lines = bordersFromTopology(countriesTopo).features[0].geometry.coordinates;
    expect(lines.length).toBeGreaterThan(100);
    for (const line of lines) for (let i = 1; i < line.length; i++) expect(Math.abs(line[i][0] - line[i - 1][0])).toBeLessThanOrEqual(180);
  });
});

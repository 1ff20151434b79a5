import { describe, expect, it } from 'vitest';
import { checkUniqueRegionIds, parseRegionFile, parseRegionGeoJson } from '../../pipeline/regions/parse-regions.ts';
import { collection, expectCatalogued, polygonFeature, rect } from './helpers.ts';

const F = 'content/regions/test.geojson';
const parse = (v: unknown) => parseRegionGeoJson(v, F);

describe('region files (GeoJSON, RFC 7946)', () => {
  it('parses a FeatureCollection of a Polygon with a hole and a MultiPolygon, keeping id, name and properties', () => {
    const multi = {
      type: 'Feature',
      properties: { id: 'two-islands', name: 'Two Islands', note: 'invented' },
      geometry: { type: 'MultiPolygon', coordinates: [[[...rect(0, 0, 1, 1), [0, 0]]], [[...rect(3, 3, 4, 4), [3, 3]]]] },
    };
    const regions = parse(collection(polygonFeature('ring-land', [rect(0, 0, 4, 4), rect(1, 1, 2, 2)]), multi));
    expect(regions.map((r) => r.id)).toEqual(['ring-land', 'two-islands']);
    expect(regions[0].polygons[0].rings).toHaveLength(2);
    expect([...regions[0].polygons[0].rings[0]]).toEqual([0, 0, 4, 0, 4, 4, 0, 4]); // closing position dropped
    expect(regions[1].polygons).toHaveLength(2);
    expect(regions[1].properties.note).toBe('invented');
    expect(regions[1].feature).toBe(1);
    expect(regions[0].polygons[0].bbox).toEqual([0, 0, 4, 4]);
  });

  it('parses a lone Feature from text', () => {
    const r = parseRegionFile(JSON.stringify(polygonFeature('coast', [rect(10, 10, 11, 11)])), F);
    expect(r).toHaveLength(1);
    expect(r[0].name).toBe('Region coast');
    expect(r[0].file).toBe(F);
  });

  it('makes a ring across the antimeridian continuous: 179 → −179 becomes 179 → 181', () => {
    const r = parse(
      polygonFeature('dateline', [
        [
          [179, -1],
          [-179, -1],
          [-179, 1],
          [179, 1],
        ],
      ]),
    );
    expect([...r[0].polygons[0].rings[0]]).toEqual([179, -1, 181, -1, 181, 1, 179, 1]);
    expect(r[0].polygons[0].bbox).toEqual([179, -1, 181, 1]);
  });

  it('gives a hole across the antimeridian the same 360° offset as its outer ring', () => {
    const r = parse(
      polygonFeature('dl-hole', [
        [
          [178, -2],
          [-178, -2],
          [-178, 2],
          [178, 2],
        ],
        [
          [-179.5, -1],
          [-179.5, 1],
          [179.5, 1],
          [179.5, -1],
        ],
      ]),
    );
    const hole = [...r[0].polygons[0].rings[1]];
    expect(hole).toEqual([180.5, -1, 180.5, 1, 179.5, 1, 179.5, -1]);
  });

  it('not JSON, not GeoJSON, a bare geometry and an empty collection are catalogued errors naming the file', () => {
    let e = expectCatalogued(() => parseRegionFile('{"type": "Feature",', F), 'RegionNotGeoJson', /not valid JSON/);
    expect(e.where.file).toBe(F);
    expectCatalogued(() => parse([1, 2]), 'RegionNotGeoJson');
    expectCatalogued(() => parse({ type: 'Topology', objects: {} }), 'RegionNotGeoJson', /"Topology" is not Feature or FeatureCollection/);
    expectCatalogued(() => parse({ type: 'Polygon', coordinates: [] }), 'RegionNotGeoJson', /bare Polygon/);
    e = expectCatalogued(() => parse(collection()), 'RegionNoFeatures');
    expect(e.where.file).toBe(F);
    expectCatalogued(() => parse(collection({ type: 'Point' })), 'RegionNotGeoJson', /feature 0 is not a GeoJSON Feature/);
  });

  it('a Point, a LineString or a null geometry is RegionWrongGeometry naming the region and feature', () => {
    const point = { type: 'Feature', properties: { id: 'spot', name: 'Spot' }, geometry: { type: 'Point', coordinates: [1, 2] } };
    const e = expectCatalogued(
      () => parse(collection(polygonFeature('a', [rect(0, 0, 1, 1)]), point)),
      'RegionWrongGeometry',
      /region "spot" \(feature 1\) has geometry type Point/,
    );
    expect(e.where.key).toBe('features[1].geometry.type');
    expect(e.format()).toMatch(/file content\/regions\/test\.geojson/);
    const line = {
      ...point,
      geometry: {
        type: 'LineString',
        coordinates: [
          [0, 0],
          [1, 1],
        ],
      },
    };
    expectCatalogued(() => parse(line), 'RegionWrongGeometry', /LineString/);
    expectCatalogued(() => parse({ ...point, geometry: null }), 'RegionWrongGeometry', /geometry type null/);
  });

  it('a missing id, an id that is not a slug and a missing name are catalogued', () => {
    const noId = { type: 'Feature', properties: { name: 'X' }, geometry: polygonFeature('x', [rect(0, 0, 1, 1)]).geometry };
    const e = expectCatalogued(() => parse(collection(noId)), 'RegionMissingId', /feature 0 has no string property "id"/);
    expect(e.where.key).toBe('features[0].properties.id');
    expectCatalogued(() => parse(polygonFeature('North Coast', [rect(0, 0, 1, 1)])), 'RegionBadId', /"North Coast" is not a lower-case slug/);
    expectCatalogued(() => parse(polygonFeature('a--b', [rect(0, 0, 1, 1)])), 'RegionBadId');
    expectCatalogued(() => parse(polygonFeature('nameless', [rect(0, 0, 1, 1)], true, '  ')), 'RegionMissingName', /"nameless"/);
  });

  it('a duplicate id, in one file or across files, is RegionDuplicateId naming both places', () => {
    const a = polygonFeature('same', [rect(0, 0, 1, 1)]);
    expectCatalogued(
      () => parse(collection(a, a)),
      'RegionDuplicateId',
      /"same" is used by content\/regions\/test\.geojson feature 0 and by content\/regions\/test\.geojson feature 1/,
    );
    const r1 = parseRegionGeoJson(a, 'a.geojson');
    const r2 = parseRegionGeoJson(a, 'b.geojson');
    const e = expectCatalogued(() => checkUniqueRegionIds([...r1, ...r2]), 'RegionDuplicateId', /a\.geojson feature 0 and by b\.geojson feature 0/);
    expect(e.where.file).toBe('b.geojson');
  });

  it("an unclosed ring is RegionRingNotClosed with the ring's key", () => {
    const e = expectCatalogued(
      () =>
        parse(
          collection(
            polygonFeature(
              'open',
              [
                [
                  [0, 0],
                  [1, 0],
                  [1, 1],
                  [0, 1],
                  [0, 0.5],
                ],
              ],
              false,
            ),
          ),
        ),
      'RegionRingNotClosed',
      /starts at \[0, 0\] but ends at \[0, 0\.5\]/,
    );
    expect(e.where.key).toBe('features[0].geometry.coordinates[0]');
  });

  it('a ring with fewer than 4 positions is RegionRingTooShort', () => {
    expectCatalogued(
      () =>
        parse(
          polygonFeature(
            'short',
            [
              [
                [0, 0],
                [1, 0],
                [0, 0],
              ],
            ],
            false,
          ),
        ),
      'RegionRingTooShort',
      /3 positions/,
    );
  });

  it('coordinates out of range (e.g. [lat, lon] swapped) are RegionCoordinateOutOfRange with the position', () => {
    expectCatalogued(
      () =>
        parse(
          polygonFeature('swapped', [
            [
              [10, 100],
              [11, 100],
              [11, 101],
              [10, 101],
            ],
          ]),
        ),
      'RegionCoordinateOutOfRange',
      /position 0 is \[10, 100\]/,
    );
    expectCatalogued(() => parse(polygonFeature('far', [rect(400, 0, 401, 1)])), 'RegionCoordinateOutOfRange');
    expectCatalogued(
      () => parse(polygonFeature('text', [[[0, 0], ['1', 0] as unknown as [number, number], [1, 1], [0, 1]]])),
      'RegionBadPosition',
      /position 1/,
    );
  });

  it('a bow-tie (figure of two triangles meeting in a crossing) is RegionSelfIntersecting at the crossing', () => {
    // Corners (0,0) (2,2) (2,0) (0,2): edges 0 and 2 cross at (1, 1) (hand-checked).
    const bowTie = polygonFeature('bow-tie', [
      [
        [0, 0],
        [2, 2],
        [2, 0],
        [0, 2],
      ],
    ]);
    const e = expectCatalogued(() => parse(collection(bowTie)), 'RegionSelfIntersecting', /edges 0 and 2 of the outer ring cross or touch near \[1, 1\]/);
    expect(e.where.key).toBe('features[0].geometry.coordinates');
    expect(e.where.file).toBe(F);
  });

  it('a ring that touches itself at a corner, or folds back on itself, is RegionSelfIntersecting', () => {
    // Figure eight through (1, 1) twice.
    expectCatalogued(
      () =>
        parse(
          polygonFeature('eight', [
            [
              [0, 0],
              [1, 1],
              [2, 0],
              [2, 2],
              [1, 1],
              [0, 2],
            ],
          ]),
        ),
      'RegionSelfIntersecting',
    );
    // A spike: (2, 0) → (3, 0) → (2.5, 0) doubles back along the same line.
    expectCatalogued(
      () =>
        parse(
          polygonFeature('spike', [
            [
              [0, 0],
              [2, 0],
              [3, 0],
              [2.5, 0],
              [2, 2],
              [0, 2],
            ],
          ]),
        ),
      'RegionSelfIntersecting',
    );
  });

  it('a hole that crosses the outer ring is RegionSelfIntersecting; one outside it, or inside another hole, is RegionHoleOutside', () => {
    expectCatalogued(() => parse(polygonFeature('cross', [rect(0, 0, 4, 4), rect(3, 1, 5, 2)])), 'RegionSelfIntersecting', /the outer ring and hole 1 cross/);
    expectCatalogued(() => parse(polygonFeature('away', [rect(0, 0, 4, 4), rect(5, 5, 6, 6)])), 'RegionHoleOutside', /hole 1 lies outside the outer ring/);
    expectCatalogued(
      () => parse(polygonFeature('nested', [rect(0, 0, 4, 4), rect(1, 1, 3, 3), rect(1.5, 1.5, 2, 2)])),
      'RegionHoleOutside',
      /hole 2 lies inside hole 1/,
    );
  });

  it('a hole touching the outer ring at one corner is allowed (OGC validity, common practice)', () => {
    const r = parse(
      polygonFeature('touch', [
        rect(0, 0, 4, 4),
        [
          [0, 0],
          [1, 2],
          [2, 1],
        ],
      ]),
    );
    expect(r[0].polygons[0].rings).toHaveLength(2);
  });

  it('a ring whose corners lie on one line is RegionRingDegenerate; a ring around a pole is RegionAroundPole', () => {
    expectCatalogued(
      () =>
        parse(
          polygonFeature('flat', [
            [
              [0, 0],
              [1, 1],
              [2, 2],
            ],
          ]),
        ),
      'RegionRingDegenerate',
    );
    const cap = [
      [-180, 80],
      [-90, 80],
      [0, 80],
      [90, 80],
    ] as [number, number][];
    expectCatalogued(() => parse(polygonFeature('cap', [cap])), 'RegionAroundPole');
  });
});

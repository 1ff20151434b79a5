import { describe, expect, it } from 'vitest';
import { geoArea } from 'd3-geo';
import { allRegionCellWeights, regionCellWeights } from '../../pipeline/regions/cell-weights.ts';
import { applyLandMask } from '../../pipeline/regions/land-mask.ts';
import { parseRegionGeoJson } from '../../pipeline/regions/parse-regions.ts';
import { EARTH_RADIUS_KM, rectangleAreaSr, ringAreaSr } from '../../pipeline/regions/spherical-area.ts';
import type { Region } from '../../pipeline/regions/region.ts';
import { expectCatalogued, grid, jitteredLattice, polygonFeature, rect } from './helpers.ts';

type Pos = [number, number];
const RAD = Math.PI / 180;
const one = (rings: Pos[][], id = 'r', file = 'test.geojson'): Region => parseRegionGeoJson(polygonFeature(id, rings), file)[0];
const byCell = (w: { cells: Uint32Array; fraction: Float64Array }) => Object.fromEntries([...w.cells].map((c, k) => [c, w.fraction[k]]));

/** d3-geo's spherical area of a ring densified to `steps` points per edge, so great-circle edges follow the lon/lat lines [sr]. */
function d3AreaDensified(ring: Pos[], steps = 400): number {
  const dense: Pos[] = [];
  for (let i = 0; i < ring.length; i++) {
    const [x0, y0] = ring[i];
    const [x1, y1] = ring[(i + 1) % ring.length];
    for (let s = 0; s < steps; s++) dense.push([x0 + ((x1 - x0) * s) / steps, y0 + ((y1 - y0) * s) / steps]);
  }
  dense.push(dense[0]);
  const a = geoArea({ type: 'Polygon', coordinates: [dense] });
  return a > 2 * Math.PI ? 4 * Math.PI - a : a; // d3 winds the other way round from RFC 7946
}

describe('region cell weights (exact clipping, areas on the sphere)', () => {
  // A 4×4 grid of 1° cells, centres 0.5…3.5 °N and 10.5…13.5 °E (hand-checkable, d3-contour style).
  const g4 = grid(0.5, 4, 10.5, 4);

  it('a square covering exactly 2×2 cells gives those 4 cells fraction 1, weights ∝ cell area on the sphere', () => {
    const w = regionCellWeights(one([rect(11, 1, 13, 3)]), g4);
    expect([...w.cells]).toEqual([5, 6, 9, 10]);
    for (const f of w.fraction) expect(f).toBeCloseTo(1, 12);
    // Cell area on the sphere ∝ Δλ·(sin φ2 − sin φ1) (common practice): rows 1–2 °N and 2–3 °N.
    const a1 = Math.sin(2 * RAD) - Math.sin(1 * RAD);
    const a2 = Math.sin(3 * RAD) - Math.sin(2 * RAD);
    expect(w.weight[0]).toBeCloseTo(a1 / (2 * a1 + 2 * a2), 12);
    expect(w.weight[2]).toBeCloseTo(a2 / (2 * a1 + 2 * a2), 12);
    expect(w.weight.reduce((s, x) => s + x, 0)).toBeCloseTo(1, 14);
    expect(w.coveredFraction).toBeCloseTo(1, 12);
  });

  it("a triangle that cuts the west half out of a cell gives fraction 0.5 exactly (a meridian bisects a cell's area)", () => {
    // Triangle (11.5, 0) (11.5, 3) (5, 1.5): inside cell (1 °N–2 °N, 11–12 °E) it is exactly the west half (hand-checked: its
    // slanted edges pass the cell's west edge at 1.5 ± 1.5·(6/6.5) °N, outside 1–2 °N).
    const w = regionCellWeights(
      one([
        [
          [11.5, 0],
          [11.5, 3],
          [5, 1.5],
        ],
      ]),
      g4,
    );
    expect(byCell(w)[5]).toBeCloseTo(0.5, 12);
  });

  it('a diagonal half-cell triangle gives (1 − cos b)/(b · sin b) ≈ 0.5, the analytic value for a 1° cell at the equator', () => {
    // Hand derivation: ∫₀ᵇ a(1 − φ/b) cos φ dφ / (a sin b) = (1 − cos b)/(b sin b), b = 1° in radians.
    const b = RAD;
    const want = (1 - Math.cos(b)) / (b * Math.sin(b));
    const gEq = grid(0.5, 2, 0.5, 2);
    const w = regionCellWeights(
      one([
        [
          [0, 0],
          [1, 0],
          [1, 1],
        ],
      ]),
      gEq,
    );
    expect(w.fraction[0]).toBeCloseTo(want, 11); // the closed form itself loses ~1e-13 to 1 − cos b
    expect(Math.abs(w.fraction[0] - 0.5)).toBeLessThan(2e-5);
  });

  it("a polygon with a hole leaves the hole's cells out and halves the cell a hole half covers", () => {
    const w = regionCellWeights(one([rect(10, 0, 14, 4), rect(11, 1, 13, 3)]), g4);
    expect(w.cells).toHaveLength(12);
    for (const c of [5, 6, 9, 10]) expect(byCell(w)[c]).toBeUndefined();
    for (const f of w.fraction) expect(f).toBeCloseTo(1, 12);
    const half = regionCellWeights(one([rect(10, 0, 14, 4), rect(11, 1, 11.5, 2)]), g4);
    expect(byCell(half)[5]).toBeCloseTo(0.5, 12);
  });

  it('a region across the antimeridian written in −180…180 matches a grid running 170…190 °E', () => {
    const gd = grid(-4.5, 10, 170.5, 20); // centres 170.5 … 189.5 °E
    const r = one([
      [
        [175, -2],
        [-175, -2],
        [-175, 2],
        [175, 2],
      ],
    ]);
    const w = regionCellWeights(r, gd);
    expect(w.cells).toHaveLength(40); // 10 columns (175…185) × 4 rows (−2…2)
    for (const f of w.fraction) expect(f).toBeCloseTo(1, 12);
    expect(w.coveredFraction).toBeCloseTo(1, 12);
  });

  it('and the reverse: a region written 175…185 °E matches a global grid −180…180, split across its two edges', () => {
    const gg = grid(-4.5, 10, -179.5, 360);
    const w = regionCellWeights(one([rect(175, -2, 185, 2)]), gg);
    const cols = [...new Set([...w.cells].map((c) => c % 360))].sort((a, b) => a - b);
    expect(cols).toEqual([0, 1, 2, 3, 4, 355, 356, 357, 358, 359]);
    expect(w.cells).toHaveLength(40);
    expect(w.coveredFraction).toBeCloseTo(1, 12);
  });

  it('a region across Greenwich (−10…10 °E) matches a grid running 0…360 °E (ERA5 layout) once, with no cell counted twice', () => {
    const g360 = grid(-4.5, 10, 0.5, 360);
    const w = regionCellWeights(one([rect(-10, -2, 10, 2)]), g360);
    expect(w.cells).toHaveLength(80);
    for (const f of w.fraction) expect(f).toBeCloseTo(1, 12);
    expect(w.coveredFraction).toBeCloseTo(1, 12);
  });

  it('a region split at ±180 into a MultiPolygon (RFC 7946 §3.1.9) gives the same cells as the continuous one', () => {
    const gd = grid(-4.5, 10, 170.5, 20);
    const split = parseRegionGeoJson(
      {
        type: 'Feature',
        properties: { id: 'split', name: 'Split' },
        geometry: { type: 'MultiPolygon', coordinates: [[[...rect(175, -2, 180, 2), [175, -2]]], [[...rect(-180, -2, -175, 2), [-180, -2]]]] },
      },
      'f',
    )[0];
    const a = regionCellWeights(split, gd);
    const b = regionCellWeights(one([rect(175, -2, 185, 2)]), gd);
    expect([...a.cells]).toEqual([...b.cells]);
    a.area.forEach((x, k) => expect(x).toBeCloseTo(b.area[k], 9));
  });

  it("total covered area equals the polygon's area within 1e-9, and that area agrees with d3-geo geoArea within 1e-6", () => {
    // An irregular concave 12-corner star over a 10×10 grid of 0.5° cells at 40–45 °N.
    const g10 = grid(40.25, 10, 20.25, 10, 0.5);
    const star: Pos[] = Array.from({ length: 12 }, (_, i) => {
      const t = (2 * Math.PI * i) / 12;
      const rr = i % 2 ? 1.1 : 2.3 + 0.1 * (i % 5);
      return [22.5 + rr * Math.cos(t), 42.5 + 0.9 * rr * Math.sin(t)];
    });
    const w = regionCellWeights(one([star]), g10);
    const total = w.area.reduce((s, x) => s + x, 0);
    expect(Math.abs(total - w.regionArea) / w.regionArea).toBeLessThan(1e-9);
    // Σ fraction × cell area / cell area: the same identity written per cell.
    let sumFracArea = 0;
    for (let k = 0; k < w.cells.length; k++) {
      const row = Math.floor(w.cells[k] / 10);
      const col = w.cells[k] % 10;
      sumFracArea += w.fraction[k] * rectangleAreaSr(20 + col * 0.5, 20.5 + col * 0.5, 40 + row * 0.5, 40.5 + row * 0.5);
    }
    expect(Math.abs(sumFracArea * EARTH_RADIUS_KM ** 2 - w.regionArea) / w.regionArea).toBeLessThan(1e-9);
    // Outside reference: d3-geo 3.1.2 geoArea (great-circle edges), densified so its edges follow our straight lon/lat edges.
    const d3 = d3AreaDensified(star);
    expect(Math.abs(d3 - w.regionArea / EARTH_RADIUS_KM ** 2) / d3).toBeLessThan(1e-6);
    expect(Math.abs(ringAreaSr(new Float64Array(star.flat())))).toBeCloseTo(w.regionArea / EARTH_RADIUS_KM ** 2, 15);
  });

  it('a 1°×1° cell at the equator has the area given by d3-geo within 1e-6 (≈ 12,364 km² on a 6371.0088 km sphere)', () => {
    const sr = rectangleAreaSr(0, 1, 0, 1);
    expect(Math.abs(sr - d3AreaDensified(rect(0, 0, 1, 1))) / sr).toBeLessThan(1e-6);
    expect(sr * EARTH_RADIUS_KM ** 2).toBeCloseTo(12364, 0);
  });

  it('a region partly outside the grid is allowed and reports the covered share (half here)', () => {
    const w = regionCellWeights(one([rect(13, 1, 15, 2)]), g4); // 13–14 inside, 14–15 outside
    expect(w.coveredFraction).toBeCloseTo(0.5, 12);
    expect([...w.cells]).toEqual([7]);
  });

  it('a region that misses the grid is RegionOutsideGrid naming the file and region', () => {
    const e = expectCatalogued(
      () => regionCellWeights(one([rect(50, 50, 51, 51)], 'far-away', 'content/regions/far.geojson'), g4),
      'RegionOutsideGrid',
      /region "far-away" \(lon 50…51, lat 50…51\)/,
    );
    expect(e.where.file).toBe('content/regions/far.geojson');
    // Touching the grid's edge only is not overlapping.
    expectCatalogued(() => regionCellWeights(one([rect(14, 0, 15, 1)]), g4), 'RegionOutsideGrid');
  });

  it('an irregular grid is RegionGridInvalid', () => {
    const r = one([rect(11, 1, 12, 2)]);
    expectCatalogued(() => regionCellWeights(r, { lat: new Float64Array([0.5, 1.5, 3.5]), lon: g4.lon }), 'RegionGridInvalid', /not evenly spaced/);
    expectCatalogued(() => regionCellWeights(r, { lat: new Float64Array([0.5]), lon: g4.lon }), 'RegionGridInvalid', /at least 2/);
    expectCatalogued(() => regionCellWeights(r, { lat: new Float64Array([3.5, 2.5]), lon: g4.lon }), 'RegionGridInvalid', /not ascending/);
  });

  it('a land mask drops sea cells and renormalises the weights; all-sea is RegionNoLandCells', () => {
    const w = regionCellWeights(one([rect(11, 1, 13, 3)]), g4);
    const land = new Uint8Array(16);
    land[5] = 1;
    land[9] = 1; // the western column
    const m = applyLandMask(w, land);
    expect([...m.cells]).toEqual([5, 9]);
    expect(m.weight[0] + m.weight[1]).toBeCloseTo(1, 14);
    expect(m.coveredFraction).toBeCloseTo(0.5, 12);
    expect(m.landMasked).toBe(true);
    expectCatalogued(() => applyLandMask(w, new Uint8Array(16)), 'RegionNoLandCells', /"r"/);
    expectCatalogued(() => applyLandMask(w, new Uint8Array(4)), 'RegionFieldShape');
  });

  it("1,000 regions tiling a 40×60 grid: every cell's fractions sum to 1 within 1e-9 (its time: npm run bench -- --only region-weights-1000)", () => {
    // A jittered 25 × 40 lattice of quadrilaterals exactly covering the grid (invented test shapes).
    const gBig = grid(10 + 0.25 / 2, 40, 30 + 0.25 / 2, 60, 0.25);
    const regions = parseRegionGeoJson(jitteredLattice(), 'tiles.geojson');
    const all = allRegionCellWeights(regions, gBig);
    const sum = new Float64Array(2400);
    for (const w of all) w.cells.forEach((c, k) => (sum[c] += w.fraction[k]));
    expect(all.length).toBe(1000);
    for (let c = 0; c < 2400; c++) expect(Math.abs(sum[c] - 1)).toBeLessThan(1e-9);
    expect(all.every((w) => Math.abs(w.coveredFraction - 1) < 1e-9)).toBe(true);
  });
});

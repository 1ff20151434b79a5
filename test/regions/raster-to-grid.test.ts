import { describe, expect, it } from 'vitest';
import { describeGridCells } from '../../pipeline/regions/grid-cells.ts';
import { GridAggregator, rasterWindows, type PixelLayout } from '../../pipeline/regions/raster-to-grid.ts';
import { rectangleAreaSr, EARTH_RADIUS_KM } from '../../pipeline/regions/spherical-area.ts';
import { regionCellPieces } from '../../pipeline/regions/cell-pieces.ts';
import { parseRegionGeoJson } from '../../pipeline/regions/parse-regions.ts';
import { expectCatalogued, grid, polygonFeature, rect } from './helpers.ts';

const R2 = EARTH_RADIUS_KM * EARTH_RADIUS_KM;
const allCells = (n: number) => Int32Array.from({ length: n }, (_, i) => i);

/** Aggregates a whole raster held in memory, reading it in strips of `strip` rows. */
function aggregate(
  layout: PixelLayout,
  values: Float32Array | Float64Array,
  gridCentres: ReturnType<typeof grid>,
  land?: Int32Array,
  noData: number | null = null,
  strip = 3,
) {
  const g = describeGridCells(gridCentres);
  const cells = land ?? allCells(g.nLat * g.nLon);
  const agg = new GridAggregator(g, cells, layout, noData, 'test.tif');
  for (const win of rasterWindows(layout, g)) {
    const w = win.col1 - win.col0;
    for (let r0 = win.row0; r0 < win.row1; r0 += strip) {
      const r1 = Math.min(win.row1, r0 + strip);
      const part = new Float64Array((r1 - r0) * w);
      for (let r = r0; r < r1; r++) for (let c = win.col0; c < win.col1; c++) part[(r - r0) * w + (c - win.col0)] = values[r * layout.width + c];
      agg.addRows(win, r0, r1 - r0, part);
    }
  }
  return agg.result();
}

/** A raster of uniform density `rho` [people km⁻²]: each pixel holds rho × its area on the sphere. */
function uniformRaster(layout: PixelLayout, rho: number): Float64Array {
  const v = new Float64Array(layout.width * layout.height);
  for (let j = 0; j < layout.height; j++) {
    const a = layout.top + j * layout.dLatRow;
    const b = a + layout.dLatRow;
    for (let i = 0; i < layout.width; i++) {
      const w = layout.west + i * layout.dLon;
      v[j * layout.width + i] = rho * R2 * rectangleAreaSr(w, w + layout.dLon, Math.min(a, b), Math.max(a, b));
    }
  }
  return v;
}

const sum = (a: ArrayLike<number>) => Array.from(a).reduce((s, x) => s + x, 0);

describe('conservative aggregation of a people raster onto the atlas grid', () => {
  it('one pixel straddling four cells is split by area on the sphere (hand computation)', () => {
    // 2 × 2 cells of 1° (edges 0…2 °E, 0…2 °N); one pixel of 100 people over 0.5…1.5 °E, 0.5…1.5 °N.
    // Longitude shares 1/2, 1/2; latitude shares by Δ sin φ: (sin 1° − sin 0.5°)/(sin 1.5° − sin 0.5°)
    // = 0.500038081 south, 0.499961919 north (computed by hand with Python's math module, 3.11).
    const r = aggregate({ width: 1, height: 1, west: 0.5, dLon: 1, top: 1.5, dLatRow: -1 }, Float64Array.of(100), grid(0.5, 2, 0.5, 2));
    expect(r.people[0]).toBeCloseTo(25.001904064297, 9);
    expect(r.people[1]).toBeCloseTo(25.001904064297, 9);
    expect(r.people[2]).toBeCloseTo(24.998095935703, 9);
    expect(r.people[3]).toBeCloseTo(24.998095935703, 9);
    expect(r.offLand).toBe(0);
    expect(r.outsideGrid).toBe(0);
  });

  it('a raster of uniform density gives every cell density × its area, with pixels not aligned to cells (known sums)', () => {
    // 0.03° pixels from 9.991 °E, 21.007 °N down, over 0.25° cells: 8.33 pixels per cell, never aligned.
    const layout: PixelLayout = { width: 60, height: 50, west: 9.991, dLon: 0.03, top: 21.007, dLatRow: -0.03 };
    const rho = 137.5;
    const cells = grid(19.75 + 0.125, 4, 10 + 0.125, 6, 0.25);
    const r = aggregate(layout, uniformRaster(layout, rho), cells);
    const g = describeGridCells(cells);
    for (let k = 0; k < r.people.length; k++) {
      const row = Math.floor(k / g.nLon);
      const col = k % g.nLon;
      const area = R2 * rectangleAreaSr(g.lonEdges[col], g.lonEdges[col + 1], g.latEdges[row], g.latEdges[row + 1]);
      expect(r.people[k] / (rho * area)).toBeCloseTo(1, 10);
    }
  });

  it('pixels coarser than the cells are split among them by area (a 1° pixel over 0.25° cells)', () => {
    const layout: PixelLayout = { width: 1, height: 1, west: 20, dLon: 1, top: 41, dLatRow: -1 };
    const cells = grid(40.125, 4, 20.125, 4, 0.25);
    const r = aggregate(layout, Float64Array.of(1e6), cells);
    const g = describeGridCells(cells);
    const pixel = rectangleAreaSr(20, 21, 40, 41);
    for (let k = 0; k < 16; k++) {
      const row = Math.floor(k / 4);
      const col = k % 4;
      expect(r.people[k]).toBeCloseTo((1e6 * rectangleAreaSr(g.lonEdges[col], g.lonEdges[col + 1], g.latEdges[row], g.latEdges[row + 1])) / pixel, 6);
    }
    expect(sum(r.people)).toBeCloseTo(1e6, 6);
    // Northern rows hold less area than southern ones at 40 °N, so the split is not even.
    expect(r.people[0]).toBeGreaterThan(r.people[12]);
  });

  it('people over sea cells and outside the grid are counted apart, and everything adds up to the raster total', () => {
    // The raster overhangs the grid on every side; the land mask keeps 5 of 12 cells.
    const layout: PixelLayout = { width: 23, height: 17, west: 9.9, dLon: 0.07, top: 21.1, dLatRow: -0.07 };
    const values = new Float64Array(23 * 17).map((_, i) => (i * 7919) % 101);
    const land = Int32Array.of(0, 3, 5, 6, 11);
    const r = aggregate(layout, values, grid(20.125, 3, 10.125, 4, 0.25), land);
    expect(r.people.length).toBe(5);
    expect(r.offLand).toBeGreaterThan(0);
    expect(r.outsideGrid).toBeGreaterThan(0);
    // Only the pixels of the windows overlapping the grid are read; all of them are accounted for.
    const g = describeGridCells(grid(20.125, 3, 10.125, 4, 0.25));
    const [win] = rasterWindows(layout, g);
    let read = 0;
    for (let j = win.row0; j < win.row1; j++) for (let i = win.col0; i < win.col1; i++) read += values[j * 23 + i];
    expect((sum(r.people) + r.offLand + r.outsideGrid) / read).toBeCloseTo(1, 12);
    expect(r.pixels).toBe((win.row1 - win.row0) * (win.col1 - win.col0));
  });

  it('a raster in −180…180 meets a grid across the antimeridian on both sides, and the same people arrive as from the raster written 0…360', () => {
    const cells = grid(-0.875, 4, 179.125, 8, 0.25); // 179…181 °E
    const rho = 50;
    const west: PixelLayout = { width: 720, height: 8, west: -180, dLon: 0.5, top: 1, dLatRow: -0.25 };
    const east: PixelLayout = { ...west, west: 0 };
    const a = aggregate(west, uniformRaster(west, rho), cells, undefined, null, 8);
    const b = aggregate(east, uniformRaster(east, rho), cells, undefined, null, 8);
    expect(rasterWindows(west, describeGridCells(cells)).length).toBe(2);
    for (let k = 0; k < a.people.length; k++) expect(a.people[k]).toBeCloseTo(b.people[k], 6);
    expect(sum(a.people)).toBeGreaterThan(0);
    expect(a.outsideGrid).toBeCloseTo(0, 9);
  });

  it('pixels marked as no data (a number or nan) are skipped, not counted', () => {
    const layout: PixelLayout = { width: 2, height: 1, west: 0, dLon: 1, top: 1, dLatRow: -1 };
    const r = aggregate(layout, Float64Array.of(-99999, 40), grid(0.5, 2, 0.5, 2), undefined, -99999);
    expect(sum(r.people)).toBeCloseTo(40, 12);
    expect(r.noDataPixels).toBe(1);
    const n = aggregate(layout, Float64Array.of(NaN, 40), grid(0.5, 2, 0.5, 2), undefined, NaN);
    expect(sum(n.people)).toBeCloseTo(40, 12);
    // Float32 rasters store −3.4028234663852886e38 rounded to float32: still no data.
    const f = aggregate(layout, Float32Array.of(-3.4028234663852886e38, 40), grid(0.5, 2, 0.5, 2), undefined, -3.4028234663852886e38);
    expect(sum(f.people)).toBeCloseTo(40, 5);
  });

  it('a negative or NaN count is refused, naming the pixel', () => {
    const layout: PixelLayout = { width: 3, height: 2, west: 0, dLon: 0.5, top: 1, dLatRow: -0.5 };
    expectCatalogued(() => aggregate(layout, Float64Array.of(1, 2, 3, 4, -5, 6), grid(0.5, 2, 0.5, 2)), 'WorkforceCountInvalid', /column 1, row 1.*-5/);
    expectCatalogued(() => aggregate(layout, Float64Array.of(1, 2, NaN, 4, 5, 6), grid(0.5, 2, 0.5, 2)), 'WorkforceCountInvalid', /column 2, row 0.*NaN/);
    // NaN is a count error when the no-data value is a number.
    expectCatalogued(() => aggregate(layout, Float64Array.of(1, 2, NaN, 4, 5, 6), grid(0.5, 2, 0.5, 2), undefined, -1), 'WorkforceCountInvalid');
  });

  it('a region covering part of a cell gets the pixels inside it, each by the share of its area inside (hand computation)', () => {
    // Cell 0 is 0…1 °E × 0…1 °N; pixels of 0.25° hold 1…16 (row 0 at the top). The region is
    // 0…0.6 °E × 0…1 °N: pixel columns 0 and 1 wholly, column 2 (0.5…0.75) by 0.1/0.25 = 0.4.
    const layout: PixelLayout = { width: 4, height: 4, west: 0, dLon: 0.25, top: 1, dLatRow: -0.25 };
    const values = Float64Array.from({ length: 16 }, (_, i) => i + 1);
    const centres = grid(0.5, 2, 0.5, 2);
    const g = describeGridCells(centres);
    const region = parseRegionGeoJson(polygonFeature('left', [rect(0, 0, 0.6, 1)]), 'test.geojson')[0];
    const pieces = regionCellPieces(region, 0, g, [0]);
    const agg = new GridAggregator(g, allCells(4), layout, null, 'test.tif');
    agg.setPieces(pieces);
    agg.addRows(rasterWindows(layout, g)[0], 0, 4, values);
    // Columns 0, 1: 1+2, 5+6, 9+10, 13+14 = 60; column 2 × 0.4: (3+7+11+15) × 0.4 = 14.4.
    expect(agg.pieceSums()[0]).toBeCloseTo(74.4, 10);
    expect(agg.result().people[0]).toBeCloseTo(136, 10);
  });

  it('a south-up raster gives the same people as its north-up copy', () => {
    const up: PixelLayout = { width: 5, height: 6, west: 0.1, dLon: 0.3, top: 1.9, dLatRow: -0.3 };
    const down: PixelLayout = { ...up, top: 1.9 - 6 * 0.3, dLatRow: 0.3 };
    const v = Float64Array.from({ length: 30 }, (_, i) => i + 1);
    const flipped = new Float64Array(30);
    for (let j = 0; j < 6; j++) for (let i = 0; i < 5; i++) flipped[(5 - j) * 5 + i] = v[j * 5 + i];
    const a = aggregate(up, v, grid(0.5, 2, 0.5, 2));
    const b = aggregate(down, flipped, grid(0.5, 2, 0.5, 2));
    for (let k = 0; k < 4; k++) expect(b.people[k]).toBeCloseTo(a.people[k], 10);
  });
});

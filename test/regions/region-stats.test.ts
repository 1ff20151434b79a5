import { describe, expect, it } from 'vitest';
import { regionCellWeights } from '../../pipeline/regions/cell-weights.ts';
import { cellAreaSr, cellCentre, describeGridCells } from '../../pipeline/regions/grid-cells.ts';
import { parseRegionGeoJson } from '../../pipeline/regions/parse-regions.ts';
import { regionFieldStats } from '../../pipeline/regions/region-stats.ts';
import { expectCatalogued, grid, polygonFeature, rect } from './helpers.ts';

const RAD = Math.PI / 180;
const g4 = grid(0.5, 4, 10.5, 4); // 4×4 cells of 1°, 0–4 °N, 10–14 °E

describe('region statistics of per-cell fields', () => {
  const square = parseRegionGeoJson(polygonFeature('sq', [rect(11, 1, 13, 3)]), 'sq.geojson')[0]; // cells 5, 6, 9, 10
  const w = regionCellWeights(square, g4);
  // Area weights by hand: rows 1–2 °N and 2–3 °N, ∝ sin φ2 − sin φ1 (common practice).
  const a1 = Math.sin(2 * RAD) - Math.sin(1 * RAD);
  const a2 = Math.sin(3 * RAD) - Math.sin(2 * RAD);

  it('the area-weighted mean of two fields matches the hand-computed cos-latitude weighting', () => {
    const fields = new Float64Array(2 * 16);
    // Field 0: 10 h in the southern row (cells 5, 6), 20 h in the northern row (9, 10). Field 1: constant 3.
    fields[5] = fields[6] = 10;
    fields[9] = fields[10] = 20;
    fields.fill(3, 16, 32);
    const s = regionFieldStats(w, fields, 2, 16);
    expect(s.mean[0]).toBeCloseTo((10 * a1 + 20 * a2) / (a1 + a2), 12);
    expect(s.mean[1]).toBeCloseTo(3, 14);
    expect(s.coveredWeight[0]).toBeCloseTo(1, 14);
  });

  it('NaN cells are left out, their weight is reported as not covered, and all-NaN gives NaN', () => {
    const fields = new Float32Array(2 * 16).fill(NaN);
    fields[5] = 4;
    fields[6] = 8;
    fields[9] = NaN;
    fields[10] = 8;
    const s = regionFieldStats(w, fields, 2, 16);
    expect(s.mean[0]).toBeCloseTo((4 * a1 + 8 * a1 + 8 * a2) / (2 * a1 + a2), 6); // float32 input
    expect(s.coveredWeight[0]).toBeCloseTo((2 * a1 + a2) / (2 * a1 + 2 * a2), 12);
    expect(s.mean[1]).toBeNaN();
    expect(s.coveredWeight[1]).toBe(0);
    expect(s.maxCell[1]).toBe(-1);
    expect(s.max[1]).toBeNaN();
  });

  it('reports the highest and lowest cell with index and centre; ties go to the lowest cell index', () => {
    const fields = new Float64Array(16);
    fields[5] = 7;
    fields[6] = 9;
    fields[9] = 9;
    fields[10] = 1;
    fields[0] = 100; // outside the region: never counted
    const s = regionFieldStats(w, fields, 1, 16);
    expect(s.max[0]).toBe(9);
    expect(s.maxCell[0]).toBe(6);
    expect(cellCentre(g4, s.maxCell[0])).toEqual({ row: 1, col: 2, lat: 1.5, lon: 12.5 });
    expect(s.min[0]).toBe(1);
    expect(cellCentre(describeGridCells(g4), s.minCell[0])).toEqual({ row: 2, col: 2, lat: 2.5, lon: 12.5 });
  });

  it('extremesMinFraction keeps barely-touched cells out of the highest/lowest but not out of the mean', () => {
    const sliver = parseRegionGeoJson(polygonFeature('sl', [rect(11, 1, 12.01, 2)]), 'f')[0]; // cell 5 whole, cell 6 by 1 %
    const ws = regionCellWeights(sliver, g4);
    const fields = new Float64Array(16);
    fields[5] = 1;
    fields[6] = 50;
    expect(regionFieldStats(ws, fields, 1, 16).max[0]).toBe(50);
    const s = regionFieldStats(ws, fields, 1, 16, { extremesMinFraction: 0.05 });
    expect(s.max[0]).toBe(1);
    expect(s.mean[0]).toBeCloseTo((1 * 1 + 50 * 0.01) / 1.01, 9);
  });

  it('fields of the wrong shape are RegionFieldShape', () => {
    expectCatalogued(() => regionFieldStats(w, new Float64Array(15), 1, 16), 'RegionFieldShape', /15 values; 1 fields × 16 cells need 16/);
    expectCatalogued(() => regionFieldStats(w, new Float64Array(8), 1, 8), 'RegionFieldShape', /uses cell 10/);
  });
});

describe('the area of a grid cell', () => {
  it('is Δλ·(sin φ2 − sin φ1) on the unit sphere: cell 1 of the 1° grid (0–1 °N, 11–12 °E) is 3.046019547268505e-4 sr (numpy 2.4.6: deg2rad(1)·(sin(deg2rad(1)) − sin 0))', () => {
    const g = describeGridCells(g4);
    expect(cellAreaSr(g, 1)).toBeCloseTo(3.046019547268505e-4, 15);
    // Cell 13 lies in the row 3–4 °N (numpy 2.4.6: deg2rad(1)·(sin(deg2rad(4)) − sin(deg2rad(3))) = 3.040453877969118e-4).
    expect(cellAreaSr(g, 13)).toBeCloseTo(3.040453877969118e-4, 15);
  });
});

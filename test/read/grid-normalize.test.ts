import { describe, expect, it } from 'vitest';
import { normalizeLatitude, normalizeLongitude, sourceRuns, wrapLongitude } from '../../pipeline/read/grid-normalize.ts';
import { expectCatalogued } from './helpers.ts';

const range = (a: number, n: number, d: number) => Array.from({ length: n }, (_, i) => a + i * d);

describe('grid convention (pipeline/model/grid.ts: lat ascending, lon ascending in [-180, 180), continuous across the antimeridian)', () => {
  it('a descending ERA5 latitude 90 … -90 is flipped, each canonical row naming its source row', () => {
    const m = normalizeLatitude(range(90, 721, -0.25), 'era5.nc');
    expect(m.values[0]).toBe(-90);
    expect(m.values[720]).toBe(90);
    expect(m.source[0]).toBe(720);
  });

  it('a global 0 … 359.75 longitude becomes -180 … 179.75 with source column 720 first (ERA5 CDS grid, docs/methods.md §2.3)', () => {
    const m = normalizeLongitude(range(0, 1440, 0.25), 'era5.nc');
    expect(m.values[0]).toBe(-180);
    expect(m.values[1439]).toBe(179.75);
    expect(m.source[0]).toBe(720);
    expect(sourceRuns(m.source, 0, 1440)).toEqual([
      { to: 0, from: 720, length: 720 },
      { to: 720, from: 0, length: 720 },
    ]);
  });

  it('a regional grid crossing 180° in 0–360 form keeps continuous longitudes 169.0625 … 236.875 (as in flxf06.gdas.1979.grb2.nc)', () => {
    const m = normalizeLongitude(range(169.0625, 218, 0.3125), 'flxf06');
    expect(m.values[0]).toBeCloseTo(169.0625, 9);
    expect(m.values[217]).toBeCloseTo(236.875, 9);
    expect(Array.from(m.source)).toEqual(range(0, 218, 1));
  });

  it('longitudes past 360 (20 … 375 in esku_heat_budget.cdf) wrap to a global -180 … 175 axis', () => {
    const m = normalizeLongitude(range(20, 72, 5), 'esku');
    expect(m.values[0]).toBe(-180);
    expect(m.values[71]).toBe(175);
    expect(m.source[0]).toBe(32); // 180° E is the 33rd source point
  });

  it('a grid around the prime meridian stored as 359.5, 359.75, 0, 0.25 becomes -0.5 … 0.25', () => {
    const m = normalizeLongitude([359.5, 359.75, 0, 0.25], 'x');
    expect(Array.from(m.values)).toEqual([-0.5, -0.25, 0, 0.25]);
    expect(Array.from(m.source)).toEqual([0, 1, 2, 3]);
  });

  it('descending longitudes are reversed; 180 wraps to -180', () => {
    expect(Array.from(normalizeLongitude([10, 5, 0], 'x').source)).toEqual([2, 1, 0]);
    expect(wrapLongitude(180)).toBe(-180);
    expect(wrapLongitude(-180)).toBe(-180);
    expect(wrapLongitude(540.5)).toBe(-179.5);
  });

  it('a repeated column (0 and 360) and a non-monotonic latitude are NetcdfGridUnsupported errors naming the file', async () => {
    await expectCatalogued(() => normalizeLongitude([0, 90, 180, 270, 360], 'rep.nc'), 'NetcdfGridUnsupported', /rep\.nc/);
    await expectCatalogued(() => normalizeLatitude([0, 1, 0.5], 'lat.nc'), 'NetcdfGridUnsupported', /lat\.nc/);
  });
});

import { describe, expect, it } from 'vitest';
import { renderLayerPng } from '../../../pipeline/publish/layers/render-layer-png.ts';
import { writeGeoTiff } from '../../../pipeline/publish/layers/geotiff-write.ts';
import { compileStyle, type ContinuousStyle } from '../../../pipeline/publish/layers/style.ts';
import { errorCatalogue } from '../../../pipeline/model/errors.ts';
import '../../../pipeline/commands/catalogue.ts';
import { expectCatalogued, regularGrid } from './helpers.ts';

// Checks against the project's own grid convention (pipeline/model/grid.ts) and catalogue.
const style: ContinuousStyle = { kind: 'continuous', ramp: 'viridis', domain: [0, 10], units: 'h' };
const good = () => regularGrid(10.5, 1, 4, 20.5, 1, 5, (y, x) => y + x);
const both = (grid: ReturnType<typeof good>) => [() => renderLayerPng(grid, style), () => writeGeoTiff(grid, { units: 'h', description: 'x' })];

describe('bad layer input gives catalogued errors, for the PNG and the GeoTIFF alike', () => {
  it('values length ≠ ny·nx is LayerValuesLength, naming both sizes', () => {
    const g = good();
    g.values = new Float32Array(19);
    for (const f of both(g)) expectCatalogued(f, 'LayerValuesLength', /19 entries .* 4 rows × 5 columns = 20/);
  });

  it('a skipped latitude row is LayerGridIrregular on lat', () => {
    const g = good();
    g.lat = Float64Array.from([10.5, 11.5, 13.5, 14.5]);
    for (const f of both(g)) expect(expectCatalogued(f, 'LayerGridIrregular').where.variable).toBe('lat');
  });

  it('descending latitudes (north to south, as many files store them) are LayerGridIrregular with a hint to flip in read', () => {
    const g = good();
    g.lat = Float64Array.from([13.5, 12.5, 11.5, 10.5]);
    for (const f of both(g)) expectCatalogued(f, 'LayerGridIrregular', /ascend.*flip descending files in read/s);
  });

  it('uneven longitudes are LayerGridIrregular on lon', () => {
    const g = good();
    g.lon = Float64Array.from([20.5, 21.5, 22.5, 23.7, 24.5]);
    for (const f of both(g)) expect(expectCatalogued(f, 'LayerGridIrregular').where.variable).toBe('lon');
  });

  it('float32 rounding of a 0.1° grid (about 1e-6 °) is accepted as regular', () => {
    const lat = Float64Array.from({ length: 50 }, (_, i) => Math.fround(30.05 + 0.1 * i));
    const lon = Float64Array.from({ length: 50 }, (_, i) => Math.fround(-9.95 + 0.1 * i));
    const g = { lat, lon, values: new Float32Array(2500) };
    expect(renderLayerPng(g, style).width).toBe(400);
  });

  it('an empty grid and a single row are LayerGridEmpty', () => {
    const empty = { lat: new Float64Array(0), lon: new Float64Array(0), values: new Float32Array(0) };
    for (const f of both(empty)) expectCatalogued(f, 'LayerGridEmpty', /0 latitude rows/);
    const row = regularGrid(10.5, 1, 1, 20.5, 1, 5, () => 1);
    for (const f of both(row)) expectCatalogued(f, 'LayerGridEmpty', /1 latitude rows/);
  });

  it('a NaN or out-of-range coordinate is LayerCoordinateInvalid', () => {
    const g = good();
    g.lon = Float64Array.from([20.5, NaN, 22.5, 23.5, 24.5]);
    for (const f of both(g)) expectCatalogued(f, 'LayerCoordinateInvalid', /lon\[1\] = NaN/);
    const h = good();
    h.lat = Float64Array.from([89.5, 90.5, 91.5, 92.5]);
    for (const f of both(h)) expectCatalogued(f, 'LayerCoordinateInvalid', /lat\[1\] = 90.5/);
  });

  it('a domain with min ≥ max or a non-finite end is LayerDomainInvalid', () => {
    for (const domain of [
      [5, 5],
      [10, 0],
      [0, NaN],
      [-Infinity, 1],
    ] as [number, number][]) {
      expectCatalogued(() => renderLayerPng(good(), { ...style, domain }), 'LayerDomainInvalid', /min must be finite and less than max/);
    }
  });

  it('classes outside 2–20 or not whole are LayerClassesInvalid', () => {
    for (const classes of [1, 0, 2.5, 21]) expectCatalogued(() => compileStyle({ ...style, classes }), 'LayerClassesInvalid');
  });

  it('a ramp that is not one of ours is LayerRampUnknown, listing the ones we offer', () => {
    expectCatalogued(() => compileStyle({ ...style, ramp: 'jet' as never }), 'LayerRampUnknown', /viridis, cividis/);
  });

  it('categorical classes with duplicate codes, bad colours, empty labels, or a cell code no class has are LayerCategoriesInvalid', () => {
    const base = { kind: 'categorical' as const, units: '1' };
    expectCatalogued(() => compileStyle({ ...base, classes: [] }), 'LayerCategoriesInvalid', /no classes/);
    expectCatalogued(
      () =>
        compileStyle({
          ...base,
          classes: [
            { value: 1, label: 'a', color: '#000000' },
            { value: 1, label: 'b', color: '#ffffff' },
          ],
        }),
      'LayerCategoriesInvalid',
      /used twice/,
    );
    expectCatalogued(() => compileStyle({ ...base, classes: [{ value: 1, label: 'a', color: 'red' }] }), 'LayerCategoriesInvalid', /not #rrggbb/);
    expectCatalogued(() => compileStyle({ ...base, classes: [{ value: 1, label: ' ', color: '#112233' }] }), 'LayerCategoriesInvalid', /empty label/);
    expectCatalogued(() => compileStyle({ ...base, classes: [{ value: 1.5, label: 'a', color: '#112233' }] }), 'LayerCategoriesInvalid', /non-integer/);
    const g = regularGrid(0.5, 1, 2, 0.5, 1, 2, () => 7);
    expectCatalogued(() => renderLayerPng(g, { ...base, classes: [{ value: 1, label: 'a', color: '#112233' }] }), 'LayerCategoriesInvalid', /holds 7/);
  });

  it('every layer error is registered in the catalogue through pipeline/commands/catalogue.ts', () => {
    const codes = errorCatalogue().map((e) => e.code);
    for (const c of [
      'LayerGridEmpty',
      'LayerValuesLength',
      'LayerGridIrregular',
      'LayerCoordinateInvalid',
      'LayerDomainInvalid',
      'LayerClassesInvalid',
      'LayerRampUnknown',
      'LayerCategoriesInvalid',
      'LayerNoData',
      'LayerNoDataValueInvalid',
    ]) {
      expect(codes).toContain(c);
    }
  });
});

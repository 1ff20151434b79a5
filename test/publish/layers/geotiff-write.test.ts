import { describe, expect, it } from 'vitest';
import { fromArrayBuffer } from 'geotiff';
import sharp from 'sharp';
import { writeGeoTiff } from '../../../pipeline/publish/layers/geotiff-write.ts';
import { exactBuffer, expectCatalogued, regularGrid } from './helpers.ts';

// Outside reader: geotiff.js 3.0.5 (a general-purpose GeoTIFF reader), fromArrayBuffer → getImage.
async function readBack(tif: Uint8Array) {
  const file = await fromArrayBuffer(exactBuffer(tif));
  return file.getImage();
}

// 0.5° grid, 8 rows × 5 columns, centres 40.25…43.75 °N and 10.25…12.25 °E, value = 10·row + col,
// one NaN cell in the southernmost row.
const grid = regularGrid(40.25, 0.5, 8, 10.25, 0.5, 5, (y, x) => (y === 0 && x === 2 ? NaN : 10 * y + x));

describe('writeGeoTiff read back with geotiff.js 3.0.5', () => {
  it('the bounding box is the grid cell edges, not the centres (geotiff.js getBoundingBox)', async () => {
    const im = await readBack(writeGeoTiff(grid, { units: 'h', description: 'test figure' }));
    const [w, s, e, n] = im.getBoundingBox();
    expect(w).toBeCloseTo(10.0, 12);
    expect(s).toBeCloseTo(40.0, 12);
    expect(e).toBeCloseTo(12.5, 12);
    expect(n).toBeCloseTo(44.0, 12);
    expect(im.getWidth()).toBe(5);
    expect(im.getHeight()).toBe(8);
  });

  it('origin is the north-west cell edge and resolution is the grid step, north-up (geotiff.js getOrigin, getResolution)', async () => {
    const im = await readBack(writeGeoTiff(grid, { units: 'h', description: 'test figure' }));
    const [ox, oy] = im.getOrigin();
    expect(ox).toBeCloseTo(10.0, 12);
    expect(oy).toBeCloseTo(44.0, 12);
    const [rx, ry] = im.getResolution();
    expect(rx).toBeCloseTo(0.5, 12);
    expect(ry).toBeCloseTo(-0.5, 12); // negative: rows run north to south
  });

  it('GeoKeys say geographic, PixelIsArea, EPSG:4326, degrees (geotiff.js getGeoKeys; GeoTIFF 1.1 key codes)', async () => {
    const im = await readBack(writeGeoTiff(grid, { units: 'h', description: 'test figure' }));
    const keys = im.getGeoKeys() as Record<string, number>;
    expect(keys.GTModelTypeGeoKey).toBe(2);
    expect(keys.GTRasterTypeGeoKey).toBe(1);
    expect(keys.GeographicTypeGeoKey).toBe(4326);
    expect(keys.GeogAngularUnitsGeoKey).toBe(9102);
  });

  it('readRasters gives Float32 values north-up: raster row 0 is the northernmost grid row, NaN kept with GDAL_NODATA "nan"', async () => {
    const im = await readBack(writeGeoTiff(grid, { units: 'h', description: 'test figure' }));
    expect(im.getSampleFormat()).toBe(3);
    expect(im.getBitsPerSample()).toBe(32);
    expect(Number.isNaN(im.getGDALNoData())).toBe(true);
    const [band] = (await im.readRasters()) as unknown as Float32Array[];
    expect(band).toBeInstanceOf(Float32Array);
    for (let r = 0; r < 8; r++) {
      for (let x = 0; x < 5; x++) {
        const gridRow = 7 - r;
        const want = grid.values[gridRow * 5 + x];
        const got = band[r * 5 + x];
        if (Number.isNaN(want)) expect(Number.isNaN(got)).toBe(true);
        else expect(got).toBe(want);
      }
    }
    expect(band[0]).toBe(70); // north-west cell: row 7, column 0
    expect(Number.isNaN(band[7 * 5 + 2])).toBe(true);
  });

  it('an explicit noData replaces NaN cells and is announced in GDAL_NODATA (geotiff.js getGDALNoData)', async () => {
    const im = await readBack(writeGeoTiff(grid, { units: 'h', description: 'x', noData: -9999 }));
    expect(im.getGDALNoData()).toBe(-9999);
    const [band] = (await im.readRasters()) as unknown as Float32Array[];
    expect(band[7 * 5 + 2]).toBe(-9999);
    expect(band.some((v) => Number.isNaN(v))).toBe(false);
  });

  it('GDAL_METADATA carries units and description for band 0 and the dataset (geotiff.js getGDALMetadata)', async () => {
    const im = await readBack(writeGeoTiff(grid, { units: 'degC', description: 'mean WBGT in the sun, July' }));
    const band = (await im.getGDALMetadata(0)) as Record<string, string>;
    expect(band.UNITTYPE).toBe('degC');
    expect(band.DESCRIPTION).toBe('mean WBGT in the sun, July');
    const ds = (await im.getGDALMetadata()) as Record<string, string>;
    expect(ds.units).toBe('degC');
    expect(ds.description).toBe('mean WBGT in the sun, July');
  });

  it('markup characters in the description are XML-escaped in GDAL_METADATA (geotiff.js returns the item text undecoded)', async () => {
    const im = await readBack(writeGeoTiff(grid, { units: 'h', description: 'hours <sun> & "shade"' }));
    const band = (await im.getGDALMetadata(0)) as Record<string, string>;
    expect(band.DESCRIPTION).toBe('hours &lt;sun&gt; &amp; &quot;shade&quot;');
  });

  it('a grid across the antimeridian keeps continuous longitudes past 180 in the bbox', async () => {
    const g = regularGrid(-10.125, 0.25, 4, 179.625, 0.25, 6, (y, x) => y + x);
    const im = await readBack(writeGeoTiff(g, { units: '1', description: 'x' }));
    const [w, s, e, n] = im.getBoundingBox();
    expect([w, s, e, n].map((v) => +v.toFixed(9))).toEqual([179.5, -10.25, 181, -9.25]);
  });

  it('a grid big enough for several strips reads back value for value', async () => {
    const g = regularGrid(-29.95, 0.1, 300, 100.05, 0.1, 400, (y, x) => Math.sin(y * 0.1) * 30 + x * 0.01);
    const tif = writeGeoTiff(g, { units: 'degC', description: 'x' });
    const im = await readBack(tif);
    expect(im.getTileHeight()).toBeLessThan(300); // RowsPerStrip < rows: more than one strip
    const [band] = (await im.readRasters()) as unknown as Float32Array[];
    let mismatches = 0;
    for (let r = 0; r < 300; r++) for (let x = 0; x < 400; x++) if (band[r * 400 + x] !== g.values[(299 - r) * 400 + x]) mismatches++;
    expect(mismatches).toBe(0);
  });

  it('libvips (through sharp 0.34.5, a second outside TIFF reader) opens it as a 1-band float image of the right size', async () => {
    const meta = await sharp(writeGeoTiff(grid, { units: 'h', description: 'x', noData: -9999 })).metadata();
    expect(meta.format).toBe('tiff');
    expect(meta.width).toBe(5);
    expect(meta.height).toBe(8);
    expect(meta.channels).toBe(1);
    expect(meta.depth).toBe('float');
  });

  it('a non-finite noData and one that a cell already holds are LayerNoDataValueInvalid errors', () => {
    expectCatalogued(() => writeGeoTiff(grid, { units: 'h', description: 'x', noData: Infinity }), 'LayerNoDataValueInvalid', /finite/);
    expectCatalogued(() => writeGeoTiff(grid, { units: 'h', description: 'x', noData: 21 }), 'LayerNoDataValueInvalid', /grid row 2, column 1/);
  });
});

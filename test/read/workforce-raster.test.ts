/**
 * Reading people rasters: what GDAL (Debian's gdal-bin, 3.6.2 here) writes is read with the same
 * georeference gdalinfo reports, and every raster heathours cannot use is a catalogued error
 * naming the file, with the GDAL command that fixes it.
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { execFileSync } from 'node:child_process';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { writeGeoTiff } from '../../pipeline/publish/layers/geotiff-write.ts';
import { openWorkforceRaster } from '../../pipeline/read/workforce-raster.ts';
import { aggregateRasterFile } from '../../pipeline/run/workforce-aggregate.ts';
import { expectCataloguedAsync } from '../helpers/catalogued.ts';

let dir = '';
const W = 40;
const H = 30;
const D = 0.05;
const WEST = 100.02;
const NORTH = -5.01;

function gdal(args: string[]): void {
  execFileSync(args[0], args.slice(1), { stdio: 'pipe' });
}

beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'hh-wraster-'));
  const lat = Float64Array.from({ length: H }, (_, j) => NORTH - (H - 1 - j + 0.5) * D);
  const lon = Float64Array.from({ length: W }, (_, i) => WEST + (i + 0.5) * D);
  const values = Float32Array.from({ length: W * H }, (_, i) => (i % 17) + 1);
  writeFileSync(join(dir, 'ok.tif'), writeGeoTiff({ lat, lon, values }, { units: 'people', description: 'invented people (test)' }));
});

describe('people rasters heathours reads', () => {
  it('reads the size and georeference gdalinfo reports, and the no-data value GDAL wrote', async () => {
    gdal(['gdal_translate', '-q', '-a_nodata', '-99999', '-ot', 'Int32', join(dir, 'ok.tif'), join(dir, 'int.tif')]);
    const info = JSON.parse(execFileSync('gdalinfo', ['-json', join(dir, 'int.tif')], { encoding: 'utf8' })) as {
      size: number[];
      geoTransform: number[];
      bands: Array<{ noDataValue: number; type: string }>;
    };
    const r = await openWorkforceRaster(join(dir, 'int.tif'));
    expect([r.width, r.height]).toEqual(info.size);
    expect(r.west).toBeCloseTo(info.geoTransform[0], 12);
    expect(r.dLon).toBeCloseTo(info.geoTransform[1], 12);
    expect(r.top).toBeCloseTo(info.geoTransform[3], 12);
    expect(r.dLatRow).toBeCloseTo(info.geoTransform[5], 12);
    expect(r.noData).toBe(info.bands[0].noDataValue);
    expect(r.sampleType).toBe('int32');
    const window = await r.read(3, 2, 7, 4);
    // writeGeoTiff took rows south to north: the file's row r is row H − 1 − r of the values.
    const at = (row: number, col: number) => (((H - 1 - row) * W + col) % 17) + 1;
    expect(Array.from(window)).toEqual([at(2, 3), at(2, 4), at(2, 5), at(2, 6), at(3, 3), at(3, 4), at(3, 5), at(3, 6)]);
    await r.close();
  });

  it('a raster stamped PixelIsPoint (tiepoint at a pixel centre) gives the same people as the same pixels stamped PixelIsArea', async () => {
    gdal(['gdal_translate', '-q', '-mo', 'AREA_OR_POINT=Point', join(dir, 'ok.tif'), join(dir, 'point.tif')]);
    const grid = { lat: Float64Array.from({ length: 5 }, (_, j) => -6.25 + j * 0.2), lon: Float64Array.from({ length: 8 }, (_, i) => 100.3 + i * 0.2) };
    const cells = Int32Array.from({ length: 40 }, (_, i) => i);
    const a = await aggregateRasterFile(join(dir, 'ok.tif'), grid, cells);
    const b = await aggregateRasterFile(join(dir, 'point.tif'), grid, cells);
    for (let k = 0; k < 40; k++) expect(b.people[k]).toBeCloseTo(a.people[k], 6);
    expect(b.raster.west).toBeCloseTo(WEST, 9);
  });
});

describe('people rasters heathours refuses, with a catalogued error and the fix', () => {
  it('a raster in a projected CRS (Web Mercator) names the CRS and shows the gdalwarp command to EPSG:4326', async () => {
    gdal(['gdalwarp', '-q', '-t_srs', 'EPSG:3857', join(dir, 'ok.tif'), join(dir, 'mercator.tif')]);
    const e = await expectCataloguedAsync(openWorkforceRaster(join(dir, 'mercator.tif')), 'WorkforceRasterCrs', /EPSG:3857/);
    expect(e.hint).toContain('gdalwarp -t_srs EPSG:4326 -r sum');
    expect(e.where.file).toBe(join(dir, 'mercator.tif'));
  });

  it('a raster in another geographic CRS (NAD83, EPSG:4269) is refused too', async () => {
    gdal(['gdal_translate', '-q', '-a_srs', 'EPSG:4269', join(dir, 'ok.tif'), join(dir, 'nad83.tif')]);
    await expectCataloguedAsync(openWorkforceRaster(join(dir, 'nad83.tif')), 'WorkforceRasterCrs', /EPSG:4269/);
  });

  it('a TIFF without GeoTIFF keys is refused as having no coordinate system', async () => {
    gdal(['gdal_translate', '-q', '-co', 'PROFILE=BASELINE', join(dir, 'ok.tif'), join(dir, 'plain.tif')]);
    await expectCataloguedAsync(openWorkforceRaster(join(dir, 'plain.tif')), 'WorkforceRasterCrs', /plain TIFF/);
  });

  it('a raster of two bands names the bands and shows gdal_translate -b', async () => {
    gdal(['gdal_translate', '-q', '-b', '1', '-b', '1', join(dir, 'ok.tif'), join(dir, 'two.tif')]);
    const e = await expectCataloguedAsync(openWorkforceRaster(join(dir, 'two.tif')), 'WorkforceRasterBands', /2 bands/);
    expect(e.hint).toContain('gdal_translate -b');
  });

  it('a rotated raster (a geotransform with rotation terms, written by GDAL from a VRT) is refused', async () => {
    const vrt = `<VRTDataset rasterXSize="${W}" rasterYSize="${H}">
  <SRS>EPSG:4326</SRS>
  <GeoTransform>${WEST}, ${D}, 0.01, ${NORTH}, 0.01, ${-D}</GeoTransform>
  <VRTRasterBand dataType="Float32" band="1">
    <SimpleSource><SourceFilename relativeToVRT="1">ok.tif</SourceFilename><SourceBand>1</SourceBand></SimpleSource>
  </VRTRasterBand>
</VRTDataset>`;
    writeFileSync(join(dir, 'rotated.vrt'), vrt);
    gdal(['gdal_translate', '-q', join(dir, 'rotated.vrt'), join(dir, 'rotated.tif')]);
    await expectCataloguedAsync(openWorkforceRaster(join(dir, 'rotated.tif')), 'WorkforceRasterGeoreference', /rotated/);
  });

  it('a file that is not a TIFF, and a TIFF cut short, are unreadable, naming the file', async () => {
    writeFileSync(join(dir, 'text.tif'), 'region_id,workload_class,share\n');
    await expectCataloguedAsync(openWorkforceRaster(join(dir, 'text.tif')), 'WorkforceRasterUnreadable', /text\.tif/);
    // A larger raster whose pixels fill most of the file, cut so that its header is whole but its last strips are gone.
    gdal([
      'gdal_translate',
      '-q',
      '-outsize',
      '400',
      '300',
      '-r',
      'bilinear',
      '-co',
      'COMPRESS=DEFLATE',
      '-co',
      'PREDICTOR=3',
      join(dir, 'ok.tif'),
      join(dir, 'deflate.tif'),
    ]);
    const bytes = readFileSync(join(dir, 'deflate.tif'));
    writeFileSync(join(dir, 'cut.tif'), bytes.subarray(0, Math.floor(bytes.length * 0.8)));
    const grid = { lat: Float64Array.from({ length: 5 }, (_, j) => -6.25 + j * 0.2), lon: Float64Array.from({ length: 8 }, (_, i) => 100.3 + i * 0.2) };
    await expectCataloguedAsync(
      aggregateRasterFile(
        join(dir, 'cut.tif'),
        grid,
        Int32Array.from({ length: 40 }, (_, i) => i),
      ),
      'WorkforceRasterUnreadable',
      /cut\.tif/,
    );
  });
});

/**
 * The people raster streamed from a GeoTIFF onto the atlas grid, checked against GDAL: Debian's
 * gdal-bin (GDAL 3.6.2 here; `.ci/run` installs it when absent) warps the same file with
 * `gdalwarp -r sum` (GDAL ≥ 3.1: the weighted sum of the contributing pixels) onto the atlas grid,
 * and every cell's people agree within 0.5 %. GDAL splits a pixel by its share in degrees, we by
 * its share of the area on the sphere; for these small pixels the two differ by about 1e-4.
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { execFileSync } from 'node:child_process';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fromFile } from 'geotiff';
import { writeGeoTiff } from '../../pipeline/publish/layers/geotiff-write.ts';
import { aggregateRasterFile } from '../../pipeline/run/workforce-aggregate.ts';
import type { HorizontalGrid } from '../../pipeline/model/grid.ts';

let dir = '';
const GDAL_VERSION = (() => {
  try {
    return execFileSync('gdalinfo', ['--version'], { encoding: 'utf8' }).trim();
  } catch {
    return 'gdal-bin missing';
  }
})();

/** An invented raster: 0.013° pixels (not a divisor of the 0.1° cells), smooth people with a few hot spots. */
const RASTER = { width: 230, height: 170, west: 29.987, north: 12.212, d: 0.013 };
/** The atlas grid: 0.1° cells, 20 × 27, inside the raster with a margin. */
const GRID: HorizontalGrid = {
  lat: Float64Array.from({ length: 20 }, (_, j) => 10.25 + j * 0.1),
  lon: Float64Array.from({ length: 27 }, (_, i) => 30.15 + i * 0.1),
};

function rasterValues(): Float32Array {
  const v = new Float32Array(RASTER.width * RASTER.height);
  for (let j = 0; j < RASTER.height; j++) {
    for (let i = 0; i < RASTER.width; i++) {
      const x = i / RASTER.width;
      const y = j / RASTER.height;
      const town = 4000 * Math.exp(-((x - 0.4) ** 2 + (y - 0.6) ** 2) / 0.004) + 900 * Math.exp(-((x - 0.75) ** 2 + (y - 0.3) ** 2) / 0.01);
      v[j * RASTER.width + i] = Math.round(20 + 15 * Math.sin(11 * x) * Math.cos(7 * y) + town + ((i * 31 + j * 17) % 13));
    }
  }
  return v;
}

/** Writes the raster with our GeoTIFF writer (north-up, tiled, Float32, EPSG:4326). */
function writeRaster(path: string, values: Float32Array): void {
  const lat = Float64Array.from({ length: RASTER.height }, (_, j) => RASTER.north - (RASTER.height - 1 - j + 0.5) * RASTER.d);
  const lon = Float64Array.from({ length: RASTER.width }, (_, i) => RASTER.west + (i + 0.5) * RASTER.d);
  // writeGeoTiff takes rows south to north (the pipeline's grid convention).
  const southUp = new Float32Array(values.length);
  for (let j = 0; j < RASTER.height; j++) southUp.set(values.subarray(j * RASTER.width, (j + 1) * RASTER.width), (RASTER.height - 1 - j) * RASTER.width);
  writeFileSync(path, writeGeoTiff({ lat, lon, values: southUp }, { units: 'people', description: 'invented people per pixel (test)' }));
}

async function readGdalGrid(path: string): Promise<Float64Array> {
  const tif = await fromFile(path);
  const img = await tif.getImage(0);
  const r = (await img.readRasters({ interleave: true })) as unknown as ArrayLike<number>;
  const nLon = img.getWidth();
  const nLat = img.getHeight();
  // GDAL writes north-up: flip to the pipeline's rows (south to north).
  const out = new Float64Array(nLat * nLon);
  for (let j = 0; j < nLat; j++) for (let i = 0; i < nLon; i++) out[(nLat - 1 - j) * nLon + i] = r[j * nLon + i];
  await tif.close();
  return out;
}

beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'hh-workforce-'));
  writeRaster(join(dir, 'people.tif'), rasterValues());
  // The same pixels as GDAL writes them: DEFLATE strips with the floating-point predictor, and LZW tiles.
  execFileSync('gdal_translate', ['-q', '-co', 'COMPRESS=DEFLATE', '-co', 'PREDICTOR=3', join(dir, 'people.tif'), join(dir, 'deflate.tif')]);
  execFileSync('gdal_translate', [
    '-q',
    '-co',
    'COMPRESS=LZW',
    '-co',
    'TILED=YES',
    '-co',
    'BLOCKXSIZE=64',
    '-co',
    'BLOCKYSIZE=64',
    join(dir, 'people.tif'),
    join(dir, 'lzw.tif'),
  ]);
});

describe(`people per cell against GDAL's gdalwarp -r sum (${GDAL_VERSION})`, () => {
  it('every cell of the atlas grid holds the people gdalwarp -r sum gives it, within 0.5 %', async () => {
    const ours = await aggregateRasterFile(
      join(dir, 'people.tif'),
      GRID,
      Int32Array.from({ length: 20 * 27 }, (_, i) => i),
    );
    const west = GRID.lon[0] - 0.05;
    const south = GRID.lat[0] - 0.05;
    execFileSync('gdalwarp', [
      '-q',
      '-overwrite',
      '-r',
      'sum',
      '-ot',
      'Float64',
      '-te',
      String(west),
      String(south),
      String(west + 2.7),
      String(south + 2.0),
      '-ts',
      '27',
      '20',
      join(dir, 'people.tif'),
      join(dir, 'gdal-sum.tif'),
    ]);
    const gdal = await readGdalGrid(join(dir, 'gdal-sum.tif'));
    let worst = 0;
    for (let k = 0; k < gdal.length; k++) {
      expect(gdal[k]).toBeGreaterThan(500);
      worst = Math.max(worst, Math.abs(ours.people[k] / gdal[k] - 1));
    }
    expect(worst).toBeLessThan(0.005);
    // The two splits differ only in latitude shares (degrees against areas): measured 1.5e-6 here.
    expect(worst).toBeLessThan(1e-4);
    expect(ours.offLand).toBe(0);
  });

  it('GDAL-written DEFLATE strips and LZW tiles give the same people as our uncompressed tiles', async () => {
    const cells = Int32Array.from({ length: 20 * 27 }, (_, i) => i);
    const a = await aggregateRasterFile(join(dir, 'people.tif'), GRID, cells);
    for (const f of ['deflate.tif', 'lzw.tif']) {
      const b = await aggregateRasterFile(join(dir, f), GRID, cells);
      expect(Array.from(b.people), f).toEqual(Array.from(a.people));
      expect(b.raster.sampleType).toBe('float32');
    }
  });

  it('the total on the grid equals the raster total inside the grid, summed by Python over the pixels (numpy, Debian python3-numpy)', async () => {
    const ours = await aggregateRasterFile(
      join(dir, 'people.tif'),
      GRID,
      Int32Array.from({ length: 20 * 27 }, (_, i) => i),
    );
    const values = rasterValues();
    writeFileSync(join(dir, 'values.f32'), Buffer.from(values.buffer));
    // numpy sums the pixels weighted by the share of each pixel inside the grid's rectangle (degrees in longitude, sin φ in latitude).
    const py = `
import numpy as np
W,H,west,north,d=${RASTER.width},${RASTER.height},${RASTER.west},${RASTER.north},${RASTER.d}
v=np.fromfile('${join(dir, 'values.f32')}',dtype='<f4').astype(np.float64).reshape(H,W)
x0,x1,y0,y1=${GRID.lon[0] - 0.05},${GRID.lon[26] + 0.05},${GRID.lat[0] - 0.05},${GRID.lat[19] + 0.05}
xe=west+d*np.arange(W+1); ye=north-d*np.arange(H+1)
fx=np.clip(np.minimum(xe[1:],x1)-np.maximum(xe[:-1],x0),0,None)/d
s=lambda a: np.sin(np.radians(a))
fy=np.clip(s(np.minimum(ye[:-1],y1))-s(np.maximum(ye[1:],y0)),0,None)/(s(ye[:-1])-s(ye[1:]))
print(repr(float((v*fy[:,None]*fx[None,:]).sum())))
`;
    const total = Number(execFileSync('/usr/bin/python3', ['-c', py], { encoding: 'utf8' }).trim());
    const mine = Array.from(ours.people).reduce((s, x) => s + x, 0);
    expect(mine / total).toBeCloseTo(1, 9);
    expect(readFileSync(join(dir, 'values.f32')).length).toBe(4 * RASTER.width * RASTER.height);
  });
});

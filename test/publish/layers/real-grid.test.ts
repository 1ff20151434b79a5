import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { NetCDFReader } from 'netcdfjs';
import { fromArrayBuffer } from 'geotiff';
import { writeGeoTiff } from '../../../pipeline/publish/layers/geotiff-write.ts';
import { renderLayerPng } from '../../../pipeline/publish/layers/render-layer-png.ts';
import { niceDomain } from '../../../pipeline/publish/layers/nice-domain.ts';
import { figureStyle } from '../../../pipeline/publish/layers/figure-style.ts';
import { decodePng, exactBuffer } from './helpers.ts';
import { fixturePath } from '../../helpers/fixtures.ts';

// Real data: test/fixtures/realdata/bcsd_obs_1999.nc (PROVENANCE.md there: observed monthly `tas` [C],
// 1/8°, south-east USA, missing cells NaN), read with netcdfjs 4.0.0. Its coordinate extremes as
// printed by the reference library's own `ncdump -v latitude,longitude`: latitude 33.0625 …
// 37.0625 (33 rows), longitude −84.9375 … −74.9375 (81 columns), so cell edges 33.0 … 37.125 °N and
// −85.0 … −74.875 °E. Read back with geotiff.js 3.0.5 and sharp 0.34.5.
const file = fixturePath('realdata', 'bcsd_obs_1999.nc');
const nc = new NetCDFReader(readFileSync(file));
const lat = Float64Array.from(nc.getDataVariable('latitude') as number[]);
const lon = Float64Array.from(nc.getDataVariable('longitude') as number[]);
const records = nc.getDataVariable('tas') as unknown as number[][];
const july = Float32Array.from(records[6], (v) => (v >= 1e19 ? NaN : v));

describe('a real 1/8° grid (bcsd_obs_1999.nc, July tas)', () => {
  it('the GeoTIFF bbox is the ncdump coordinates ± 1/16° and its NaN cells are the source NaN cells', async () => {
    const tif = writeGeoTiff({ lat, lon, values: july }, { units: 'degC', description: 'July 1999 mean air temperature (bcsd_obs)' });
    const im = await (await fromArrayBuffer(exactBuffer(tif))).getImage();
    expect(im.getBoundingBox()).toEqual([-85, 33, -74.875, 37.125]);
    const [band] = (await im.readRasters()) as unknown as Float32Array[];
    const nanSource = july.reduce((n, v) => n + (Number.isNaN(v) ? 1 : 0), 0);
    const nanTif = band.reduce((n, v) => n + (Number.isNaN(v) ? 1 : 0), 0);
    expect(nanSource).toBeGreaterThan(0);
    expect(nanTif).toBe(nanSource);
    // north-west cell of the GeoTIFF = the source's last row, first column
    const nw = july[(lat.length - 1) * lon.length];
    if (Number.isNaN(nw)) expect(Number.isNaN(band[0])).toBe(true);
    else expect(band[0]).toBe(nw);
  });

  it('the PNG is transparent in the same share of cells that are NaN (within 2 %, the Mercator rows weigh cells a little unevenly)', async () => {
    const domain = niceDomain(july, { fromZero: false });
    expect(domain[0]).toBeLessThan(domain[1]);
    const layer = renderLayerPng({ lat, lon, values: july }, figureStyle('meanAnnualTemperature', domain, 'degC'));
    expect(layer.coordinates).toEqual([
      [-85, 37.125],
      [-74.875, 37.125],
      [-74.875, 33],
      [-85, 33],
    ]);
    const img = await decodePng(layer.png);
    let clear = 0;
    for (let y = 0; y < img.height; y++) for (let x = 0; x < img.width; x++) if (img.at(x, y)[3] === 0) clear++;
    const nanShare = july.reduce((n, v) => n + (Number.isNaN(v) ? 1 : 0), 0) / july.length;
    expect(Math.abs(clear / (img.width * img.height) - nanShare)).toBeLessThan(0.02);
  });
});

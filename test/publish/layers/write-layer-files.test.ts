import { describe, expect, it } from 'vitest';
import { mkdtempSync, readFileSync, readdirSync } from 'node:fs';
import { createHash } from 'node:crypto';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fromArrayBuffer } from 'geotiff';
import { writeLayerFiles } from '../../../pipeline/publish/layers/write-layer-files.ts';
import { figureStyle } from '../../../pipeline/publish/layers/figure-style.ts';
import { decodePng, exactBuffer, regularGrid } from './helpers.ts';

// Outside readers: sharp 0.34.5 for the PNG, geotiff.js 3.0.5 for the GeoTIFF; node:crypto SHA-256.
describe('writeLayerFiles', () => {
  it('writes name.png and name.tif, nothing else, with the digests and legend it reports', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'layers-'));
    const g = regularGrid(20.5, 1, 6, 30.5, 1, 8, (y, x) => y * 8 + x);
    const out = await writeLayerFiles(dir, 'hours-above-07', g, figureStyle('hoursAboveLimit', [0, 50], 'h'), { description: 'hours above the limit, July' });
    expect(readdirSync(dir).sort()).toEqual(['hours-above-07.png', 'hours-above-07.tif']);
    const png = readFileSync(join(dir, out.png));
    const tif = readFileSync(join(dir, out.tif));
    expect(out.pngSha256).toBe(createHash('sha256').update(png).digest('hex'));
    expect(out.tifSha256).toBe(createHash('sha256').update(tif).digest('hex'));
    const img = await decodePng(png);
    expect([img.width, img.height]).toEqual([out.width, out.height]);
    const im = await (await fromArrayBuffer(exactBuffer(tif))).getImage();
    expect(im.getBoundingBox()).toEqual([30, 20, 38, 26]);
    expect(((await im.getGDALMetadata(0)) as Record<string, string>).UNITTYPE).toBe('h');
    expect(out.legend.ramp).toBe('Reds');
    expect(out.coordinates).toEqual([
      [30, 26],
      [38, 26],
      [38, 20],
      [30, 20],
    ]);
  });
});

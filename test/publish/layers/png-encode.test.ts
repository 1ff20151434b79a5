import { describe, expect, it } from 'vitest';
import { crc32 as zlibCrc32 } from 'node:zlib';
import { crc32, encodePngRgba } from '../../../pipeline/publish/layers/png-encode.ts';
import { decodePng } from './helpers.ts';

describe('encodePngRgba', () => {
  it('crc32 matches node:zlib crc32 and the check value 0xCBF43926 of "123456789" (ITU-T V.42 / PNG spec CRC)', () => {
    const nine = new TextEncoder().encode('123456789');
    expect(crc32(nine)).toBe(0xcbf43926); // standard CRC-32 check value, common practice
    const bytes = Uint8Array.from({ length: 5000 }, (_, i) => (i * 7919) & 255);
    expect(crc32(bytes)).toBe(zlibCrc32(bytes));
  });

  it('sharp decodes every pixel of a random RGBA image back exactly, alpha included', async () => {
    const w = 37;
    const h = 23;
    const rgba = Uint8Array.from({ length: w * h * 4 }, (_, i) => (i * 2654435761) >>> 24);
    const img = await decodePng(encodePngRgba(rgba, w, h));
    expect([img.width, img.height, img.channels]).toEqual([w, h, 4]);
    let diff = 0;
    for (let y = 0; y < h; y++)
      for (let x = 0; x < w; x++) {
        const p = img.at(x, y);
        for (let k = 0; k < 4; k++) if (p[k] !== rgba[(y * w + x) * 4 + k]) diff++;
      }
    expect(diff).toBe(0);
  });

  it('starts with the PNG signature and an IHDR of 8-bit RGBA (PNG spec §5.2, §11.2.2)', () => {
    const png = encodePngRgba(new Uint8Array(4 * 6), 3, 2);
    expect(Array.from(png.subarray(0, 8))).toEqual([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]);
    expect(new TextDecoder().decode(png.subarray(12, 16))).toBe('IHDR');
    const v = new DataView(png.buffer, png.byteOffset);
    expect([v.getUint32(16), v.getUint32(20), png[24], png[25]]).toEqual([3, 2, 8, 6]);
  });
});

/**
 * A minimal PNG encoder for 8-bit RGBA images: signature, IHDR, one zlib-deflated IDAT, IEND
 * (PNG specification, W3C Recommendation, 2nd ed. 2003, §5 datastream, §9 filtering, §11.2 chunks;
 * section numbers from memory). A scanline equal to the one above uses filter type 2 (Up, all
 * zeros then), any other type 1 (Sub: runs of equal pixels become zeros), which suits a layer of
 * flat cells repeated over many rows; deflate then uses its run-length strategy (Z_RLE).
 *
 * Why our own and not sharp: sharp's encoder is asynchronous (a Promise), while this keeps
 * `renderLayerPng` a synchronous, deterministic function of its inputs (same bytes every build,
 * so digests in the manifest are stable) at a few dozen lines. sharp decodes it in the tests as an
 * outside reader (libpng/libspng check every CRC).
 */
import { constants, deflateSync } from 'node:zlib';

const SIGNATURE = new Uint8Array([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]);

let crcTable: Uint32Array | undefined;

/** CRC-32 (ISO 3309 / ITU-T V.42, polynomial 0xEDB88320 reflected), as PNG §5.5 requires. */
export function crc32(bytes: Uint8Array, start = 0, end = bytes.length): number {
  if (!crcTable) {
    crcTable = new Uint32Array(256);
    for (let n = 0; n < 256; n++) {
      let c = n;
      for (let k = 0; k < 8; k++) c = c & 1 ? 0xedb88320 ^ (c >>> 1) : c >>> 1;
      crcTable[n] = c >>> 0;
    }
  }
  let c = 0xffffffff;
  for (let i = start; i < end; i++) c = crcTable[(c ^ bytes[i]) & 255] ^ (c >>> 8);
  return (c ^ 0xffffffff) >>> 0;
}

function chunk(type: string, data: Uint8Array): Uint8Array {
  const out = new Uint8Array(12 + data.length);
  const view = new DataView(out.buffer);
  view.setUint32(0, data.length);
  for (let i = 0; i < 4; i++) out[4 + i] = type.charCodeAt(i);
  out.set(data, 8);
  view.setUint32(8 + data.length, crc32(out, 4, 8 + data.length));
  return out;
}

/** PNG bytes of an RGBA image (row-major, 4 bytes per pixel, row 0 at the top). */
export function encodePngRgba(rgba: Uint8Array, width: number, height: number): Uint8Array {
  if (!(width > 0 && height > 0) || rgba.length !== width * height * 4) {
    throw new Error(`encodePngRgba: ${rgba.length} bytes is not ${width} × ${height} × 4`);
  }
  const ihdr = new Uint8Array(13);
  const hv = new DataView(ihdr.buffer);
  hv.setUint32(0, width);
  hv.setUint32(4, height);
  ihdr[8] = 8; // bit depth
  ihdr[9] = 6; // colour type 6: truecolour with alpha
  ihdr[10] = 0; // compression method 0 (deflate)
  ihdr[11] = 0; // filter method 0
  ihdr[12] = 0; // no interlace

  const stride = width * 4;
  const raw = new Uint8Array((stride + 1) * height);
  for (let y = 0; y < height; y++) {
    const src = y * stride;
    const dst = y * (stride + 1);
    let same = y > 0;
    for (let i = 0; same && i < stride; i++) same = rgba[src + i] === rgba[src - stride + i];
    if (same) {
      raw[dst] = 2; // Up: Filt(x) = Orig(x) − Orig(b) = 0 for a repeated row
      continue; // raw is zero-filled
    }
    raw[dst] = 1; // Sub: Filt(x) = Orig(x) − Orig(a), a = the same channel one pixel left (0 at the row start)
    for (let i = 0; i < 4 && i < stride; i++) raw[dst + 1 + i] = rgba[src + i];
    for (let i = 4; i < stride; i++) raw[dst + 1 + i] = (rgba[src + i] - rgba[src + i - 4]) & 255;
  }
  const idat = new Uint8Array(deflateSync(raw, { level: 6, strategy: constants.Z_RLE }));

  const parts = [SIGNATURE, chunk('IHDR', ihdr), chunk('IDAT', idat), chunk('IEND', new Uint8Array(0))];
  const out = new Uint8Array(parts.reduce((n, p) => n + p.length, 0));
  let o = 0;
  for (const p of parts) {
    out.set(p, o);
    o += p.length;
  }
  return out;
}

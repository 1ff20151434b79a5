/** Shared helpers of the layer tests: grids, catalogued-error expectation, sharp decoding. */
export { expectCatalogued } from '../../helpers/catalogued.ts';
import sharp from 'sharp';

/** A regular grid of cell centres: first centre, step and count along each axis [°]. */
export function regularGrid(lat0: number, dLat: number, ny: number, lon0: number, dLon: number, nx: number, value: (y: number, x: number) => number) {
  const lat = Float64Array.from({ length: ny }, (_, i) => lat0 + i * dLat);
  const lon = Float64Array.from({ length: nx }, (_, i) => lon0 + i * dLon);
  const values = new Float32Array(ny * nx);
  for (let y = 0; y < ny; y++) for (let x = 0; x < nx; x++) values[y * nx + x] = value(y, x);
  return { lat, lon, values };
}

export interface Decoded {
  width: number;
  height: number;
  channels: number;
  /** [r, g, b, a] of the pixel in column x, row y (row 0 at the top). */
  at(x: number, y: number): [number, number, number, number];
}

/** Decodes a PNG with sharp (libvips / libspng), an outside reader. */
export async function decodePng(png: Uint8Array): Promise<Decoded> {
  const { data, info } = await sharp(png).raw().toBuffer({ resolveWithObject: true });
  return {
    width: info.width,
    height: info.height,
    channels: info.channels,
    at(x, y) {
      const i = (y * info.width + x) * info.channels;
      return [data[i], data[i + 1], data[i + 2], data[i + 3]];
    },
  };
}

/** Parses the colour strings d3-scale-chromatic returns (`#rrggbb` or `rgb(r, g, b)`), independently of our code. */
export function cssToRgb(s: string): [number, number, number] {
  if (s.startsWith('#')) return [1, 3, 5].map((i) => parseInt(s.slice(i, i + 2), 16)) as [number, number, number];
  const m = s.match(/[\d.]+/g)!;
  return [Math.round(+m[0]), Math.round(+m[1]), Math.round(+m[2])];
}

export function hexToRgb(s: string): [number, number, number] {
  return cssToRgb(s);
}

/** An ArrayBuffer holding exactly the bytes of a Uint8Array. */
export function exactBuffer(b: Uint8Array): ArrayBuffer {
  return b.buffer.slice(b.byteOffset, b.byteOffset + b.byteLength) as ArrayBuffer;
}

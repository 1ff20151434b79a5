/**
 * The area of a region inside a longitude/latitude rectangle, on the sphere: each ring clipped to
 * the rectangle by four half-planes (clip-rectangle.ts) at every 360° offset of the region that
 * meets it, then measured exactly (spherical-area.ts). Holes subtract. Used to tell how much of a
 * region a raster's extent covers.
 */
import { ClipBuffer, clipHalfPlane } from './clip-rectangle.ts';
import { planarSignedArea2 } from './ring-prep.ts';
import { ringAreaSr } from './spherical-area.ts';
import type { Region } from './region.ts';

/** A rectangle [° E, ° N]: west < east, south < north. */
export interface LonLatRectangle {
  west: number;
  south: number;
  east: number;
  north: number;
}

const buffers = [new ClipBuffer(), new ClipBuffer(), new ClipBuffer(), new ClipBuffer(), new ClipBuffer()];

/** Area of the part of `region` inside `rect` on the unit sphere [sr]. */
export function regionAreaInRectangleSr(region: Region, rect: LonLatRectangle): number {
  let total = 0;
  for (const poly of region.polygons) {
    const [w, , e] = poly.bbox;
    for (let k = Math.ceil((rect.west - e) / 360); k <= Math.floor((rect.east - w) / 360); k++) {
      const shift = 360 * k;
      for (let r = 0; r < poly.rings.length; r++) {
        const src = poly.rings[r];
        const nc = src.length / 2;
        const sign = (r === 0 ? 1 : -1) * Math.sign(planarSignedArea2(src));
        const ring = buffers[0].ensure(nc);
        for (let i = 0; i < src.length; i += 2) {
          ring[i] = src[i] + shift;
          ring[i + 1] = src[i + 1];
        }
        let m = clipHalfPlane(ring, nc, 0, rect.west, true, buffers[1]);
        if (m < 3) continue;
        m = clipHalfPlane(buffers[1].data, m, 0, rect.east, false, buffers[2]);
        if (m < 3) continue;
        m = clipHalfPlane(buffers[2].data, m, 1, rect.south, true, buffers[3]);
        if (m < 3) continue;
        m = clipHalfPlane(buffers[3].data, m, 1, rect.north, false, buffers[4]);
        if (m < 3) continue;
        total += sign * ringAreaSr(buffers[4].data, m);
      }
    }
  }
  return total;
}

/** The intersection of two rectangles, or undefined when they do not overlap. */
export function intersectRectangles(a: LonLatRectangle, b: LonLatRectangle): LonLatRectangle | undefined {
  const r = { west: Math.max(a.west, b.west), south: Math.max(a.south, b.south), east: Math.min(a.east, b.east), north: Math.min(a.north, b.north) };
  return r.west < r.east && r.south < r.north ? r : undefined;
}

/**
 * Bob Jenkins' lookup3 hash, `hashlittle` (public domain, lookup3.c, 2006), the checksum HDF5
 * stores in version 2 superblocks, version 2 object headers, version 2 B-trees and fractal heaps
 * (HDF5 File Format Specification version 3.0, §II.A and §III, "Checksum"; H5checksum.c
 * `H5_checksum_lookup3`, initial value 0). All arithmetic is modulo 2^32.
 */

const rot = (x: number, k: number): number => (x << k) | (x >>> (32 - k));

/** The lookup3 `hashlittle` of `k` with initial value `init` (a 32-bit unsigned number). */
export function lookup3(k: Uint8Array, init = 0): number {
  let length = k.length;
  let a = (0xdeadbeef + length + init) | 0;
  let b = a;
  let c = a;
  let o = 0;
  const w = (i: number) => k[i] | (k[i + 1] << 8) | (k[i + 2] << 16) | (k[i + 3] << 24);
  while (length > 12) {
    a = (a + w(o)) | 0;
    b = (b + w(o + 4)) | 0;
    c = (c + w(o + 8)) | 0;
    // mix(a, b, c)
    a = (a - c) | 0;
    a ^= rot(c, 4);
    c = (c + b) | 0;
    b = (b - a) | 0;
    b ^= rot(a, 6);
    a = (a + c) | 0;
    c = (c - b) | 0;
    c ^= rot(b, 8);
    b = (b + a) | 0;
    a = (a - c) | 0;
    a ^= rot(c, 16);
    c = (c + b) | 0;
    b = (b - a) | 0;
    b ^= rot(a, 19);
    a = (a + c) | 0;
    c = (c - b) | 0;
    c ^= rot(b, 4);
    b = (b + a) | 0;
    length -= 12;
    o += 12;
  }
  if (length === 0) return c >>> 0;
  // The last 1–12 bytes, added byte by byte (the switch of lookup3.c falls through).
  const tail = [0, 0, 0];
  for (let i = 0; i < length; i++) tail[i >> 2] += k[o + i] << (8 * (i & 3));
  a = (a + tail[0]) | 0;
  b = (b + tail[1]) | 0;
  c = (c + tail[2]) | 0;
  // final(a, b, c)
  c ^= b;
  c = (c - rot(b, 14)) | 0;
  a ^= c;
  a = (a - rot(c, 11)) | 0;
  b ^= a;
  b = (b - rot(a, 25)) | 0;
  c ^= b;
  c = (c - rot(b, 16)) | 0;
  a ^= c;
  a = (a - rot(c, 4)) | 0;
  b ^= a;
  b = (b - rot(a, 14)) | 0;
  c ^= b;
  c = (c - rot(b, 24)) | 0;
  return c >>> 0;
}

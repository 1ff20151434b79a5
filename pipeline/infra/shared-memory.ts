/** Typed arrays on SharedArrayBuffers: one copy that every worker thread of a pool reads and writes. */

/** A Float32Array of length n on a SharedArrayBuffer. */
export function sharedFloat32(n: number): Float32Array {
  return new Float32Array(new SharedArrayBuffer(n * 4));
}

/** A Uint8Array of length n on a SharedArrayBuffer. */
export function sharedUint8(n: number): Uint8Array {
  return new Uint8Array(new SharedArrayBuffer(n));
}

/**
 * The fused hot-path decoder: mask (cf-mask.ts), unpack (cf-scale.ts) and convert units
 * (units.ts) in one pass over a typed array, with no per-value function call:
 * `out = missing(raw) ? NaN : raw * a + b`, where `a = scale_factor * k` and
 * `b = add_offset * k + c` for a linear unit conversion `canonical = k * source + c`.
 */
import type { MaskSpec } from './cf-mask.ts';
import type { ScaleOffset } from './cf-scale.ts';
import type { RawArray, RawSlab } from './source.ts';

/** A linear unit conversion: `canonical = k * source + c`. */
export interface LinearUnit {
  k: number;
  c: number;
}

export const IDENTITY_UNIT: LinearUnit = { k: 1, c: 0 };

/** Everything the decoder loop needs, in raw units for the tests and folded for the arithmetic. */
export interface DecodePlan {
  fill0: number;
  fill1: number;
  /** Further fill values beyond the first two (rare). */
  fillRest: number[];
  lo: number;
  hi: number;
  /** Multiplier [canonical units per raw step]. */
  a: number;
  /** Offset [canonical units]. */
  b: number;
}

/** Folds mask, packing and unit conversion into one plan. */
export function makeDecodePlan(mask: MaskSpec, so: ScaleOffset, unit: LinearUnit = IDENTITY_UNIT): DecodePlan {
  return {
    fill0: mask.fill.length > 0 ? mask.fill[0] : NaN,
    fill1: mask.fill.length > 1 ? mask.fill[1] : NaN,
    fillRest: mask.fill.slice(2),
    lo: mask.validMin,
    hi: mask.validMax,
    a: so.scale * unit.k,
    b: so.offset * unit.k + unit.c,
  };
}

/**
 * Decodes `n` raw values from `raw[from]` into `out[to]` [canonical units]; returns how many
 * were missing (fill, missing_value, NaN, or outside the valid range).
 */
export function decodeRun(raw: RawArray, from: number, n: number, out: Float32Array, to: number, p: DecodePlan): number {
  const { fill0, fill1, lo, hi, a, b } = p;
  let missing = 0;
  if (p.fillRest.length === 0) {
    for (let i = 0; i < n; i++) {
      const x = raw[from + i];
      if (x !== x || x === fill0 || x === fill1 || x < lo || x > hi) {
        out[to + i] = NaN;
        missing++;
      } else out[to + i] = x * a + b;
    }
    return missing;
  }
  const rest = p.fillRest;
  for (let i = 0; i < n; i++) {
    const x = raw[from + i];
    if (x !== x || x === fill0 || x === fill1 || x < lo || x > hi || rest.includes(x)) {
      out[to + i] = NaN;
      missing++;
    } else out[to + i] = x * a + b;
  }
  return missing;
}

/** Decodes a whole raw array into a new Float32Array [canonical units]. */
export function decodeAll(raw: RawArray, p: DecodePlan): { values: Float32Array; missing: number } {
  const values = new Float32Array(raw.length);
  const missing = decodeRun(raw, 0, raw.length, values, 0, p);
  return { values, missing };
}

/**
 * Where the cells of a tile lie inside a slab piece, with the row flip and the longitude
 * rotation folded into the index arithmetic: canonical row `y` comes from `rowOff[y]`, and its
 * columns from the runs `(runs[2r] .. + runs[2r+1] values)`, offsets in the slab's units
 * (elements, or bytes for big-endian slabs).
 */
export interface SlabLayout {
  /** Step of one time index [slab units] (0 for a static field). */
  tStride: number;
  /** Step of one expver index [slab units]. */
  eStride: number;
  /** Expver indices, best first ([0] without an expver dimension). */
  order: readonly number[];
  /** Offset of each tile row's source row [slab units]. */
  rowOff: Int32Array;
  /** Pairs (offset of the run's first source column [slab units], length [values]). */
  runs: Int32Array;
  /** Step of one column [slab units]. */
  colStride: number;
}

/**
 * Decodes `nt` time indices of a slab piece into `out` from `to` (time-major, tile cells), in
 * canonical units; returns how many values were missing. One tight loop per storage kind
 * (big-endian int16 or float32 read with DataView, native typed arrays), no per-value calls.
 */
export function decodeSlab(slab: RawSlab, L: SlabLayout, nt: number, p: DecodePlan, out: Float32Array, to: number): number {
  const cells = L.rowOff.length * runCells(L.runs);
  let missing = 0;
  const fast = p.fillRest.length === 0;
  for (let t = 0; t < nt; t++) {
    const base = slab.base + t * L.tStride;
    const o = to + t * cells;
    const b0 = base + L.order[0] * L.eStride;
    if (fast && slab.view && slab.type === 'short' && L.colStride === 2) missing += beShort(slab.view, b0, L, p, out, o);
    else if (fast && slab.view && slab.type === 'float' && L.colStride === 4) missing += beFloat(slab.view, b0, L, p, out, o);
    else if (fast && !slab.view && L.colStride === 1) missing += native(slab.data, b0, L, p, out, o);
    else missing += generic(slab, b0, L, p, out, o, false);
    for (let q = 1; q < L.order.length; q++) generic(slab, base + L.order[q] * L.eStride, L, p, out, o, true);
  }
  return missing;
}

function runCells(runs: Int32Array): number {
  let n = 0;
  for (let r = 1; r < runs.length; r += 2) n += runs[r];
  return n;
}

function beShort(dv: DataView, base: number, L: SlabLayout, p: DecodePlan, out: Float32Array, o: number): number {
  const { fill0, fill1, lo, hi, a, b } = p;
  const rowOff = L.rowOff;
  const runs = L.runs;
  const ny = rowOff.length;
  const nr = runs.length;
  let missing = 0;
  for (let y = 0; y < ny; y++) {
    const row = base + rowOff[y];
    for (let r = 0; r < nr; r += 2) {
      const s = row + runs[r];
      const e = s + 2 * runs[r + 1];
      for (let q = s; q < e; q += 2) {
        const x = dv.getInt16(q, false);
        if (x === fill0 || x === fill1 || x < lo || x > hi) {
          out[o++] = NaN;
          missing++;
        } else out[o++] = x * a + b;
      }
    }
  }
  return missing;
}

function beFloat(dv: DataView, base: number, L: SlabLayout, p: DecodePlan, out: Float32Array, o: number): number {
  const { fill0, fill1, lo, hi, a, b } = p;
  const rowOff = L.rowOff;
  const runs = L.runs;
  const ny = rowOff.length;
  const nr = runs.length;
  let missing = 0;
  for (let y = 0; y < ny; y++) {
    const row = base + rowOff[y];
    for (let r = 0; r < nr; r += 2) {
      const s = row + runs[r];
      const e = s + 4 * runs[r + 1];
      for (let q = s; q < e; q += 4) {
        const x = dv.getFloat32(q, false);
        if (x !== x || x === fill0 || x === fill1 || x < lo || x > hi) {
          out[o++] = NaN;
          missing++;
        } else out[o++] = x * a + b;
      }
    }
  }
  return missing;
}

function native(data: RawArray, base: number, L: SlabLayout, p: DecodePlan, out: Float32Array, o: number): number {
  const { fill0, fill1, lo, hi, a, b } = p;
  const rowOff = L.rowOff;
  const runs = L.runs;
  const ny = rowOff.length;
  const nr = runs.length;
  let missing = 0;
  for (let y = 0; y < ny; y++) {
    const row = base + rowOff[y];
    for (let r = 0; r < nr; r += 2) {
      const s = row + runs[r];
      const e = s + runs[r + 1];
      for (let q = s; q < e; q++) {
        const x = data[q];
        if (x !== x || x === fill0 || x === fill1 || x < lo || x > hi) {
          out[o++] = NaN;
          missing++;
        } else out[o++] = x * a + b;
      }
    }
  }
  return missing;
}

/** Any storage type and stride, extra fill values, and the expver merge (`merge`: fill gaps only). */
function generic(slab: RawSlab, base: number, L: SlabLayout, p: DecodePlan, out: Float32Array, o: number, merge: boolean): number {
  const { fill0, fill1, lo, hi, a, b, fillRest } = p;
  const get = valueGetter(slab);
  let missing = 0;
  for (let y = 0; y < L.rowOff.length; y++) {
    const row = base + L.rowOff[y];
    for (let r = 0; r < L.runs.length; r += 2) {
      const s = row + L.runs[r];
      for (let i = 0; i < L.runs[r + 1]; i++, o++) {
        if (merge && out[o] === out[o]) continue;
        const x = get(s + i * L.colStride);
        if (x !== x || x === fill0 || x === fill1 || x < lo || x > hi || fillRest.includes(x)) {
          out[o] = NaN;
          missing++;
        } else out[o] = x * a + b;
      }
    }
  }
  return missing;
}

function valueGetter(slab: RawSlab): (at: number) => number {
  const dv = slab.view;
  if (!dv) {
    const d = slab.data;
    return (at) => d[at];
  }
  switch (slab.type) {
    case 'byte':
      return (at) => dv.getInt8(at);
    case 'char':
    case 'ubyte':
      return (at) => dv.getUint8(at);
    case 'short':
      return (at) => dv.getInt16(at, false);
    case 'int':
      return (at) => dv.getInt32(at, false);
    case 'float':
      return (at) => dv.getFloat32(at, false);
    case 'double':
      return (at) => dv.getFloat64(at, false);
    default:
      throw new Error(`cannot decode values of type ${slab.type}`);
  }
}

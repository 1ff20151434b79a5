/**
 * The CF packing coder: `decoded = packed * scale_factor + add_offset` (CF conventions §8.1
 * "Packed Data"; xarray `CFScaleOffsetCoder`). Encoding rounds to the nearest integer for
 * integer storage types, so decode(encode(x)) is within half a packing step of x.
 */
import { attrNumber } from './attrs.ts';
import type { RawType, SourceVariable } from './source.ts';

/** Packing of a variable: `scale` [units per packed step] and `offset` [units]. */
export interface ScaleOffset {
  scale: number;
  offset: number;
}

/** The packing attributes of `v` (1 and 0 when absent). */
export function scaleOffsetOf(v: Pick<SourceVariable, 'attrs'>): ScaleOffset {
  const scale = attrNumber(v, 'scale_factor');
  const offset = attrNumber(v, 'add_offset');
  return {
    scale: scale !== undefined && Number.isFinite(scale) && scale !== 0 ? scale : 1,
    offset: offset !== undefined && Number.isFinite(offset) ? offset : 0,
  };
}

/** Whether `v` is packed (has a scale factor or offset other than 1 and 0). */
export function isPacked(so: ScaleOffset): boolean {
  return so.scale !== 1 || so.offset !== 0;
}

/** Unpacks raw values: `packed * scale + offset` [decoded units]. */
export function decodeScaleOffset(packed: ArrayLike<number>, so: ScaleOffset): Float64Array {
  const out = new Float64Array(packed.length);
  const { scale, offset } = so;
  for (let i = 0; i < packed.length; i++) out[i] = packed[i] * scale + offset;
  return out;
}

/** Packs decoded values: `(x - offset) / scale`, rounded for integer types; NaN stays NaN. */
export function encodeScaleOffset(values: ArrayLike<number>, so: ScaleOffset, type: RawType): Float64Array {
  const out = new Float64Array(values.length);
  const integer = type !== 'float' && type !== 'double';
  for (let i = 0; i < values.length; i++) {
    const p = (values[i] - so.offset) / so.scale;
    out[i] = integer ? Math.round(p) : p;
  }
  return out;
}

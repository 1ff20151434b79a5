/**
 * The CF missing-data coder: raw values equal to `_FillValue` or `missing_value`, NaN, or outside
 * `valid_min` / `valid_max` / `valid_range` become NaN (CF conventions §2.5.1 "Missing data,
 * valid and actual range of data"; xarray `CFMaskCoder`). Tests are made on the raw (packed)
 * values; a valid range given in unpacked units (its type differs from the packed type) is
 * turned into raw units first, as CF §8.1 allows. Without `_FillValue`, the netCDF default fill
 * of the type is used (netCDF-C `netcdf.h`, NC_FILL_*).
 */
import { attr, attrNumbers } from './attrs.ts';
import type { ScaleOffset } from './cf-scale.ts';
import type { RawType, SourceVariable } from './source.ts';

/** Which raw values are missing. */
export interface MaskSpec {
  /** Raw values that mean "missing" (fill and missing_value). */
  fill: number[];
  /** Smallest and largest valid raw value (±Infinity when unbounded). */
  validMin: number;
  validMax: number;
}

/** netCDF-C default fill values by type (netcdf.h NC_FILL_SHORT, NC_FILL_INT, NC_FILL_FLOAT, NC_FILL_DOUBLE). */
const DEFAULT_FILL: Partial<Record<RawType, number>> = {
  short: -32767,
  int: -2147483647,
  float: Math.fround(9.969209968386869e36),
  double: 9.969209968386869e36,
};

/** The mask of `v`, in raw units, given its packing. */
export function maskSpecOf(v: Pick<SourceVariable, 'attrs' | 'attrTypes' | 'type'>, so: ScaleOffset): MaskSpec {
  const asRaw = (x: number) => (v.type === 'float' ? Math.fround(x) : x);
  const fill: number[] = [];
  const fv = attrNumbers(v, '_FillValue');
  if (fv.length > 0) fill.push(asRaw(fv[0]));
  else if (attr(v, '_FillValue') === undefined && DEFAULT_FILL[v.type] !== undefined) fill.push(DEFAULT_FILL[v.type]!);
  for (const m of attrNumbers(v, 'missing_value')) if (!fill.includes(asRaw(m))) fill.push(asRaw(m));
  let validMin = -Infinity;
  let validMax = Infinity;
  const packedTypeDiffers = (name: string) => {
    const key = Object.keys(v.attrTypes).find((k) => k.toLowerCase() === name);
    return key !== undefined && v.attrTypes[key] !== v.type && (so.scale !== 1 || so.offset !== 0);
  };
  const toRaw = (x: number, name: string) => (packedTypeDiffers(name) ? (x - so.offset) / so.scale : x);
  const range = attrNumbers(v, 'valid_range');
  if (range.length >= 2) {
    const a = toRaw(range[0], 'valid_range');
    const b = toRaw(range[1], 'valid_range');
    validMin = Math.min(a, b);
    validMax = Math.max(a, b);
  } else {
    const lo = attrNumbers(v, 'valid_min');
    const hi = attrNumbers(v, 'valid_max');
    if (lo.length > 0) validMin = toRaw(lo[0], 'valid_min');
    if (hi.length > 0) validMax = toRaw(hi[0], 'valid_max');
    if (so.scale < 0 && (lo.length > 0 || hi.length > 0) && (packedTypeDiffers('valid_min') || packedTypeDiffers('valid_max'))) {
      [validMin, validMax] = [Math.min(validMin, validMax), Math.max(validMin, validMax)];
    }
  }
  return { fill, validMin, validMax };
}

/** Raw values with missing ones as NaN (no unpacking). */
export function decodeMask(raw: ArrayLike<number>, m: MaskSpec): Float64Array {
  const out = new Float64Array(raw.length);
  const f0 = m.fill.length > 0 ? m.fill[0] : NaN;
  const f1 = m.fill.length > 1 ? m.fill[1] : NaN;
  const rest = m.fill.slice(2);
  for (let i = 0; i < raw.length; i++) {
    const x = raw[i];
    out[i] = x !== x || x === f0 || x === f1 || x < m.validMin || x > m.validMax || (rest.length > 0 && rest.includes(x)) ? NaN : x;
  }
  return out;
}

/** Missing values (NaN) replaced by the first fill value (or left NaN when there is none). */
export function encodeMask(values: ArrayLike<number>, m: MaskSpec): Float64Array {
  const out = new Float64Array(values.length);
  const f = m.fill.length > 0 ? m.fill[0] : NaN;
  for (let i = 0; i < values.length; i++) out[i] = Number.isNaN(values[i]) ? f : values[i];
  return out;
}

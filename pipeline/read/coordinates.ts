/**
 * Finding the coordinate variables of a file: latitude, longitude and time by CF attributes
 * (CF conventions §4.1-§4.4: units degrees_north / degrees_east / "<unit> since <date>",
 * standard_name, axis) and, failing those, by the usual names. Which dimension each data
 * variable runs over follows from these.
 */
import { attrText } from './attrs.ts';
import { baseName } from './era5-variables.ts';
import type { SourceFile, SourceVariable } from './source.ts';

const LAT_UNITS = /^(degrees?_?n(orth)?|degrees?n|deg_?n)$/i;
const LON_UNITS = /^(degrees?_?e(ast)?|degrees?e|deg_?e)$/i;
const TIME_UNITS = /^\s*[a-z]+\s+since\s+/i;

export type AxisKind = 'lat' | 'lon' | 'time';

/** Which axis a 1-D variable is, if any. */
export function axisOf(v: SourceVariable): AxisKind | undefined {
  if (v.shape.length !== 1) return undefined;
  const units = attrText(v, 'units') ?? '';
  const sn = (attrText(v, 'standard_name') ?? '').toLowerCase();
  const axis = (attrText(v, 'axis') ?? '').toUpperCase();
  const name = baseName(v.name).toLowerCase();
  if (sn === 'latitude' || LAT_UNITS.test(units.replace(/\s+/g, '_'))) return 'lat';
  if (sn === 'longitude' || LON_UNITS.test(units.replace(/\s+/g, '_'))) return 'lon';
  if (sn === 'time' || TIME_UNITS.test(units)) return 'time';
  if (axis === 'Y' || name === 'lat' || name === 'latitude') return 'lat';
  if (axis === 'X' || name === 'lon' || name === 'longitude') return 'lon';
  if (axis === 'T' || name === 'time' || name === 'valid_time') return 'time';
  return undefined;
}

/** The coordinate variable of dimension `dim` (a 1-D variable over it, preferably named like it). */
export function coordinateOf(sf: SourceFile, dim: string): SourceVariable | undefined {
  const over = sf.variables.filter((v) => v.dims.length === 1 && v.dims[0] === dim);
  return over.find((v) => v.name === dim) ?? over.find((v) => axisOf(v) !== undefined) ?? over[0];
}

/** Names of variables that are coordinates, bounds, edges or other auxiliary labels. */
export function coordinateNames(sf: SourceFile): Set<string> {
  const names = new Set<string>();
  const dimNames = new Set(sf.dims.map((d) => d.name));
  const byBase = new Map(sf.variables.map((v) => [v.name, v]));
  for (const v of sf.variables) {
    if (v.dims.length === 1 && (v.dims[0] === v.name || axisOf(v) !== undefined)) names.add(v.name);
    if (dimNames.has(v.name)) names.add(v.name);
    if (baseName(v.name).toLowerCase() === 'expver' || baseName(v.name).toLowerCase() === 'number') names.add(v.name);
    for (const key of ['bounds', 'edges', 'climatology']) {
      const ref = attrText(v, key);
      if (ref) {
        const prefix = v.name.includes('/') ? v.name.slice(0, v.name.lastIndexOf('/') + 1) : '';
        for (const r of ref.split(/\s+/)) if (byBase.has(prefix + r)) names.add(prefix + r);
      }
    }
  }
  for (const v of sf.variables) if (/(_bnds|_bounds|_edges)$/i.test(v.name) || v.type === 'char' || v.type === 'string') names.add(v.name);
  return names;
}

/** For variable `v`, the index of its dimension whose coordinate is of `kind` (or -1). */
export function dimIndexOf(sf: SourceFile, v: SourceVariable, kind: AxisKind): number {
  for (let i = 0; i < v.dims.length; i++) {
    const c = coordinateOf(sf, v.dims[i]);
    if (c && axisOf(c) === kind) return i;
  }
  // Dimension names alone (no coordinate variable).
  const names: Record<AxisKind, string[]> = { lat: ['lat', 'latitude', 'y'], lon: ['lon', 'longitude', 'x'], time: ['time', 'valid_time', 't'] };
  return v.dims.findIndex((d) => names[kind].includes(baseName(d).toLowerCase()));
}

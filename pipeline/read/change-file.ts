/**
 * A scenario's change file (the delta change method, pipeline/scenario): monthly change factors
 * on a regular latitude–longitude grid in a CF NetCDF file (NetCDF-3 or NetCDF-4, any packing),
 * as people derive them from climate-model ensembles for a global warming level or a future
 * period. What it may hold, recognised by CMIP short name or CF standard_name:
 *
 * - `tas` / air_temperature (required): the change of near-surface air temperature, a difference
 *   in K or degC (the same number: never shifted by 273.15; units.ts `temperatureDifference`);
 * - `hurs` / relative_humidity: the change of relative humidity in percentage points, or `huss` /
 *   specific_humidity: the relative change of specific humidity (future/baseline − 1), whichever
 *   the scenario's `humidity` names;
 * - `rsds` / surface_downwelling_shortwave_flux_in_air: the relative change of surface solar
 *   radiation.
 *
 * Each variable runs over (month axis, lat, lon), latitude and longitude last; the month axis has
 * 12 entries, one per calendar month in any order, told by a CF time coordinate (any calendar of
 * cf-month.ts) or by a coordinate holding 1…12. The grid is put into the pipeline's convention
 * (grid-normalize.ts: latitude ascending, longitude in [−180, 180)), so a 0–360 file and its
 * −180–180 copy read the same; wrapped longitudes are rounded to 1e−9° so that the two give the
 * same numbers to the bit. Values are decoded with the CF coders (mask, packing) and converted to
 * canonical changes [K, percentage points, fraction] once, here. Rows are read on demand
 * ({@link ChangeFile.readRows}), so memory holds the rows a band of the atlas needs, not the file.
 */
import { basename } from 'node:path';
import { attrText } from './attrs.ts';
import { decodeMask, maskSpecOf } from './cf-mask.ts';
import { decodeScaleOffset, scaleOffsetOf } from './cf-scale.ts';
import { monthsOfTimes } from './cf-month.ts';
import { axisOf, coordinateOf } from './coordinates.ts';
import { baseName } from './era5-variables.ts';
import {
  ChangeFileHumidityMismatch,
  ChangeFileNoTemperature,
  ChangeFileNotADifference,
  ChangeFileNotMonthly,
  NetcdfDimensionUnsupported,
  NetcdfGridUnsupported,
} from './errors.ts';
import { normalizeLatitude, normalizeLongitude, type AxisMap } from './grid-normalize.ts';
import { openSourceFile } from './open-file.ts';
import { isNumericType, type SourceFile, type SourceVariable } from './source.ts';
import { conversionFor, type UnitKind } from './units.ts';

/** What a scenario's humidity change is: RH in percentage points, or a relative change of specific humidity. */
export type HumidityChangeKind = 'relative' | 'specific';

/** The quantities a change file may hold. */
export type ChangeRole = 'temperature' | 'humidity' | 'solar';

/** One variable of a change file, ready to read. */
export interface ChangeVariable {
  role: ChangeRole;
  name: string;
  /** The units attribute as written. */
  units: string;
  /** Index of the month axis, latitude and longitude in the variable's dimensions. */
  monthDim: number;
  latDim: number;
  lonDim: number;
  /** Index along the month axis of each calendar month, January first. */
  monthIndex: number[];
}

export interface ChangeFile {
  path: string;
  /** File name, for messages and provenance. */
  name: string;
  /** The grid in the pipeline's convention, with the source index of each row and column. */
  lat: AxisMap;
  lon: AxisMap;
  humidityKind: HumidityChangeKind;
  temperature: ChangeVariable;
  humidity: ChangeVariable | undefined;
  solar: ChangeVariable | undefined;
  /**
   * Rows [r0, r1) (canonical, south to north) of one variable for every month, converted:
   * `values[(m · (r1 − r0) + r − r0) · nLon + x]` [K, percentage points or fraction]; NaN where missing.
   */
  readRows(v: ChangeVariable, r0: number, r1: number): Promise<Float64Array>;
  close(): Promise<void>;
}

/** Names and standard names of each quantity (CMIP short names; CF standard names). */
const NAMES: Record<'temperature' | 'relative' | 'specific' | 'solar', { names: string[]; standard: string[]; kind: UnitKind; words: string }> = {
  temperature: { names: ['tas'], standard: ['air_temperature'], kind: 'temperatureDifference', words: 'temperature' },
  relative: { names: ['hurs'], standard: ['relative_humidity'], kind: 'humidityPoints', words: 'a change of relative humidity (hurs)' },
  specific: { names: ['huss'], standard: ['specific_humidity'], kind: 'relativeChange', words: 'a relative change of specific humidity (huss)' },
  solar: { names: ['rsds'], standard: ['surface_downwelling_shortwave_flux_in_air'], kind: 'relativeChange', words: 'solar radiation' },
};

function findVariable(sf: SourceFile, which: keyof typeof NAMES, exclude: Set<string>): SourceVariable | undefined {
  const spec = NAMES[which];
  const cands = sf.variables.filter((v) => isNumericType(v.type) && v.dims.length >= 2 && !exclude.has(v.name));
  return (
    cands.find((v) => spec.names.includes(baseName(v.name).toLowerCase())) ??
    cands.find((v) => spec.standard.includes((attrText(v, 'standard_name') ?? '').toLowerCase()))
  );
}

function axisVariable(sf: SourceFile, kind: 'lat' | 'lon'): SourceVariable | undefined {
  const cands = sf.variables.filter((v) => isNumericType(v.type) && axisOf(v) === kind);
  return cands.find((v) => v.dims[0] === v.name) ?? cands[0];
}

/** Rounds wrapped longitudes to 1e−9° so a 0–360 file and its −180–180 copy give the same numbers. */
function snap(a: AxisMap): AxisMap {
  return { values: a.values.map((x) => Math.round(x * 1e9) / 1e9), source: a.source };
}

/** The months of the month axis `dim` of `v`: index along the axis of each month, January first. */
async function monthAxis(sf: SourceFile, v: SourceVariable, dim: number): Promise<number[]> {
  const where = { file: sf.path, variable: v.name };
  const fail = (detail: string) => ChangeFileNotMonthly({ path: sf.path, variable: v.name, detail }, where);
  const n = v.shape[dim];
  const coord = coordinateOf(sf, v.dims[dim]);
  if (!coord || !isNumericType(coord.type)) throw fail(`its axis ${v.dims[dim]} has no numeric coordinate saying which month each entry is`);
  const values = await sf.readNumbers(coord);
  const units = attrText(coord, 'units') ?? '';
  let months: number[];
  if (/since/i.test(units)) {
    try {
      months = monthsOfTimes(values, units, attrText(coord, 'calendar'));
    } catch (e) {
      if (e instanceof Error && 'where' in e) Object.assign((e as { where: object }).where, { file: sf.path, variable: coord.name });
      throw e;
    }
  } else if (Array.from(values).every((x) => Number.isInteger(x) && x >= 1 && x <= 12)) {
    months = Array.from(values);
  } else {
    throw fail(`the coordinate ${coord.name} is neither a CF time (units "<unit> since <date>") nor month numbers 1…12`);
  }
  const index = new Array<number>(12).fill(-1);
  months.forEach((m, i) => {
    if (index[m - 1] >= 0) throw fail(`month ${m} appears twice along ${v.dims[dim]} (entries ${index[m - 1] + 1} and ${i + 1}); ${n} entries in all`);
    index[m - 1] = i;
  });
  const missing = index.flatMap((i, m) => (i < 0 ? [m + 1] : []));
  if (missing.length > 0) throw fail(`months ${missing.join(', ')} are missing along ${v.dims[dim]}`);
  return index;
}

async function describeVariable(
  sf: SourceFile,
  v: SourceVariable,
  role: ChangeRole,
  kind: UnitKind,
  latVar: SourceVariable,
  lonVar: SourceVariable,
): Promise<ChangeVariable> {
  const where = { file: sf.path, variable: v.name };
  const nd = v.dims.length;
  const latDim = v.dims.indexOf(latVar.dims[0]);
  const lonDim = v.dims.indexOf(lonVar.dims[0]);
  if (latDim !== nd - 2 || lonDim !== nd - 1) {
    throw NetcdfDimensionUnsupported({ detail: `${v.name} has dims (${v.dims.join(', ')}); latitude and longitude must be its last two dimensions` }, where);
  }
  const long = v.shape.flatMap((s, i) => (i < nd - 2 && s > 1 ? [i] : []));
  if (long.length > 1) {
    throw NetcdfDimensionUnsupported(
      {
        detail: `${v.name} has more than one axis besides latitude and longitude longer than 1 (${long.map((i) => `${v.dims[i]} of ${v.shape[i]}`).join(', ')})`,
      },
      where,
    );
  }
  if (long.length === 0 || v.shape[long[0]] !== 12) {
    const detail =
      long.length === 0
        ? `it has no time axis (dims ${v.dims.join(', ')}): one change per calendar month is needed`
        : `its axis ${v.dims[long[0]]} has ${v.shape[long[0]]} entries, not 12 (one per calendar month)`;
    throw ChangeFileNotMonthly({ path: sf.path, variable: v.name, detail }, where);
  }
  const units = attrText(v, 'units') ?? '';
  conversionFor(kind, units, where);
  if (role === 'temperature' && /on_scale/i.test(attrText(v, 'units_metadata') ?? '')) {
    throw ChangeFileNotADifference(
      { path: sf.path, variable: v.name, detail: 'its units_metadata says "temperature: on_scale" (temperatures, not differences)' },
      where,
    );
  }
  return { role, name: v.name, units, monthDim: long[0], latDim, lonDim, monthIndex: await monthAxis(sf, v, long[0]) };
}

/**
 * Opens and checks a change file: its grid, which variables it holds, their units and their
 * month axes. Catalogued errors name the file and the variable.
 */
export async function openChangeFile(path: string, humidity: HumidityChangeKind): Promise<ChangeFile> {
  const sf = await openSourceFile(path);
  try {
    return await describe(sf, humidity);
  } catch (e) {
    await sf.close();
    throw e;
  }
}

async function describe(sf: SourceFile, humidityKind: HumidityChangeKind): Promise<ChangeFile> {
  const file = sf.path;
  const latVar = axisVariable(sf, 'lat');
  const lonVar = axisVariable(sf, 'lon');
  if (!latVar || !lonVar)
    throw NetcdfGridUnsupported({ detail: `${file}: no 1-D latitude and longitude coordinate variables (degrees_north, degrees_east)` }, { file });
  const lat = normalizeLatitude(await sf.readNumbers(latVar), file);
  const lon = snap(normalizeLongitude(await sf.readNumbers(lonVar), file));
  const used = new Set<string>();
  const tv = findVariable(sf, 'temperature', used);
  if (!tv) throw ChangeFileNoTemperature({ path: file, variables: sf.variables.filter((v) => v.dims.length >= 2).map((v) => v.name) }, { file });
  used.add(tv.name);
  const temperature = await describeVariable(sf, tv, 'temperature', 'temperatureDifference', latVar, lonVar);
  const other: HumidityChangeKind = humidityKind === 'relative' ? 'specific' : 'relative';
  const hv = findVariable(sf, humidityKind, used);
  if (!hv && findVariable(sf, other, used)) {
    throw ChangeFileHumidityMismatch({ path: file, want: humidityKind, found: NAMES[other].words }, { file, variable: findVariable(sf, other, used)!.name });
  }
  if (hv) used.add(hv.name);
  const humidity = hv ? await describeVariable(sf, hv, 'humidity', NAMES[humidityKind].kind, latVar, lonVar) : undefined;
  const sv = findVariable(sf, 'solar', used);
  const solar = sv ? await describeVariable(sf, sv, 'solar', 'relativeChange', latVar, lonVar) : undefined;
  const byName = new Map(sf.variables.map((v) => [v.name, v]));
  const kindOf: Record<ChangeRole, UnitKind> = { temperature: 'temperatureDifference', humidity: NAMES[humidityKind].kind, solar: 'relativeChange' };
  const nLon = lon.values.length;

  async function readRows(cv: ChangeVariable, r0: number, r1: number): Promise<Float64Array> {
    const v = byName.get(cv.name)!;
    const nRows = r1 - r0;
    const out = new Float64Array(12 * nRows * nLon);
    if (nRows <= 0) return out;
    let s0 = Infinity;
    let s1 = -Infinity;
    for (let r = r0; r < r1; r++) {
      s0 = Math.min(s0, lat.source[r]);
      s1 = Math.max(s1, lat.source[r]);
    }
    const start = v.shape.map(() => 0);
    const count = v.shape.map(() => 1);
    start[cv.latDim] = s0;
    count[cv.latDim] = s1 - s0 + 1;
    count[cv.lonDim] = v.shape[cv.lonDim];
    count[cv.monthDim] = 12;
    const raw = await sf.read(v, start, count);
    const so = scaleOffsetOf(v);
    const unit = conversionFor(kindOf[cv.role], cv.units, { file, variable: v.name });
    const values = decodeScaleOffset(decodeMask(raw, maskSpecOf(v, so)), { scale: so.scale * unit.k, offset: so.offset * unit.k + unit.c });
    // Strides of the slab (row-major over `count`).
    const stride = new Array<number>(count.length);
    for (let k = count.length - 1, s = 1; k >= 0; k--) {
      stride[k] = s;
      s *= count[k];
    }
    for (let m = 0; m < 12; m++) {
      const mOff = cv.monthIndex[m] * stride[cv.monthDim];
      for (let r = r0; r < r1; r++) {
        const rOff = mOff + (lat.source[r] - s0) * stride[cv.latDim];
        const o = (m * nRows + r - r0) * nLon;
        for (let x = 0; x < nLon; x++) out[o + x] = values[rOff + lon.source[x] * stride[cv.lonDim]];
      }
    }
    return out;
  }

  return { path: file, name: basename(file), lat, lon, humidityKind, temperature, humidity, solar, readRows, close: () => sf.close() };
}

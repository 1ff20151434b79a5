/**
 * `inspectFile`: what is in any NetCDF file (not only ERA5): format, dimensions, and per variable
 * its dims, shape, units, detected role, CF-decoded min / max / mean and missing count, plus the
 * decoded range of each time axis. Values are streamed in slabs, so memory stays bounded.
 * Problems (undecodable time axis, implausible units) are reported, not thrown, so the rest of
 * the file is still listed.
 */
import { basename } from 'node:path';
import { attrText } from './attrs.ts';
import { maskSpecOf } from './cf-mask.ts';
import { scaleOffsetOf } from './cf-scale.ts';
import { decodeTimes, isoSeconds, parseTimeUnits } from './cf-time.ts';
import { axisOf, coordinateNames } from './coordinates.ts';
import { decodeRun, makeDecodePlan } from './decode.ts';
import { recognizeEra5 } from './era5-variables.ts';
import { detectLayout, type Layout } from './layout.ts';
import { openSourceFile } from './open-file.ts';
import { isNumericType, product, type AttrValue, type RawArray, type SourceFile, type SourceVariable } from './source.ts';
import { checkPlausible, findConversion, kindOfUnits } from './units.ts';
import { HeathoursError } from '../model/errors.ts';
import type { CanonicalName } from '../model/fields.ts';
import type { InputFormat } from './format.ts';

/** A problem found while inspecting: a catalogued error code and its message. */
export interface InspectionProblem {
  code: string;
  message: string;
}

export interface VariableInspection {
  /** Name with group path (`grp1/T`). */
  name: string;
  dims: string[];
  shape: number[];
  /** Storage type (NetCDF name: short, float, ...). */
  type: string;
  units: string | null;
  long_name: string | null;
  /** Canonical field it feeds, `coordinate`, or `other`. */
  role: CanonicalName | 'coordinate' | 'other';
  /** ERA5 short name when recognised. */
  era5?: string;
  /** Decoded values (mask + scale_factor/add_offset) [source units]; null without valid values. */
  min: number | null;
  max: number | null;
  mean: number | null;
  /** Number of values. */
  count: number;
  /** Values that were fill / missing_value / NaN / outside the valid range. */
  fillCount: number;
  problems: InspectionProblem[];
}

export interface TimeAxisInspection {
  variable: string;
  units: string | null;
  calendar: string | null;
  count: number;
  /** First and last time, ISO 8601 UTC; null when the axis could not be decoded. */
  start: string | null;
  end: string | null;
  /** Why the axis could not be decoded. */
  problem?: InspectionProblem;
}

export interface FileInspection {
  path: string;
  name: string;
  bytes: number;
  format: InputFormat;
  layout: Layout;
  dimensions: Array<{ name: string; size: number; unlimited: boolean }>;
  globalAttributes: Record<string, AttrValue>;
  variables: VariableInspection[];
  timeAxes: TimeAxisInspection[];
}

/** Largest slab read at once while streaming a variable [values]. */
const SLAB_VALUES = 1 << 22;

/** Inspects one file (see the file comment); throws catalogued errors for unreadable files. */
export async function inspectFile(path: string): Promise<FileInspection> {
  const sf = await openSourceFile(path);
  try {
    const coords = coordinateNames(sf);
    const variables: VariableInspection[] = [];
    for (const v of sf.variables) variables.push(await inspectVariable(sf, v, coords.has(v.name)));
    const timeAxes: TimeAxisInspection[] = [];
    for (const v of sf.variables) {
      const isTimeDim = v.dims.length === 1 && sf.dims.some((d) => d.name === v.dims[0] && d.name === v.name) && /time/i.test(v.name);
      if (axisOf(v) === 'time' || isTimeDim) timeAxes.push(await inspectTimeAxis(sf, v));
    }
    return {
      path,
      name: basename(path),
      bytes: sf.bytes,
      format: sf.format,
      layout: detectLayout(sf),
      dimensions: sf.dims.map((d) => ({ name: d.name, size: d.size, unlimited: d.unlimited })),
      globalAttributes: sf.globalAttrs,
      variables,
      timeAxes,
    };
  } finally {
    await sf.close();
  }
}

async function inspectVariable(sf: SourceFile, v: SourceVariable, isCoordinate: boolean): Promise<VariableInspection> {
  const era5 = recognizeEra5(v);
  const units = attrText(v, 'units') ?? null;
  const out: VariableInspection = {
    name: v.name,
    dims: v.dims,
    shape: v.shape,
    type: v.type,
    units,
    long_name: attrText(v, 'long_name') ?? null,
    role: isCoordinate ? 'coordinate' : era5 ? era5.canonical : 'other',
    ...(era5 && !isCoordinate ? { era5: era5.short } : {}),
    min: null,
    max: null,
    mean: null,
    count: product(v.shape),
    fillCount: 0,
    problems: [],
  };
  if (!isNumericType(v.type)) return out;
  const stats = await streamStats(sf, v);
  out.min = stats.min;
  out.max = stats.max;
  out.mean = stats.mean;
  out.fillCount = stats.missing;
  if (isCoordinate) return out;
  const kind = era5?.kind ?? kindOfUnits(units ?? undefined);
  const where = { file: sf.path, variable: v.name };
  try {
    if (era5 && !findConversion(era5.kind, units ?? undefined)) {
      out.problems.push({ code: 'NetcdfUnitUnknown', message: `units "${units ?? '(none)'}" are not accepted for ${era5.short}` });
    } else if (kind === 'temperature' && stats.min !== null && stats.max !== null) {
      const c = findConversion('temperature', units ?? undefined)!;
      checkPlausible('temperature', units ?? '', stats.min * c.k + c.c, stats.max * c.k + c.c, where);
    }
  } catch (e) {
    if (e instanceof HeathoursError) out.problems.push({ code: e.code, message: e.message });
    else throw e;
  }
  return out;
}

/** Min / max / mean / missing count of a numeric variable, decoded, streamed in slabs. */
export async function streamStats(
  sf: SourceFile,
  v: SourceVariable,
): Promise<{ min: number | null; max: number | null; mean: number | null; missing: number }> {
  const so = scaleOffsetOf(v);
  const plan = makeDecodePlan(maskSpecOf(v, so), so);
  const n = v.shape.length;
  let min = Infinity;
  let max = -Infinity;
  let sum = 0;
  let valid = 0;
  let missing = 0;
  // Slab along the outermost dims so that each read holds at most SLAB_VALUES values.
  let split = 0;
  while (split < n && product(v.shape.slice(split + 1)) > SLAB_VALUES) split++;
  const inner = product(v.shape.slice(split + 1));
  const step = n === 0 ? 1 : Math.max(1, Math.floor(SLAB_VALUES / Math.max(1, inner)));
  const outer = v.shape.slice(0, split);
  const total = product(outer);
  const buf = new Float32Array(n === 0 ? 1 : Math.min(SLAB_VALUES, inner * Math.min(step, v.shape[split] ?? 1)));
  const consume = (raw: RawArray, from: number, m: number): void => {
    const out = m <= buf.length ? buf : new Float32Array(m);
    const gone = decodeRun(raw, from, m, out, 0, plan);
    missing += gone;
    // Sums in locals, written back once: a captured `let` changed per value is a boxed number in
    // V8, one allocation per value (26 ns a value that way). Selects rather than branches: real
    // fields are noisy, and a mispredicted branch costs more. A run without missing values skips
    // the test for them (3-4× faster); the values are summed in the same order either way.
    let lo = min;
    let hi = max;
    let s = sum;
    let k = 0;
    if (gone === 0) {
      for (let i = 0; i < m; i++) {
        const x = out[i];
        lo = x < lo ? x : lo;
        hi = x > hi ? x : hi;
        s += x;
      }
      k = m;
    }
    // A NaN the decoding did not count (a damaged scale factor, Inf × 0): the checked loop.
    if (gone !== 0 || s !== s) {
      lo = min;
      hi = max;
      s = sum;
      k = 0;
      for (let i = 0; i < m; i++) {
        const x = out[i];
        if (x === x) {
          lo = x < lo ? x : lo;
          hi = x > hi ? x : hi;
          s += x;
          k++;
        }
      }
    }
    min = lo;
    max = hi;
    sum = s;
    valid += k;
  };
  const slabs = sf.format === 'netcdf4' && n > 0;
  for (let o = 0; o < total; o++) {
    const idx: number[] = [];
    let rem = o;
    for (let k = outer.length - 1; k >= 0; k--) {
      idx[k] = rem % outer[k];
      rem = Math.floor(rem / outer[k]);
    }
    const len = n === 0 ? 1 : v.shape[split];
    for (let s0 = 0; s0 < len; s0 += step) {
      const cnt = Math.min(step, len - s0);
      const start = n === 0 ? [] : [...idx, s0, ...v.shape.slice(split + 1).map(() => 0)];
      const count = n === 0 ? [] : [...outer.map(() => 1), cnt, ...v.shape.slice(split + 1)];
      if (slabs) {
        // NetCDF-4: the raw-chunk path (pipeline/read/hdf5-chunks.ts) where it applies; each piece
        // holds whole rows of the slab, dense, from `base` on.
        const row = product(count.slice(1));
        await sf.readSlabs([{ v, start, count }], (_i, slab, _from, rows) => consume(slab.data, slab.base, rows * row));
      } else {
        const raw = await sf.read(v, start, count);
        consume(raw, 0, raw.length);
      }
    }
  }
  return valid > 0 ? { min, max, mean: sum / valid, missing } : { min: null, max: null, mean: null, missing };
}

async function inspectTimeAxis(sf: SourceFile, v: SourceVariable): Promise<TimeAxisInspection> {
  const units = attrText(v, 'units') ?? null;
  const calendar = attrText(v, 'calendar') ?? null;
  const base: TimeAxisInspection = { variable: v.name, units, calendar, count: product(v.shape), start: null, end: null };
  try {
    if (!isNumericType(v.type)) throw new Error('the time variable is not numeric');
    const coding = parseTimeUnits(units ?? '', calendar ?? undefined);
    const ms = decodeTimes(await sf.readNumbers(v), coding);
    if (ms.length > 0) {
      let lo = Infinity;
      let hi = -Infinity;
      for (const t of ms) {
        if (t < lo) lo = t;
        if (t > hi) hi = t;
      }
      base.start = isoSeconds(lo);
      base.end = isoSeconds(hi);
    }
  } catch (e) {
    if (e instanceof HeathoursError) base.problem = { code: e.code, message: e.message };
    else base.problem = { code: 'NetcdfTimeUnits', message: (e as Error).message };
  }
  return base;
}

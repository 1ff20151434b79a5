/**
 * One input file of a dataset, analysed: its grid in the canonical convention, its hourly time
 * stamps, its ERA5 variables with their decoding plans (packing and mask of this file, unit
 * conversion into canonical units), and how its expver labels rank (final ERA5 before ERA5T).
 */
import { sha256OfFile } from '../model/file-sha256.ts';
import { attrText } from './attrs.ts';
import { maskSpecOf } from './cf-mask.ts';
import { scaleOffsetOf } from './cf-scale.ts';
import { decodeTimes, isoSeconds, parseTimeUnits } from './cf-time.ts';
import { axisOf } from './coordinates.ts';
import { makeDecodePlan, type DecodePlan } from './decode.ts';
import { baseName, recognizeEra5, type Era5Role, type Era5Short } from './era5-variables.ts';
import { NetcdfDimensionUnsupported, NetcdfDuplicateHours, NetcdfGridUnsupported, NetcdfNoTimeAxis, NetcdfTimeNotHourly } from './errors.ts';
import { normalizeLatitude, normalizeLongitude, type AxisMap } from './grid-normalize.ts';
import { detectLayout } from './layout.ts';
import { openSourceFile } from './open-file.ts';
import { inputName } from './zip-archive.ts';
import { isNumericType, type SourceFile, type SourceVariable } from './source.ts';
import { conversionFor, type UnitConversion } from './units.ts';
import type { InventoryFile } from './inventory-types.ts';

/** One hour [ms]. */
export const HOUR_MS = 3_600_000;

/** A variable of a file, ready to read: dimension roles and its decoding plan. */
export interface FileVariable {
  v: SourceVariable;
  role: Era5Role;
  units: string;
  conversion: UnitConversion;
  plan: DecodePlan;
  /** Index of the time / expver / lat / lon dimension in `v.dims` (-1 when absent). */
  tDim: number;
  eDim: number;
  latDim: number;
  lonDim: number;
}

export interface AnalysedFile {
  sf: SourceFile;
  info: InventoryFile;
  lat: AxisMap;
  lon: AxisMap;
  /** Time stamps [ms since 1970-01-01 UTC], or null for a file with static fields only. */
  times: Float64Array | null;
  /** Rank of each time's expver (0 final ERA5, 1 ERA5T, 2 other), when expver runs along time. */
  timeRanks: Int8Array | null;
  /** Expver indices of an expver dimension, best first (final ERA5 before ERA5T). */
  expverOrder: number[] | null;
  /** Labels of an expver dimension's indices (its coordinate variable), when it has one. */
  expverLabels?: Array<string | number>;
  vars: Map<Era5Short, FileVariable>;
  /** Other variables by name (for a land-sea mask under another name). */
  byName: Map<string, SourceVariable>;
}

/** SHA-256 of a file's bytes, hex, streamed. */
export async function sha256File(path: string): Promise<string> {
  return sha256OfFile(path);
}

/** Rank of an expver label: 1 / "0001" is final ERA5 (0), 5 / "0005" is ERA5T (1), others 2. */
export function expverRank(label: string | number): number {
  const n = typeof label === 'number' ? label : Number(String(label).trim());
  if (n === 1) return 0;
  if (n === 5) return 1;
  return 2;
}

function findAxisVar(sf: SourceFile, kind: 'lat' | 'lon' | 'time'): SourceVariable | undefined {
  const cands = sf.variables.filter((v) => isNumericType(v.type) && axisOf(v) === kind);
  if (kind === 'time') {
    const since = cands.filter((v) => /since/i.test(attrText(v, 'units') ?? ''));
    return since.find((v) => baseName(v.name) === 'valid_time') ?? since.find((v) => v.dims[0] === v.name) ?? since[0];
  }
  return cands.find((v) => v.dims[0] === v.name) ?? cands[0];
}

/**
 * Opens and analyses one file of a dataset (`digest`: hash its bytes, default true). Closes the
 * file again when it throws.
 */
export async function analyseFile(path: string, opts: { digest?: boolean; memberCache?: string; sha256?: string } = {}): Promise<AnalysedFile> {
  const sf = await openSourceFile(path, { memberCache: opts.memberCache });
  try {
    return await analyse(sf, opts.digest ?? true, opts.sha256);
  } catch (e) {
    await sf.close();
    throw e;
  }
}

async function analyse(sf: SourceFile, digest: boolean, known?: string): Promise<AnalysedFile> {
  const file = sf.path;
  const latVar = findAxisVar(sf, 'lat');
  const lonVar = findAxisVar(sf, 'lon');
  if (!latVar || !lonVar)
    throw NetcdfGridUnsupported({ detail: `${file}: no 1-D latitude and longitude coordinate variables (degrees_north, degrees_east)` }, { file });
  const lat = normalizeLatitude(await sf.readNumbers(latVar), file);
  const lon = normalizeLongitude(await sf.readNumbers(lonVar), file);

  const vars = new Map<Era5Short, FileVariable>();
  const byName = new Map<string, SourceVariable>();
  const timeVar = findAxisVar(sf, 'time');
  const expverVar = sf.variables.find((v) => baseName(v.name).toLowerCase() === 'expver');
  for (const v of sf.variables) {
    byName.set(v.name, v);
    if (v.dims.length < 2 || !isNumericType(v.type)) continue;
    const role = recognizeEra5(v);
    if (!role) continue;
    if (vars.has(role.short)) continue; // the root group (listed first) wins over subgroups
    const where = { file, variable: v.name };
    const latDim = v.dims.indexOf(latVar.dims[0]);
    const lonDim = v.dims.indexOf(lonVar.dims[0]);
    const n = v.dims.length;
    if (latDim !== n - 2 || lonDim !== n - 1) {
      throw NetcdfDimensionUnsupported({ detail: `${v.name} has dims (${v.dims.join(', ')}); latitude and longitude must be its last two dimensions` }, where);
    }
    const tDim = timeVar ? v.dims.indexOf(timeVar.dims[0]) : -1;
    const eDim = v.dims.findIndex((d) => baseName(d).toLowerCase() === 'expver');
    for (let i = 0; i < n - 2; i++) {
      if (i === tDim || i === eDim) continue;
      if (v.shape[i] !== 1) {
        throw NetcdfDimensionUnsupported(
          { detail: `${v.name} has dimension ${v.dims[i]} of length ${v.shape[i]} (only time, expver, latitude and longitude may be longer than 1)` },
          where,
        );
      }
    }
    if (tDim < 0 && role.short !== 'lsm') {
      throw NetcdfNoTimeAxis({ detail: `${file}: ${v.name} has no time dimension with CF time units` }, where);
    }
    const units = attrText(v, 'units') ?? '';
    const conversion = conversionFor(role.kind, units, where);
    const so = scaleOffsetOf(v);
    vars.set(role.short, { v, role, units, conversion, plan: makeDecodePlan(maskSpecOf(v, so), so, conversion), tDim, eDim, latDim, lonDim });
  }

  let times: Float64Array | null = null;
  const timeVarying = [...vars.values()].some((fv) => fv.role.short !== 'lsm');
  if (timeVarying) {
    if (!timeVar) throw NetcdfNoTimeAxis({ detail: `${file}: no time coordinate with units "<unit> since <date>"` }, { file });
    const where = { file, variable: timeVar.name };
    let coding: ReturnType<typeof parseTimeUnits>;
    try {
      coding = parseTimeUnits(attrText(timeVar, 'units') ?? '', attrText(timeVar, 'calendar'));
      times = decodeTimes(await sf.readNumbers(timeVar), coding);
    } catch (e) {
      if (e instanceof Error && 'where' in e) Object.assign((e as { where: object }).where, where);
      throw e;
    }
    for (let i = 0; i < times.length; i++) {
      const r = Math.round(times[i] / HOUR_MS) * HOUR_MS;
      if (Math.abs(times[i] - r) > 1000) {
        throw NetcdfTimeNotHourly({ detail: `${file}: time ${i} is ${isoSeconds(times[i])}, not on a whole hour` }, where);
      }
      times[i] = r;
      if (i > 0 && times[i] === times[i - 1]) {
        throw NetcdfDuplicateHours({ variable: timeVar.name, hour: isoSeconds(r), fileA: file, fileB: file }, where);
      }
    }
  }

  let timeRanks: Int8Array | null = null;
  let expverOrder: number[] | null = null;
  const eDimName = [...vars.values()].find((fv) => fv.eDim >= 0)?.v.dims.find((d) => baseName(d).toLowerCase() === 'expver');
  if (expverVar || eDimName) {
    let labels: Array<string | number> = [];
    if (expverVar) labels = isNumericType(expverVar.type) ? Array.from(await sf.readNumbers(expverVar)) : await sf.readStrings(expverVar);
    const ranks = labels.map(expverRank);
    if (expverVar && timeVar && expverVar.dims.length === 1 && expverVar.dims[0] === timeVar.dims[0]) {
      timeRanks = Int8Array.from(ranks);
    } else if (eDimName) {
      const size = sf.dims.find((d) => d.name === eDimName)?.size ?? ranks.length;
      const idx = Array.from({ length: size }, (_, i) => i);
      // Without labels, CDS order: the first expver is final ERA5, the second ERA5T.
      expverOrder = idx.sort((a, b) => (ranks[a] ?? a) - (ranks[b] ?? b));
    }
  }

  const shorts = [...vars.keys()];
  const info: InventoryFile = {
    name: inputName(file),
    bytes: sf.bytes,
    sha256: digest ? (known ?? (await (sf.digest ? sf.digest() : sha256File(file)))) : '',
    format: sf.format,
    layout: detectLayout(sf),
    timeStart: times && times.length > 0 ? isoSeconds(times[0]) : '',
    timeEnd: times && times.length > 0 ? isoSeconds(times[times.length - 1]) : '',
    variables: shorts,
  };
  const expverLabels =
    expverOrder && expverVar ? (isNumericType(expverVar.type) ? Array.from(await sf.readNumbers(expverVar)) : await sf.readStrings(expverVar)) : undefined;
  return { sf, info, lat, lon, times, timeRanks, expverOrder, ...(expverLabels ? { expverLabels } : {}), vars, byName };
}

/**
 * The coverage check (`heathours inspect --coverage`, and the start of `build`): which hours of
 * which years each ERA5 variable of a set of input files has, before anything is computed. Per
 * variable: hours present by year × month, gaps (first and last missing hour), the same hour in
 * two files with the same expver (duplicates, and whether their values differ), the ERA5T
 * (`expver` 5) tail, and files on another grid than the others.
 *
 * Hours are named by their stamp, the END of the hour in UTC (the grid convention of
 * DEVELOPERS.md); an hour belongs to the month and year it STARTS in, as everywhere in the
 * build. So the hours of 2022 have the stamps 2022-01-01T01:00Z … 2023-01-01T00:00Z, and the
 * last one lies in a data-store download of January 2023.
 *
 * Memory: per variable a few bytes per hour of the span, and one field of two files at a time
 * while comparing duplicated hours.
 */
import { isoSeconds } from './cf-time.ts';
import { analyseFile, expverRank, HOUR_MS, type AnalysedFile, type FileVariable } from './dataset-file.ts';
import { denseStrides } from './source.ts';
import type { Era5Short } from './era5-variables.ts';
import { orderedInputs } from './zip-archive.ts';
import { maskSpecOf, decodeMask } from './cf-mask.ts';
import { scaleOffsetOf } from './cf-scale.ts';

/** One month of one variable in the year × month table. */
export interface CoverageMonth {
  year: number;
  /** 1–12. */
  month: number;
  /** Hours the month has [h]. */
  expected: number;
  /** Hours present (final ERA5, ERA5T or other) [h]. */
  present: number;
  /** Of those, hours whose value is preliminary ERA5T [h]. */
  preliminary: number;
  /** Hours present in two files with the same expver [h]. */
  duplicated: number;
}

/** A run of consecutive hours, by stamp (end of hour, UTC, ISO). */
export interface HourRun {
  from: string;
  to: string;
  hours: number;
}

export interface CoverageGap extends HourRun {
  /** The file holding the hour before the gap and the one after it (null at either end). */
  before: string | null;
  after: string | null;
  /** The data-store monthly downloads that would hold the missing stamps (`YYYY-MM`). */
  months: string[];
}

export interface CoverageDuplicate extends HourRun {
  /** The two files that both hold these hours with the same expver. */
  files: [string, string];
  /** Hours among them whose values differ by more than one packing step anywhere on the grid [h]. */
  differing: number;
  /** Largest difference seen [units of the file, e.g. K]. */
  maxDifference: number;
}

export interface VariableCoverage {
  variable: Era5Short;
  months: CoverageMonth[];
  gaps: CoverageGap[];
  duplicates: CoverageDuplicate[];
  /** Hours whose value is preliminary ERA5T (no final value in any file), with the files. */
  era5t: Array<HourRun & { files: string[] }>;
  /** Hours present in total [h]. */
  present: number;
}

export interface CoverageFile {
  name: string;
  path: string;
  /** Grid: points and spacing [°]. */
  grid: { lat: number; lon: number; dLat: number; dLon: number };
  variables: string[];
  timeStart: string;
  timeEnd: string;
}

export interface CoverageReport {
  files: CoverageFile[];
  /** The grid most files share; the others are listed in `otherGrid` and left out of the tables. */
  grid: CoverageFile['grid'] | null;
  otherGrid: Array<{ file: string; grid: CoverageFile['grid']; detail: string }>;
  /** The years the tables cover (the data's years, or those asked for). */
  years: [number, number] | null;
  /** First and last stamp of any time-varying variable on the reference grid [ms], or null. */
  span: { first: number; last: number } | null;
  variables: VariableCoverage[];
}

export interface CoverageOptions {
  /** Years the table must cover (the atlas's years); default those of the data. */
  years?: [number, number];
  /** Compare the values of duplicated hours (reads both fields); default true. */
  compareValues?: boolean;
  memberCache?: string;
}

/** The year and month (1–12) an hour starts in, from its stamp (end of hour) [ms]. */
function startMonth(stamp: number): { y: number; m: number } {
  const d = new Date(stamp - HOUR_MS);
  return { y: d.getUTCFullYear(), m: d.getUTCMonth() + 1 };
}

/** Grid description of an analysed file. */
function gridOf(f: AnalysedFile): CoverageFile['grid'] {
  const step = (a: Float64Array) => (a.length > 1 ? Math.round(((a[a.length - 1] - a[0]) / (a.length - 1)) * 1e6) / 1e6 : 0);
  return { lat: f.lat.values.length, lon: f.lon.values.length, dLat: step(f.lat.values), dLon: step(f.lon.values) };
}

function sameGrid(a: AnalysedFile, b: AnalysedFile): string | null {
  for (const [k, x, y] of [
    ['latitude', a.lat.values, b.lat.values],
    ['longitude', a.lon.values, b.lon.values],
  ] as const) {
    if (x.length !== y.length) return `${x.length} ${k} points against ${y.length}`;
    for (let i = 0; i < x.length; i++) if (Math.abs(x[i] - y[i]) > 1e-4) return `${k} point ${i} is ${x[i]} against ${y[i]}`;
  }
  return null;
}

/** Analyses the files (archives expanded, in the order openDataset takes them) and reports their coverage; closes every file. */
export async function checkCoverage(paths: string[], opts: CoverageOptions = {}): Promise<CoverageReport> {
  const files: AnalysedFile[] = [];
  try {
    for (const p of await orderedInputs(paths)) files.push(await analyseFile(p, { digest: false, memberCache: opts.memberCache }));
    return await coverageOf(files, opts);
  } finally {
    for (const f of files) await f.sf.close();
  }
}

/** The coverage of analysed files (left open). */
export async function coverageOf(all: AnalysedFile[], opts: CoverageOptions = {}): Promise<CoverageReport> {
  const name = (f: AnalysedFile) => f.info.name;
  const described: CoverageFile[] = all.map((f) => ({
    name: name(f),
    path: f.sf.path,
    grid: gridOf(f),
    variables: f.info.variables,
    timeStart: f.info.timeStart,
    timeEnd: f.info.timeEnd,
  }));
  // The reference grid: the one most files share (the first such file's).
  let ref: AnalysedFile | undefined;
  let best = 0;
  for (const f of all) {
    const n = all.filter((g) => sameGrid(f, g) === null).length;
    if (n > best) {
      best = n;
      ref = f;
    }
  }
  const otherGrid: CoverageReport['otherGrid'] = [];
  const files: AnalysedFile[] = [];
  for (const f of all) {
    const d = ref ? sameGrid(ref, f) : null;
    if (d) otherGrid.push({ file: f.sf.path, grid: gridOf(f), detail: `${d} (the other files: ${name(ref!)} and ${best - 1} more)` });
    else files.push(f);
  }
  // The span of stamps: the data's, widened to the years asked for.
  let lo = Infinity;
  let hi = -Infinity;
  for (const f of files) {
    if (!f.times || f.times.length === 0 || ![...f.vars.keys()].some((s) => s !== 'lsm')) continue;
    for (const t of f.times) {
      if (t < lo) lo = t;
      if (t > hi) hi = t;
    }
  }
  if (!Number.isFinite(lo) && !opts.years) return { files: described, grid: ref ? gridOf(ref) : null, otherGrid, years: null, span: null, variables: [] };
  const span = Number.isFinite(lo) ? { first: lo, last: hi } : null;
  const years: [number, number] = opts.years ?? [startMonth(lo).y, startMonth(hi).y];
  const yearStart = Date.UTC(years[0], 0, 1) + HOUR_MS;
  const yearEnd = Date.UTC(years[1] + 1, 0, 1);
  lo = Number.isFinite(lo) ? Math.min(lo, yearStart) : yearStart;
  hi = Number.isFinite(hi) ? Math.max(hi, yearEnd) : yearEnd;
  const count = Math.round((hi - lo) / HOUR_MS) + 1;
  const stampOf = (h: number) => lo + h * HOUR_MS;

  // Per variable and hour: the winning file, its time index and rank; duplicates aside.
  const shorts = new Set<Era5Short>();
  for (const f of files) for (const [s, fv] of f.vars) if (s !== 'lsm' && fv.tDim >= 0 && f.times) shorts.add(s);
  const out: VariableCoverage[] = [];
  for (const short of [...shorts].sort()) {
    const own = new Int32Array(count).fill(-1);
    const ownIdx = new Int32Array(count);
    const rank = new Int8Array(count);
    const dups: Array<{ h: number; a: number; ia: number; b: number; ib: number }> = [];
    for (let fi = 0; fi < files.length; fi++) {
      const f = files[fi];
      const fv = f.vars.get(short);
      if (!fv || !f.times || fv.tDim < 0) continue;
      // expver as a dimension: each hour's rank is that of the best expver holding values (-1: none does).
      const dimRanks = fv.eDim >= 0 && f.expverOrder ? await expverDimensionRanks(f, fv) : null;
      for (let i = 0; i < f.times.length; i++) {
        const h = Math.round((f.times[i] - lo) / HOUR_MS);
        const r = dimRanks ? dimRanks[i] : f.timeRanks ? f.timeRanks[i] : 0;
        if (r < 0) continue;
        if (own[h] >= 0) {
          if (rank[h] === r) {
            dups.push({ h, a: own[h], ia: ownIdx[h], b: fi, ib: i });
            continue;
          }
          if (rank[h] < r) continue;
        }
        own[h] = fi;
        ownIdx[h] = i;
        rank[h] = r;
      }
    }
    // Year × month table over the years asked for.
    const months: CoverageMonth[] = [];
    const monthIndex = new Map<string, CoverageMonth>();
    for (let y = years[0]; y <= years[1]; y++) {
      for (let m = 1; m <= 12; m++) {
        const expected = (Date.UTC(y, m, 1) - Date.UTC(y, m - 1, 1)) / HOUR_MS;
        const row = { year: y, month: m, expected, present: 0, preliminary: 0, duplicated: 0 };
        months.push(row);
        monthIndex.set(`${y}-${m}`, row);
      }
    }
    let present = 0;
    for (let h = 0; h < count; h++) {
      if (own[h] < 0) continue;
      present++;
      const { y, m } = startMonth(stampOf(h));
      const row = monthIndex.get(`${y}-${m}`);
      if (!row) continue;
      row.present++;
      if (rank[h] === 1) row.preliminary++;
    }
    for (const d of dups) {
      const { y, m } = startMonth(stampOf(d.h));
      const row = monthIndex.get(`${y}-${m}`);
      if (row) row.duplicated++;
    }
    // Gaps inside the years asked for, or between data.
    const h0 = Math.round((yearStart - lo) / HOUR_MS);
    const h1 = Math.round((yearEnd - lo) / HOUR_MS);
    const gaps: CoverageGap[] = [];
    for (let h = h0; h <= h1; h++) {
      if (own[h] >= 0) continue;
      let e = h;
      while (e + 1 <= h1 && own[e + 1] < 0) e++;
      let b = h - 1;
      while (b >= 0 && own[b] < 0) b--;
      let a = e + 1;
      while (a < count && own[a] < 0) a++;
      const monthsOf = new Set<string>();
      for (let k = h; k <= e; k++) {
        const d = new Date(stampOf(k));
        monthsOf.add(`${d.getUTCFullYear()}-${String(d.getUTCMonth() + 1).padStart(2, '0')}`);
      }
      gaps.push({
        from: isoSeconds(stampOf(h)),
        to: isoSeconds(stampOf(e)),
        hours: e - h + 1,
        before: b >= 0 ? files[own[b]].sf.path : null,
        after: a < count ? files[own[a]].sf.path : null,
        months: [...monthsOf],
      });
      h = e;
    }
    // Duplicated runs (consecutive hours of the same two files), values compared.
    dups.sort((x, y) => x.a - y.a || x.b - y.b || x.h - y.h);
    const duplicates: CoverageDuplicate[] = [];
    for (let i = 0; i < dups.length; ) {
      let j = i;
      while (j + 1 < dups.length && dups[j + 1].a === dups[i].a && dups[j + 1].b === dups[i].b && dups[j + 1].h === dups[j].h + 1) j++;
      let differing = 0;
      let maxDifference = 0;
      if (opts.compareValues ?? true) {
        for (let k = i; k <= j; k++) {
          const d = dups[k];
          const diff = await fieldDifference(files[d.a], files[d.b], short, d.ia, d.ib);
          if (diff.differs) differing++;
          maxDifference = Math.max(maxDifference, diff.max);
        }
      }
      duplicates.push({
        from: isoSeconds(stampOf(dups[i].h)),
        to: isoSeconds(stampOf(dups[j].h)),
        hours: j - i + 1,
        files: [files[dups[i].a].sf.path, files[dups[i].b].sf.path],
        differing,
        maxDifference,
      });
      i = j + 1;
    }
    // ERA5T runs.
    const era5t: VariableCoverage['era5t'] = [];
    for (let h = 0; h < count; h++) {
      if (own[h] < 0 || rank[h] !== 1) continue;
      let e = h;
      const fs = new Set<string>();
      while (e + 1 < count && own[e + 1] >= 0 && rank[e + 1] === 1) e++;
      for (let k = h; k <= e; k++) fs.add(files[own[k]].sf.path);
      era5t.push({ from: isoSeconds(stampOf(h)), to: isoSeconds(stampOf(e)), hours: e - h + 1, files: [...fs] });
      h = e;
    }
    out.push({ variable: short, months, gaps, duplicates, era5t, present });
  }
  return { files: described, grid: ref ? gridOf(ref) : null, otherGrid, years, span, variables: out };
}

/** Values read at a time while ranking the hours of an expver dimension [values]. */
const RANK_BLOCK_VALUES = 1 << 22;

/**
 * Per time index of a variable with an expver DIMENSION (time × expver × lat × lon, the data
 * store's older netCDF form of a request reaching into ERA5T; docs/methods.md §2.3): the rank
 * (0 final ERA5, 1 ERA5T, 2 other; {@link expverRank}) of the best expver whose field holds any
 * value that is not missing, or -1 when no expver holds one (the hour is absent). Read in blocks
 * of hours of at most {@link RANK_BLOCK_VALUES} values.
 */
export async function expverDimensionRanks(f: AnalysedFile, fv: FileVariable): Promise<Int8Array> {
  const v = fv.v;
  const order = f.expverOrder!;
  const nt = v.shape[fv.tDim];
  const ne = v.shape[fv.eDim];
  const cells = v.shape[fv.latDim] * v.shape[fv.lonDim];
  // The expver slot ranks, as analyseFile ordered them: final ERA5 first.
  const slotRank = new Int8Array(ne).fill(2);
  const labels = f.expverLabels ?? [];
  for (let k = 0; k < ne; k++) slotRank[k] = labels[k] !== undefined ? expverRank(labels[k]) : order.indexOf(k) === 0 ? 0 : order.indexOf(k) === 1 ? 1 : 2;
  const so = scaleOffsetOf(v);
  const spec = maskSpecOf(v, so);
  const out = new Int8Array(nt).fill(-1);
  const step = Math.max(1, Math.floor(RANK_BLOCK_VALUES / (ne * cells)));
  for (let t0 = 0; t0 < nt; t0 += step) {
    const n = Math.min(step, nt - t0);
    const start = v.shape.map(() => 0);
    const count = v.shape.map(() => 1);
    start[fv.tDim] = t0;
    count[fv.tDim] = n;
    count[fv.eDim] = ne;
    count[fv.latDim] = v.shape[fv.latDim];
    count[fv.lonDim] = v.shape[fv.lonDim];
    const values = decodeMask((await f.sf.read(v, start, count)) as ArrayLike<number>, spec);
    const strides = denseStrides(count);
    for (let t = 0; t < n; t++) {
      let best = -1;
      for (let e = 0; e < ne; e++) {
        const base = t * strides[fv.tDim] + e * strides[fv.eDim];
        let any = false;
        for (let c = 0; c < cells && !any; c++) any = values[base + c] === values[base + c];
        if (any && (best < 0 || slotRank[e] < best)) best = slotRank[e];
      }
      out[t0 + t] = best;
    }
  }
  return out;
}

/** Reads one time step of a variable as decoded values in canonical cell order (fill → NaN). */
async function field(f: AnalysedFile, fv: FileVariable, t: number): Promise<{ values: Float64Array; step: number }> {
  const v = fv.v;
  const start = v.shape.map(() => 0);
  const count = v.shape.map((n) => n);
  for (let k = 0; k < v.shape.length - 2; k++) count[k] = 1;
  start[fv.tDim] = t;
  if (fv.eDim >= 0 && f.expverOrder) start[fv.eDim] = f.expverOrder[0];
  const raw = await f.sf.read(v, start, count);
  const so = scaleOffsetOf(v);
  const masked = decodeMask(raw as ArrayLike<number>, maskSpecOf(v, so));
  const ny = f.lat.values.length;
  const nx = f.lon.values.length;
  const srcNx = v.shape[v.shape.length - 1];
  const out = new Float64Array(ny * nx);
  for (let y = 0; y < ny; y++) {
    const sy = f.lat.source[y];
    for (let x = 0; x < nx; x++) out[y * nx + x] = masked[sy * srcNx + f.lon.source[x]] * so.scale + so.offset;
  }
  return { values: out, step: Math.abs(so.scale) };
}

/** Whether two files' values of a variable at two time indices differ by more than a packing step. */
async function fieldDifference(a: AnalysedFile, b: AnalysedFile, short: Era5Short, ia: number, ib: number): Promise<{ differs: boolean; max: number }> {
  const fa = await field(a, a.vars.get(short)!, ia);
  const fb = await field(b, b.vars.get(short)!, ib);
  const tol = Math.max(fa.step, fb.step, 0) * 1.0001;
  let max = 0;
  let differs = false;
  for (let i = 0; i < fa.values.length; i++) {
    const x = fa.values[i];
    const y = fb.values[i];
    if (x !== x || y !== y) {
      if ((x !== x) !== (y !== y)) differs = true;
      continue;
    }
    const d = Math.abs(x - y);
    if (d > max) max = d;
    if (d > tol + 1e-6 * Math.abs(x)) differs = true;
  }
  return { differs, max };
}

/** Hours missing from the years asked for, per variable [h]. */
export function missingHours(v: VariableCoverage): number {
  return v.gaps.reduce((s, g) => s + g.hours, 0);
}

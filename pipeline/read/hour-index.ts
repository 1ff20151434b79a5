/**
 * The one continuous hourly time axis of a multi-file dataset: for each ERA5 variable and hour,
 * which file and which time index hold it. Duplicated hours are errors, except an expver
 * overlap, where final ERA5 wins over preliminary ERA5T (docs/methods.md §2.3). Gaps (hours no file
 * covers) and variables missing for some hours are errors naming the files.
 */
import { isoSeconds } from './cf-time.ts';
import type { Era5Short } from './era5-variables.ts';
import { MissingNetcdfVariable, NetcdfDuplicateHours, NetcdfTimeGap } from './errors.ts';
import { HOUR_MS, type AnalysedFile } from './dataset-file.ts';

/** Where each hour of one variable lives. */
export interface HourTable {
  /** File index per hour (-1: none). */
  file: Int32Array;
  /** Time index within that file per hour. */
  index: Int32Array;
}

export interface HourAxis {
  /** First hour [ms since 1970-01-01 UTC, end of hour]. */
  start: number;
  /** Number of hours. */
  count: number;
  tables: Map<Era5Short, HourTable>;
  /** Hours left out because only some variables have them (one line each). */
  notes: string[];
}

const name = (f: AnalysedFile) => f.info.name;

/** Builds the hour tables from analysed files (time-varying variables only). */
export function buildHourAxis(files: AnalysedFile[]): HourAxis {
  let lo = Infinity;
  let hi = -Infinity;
  for (const f of files) {
    if (!f.times || ![...f.vars.keys()].some((s) => s !== 'lsm')) continue;
    for (const t of f.times) {
      if (t < lo) lo = t;
      if (t > hi) hi = t;
    }
  }
  if (!Number.isFinite(lo)) return { start: 0, count: 0, tables: new Map(), notes: [] };
  let count = Math.round((hi - lo) / HOUR_MS) + 1;
  const tables = new Map<Era5Short, HourTable>();
  const rank = new Map<Era5Short, Int8Array>();
  for (let fi = 0; fi < files.length; fi++) {
    const f = files[fi];
    if (!f.times) continue;
    for (const [short, fv] of f.vars) {
      if (short === 'lsm' || fv.tDim < 0) continue;
      let tab = tables.get(short);
      if (!tab) {
        tab = { file: new Int32Array(count).fill(-1), index: new Int32Array(count) };
        tables.set(short, tab);
        rank.set(short, new Int8Array(count));
      }
      const rk = rank.get(short)!;
      for (let i = 0; i < f.times.length; i++) {
        const h = Math.round((f.times[i] - lo) / HOUR_MS);
        const r = f.timeRanks ? f.timeRanks[i] : 0;
        const prev = tab.file[h];
        if (prev >= 0) {
          if (rk[h] === r) {
            throw NetcdfDuplicateHours(
              { variable: short, hour: isoSeconds(f.times[i]), fileA: name(files[prev]), fileB: name(f) },
              { file: f.sf.path, variable: fv.v.name },
            );
          }
          if (rk[h] < r) continue; // the one already there is more final
        }
        tab.file[h] = fi;
        tab.index[h] = i;
        rk[h] = r;
      }
    }
  }
  // Streams joined on their common hours: where variables come in separate files (the instant
  // and accumulated streams of a data-store archive, one variable per file), hours that some
  // variables have and others lack at either end of the record are left out and reported.
  const notes: string[] = [];
  let first = 0;
  let last = count - 1;
  for (const tab of tables.values()) {
    let a = 0;
    while (a < count && tab.file[a] < 0) a++;
    let b = count - 1;
    while (b >= 0 && tab.file[b] < 0) b--;
    first = Math.max(first, a);
    last = Math.min(last, b);
  }
  if (tables.size > 1 && last < first) {
    const spans = [...tables].map(([s, t]) => {
      const a = t.file.findIndex((x) => x >= 0);
      let b = count - 1;
      while (t.file[b] < 0) b--;
      return `${s} ${isoSeconds(lo + a * HOUR_MS)} to ${isoSeconds(lo + b * HOUR_MS)}`;
    });
    const [short] = [...tables.keys()];
    throw MissingNetcdfVariable({ name: short, detail: `the variables share no hour: ${spans.join('; ')}` }, { variable: short });
  }
  if (first > 0 || last < count - 1) {
    for (const [short, tab] of tables) {
      const spans: Array<[number, number]> = [];
      if (first > 0) spans.push([0, first - 1]);
      if (last < count - 1) spans.push([last + 1, count - 1]);
      for (const [a0, b0] of spans) {
        let a = a0;
        while (a <= b0 && tab.file[a] < 0) a++;
        if (a > b0) continue;
        let b = b0;
        while (tab.file[b] < 0) b--;
        const inFiles = new Set<string>();
        for (let k = a; k <= b; k++) if (tab.file[k] >= 0) inFiles.add(name(files[tab.file[k]]));
        const lacking = [...tables.keys()].filter(
          (s2) =>
            s2 !== short &&
            tables
              .get(s2)!
              .file.subarray(a, b + 1)
              .some((x) => x < 0),
        );
        notes.push(
          `${short} has the hours ${isoSeconds(lo + a * HOUR_MS)} to ${isoSeconds(lo + b * HOUR_MS)} (in ${[...inFiles].join(', ')}) that ${lacking.join(', ')} lack(s); they are left out (the dataset keeps the hours every variable has)`,
        );
      }
    }
    const n = last - first + 1;
    for (const [short, tab] of tables) tables.set(short, { file: tab.file.slice(first, last + 1), index: tab.index.slice(first, last + 1) });
    lo += first * HOUR_MS;
    count = n;
  }
  // Gaps: hours no variable covers.
  const covered = new Uint8Array(count);
  for (const tab of tables.values()) for (let h = 0; h < count; h++) if (tab.file[h] >= 0) covered[h] = 1;
  for (let h = 0; h < count; h++) {
    if (covered[h]) continue;
    let e = h;
    while (e + 1 < count && !covered[e + 1]) e++;
    // The files holding the hours on either side of the gap.
    const fileAt = (k: number): AnalysedFile | undefined => {
      for (const tab of tables.values()) if (tab.file[k] >= 0) return files[tab.file[k]];
      return undefined;
    };
    const before = fileAt(h - 1)!;
    const after = fileAt(e + 1)!;
    const where =
      before === after
        ? `inside ${name(before)}: its time axis jumps from ${isoSeconds(lo + (h - 1) * HOUR_MS)} to ${isoSeconds(lo + (e + 1) * HOUR_MS)}`
        : `between ${name(before)} (ending ${isoSeconds(lo + (h - 1) * HOUR_MS)}) and ${name(after)} (starting ${isoSeconds(lo + (e + 1) * HOUR_MS)}); no input file holds these hours`;
    const at = before === after ? before.sf.path : `${before.sf.path}, ${after.sf.path}`;
    throw NetcdfTimeGap({ from: isoSeconds(lo + h * HOUR_MS), to: isoSeconds(lo + e * HOUR_MS), where }, { file: at });
  }
  // Every variable present anywhere must cover every hour.
  for (const [short, tab] of tables) {
    const h = tab.file.indexOf(-1);
    if (h < 0) continue;
    let e = h;
    while (e + 1 < count && tab.file[e + 1] < 0) e++;
    const others = new Set<string>();
    for (const [s2, t2] of tables) if (s2 !== short) for (let k = h; k <= e; k++) if (t2.file[k] >= 0) others.add(name(files[t2.file[k]]));
    throw MissingNetcdfVariable(
      {
        name: short,
        detail: `it is missing for the hours ${isoSeconds(lo + h * HOUR_MS)} to ${isoSeconds(lo + e * HOUR_MS)}, which ${[...others].join(', ') || 'other files'} cover for other variables`,
      },
      { file: [...others][0], variable: short },
    );
  }
  return { start: lo, count, tables, notes };
}

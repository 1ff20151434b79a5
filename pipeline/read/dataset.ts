/**
 * `openDataset`: a set of ERA5 / ERA5-Land NetCDF files (one per month, per variable or per
 * year, any mix of the legacy and the 2024 CDS layouts) as one dataset with one canonical grid
 * and one continuous hourly time axis, read in blocks of hours per tile (`readBlock`) as
 * canonical fields (pipeline/model/fields.ts). Memory is bounded by the block, not the files.
 */
import { createHash } from 'node:crypto';
import { isoSeconds } from './cf-time.ts';
import { decodeSlab, type SlabLayout } from './decode.ts';
import { denseStrides, type RawSlab, type SlabRequest } from './source.ts';
import { fileDigests } from './file-digests.ts';
import { analyseFile, HOUR_MS, type AnalysedFile, type FileVariable } from './dataset-file.ts';
import { ERA5_ROLES, baseName, type Era5Short } from './era5-variables.ts';
import {
  MissingNetcdfVariable,
  NetcdfBlockOutOfRange,
  NetcdfChunkDamaged,
  NetcdfDataUnreadable,
  NetcdfGridMismatch,
  NetcdfNoFiles,
  NetcdfReadFailed,
} from './errors.ts';
import { HeathoursError } from '../model/errors.ts';
import { sourceRuns } from './grid-normalize.ts';
import { buildHourAxis, type HourAxis } from './hour-index.ts';
import { orderedInputs } from './zip-archive.ts';
import { maskSpecOf } from './cf-mask.ts';
import { scaleOffsetOf } from './cf-scale.ts';
import { makeDecodePlan } from './decode.ts';
import { attrText } from './attrs.ts';
import { checkPlausible, PLAUSIBLE } from './units.ts';
import { CANONICAL_FIELDS, type CanonicalName, type HourlyBlock } from '../model/fields.ts';
import { tileSize, type HorizontalGrid, type Tile } from '../model/grid.ts';
import type { InventoryFile, InventoryVariable } from './inventory-types.ts';

/** A file of the dataset as the inventory lists it (pipeline/read/inventory-types.ts). */
export type DatasetFileInfo = InventoryFile;

export interface OpenDatasetOptions {
  /** `era5-land` de-accumulates the since-00-UTC radiation accumulations (docs/methods.md §2.2). */
  product: 'era5' | 'era5-land';
  /** Land-sea mask: variable name (in any input file) and land fraction threshold [1]. */
  landSeaMask?: { variable: string; threshold: number };
  /** Canonical fields that must be present; default {@link REQUIRED_FIELDS}. */
  require?: CanonicalName[];
  /**
   * SHA-256 of every file (`DatasetFileInfo.sha256`); default true. Workers that reopen a
   * dataset the main process has already hashed pass false (`sha256` is then '').
   */
  digests?: boolean;
  /**
   * `readBlock` returns fields in buffers owned by the dataset and reused by the next
   * `readBlock` call (no per-block allocation); default false (fresh arrays each block).
   */
  reuseBlockBuffers?: boolean;
  /**
   * Folder for ZIP members that cannot be read in place (deflated, or NetCDF-4;
   * pipeline/read/zip-archive.ts); default a folder in the system's temp folder. Builds pass
   * `<cache>/zip-members`.
   */
  memberCache?: string;
}

/** What the WBGT physics needs at least. */
export const REQUIRED_FIELDS: CanonicalName[] = ['airTemperature', 'dewPointTemperature', 'surfacePressure', 'windSpeed10m', 'solarGlobal'];

export interface Dataset {
  /** The canonical grid (pipeline/model/grid.ts). */
  grid: HorizontalGrid;
  /** First hour [ms since 1970-01-01 UTC, end of hour] and number of hours. */
  time: { start: number; count: number };
  /** Time-varying canonical fields available. */
  variables: CanonicalName[];
  /** Land fraction per cell [1], canonical grid order (row-major, south to north). */
  landFraction?: Float32Array;
  /** 1 where the land fraction reaches the configured threshold (only with `landSeaMask`). */
  landMask?: Uint8Array;
  /** Cells counted as land (all cells without a mask). */
  landCells: number;
  files: DatasetFileInfo[];
  /** What the reader left out and why (hours only some variables have), one line each, for the log. */
  notes: string[];
  /** Hours [t0, t0 + nt) (hour indices) of `tile` as canonical fields. */
  readBlock(t0: number, nt: number, tile: Tile): Promise<HourlyBlock>;
  /**
   * Per canonical variable: min / max / mean / fill count over the whole dataset, streamed in
   * UTC-year chunks; `cache` keeps each chunk's sums under the digests of its files (the yearly
   * rebuild then reads only the new year). Needs the files' digests (`digests`, default on).
   */
  summary(cache?: SummaryChunkCache, parts?: ReadonlyMap<string, SummaryPart>): Promise<InventoryVariable[]>;
  /**
   * The chunks {@link summary} streams (the hours that start in one UTC year) and their cache
   * keys, so that the chunks can be summarised elsewhere (the build's worker threads) and handed
   * to `summary` as `parts`.
   */
  summaryChunks(): SummaryChunk[];
  /** One chunk's accumulators: every value of every variable over hours [c0, c1) of the whole grid. */
  summariseChunk(c0: number, c1: number): Promise<SummaryPart>;
  close(): Promise<void>;
}

/** Source short names behind each canonical field. */
const SOURCES: Record<Exclude<CanonicalName, 'landFraction'>, Era5Short[]> = {
  airTemperature: ['t2m'],
  dewPointTemperature: ['d2m'],
  surfacePressure: ['sp'],
  windSpeed10m: ['u10', 'v10'],
  solarGlobal: ['ssrd'],
  solarDirect: ['fdir'],
  thermalDown: ['strd'],
};
type TimeField = keyof typeof SOURCES;

/** Running min, max, sum and counts of one variable over some hours [canonical units]. */
export interface SummaryAccumulator {
  min: number;
  max: number;
  sum: number;
  n: number;
  fill: number;
}

/** One chunk's accumulators, by variable [canonical units]. */
export type SummaryPart = Record<string, SummaryAccumulator>;

/** A chunk of the summary: hour indices [c0, c1) and its cache key. */
export interface SummaryChunk {
  hours: [number, number];
  key: string;
}

/** Where {@link Dataset.summary} keeps its chunks' accumulators, by key (variable → accumulator). */
export interface SummaryChunkCache {
  get(key: string): Record<string, SummaryAccumulator> | undefined;
  set(key: string, value: Record<string, SummaryAccumulator>): void;
}

/** Hour-index ranges [c0, c1) of the hours (stamps are hour ends [ms]) that start in one UTC year. */
export function utcYearChunks(start: number, count: number): Array<[number, number]> {
  const out: Array<[number, number]> = [];
  for (let a = 0; a < count; ) {
    const u = new Date(start + a * HOUR_MS - HOUR_MS).getUTCFullYear();
    const b = Math.min(count, Math.ceil((Date.UTC(u + 1, 0, 1) + HOUR_MS - start) / HOUR_MS));
    out.push([a, b]);
    a = b;
  }
  return out;
}

/** Values per read while streaming the summary [values]. */
const SUMMARY_BLOCK_VALUES = 1 << 23;

export async function openDataset(paths: string[], opts: OpenDatasetOptions): Promise<Dataset> {
  if (paths.length === 0) throw NetcdfNoFiles({});
  const files: AnalysedFile[] = [];
  try {
    // A `.zip` path stands for its members (zip-archive.ts). Files in the order of the names
    // they are listed under, so an archive and its unzipped files make the same inventory.
    const ordered = await orderedInputs(paths);
    const digest = opts.digests ?? true;
    // A large dataset's files are hashed side by side on worker threads (file-digests.ts).
    const known = digest ? await fileDigests(ordered) : new Map<string, string>();
    for (const p of ordered) files.push(await analyseFile(p, { digest, memberCache: opts.memberCache, sha256: known.get(p) }));
    return await assemble(files, opts);
  } catch (e) {
    for (const f of files) await f.sf.close();
    throw e;
  }
}

function sameAxis(a: Float64Array, b: Float64Array): string | null {
  if (a.length !== b.length) return `${a.length} against ${b.length} points`;
  for (let i = 0; i < a.length; i++) if (Math.abs(a[i] - b[i]) > 1e-4) return `point ${i} is ${a[i]} against ${b[i]}`;
  return null;
}

async function assemble(files: AnalysedFile[], opts: OpenDatasetOptions): Promise<Dataset> {
  const ref = files[0];
  for (const f of files.slice(1)) {
    const dl = sameAxis(ref.lat.values, f.lat.values);
    const dn = sameAxis(ref.lon.values, f.lon.values);
    if (dl || dn) {
      throw NetcdfGridMismatch({ fileA: ref.info.name, fileB: f.info.name, detail: dl ? `latitude: ${dl}` : `longitude: ${dn}` }, { file: f.sf.path });
    }
  }
  const grid: HorizontalGrid = { lat: ref.lat.values, lon: ref.lon.values };
  const ny = grid.lat.length;
  const nx = grid.lon.length;
  const axis = buildHourAxis(files);

  // Which canonical fields are complete; required ones must be.
  const present = (s: Era5Short) => axis.tables.has(s);
  const variables = (Object.keys(SOURCES) as TimeField[]).filter((c) => SOURCES[c].every(present));
  for (const c of opts.require ?? REQUIRED_FIELDS) {
    if (c === 'landFraction') continue;
    for (const s of SOURCES[c as TimeField] ?? []) {
      if (!present(s)) {
        throw MissingNetcdfVariable(
          { name: s, detail: `needed for ${c}; none of the ${files.length} file(s) has it (${files.map((f) => f.info.name).join(', ')})` },
          { file: files[0].sf.path, variable: s },
        );
      }
    }
  }

  const era5Land = opts.product === 'era5-land';
  const ds = new DatasetReader(files, axis, grid, era5Land, opts.reuseBlockBuffers ?? false);
  // Units against values: the first hour of every variable of every file (units.ts).
  for (const f of files) {
    for (const fv of f.vars.values()) {
      const first = await ds.decodeWholeField(f, fv, 0);
      let lo = Infinity;
      let hi = -Infinity;
      for (const x of first)
        if (x === x) {
          if (x < lo) lo = x;
          if (x > hi) hi = x;
        }
      const [plo, phi] = PLAUSIBLE[fv.role.plausible];
      const scale = era5Land && fv.conversion.accumulated ? 24 : 1; // up to 24 h accumulated
      if (scale !== 1) {
        if (lo < plo * scale || hi > phi * scale) checkPlausible(fv.role.plausible, fv.units, lo, hi, { file: f.sf.path, variable: fv.v.name });
      } else checkPlausible(fv.role.plausible, fv.units, lo, hi, { file: f.sf.path, variable: fv.v.name });
    }
  }

  // Land fraction and mask.
  let landFraction: Float32Array | undefined;
  const maskName = opts.landSeaMask?.variable ?? 'lsm';
  for (const f of files) {
    let fv = f.vars.get('lsm');
    if (fv && opts.landSeaMask && baseName(fv.v.name) !== maskName && f.byName.has(maskName)) fv = undefined;
    if (!fv && f.byName.has(maskName)) {
      const v = f.byName.get(maskName)!;
      const so = scaleOffsetOf(v);
      const role = ERA5_ROLES.find((r) => r.short === 'lsm')!;
      const n = v.dims.length;
      fv = {
        v,
        role,
        units: attrText(v, 'units') ?? '',
        conversion: { k: 1, c: 0, accumulated: false },
        plan: makeDecodePlan(maskSpecOf(v, so), so),
        tDim: n > 2 ? 0 : -1,
        eDim: -1,
        latDim: n - 2,
        lonDim: n - 1,
      };
    }
    if (fv) {
      landFraction = await ds.decodeWholeField(f, fv, 0);
      break;
    }
  }
  let landMask: Uint8Array | undefined;
  let landCells = ny * nx;
  if (opts.landSeaMask) {
    if (!landFraction) {
      throw MissingNetcdfVariable(
        { name: maskName, detail: `the configuration asks for a land-sea mask, but no input file has a variable ${maskName}` },
        { file: files[0].sf.path, variable: maskName },
      );
    }
    landMask = new Uint8Array(ny * nx);
    landCells = 0;
    for (let i = 0; i < landMask.length; i++)
      if (landFraction[i] >= opts.landSeaMask.threshold) {
        landMask[i] = 1;
        landCells++;
      }
  }

  // A summary chunk's key: its hours, the variables, and the files (name, SHA-256) holding them.
  const chunkKey = (c0: number, c1: number): string => {
    const from = axis.start + c0 * HOUR_MS;
    const to = axis.start + (c1 - 1) * HOUR_MS;
    const held = files
      .map((f) => f.info)
      .filter((f) => f.timeStart && Date.parse(f.timeEnd) >= from && Date.parse(f.timeStart) <= to)
      .map((f) => `${f.name}:${f.sha256}`)
      .sort();
    return createHash('sha256')
      .update(JSON.stringify({ version: 1, from, to, variables, held }))
      .digest('hex');
  };

  /** Min, max, sum and counts of every variable over hours [c0, c1) of the whole grid. */
  const summariseChunk = async (c0: number, c1: number): Promise<SummaryPart> => {
    const full: Tile = { y0: 0, y1: ny, x0: 0, x1: nx };
    const step = Math.max(1, Math.floor(SUMMARY_BLOCK_VALUES / (ny * nx * Math.max(1, variables.length))));
    const part = Object.fromEntries(variables.map((c) => [c, { min: Infinity, max: -Infinity, sum: 0, n: 0, fill: 0 }])) as SummaryPart;
    for (let t0 = c0; t0 < c1; t0 += step) {
      const b = await ds.readBlock(t0, Math.min(step, c1 - t0), full, variables, undefined);
      for (const c of variables) {
        const a = part[c];
        const x = b.fields[c]!;
        for (let i = 0; i < x.length; i++) {
          const v = x[i];
          if (v === v) {
            if (v < a.min) a.min = v;
            if (v > a.max) a.max = v;
            a.sum += v;
            a.n++;
          } else a.fill++;
        }
      }
    }
    return part;
  };

  const dataset: Dataset = {
    grid,
    time: { start: axis.start, count: axis.count },
    variables,
    ...(landFraction ? { landFraction } : {}),
    ...(landMask ? { landMask } : {}),
    landCells,
    files: files.map((f) => f.info),
    notes: axis.notes,
    readBlock: (t0, nt, tile) => ds.readBlock(t0, nt, tile, variables, landFraction),
    summaryChunks() {
      return utcYearChunks(axis.start, axis.count).map(([c0, c1]) => ({ hours: [c0, c1] as [number, number], key: chunkKey(c0, c1) }));
    },
    summariseChunk: (c0, c1) => summariseChunk(c0, c1),
    async summary(cache?: SummaryChunkCache, parts?: ReadonlyMap<string, SummaryPart>) {
      const acc = new Map<TimeField, SummaryAccumulator>();
      for (const c of variables) acc.set(c, { min: Infinity, max: -Infinity, sum: 0, n: 0, fill: 0 });
      // Streamed in chunks of the hours that start in one UTC year, each summarised on its own
      // (or handed in, or kept in a cache under the digests of the files it read), then combined in order.
      for (const { hours, key } of dataset.summaryChunks()) {
        let part = parts?.get(key);
        const cached = part === undefined ? cache?.get(key) : undefined;
        part ??= cached ?? (await summariseChunk(hours[0], hours[1]));
        if (cache && cached === undefined) cache.set(key, part);
        for (const c of variables) {
          const a = acc.get(c)!;
          const p = part[c];
          a.min = Math.min(a.min, p.min);
          a.max = Math.max(a.max, p.max);
          a.sum += p.sum;
          a.n += p.n;
          a.fill += p.fill;
        }
      }
      const out: InventoryVariable[] = variables.map((c) => {
        const a = acc.get(c)!;
        const shorts = SOURCES[c];
        const fv = files.find((f) => f.vars.has(shorts[0]))!.vars.get(shorts[0])!;
        return {
          name: c,
          source: shorts.join(','),
          units: CANONICAL_FIELDS[c].units,
          sourceUnits: fv.units,
          long_name: CANONICAL_FIELDS[c].long_name,
          min: a.n > 0 ? a.min : NaN,
          max: a.n > 0 ? a.max : NaN,
          mean: a.n > 0 ? a.sum / a.n : NaN,
          fillCount: a.fill,
        };
      });
      if (landFraction) {
        let min = Infinity,
          max = -Infinity,
          sum = 0,
          n = 0,
          fill = 0;
        for (const v of landFraction)
          if (v === v) {
            min = Math.min(min, v);
            max = Math.max(max, v);
            sum += v;
            n++;
          } else fill++;
        out.push({
          name: 'landFraction',
          source: maskName,
          units: '1',
          sourceUnits: '1',
          long_name: CANONICAL_FIELDS.landFraction.long_name,
          min,
          max,
          mean: n ? sum / n : NaN,
          fillCount: fill,
        });
      }
      return out;
    },
    async close() {
      for (const f of files) await f.sf.close();
    },
  };
  return dataset;
}

/** One decoding job: time indices of one file variable into an output array. */
interface Job {
  f: AnalysedFile;
  fv: FileVariable;
  /** First time index in the file, or -1 for the static field. */
  tStart: number;
  nt: number;
  out: Float32Array;
  /** Hour slot of `out` the job starts at. */
  slot: number;
}

/**
 * Reads and decodes blocks. Holds no data between calls except reused buffers: scratch arrays
 * (u/v, accumulations) always, and the returned fields too with `reuseBlockBuffers`.
 */
class DatasetReader {
  private readonly pool = new Map<string, Float32Array>();

  constructor(
    private readonly files: AnalysedFile[],
    private readonly axis: HourAxis,
    private readonly grid: HorizontalGrid,
    private readonly era5Land: boolean,
    private readonly reuseOutput: boolean,
  ) {}

  /** A buffer of `n` values: pooled (reused, contents undefined) or fresh. */
  private buffer(name: string, n: number, pooled: boolean): Float32Array {
    if (!pooled) return new Float32Array(n);
    let b = this.pool.get(name);
    if (!b || b.length < n) {
      b = new Float32Array(Math.max(n, b ? Math.ceil(b.length * 1.25) : 0));
      this.pool.set(name, b);
    }
    return b.subarray(0, n);
  }

  /** One whole field (time index `t` of the file, or the static field) in canonical order. */
  async decodeWholeField(f: AnalysedFile, fv: FileVariable, t: number): Promise<Float32Array> {
    const ny = this.grid.lat.length;
    const nx = this.grid.lon.length;
    const out = new Float32Array(ny * nx);
    await this.runJobs([{ f, fv, tStart: fv.tDim >= 0 ? t : -1, nt: 1, out, slot: 0 }], { y0: 0, y1: ny, x0: 0, x1: nx });
    return out;
  }

  /**
   * Runs decoding jobs for `tile`: per file, one `readSlabs` call for all of its jobs (a classic
   * file's record variables then share one byte range per window of records), each piece
   * decoded straight into the job's output with the row flip and longitude rotation folded in.
   */
  async runJobs(jobs: Job[], tile: Tile): Promise<void> {
    const cells = tileSize(tile);
    const byFile = new Map<AnalysedFile, Job[]>();
    for (const j of jobs) {
      const list = byFile.get(j.f);
      if (list) list.push(j);
      else byFile.set(j.f, [j]);
    }
    for (const [f, list] of byFile) {
      let rmin = Infinity;
      let rmax = -Infinity;
      for (let y = tile.y0; y < tile.y1; y++) {
        const s = f.lat.source[y];
        if (s < rmin) rmin = s;
        if (s > rmax) rmax = s;
      }
      const runs = sourceRuns(f.lon.source, tile.x0, tile.x1);
      let cmin = Infinity;
      let cmax = -Infinity;
      for (const r of runs) {
        cmin = Math.min(cmin, r.from);
        cmax = Math.max(cmax, r.from + r.length - 1);
      }
      const reqs: SlabRequest[] = [];
      const direct: Job[] = [];
      const slabJobs: Job[] = [];
      for (const j of list) {
        const { v } = j.fv;
        const start = v.shape.map(() => 0);
        const count = v.shape.map(() => 1);
        if (j.fv.tDim >= 0) {
          start[j.fv.tDim] = Math.max(0, j.tStart);
          count[j.fv.tDim] = j.tStart >= 0 ? j.nt : 1;
        }
        if (j.fv.eDim >= 0) count[j.fv.eDim] = v.shape[j.fv.eDim];
        start[j.fv.latDim] = rmin;
        count[j.fv.latDim] = rmax - rmin + 1;
        start[j.fv.lonDim] = cmin;
        count[j.fv.lonDim] = cmax - cmin + 1;
        // Pieces come along the first dimension: fine when it is time or of length 1.
        if (j.fv.tDim === 0 || count[0] === 1) {
          reqs.push({ v, start, count });
          slabJobs.push(j);
        } else direct.push(Object.assign(j, { start, count }));
      }
      const decodePiece = (j: Job, slab: RawSlab, from: number, n: number, count: number[]) => {
        const fv = j.fv;
        const st = slab.strides;
        const rowStride = st[fv.latDim];
        const colStride = st[fv.lonDim];
        const rowOff = new Int32Array(tile.y1 - tile.y0);
        for (let y = 0; y < rowOff.length; y++) rowOff[y] = (f.lat.source[tile.y0 + y] - rmin) * rowStride;
        const rr = new Int32Array(runs.length * 2);
        runs.forEach((r, k) => {
          rr[2 * k] = (r.from - cmin) * colStride;
          rr[2 * k + 1] = r.length;
        });
        const ne = fv.eDim >= 0 ? fv.v.shape[fv.eDim] : 1;
        const layout: SlabLayout = {
          tStride: fv.tDim >= 0 ? st[fv.tDim] : 0,
          eStride: fv.eDim >= 0 ? st[fv.eDim] : 0,
          order: fv.eDim >= 0 ? (f.expverOrder ?? Array.from({ length: ne }, (_, i) => i)) : [0],
          rowOff,
          runs: rr,
          colStride,
        };
        const nt = fv.tDim === 0 ? n : fv.tDim >= 0 ? count[fv.tDim] : 1;
        const slot = j.slot + (fv.tDim === 0 ? from : 0);
        decodeSlab(slab, layout, nt, fv.plan, j.out, slot * cells);
      };
      try {
        if (reqs.length > 0) await f.sf.readSlabs(reqs, (i, slab, from, n) => decodePiece(slabJobs[i], slab, from, n, reqs[i].count));
        for (const j of direct as Array<Job & { start: number[]; count: number[] }>) {
          const data = await f.sf.read(j.fv.v, j.start, j.count);
          decodePiece(j, { data, view: null, type: j.fv.v.type, base: 0, strides: denseStrides(j.count) }, 0, j.count[0], j.count);
        }
      } catch (e) {
        throw withHours(e, f, list);
      }
    }
  }

  /** Jobs that decode hours [h0, h0 + n) of one source variable into `out` from slot `slot0`. */
  jobsFor(short: Era5Short, h0: number, n: number, out: Float32Array, slot0: number): Job[] {
    const tab = this.axis.tables.get(short)!;
    const jobs: Job[] = [];
    let h = h0;
    while (h < h0 + n) {
      const fi = tab.file[h];
      const i0 = tab.index[h];
      let e = h + 1;
      while (e < h0 + n && tab.file[e] === fi && tab.index[e] === tab.index[e - 1] + 1) e++;
      const f = this.files[fi];
      jobs.push({ f, fv: f.vars.get(short)!, tStart: i0, nt: e - h, out, slot: slot0 + (h - h0) });
      h = e;
    }
    return jobs;
  }

  async readBlock(t0: number, nt: number, tile: Tile, variables: CanonicalName[], landFraction: Float32Array | undefined): Promise<HourlyBlock> {
    const ny = this.grid.lat.length;
    const nx = this.grid.lon.length;
    if (!(Number.isInteger(t0) && Number.isInteger(nt) && t0 >= 0 && nt >= 1 && t0 + nt <= this.axis.count)) {
      throw NetcdfBlockOutOfRange({ detail: `hours [${t0}, ${t0 + nt}) asked for; the dataset has hours [0, ${this.axis.count})` });
    }
    if (!(tile.y0 >= 0 && tile.y1 <= ny && tile.y0 < tile.y1 && tile.x0 >= 0 && tile.x1 <= nx && tile.x0 < tile.x1)) {
      throw NetcdfBlockOutOfRange({
        detail: `tile rows [${tile.y0}, ${tile.y1}) columns [${tile.x0}, ${tile.x1}) asked for; the grid has ${ny} rows and ${nx} columns`,
      });
    }
    const cells = tileSize(tile);
    const fields: HourlyBlock['fields'] = {};
    const jobs: Job[] = [];
    const after: Array<() => void> = [];
    for (const c of variables) {
      if (c === 'landFraction') continue;
      const field = c as TimeField;
      if (field === 'windSpeed10m') {
        const u = this.buffer('u10', nt * cells, true);
        const w = this.buffer('v10', nt * cells, true);
        jobs.push(...this.jobsFor('u10', t0, nt, u, 0), ...this.jobsFor('v10', t0, nt, w, 0));
        const out = this.buffer(field, nt * cells, this.reuseOutput);
        fields.windSpeed10m = out;
        after.push(() => windSpeedInto(out, u, w));
        continue;
      }
      const short = SOURCES[field][0];
      const fv = this.files[this.axis.tables.get(short)!.file[t0]].vars.get(short)!;
      const out = this.buffer(field, nt * cells, this.reuseOutput);
      fields[field] = out;
      if (this.era5Land && fv.conversion.accumulated) {
        const withPrev = t0 > 0 ? 1 : 0;
        const acc = this.buffer(`${short}:acc`, (nt + 1) * cells, true);
        if (!withPrev) acc.fill(NaN, 0, cells);
        jobs.push(...this.jobsFor(short, t0 - withPrev, nt + withPrev, acc, 1 - withPrev));
        after.push(() => this.deaccumulate(acc, t0, nt, cells, out));
      } else jobs.push(...this.jobsFor(short, t0, nt, out, 0));
    }
    await this.runJobs(jobs, tile);
    for (const fn of after) fn();
    const lat = this.grid.lat.slice(tile.y0, tile.y1);
    const lon = this.grid.lon.slice(tile.x0, tile.x1);
    const time = new Float64Array(nt);
    for (let i = 0; i < nt; i++) time[i] = this.axis.start + (t0 + i) * HOUR_MS;
    const block: HourlyBlock = { tile, lat, lon, time, fields };
    if (landFraction) {
      const lf = new Float32Array(cells);
      const nxT = tile.x1 - tile.x0;
      for (let y = tile.y0; y < tile.y1; y++) lf.set(landFraction.subarray(y * nx + tile.x0, y * nx + tile.x1), (y - tile.y0) * nxT);
      block.landFraction = lf;
    }
    return block;
  }

  /**
   * ERA5-Land accumulations run from 00 UTC to the stamp (docs/methods.md §2.2): the hour ending at
   * t holds A(t) − A(t − 1 h), except the hour ending at 01 UTC, which is A(01) itself. Values
   * are already mean fluxes [W m-2] here (÷ 3600 is linear). Small negative differences from
   * packing noise are set to 0 (radiation downwards cannot be negative). The first hour of the
   * dataset has no predecessor: unless it ends at 01 UTC it is NaN. `acc` holds hour slots
   * t0 − 1 … t0 + nt − 1 (the first NaN when t0 = 0).
   */
  private deaccumulate(acc: Float32Array, t0: number, nt: number, cells: number, out: Float32Array): void {
    for (let t = 0; t < nt; t++) {
      const hourUtc = new Date(this.axis.start + (t0 + t) * HOUR_MS).getUTCHours();
      const cur = (t + 1) * cells;
      const prev = t * cells;
      if (hourUtc === 1) out.set(acc.subarray(cur, cur + cells), t * cells);
      else {
        for (let i = 0; i < cells; i++) {
          const d = acc[cur + i] - acc[prev + i];
          out[t * cells + i] = d < 0 ? 0 : d;
        }
      }
    }
  }
}

/**
 * A read error of a file's data (the HDF5 library's, or a damaged chunk met by the raw chunk
 * reader, whose message names the chunk), restated with the variable and the hours being read (a
 * damaged chunk shows up only when a block reaches it), with the reader's details kept.
 */
function withHours(e: unknown, f: AnalysedFile, jobs: Job[]): unknown {
  if (!(e instanceof HeathoursError) || (e.code !== NetcdfReadFailed.code && e.code !== NetcdfChunkDamaged.code)) return e;
  const mine = jobs.filter((j) => j.fv.v.name === e.where.variable);
  const pick = mine.length > 0 ? mine : jobs;
  const variable = e.where.variable ?? pick.map((j) => j.fv.v.name).join(', ');
  const stamp = (i: number) => (f.times && i >= 0 && i < f.times.length ? isoSeconds(f.times[i]) : 'the static field');
  const first = Math.min(...pick.map((j) => j.tStart));
  const last = Math.max(...pick.map((j) => j.tStart + j.nt - 1));
  return NetcdfDataUnreadable(
    { path: f.sf.path, variable, from: stamp(first), to: stamp(last), detail: e.message.replace(`${f.sf.path}: `, '') },
    { file: f.sf.path, variable },
    e.details,
  );
}

/** 10 m wind speed [m/s] from its components [m/s], into `out` (a plain function: its arguments stay in registers). */
function windSpeedInto(out: Float32Array, u: Float32Array, v: Float32Array): void {
  const n = out.length;
  for (let i = 0; i < n; i++) {
    const a = u[i];
    const b = v[i];
    out[i] = Math.sqrt(a * a + b * b);
  }
}

/** ISO text of hour index `h` of a dataset (end of hour, UTC). */
export function hourIso(ds: Pick<Dataset, 'time'>, h: number): string {
  return isoSeconds(ds.time.start + h * HOUR_MS);
}

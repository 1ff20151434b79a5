/**
 * Merging shard partials. Partials of different tiles of one year hold disjoint cells and are
 * scattered into one set of counts over the cells asked for; partials of the same cells and year
 * (a tile's pieces of the year, split by time) are added. Counts are integers, so any order gives
 * identical results.
 */
import type { ShardPartial } from './accumulator.ts';
import { HIST_LEN, HOURS, MONTHS, N_EXPOSURES } from './layout.ts';
import { PartialsIncomplete, PartialsInconsistent } from './errors.ts';

/** Per-cell array fields of a partial (besides the histogram and the maxima) and their values per cell. */
const PER_CELL_FIELDS = [
  'validHours',
  'shiftHours',
  'aboveAll',
  'aboveShift',
  'lostShift',
  'capacityLoss',
  'wbgtSum',
  'airSum',
  'airHours',
  'failedHours',
] as const;
type SummedField = (typeof PER_CELL_FIELDS)[number];

/** Histogram values of one cell-year in merged counts: month × local hour × exposure × bin. */
export const CELL_YEAR_HIST = MONTHS * HOURS * N_EXPOSURES * HIST_LEN;

/**
 * Counts of one year over a set of cells, in the order of `cells`. As a partial whose histograms
 * cover all twelve months: month × local hour × cell × exposure × bin ({@link CELL_YEAR_HIST}
 * values per cell; a cell's slot (month, hour) starts at ((month · 24 + hour) · nCells + cell) ·
 * exposures · bins, see {@link histogramSlot}).
 */
export interface YearCounts extends Omit<ShardPartial, 'months' | 'histogram'> {
  /** Hours in each WBGT bin [h], month × local hour × cell × exposure × bin. */
  histogram: Uint16Array;
}

/**
 * A partial whose histograms are still in the sparse form of the partial file
 * (./sparse-histogram.ts, checked when decoded): the merge adds them into the year as they are.
 */
export interface SparsePartial extends Omit<ShardPartial, 'histogram'> {
  sparseHistogram: Uint16Array;
}

/** Index in a merged year's histogram of cell `c`'s bins for (month m, local hour h), of `nCells` cells. */
export function histogramSlot(m: number, h: number, c: number, nCells: number): number {
  return ((m * HOURS + h) * nCells + c) * N_EXPOSURES * HIST_LEN;
}

export interface MergeOptions {
  /**
   * Partials may hold cells beyond `cells` (a merge tile smaller than the shards' tiles): those
   * are skipped instead of refused. Default false.
   */
  subset?: boolean;
}

/**
 * Merges the partials of one year into counts over `cells` (ascending global indices). Partials
 * with the same cells (one tile's pieces of the year, split by time) are added, their covered
 * hours summed; partials of different tiles must hold disjoint cells (a cell in two tiles is an
 * error naming the shards), and the covered hours are the most any tile has. Every cell of
 * `cells` must be covered.
 */
export function mergeYear(
  year: number,
  cells: Int32Array,
  partials: readonly ShardPartial[],
  names: readonly string[] = [],
  options: MergeOptions = {},
): YearCounts {
  const merger = new YearMerger(year, cells, options);
  partials.forEach((p, pi) => merger.add(p, names[pi]));
  return merger.finish();
}

/** One tile's pieces of the year seen so far: their hours per month and the months already started. */
interface PieceGroup {
  cells: Int32Array;
  /** Hours the group's pieces cover per month [h]. */
  covered: Uint32Array;
  /** 1 once a month's histogram has been copied from the group's first piece. */
  histFirst: Uint8Array;
}

/**
 * {@link mergeYear} one partial at a time, so that a merge holds the year's counts and one partial,
 * never every partial of the year: `add` each partial (read from its file just before), then
 * `finish`. A cell's sums come from its own tile's pieces only, added in the order given, so the
 * result does not depend on how the tiles' pieces are interleaved.
 */
export class YearMerger {
  private out: YearCounts | undefined;
  private first: ShardPartial | SparsePartial | undefined;
  private readonly pos = new Map<number, number>();
  /** Per cell of the year: the partial that held it, and that partial's group, or −1. */
  private readonly seen: Int32Array;
  private readonly seenGroup: Int32Array;
  private readonly groups: PieceGroup[] = [];
  private readonly bySignature = new Map<string, number[]>();
  private readonly names: string[] = [];

  constructor(
    private readonly year: number,
    private readonly cells: Int32Array,
    private readonly options: MergeOptions = {},
  ) {
    cells.forEach((c, i) => this.pos.set(c, i));
    this.seen = new Int32Array(cells.length).fill(-1);
    this.seenGroup = new Int32Array(cells.length).fill(-1);
  }

  /** Adds one partial (`name`: its shard id, for messages); it may be dropped afterwards. */
  add(p: ShardPartial | SparsePartial, name?: string): void {
    const pi = this.names.length;
    this.names.push(name ?? String(pi));
    const label = (i: number) => this.names[i];
    const first = (this.first ??= p);
    const out = (this.out ??= emptyYear(p, this.year, this.cells));
    if (p.year !== this.year) throw PartialsInconsistent({ detail: `partial ${label(pi)} is for year ${p.year}, not ${this.year}` });
    if (p.exposures.join('|') !== first.exposures.join('|')) {
      throw PartialsInconsistent({ detail: `partial ${label(pi)} counts the exposures ${p.exposures.join(', ')}, expected ${first.exposures.join(', ')}` });
    }
    if (p.evalKeys.join('|') !== first.evalKeys.join('|')) {
      throw PartialsInconsistent({ detail: `partial ${label(pi)} evaluates ${p.evalKeys.join(', ')}, expected ${first.evalKeys.join(', ')}` });
    }
    // The tile's group: same cells, in the same order.
    const sig = `${p.cells.length}:${p.cells[0]}:${p.cells[p.cells.length - 1]}`;
    const cands = this.bySignature.get(sig) ?? [];
    let gi = cands.find((g) => sameCells(this.groups[g].cells, p.cells));
    if (gi === undefined) {
      gi = this.groups.length;
      this.groups.push({ cells: p.cells, covered: new Uint32Array(MONTHS), histFirst: new Uint8Array(MONTHS) });
      cands.push(gi);
      this.bySignature.set(sig, cands);
    }
    const grp = this.groups[gi];
    for (let m = 0; m < MONTHS; m++) grp.covered[m] += p.coveredHours[m];
    const at = new Int32Array(p.cells.length).fill(-1);
    for (let j = 0; j < p.cells.length; j++) {
      const a = this.pos.get(p.cells[j]);
      if (a === undefined) {
        if (this.options.subset) continue;
        throw PartialsInconsistent({ detail: `partial ${label(pi)} holds cell ${p.cells[j]}, which is not a land cell of this build` });
      }
      if (this.seen[a] >= 0 && this.seenGroup[a] !== gi) {
        throw PartialsInconsistent({ detail: `cell ${p.cells[j]} of year ${this.year} is in partials ${label(this.seen[a])} and ${label(pi)}` });
      }
      this.seen[a] = pi;
      this.seenGroup[a] = gi;
      at[j] = a;
      for (const f of PER_CELL_FIELDS) addCell(out, p, f, a, j);
      const w = per(p, 'wbgtMax');
      for (let k = 0; k < w; k++) {
        const v = p.wbgtMax[j * w + k];
        if (v > out.wbgtMax[a * w + k]) out.wbgtMax[a * w + k] = v;
      }
    }
    if ('sparseHistogram' in p) {
      addSparseHistogram(out.histogram, this.cells.length, p, at);
      // A dense piece of this tile after it must add, not copy.
      for (let m = p.months[0]; m < p.months[1]; m++) if (p.coveredHours[m] !== 0) grp.histFirst[m] = 1;
    } else addHistogram(out.histogram, this.cells.length, p, at, grp.histFirst);
  }

  /** The year's counts; every cell must have been in a partial. */
  finish(): YearCounts {
    const out = this.out;
    if (out === undefined) throw PartialsIncomplete({ detail: `no partial for year ${this.year}` });
    // Covered hours: the most any tile has.
    for (const g of this.groups) for (let m = 0; m < MONTHS; m++) out.coveredHours[m] = Math.max(out.coveredHours[m], g.covered[m]);
    const missing: number[] = [];
    this.seen.forEach((s, i) => {
      if (s < 0) missing.push(this.cells[i]);
    });
    if (missing.length) {
      throw PartialsIncomplete({ detail: `year ${this.year}: ${missing.length} land cell(s) in no partial (first: ${missing.slice(0, 5).join(', ')})` });
    }
    return out;
  }
}

function sameCells(a: Int32Array, b: Int32Array): boolean {
  if (a.length !== b.length) return false;
  for (let i = 0; i < a.length; i++) if (a[i] !== b[i]) return false;
  return true;
}

function per(p: ShardPartial | SparsePartial, f: SummedField | 'wbgtMax'): number {
  return p[f].length / p.cells.length;
}

/**
 * Adds a cell's counts of partial `p` into `out`. Fields per cell × month skip the months the
 * partial does not cover (they hold no count): a quarter's piece adds a quarter of the year.
 */
function addCell(out: YearCounts, p: ShardPartial | SparsePartial, f: SummedField, at: number, j: number): void {
  const w = per(p, f);
  const src = p[f];
  const dst = out[f];
  const s0 = j * w;
  const d0 = at * w;
  if (f === 'failedHours') {
    for (let k = 0; k < w; k++) dst[d0 + k] += src[s0 + k];
    return;
  }
  const inner = w / MONTHS;
  for (let m = 0; m < MONTHS; m++) {
    if (p.coveredHours[m] === 0) continue;
    const a = m * inner;
    for (let k = a; k < a + inner; k++) dst[d0 + k] += src[s0 + k];
  }
}

/** Uint32 views of histograms (two bins per element), made once per array. */
const pairs = new WeakMap<Uint16Array, Uint32Array>();
function pairView(h: Uint16Array): Uint32Array {
  let v = pairs.get(h);
  if (v === undefined) {
    v = new Uint32Array(h.buffer, h.byteOffset, h.length >> 1);
    pairs.set(h, v);
  }
  return v;
}

/**
 * Adds a partial's histograms (month of its window × hour × cell × exposure × bin) into the year's
 * (month × hour × cell × exposure × bin); `at[j]` is the position of the partial's cell j in the
 * year, −1 to skip it. Runs of consecutive cells are added as one block, two bins at a time, as
 * uint32 pairs of uint16 bins: exact, since a bin counts the hours of one local hour of the day
 * in one month (at most 32, with a daylight-saving day), so no bin's sum carries into its
 * neighbour. Falls back to bin by bin when the arrays are not 4-byte aligned.
 */
function addHistogram(dst: Uint16Array, nOut: number, p: ShardPartial, at: Int32Array, first: Uint8Array): void {
  const src = p.histogram;
  const nc = p.cells.length;
  const run = N_EXPOSURES * HIST_LEN;
  const [m0, m1] = p.months;
  const aligned = (src.byteOffset & 3) === 0 && (dst.byteOffset & 3) === 0 && (run & 1) === 0;
  const s2 = aligned ? pairView(src) : undefined;
  const d2 = aligned ? pairView(dst) : undefined;
  // Runs of partial cells that land on consecutive cells of the year.
  const runs: Array<[number, number, number]> = [];
  for (let j = 0; j < nc; ) {
    if (at[j] < 0) {
      j++;
      continue;
    }
    let k = j + 1;
    while (k < nc && at[k] === at[k - 1] + 1) k++;
    runs.push([j, at[j], k - j]);
    j = k;
  }
  for (let m = m0; m < m1; m++) {
    if (p.coveredHours[m] === 0) continue;
    // The first piece of a tile's month is copied (the year starts at zero), later ones added.
    const copy = first[m] === 0;
    first[m] = 1;
    for (let h = 0; h < HOURS; h++) {
      const sRow = ((m - m0) * HOURS + h) * nc;
      const dRow = (m * HOURS + h) * nOut;
      for (const [j, a, n] of runs) {
        const s0 = (sRow + j) * run;
        const d0 = (dRow + a) * run;
        const len = n * run;
        if (copy) dst.set(src.subarray(s0, s0 + len), d0);
        else if (s2 !== undefined && d2 !== undefined) {
          const sa = s0 >> 1;
          const da = d0 >> 1;
          for (let k = 0; k < len >> 1; k++) d2[da + k] += s2[sa + k];
        } else {
          for (let k = 0; k < len; k++) dst[d0 + k] += src[s0 + k];
        }
      }
    }
  }
}

/**
 * Adds a partial's sparse histograms (slots month of its window × hour × cell × exposure, each its
 * first bin, count n and n bins; ./sparse-histogram.ts) into the year's dense ones (month × hour ×
 * cell × exposure × bin); `at[j]` is the position of the partial's cell j in the year, −1 to skip
 * it. Only the bins the partial holds are touched: the year starts at zero, and a cell's slots
 * come from its own tile's pieces only, so adding gives what copying the first piece and adding
 * the others gives (the dense path, {@link addHistogram}). Months without covered hours are
 * skipped as there.
 */
function addSparseHistogram(dst: Uint16Array, nOut: number, p: SparsePartial, at: Int32Array): void {
  const src = p.sparseHistogram;
  const nc = p.cells.length;
  const [m0, m1] = p.months;
  let s = 0;
  for (let m = m0; m < m1; m++) {
    const skipMonth = p.coveredHours[m] === 0;
    for (let h = 0; h < HOURS; h++) {
      const dRow = (m * HOURS + h) * nOut;
      for (let j = 0; j < nc; j++) {
        const a = at[j];
        const skip = skipMonth || a < 0;
        let d = (dRow + a) * N_EXPOSURES * HIST_LEN;
        for (let x = 0; x < N_EXPOSURES; x++, d += HIST_LEN) {
          const first = src[s];
          const n = src[s + 1];
          s += 2;
          if (skip) {
            s += n;
            continue;
          }
          const d0 = d + first;
          for (let k = 0; k < n; k++) dst[d0 + k] += src[s + k];
          s += n;
        }
      }
    }
  }
}

/** Empty counts of one year over `cells`, shaped like partial `p` but with a full cell-major year of histograms. */
function emptyYear(p: ShardPartial | SparsePartial, year: number, cells: Int32Array): YearCounts {
  const n = cells.length;
  const make = <T extends { length: number }>(a: T, ctor: new (len: number) => T): T => new ctor((a.length / p.cells.length) * n);
  return {
    year,
    cells,
    evalKeys: [...p.evalKeys],
    exposures: [...p.exposures],
    coveredHours: new Uint32Array(MONTHS),
    expectedHours: Uint32Array.from(p.expectedHours),
    validHours: make(p.validHours, Uint32Array),
    shiftHours: make(p.shiftHours, Uint32Array),
    aboveAll: make(p.aboveAll, Uint32Array),
    aboveShift: make(p.aboveShift, Uint32Array),
    lostShift: make(p.lostShift, Uint32Array),
    capacityLoss: make(p.capacityLoss, Uint32Array),
    wbgtSum: make(p.wbgtSum, Float64Array),
    wbgtMax: make(p.wbgtMax, Int16Array).fill(-32768),
    airSum: make(p.airSum, Float64Array),
    airHours: make(p.airHours, Uint32Array),
    histogram: new Uint16Array(n * CELL_YEAR_HIST),
    failedHours: make(p.failedHours, Uint32Array),
  };
}

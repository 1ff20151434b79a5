/**
 * Merging shard partials. Partials of different tiles of one year hold disjoint cells and are
 * scattered into one year-wide set of counts over all land cells; partials of the same cells and
 * year (a tile's pieces of the year, split by time) are added. Counts are integers, so any order
 * gives identical results.
 */
import type { ShardPartial } from './accumulator.ts';
import { MONTHS } from './layout.ts';
import { PartialsIncomplete, PartialsInconsistent } from './errors.ts';

/** Per-cell array fields of a partial and their values per cell. */
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
  'histogram',
  'failedHours',
] as const;
type SummedField = (typeof PER_CELL_FIELDS)[number];

/** Counts of one year over all land cells, in the order of `cells`. */
export type YearCounts = ShardPartial;

/**
 * Merges the partials of one year into counts over `cells` (all land cells, ascending global
 * indices). Partials with the same cells (one tile's pieces of the year, split by time) are
 * added, their covered hours summed; partials of different tiles must hold disjoint cells (a
 * cell in two tiles is an error naming the shards, unless `allowOverlap`), and the covered hours
 * are the most any tile has. Every cell must be covered.
 */
export function mergeYear(year: number, cells: Int32Array, partials: readonly ShardPartial[], names: readonly string[] = [], allowOverlap = false): YearCounts {
  if (partials.length === 0) throw PartialsIncomplete({ detail: `no partial for year ${year}` });
  const first = partials[0];
  const pos = new Map<number, number>();
  cells.forEach((c, i) => pos.set(c, i));
  const out = emptyLike(first, year, cells);
  const seen = new Int32Array(cells.length).fill(-1);
  // Group the pieces of each tile: same cells, in the same order.
  const groups: number[][] = [];
  const bySignature = new Map<string, number[][]>();
  partials.forEach((p, pi) => {
    const sig = `${p.cells.length}:${p.cells[0]}:${p.cells[p.cells.length - 1]}`;
    const cands = bySignature.get(sig) ?? [];
    const g = cands.find((grp) => sameCells(partials[grp[0]].cells, p.cells));
    if (g) g.push(pi);
    else {
      const grp = [pi];
      cands.push(grp);
      groups.push(grp);
      bySignature.set(sig, cands);
    }
  });
  for (const grp of groups) {
    const covered = new Uint32Array(MONTHS);
    for (const pi of grp) {
      const p = partials[pi];
      if (p.year !== year) throw PartialsInconsistent({ detail: `partial ${names[pi] ?? pi} is for year ${p.year}, not ${year}` });
      if (p.evalKeys.join('|') !== first.evalKeys.join('|')) {
        throw PartialsInconsistent({ detail: `partial ${names[pi] ?? pi} evaluates ${p.evalKeys.join(', ')}, expected ${first.evalKeys.join(', ')}` });
      }
      for (let m = 0; m < MONTHS; m++) covered[m] += p.coveredHours[m];
      for (let j = 0; j < p.cells.length; j++) {
        const at = pos.get(p.cells[j]);
        if (at === undefined) throw PartialsInconsistent({ detail: `partial ${names[pi] ?? pi} holds cell ${p.cells[j]}, which is not a land cell of this build` });
        if (seen[at] >= 0 && !allowOverlap && !grp.includes(seen[at])) {
          throw PartialsInconsistent({ detail: `cell ${p.cells[j]} of year ${year} is in partials ${names[seen[at]] ?? seen[at]} and ${names[pi] ?? pi}` });
        }
        // A cell's first partial is copied (the year's counts start at zero), later pieces added.
        const first = seen[at] < 0;
        seen[at] = pi;
        for (const f of PER_CELL_FIELDS) (first ? copyCell : addCell)(out, p, f, at, j);
        const w = per(p, 'wbgtMax');
        for (let k = 0; k < w; k++) {
          const v = p.wbgtMax[j * w + k];
          if (v > out.wbgtMax[at * w + k]) out.wbgtMax[at * w + k] = v;
        }
      }
    }
    for (let m = 0; m < MONTHS; m++) out.coveredHours[m] = Math.max(out.coveredHours[m], covered[m]);
  }
  const missing: number[] = [];
  seen.forEach((s, i) => {
    if (s < 0) missing.push(cells[i]);
  });
  if (missing.length) {
    throw PartialsIncomplete({ detail: `year ${year}: ${missing.length} land cell(s) in no partial (first: ${missing.slice(0, 5).join(', ')})` });
  }
  return out;
}

function sameCells(a: Int32Array, b: Int32Array): boolean {
  if (a.length !== b.length) return false;
  for (let i = 0; i < a.length; i++) if (a[i] !== b[i]) return false;
  return true;
}

function per(p: ShardPartial, f: SummedField | 'wbgtMax'): number {
  return p[f].length / p.cells.length;
}

function copyCell(out: ShardPartial, p: ShardPartial, f: SummedField, at: number, j: number): void {
  const w = per(p, f);
  const src = p[f] as Uint32Array;
  (out[f] as Uint32Array).set(src.subarray(j * w, j * w + w), at * w);
}

/**
 * Adds a cell's counts of partial `p` into `out`. Fields per cell × month skip the months the
 * partial does not cover (they hold no count): a quarter's piece adds a quarter of the year.
 */
function addCell(out: ShardPartial, p: ShardPartial, f: SummedField, at: number, j: number): void {
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
  if (f === 'histogram') return addHistogramCell(out.histogram, p, at, j, inner);
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
 * Adds a cell's histogram two bins at a time, as uint32 pairs of uint16 bins: exact, since a
 * bin counts the hours of one local hour of the day in one month (at most 32, with a
 * daylight-saving day), so no bin's sum carries into its neighbour. Falls back to bin by bin
 * when the arrays are not 4-byte aligned.
 */
function addHistogramCell(dst: Uint16Array, p: ShardPartial, at: number, j: number, inner: number): void {
  const src = p.histogram;
  const w = inner * MONTHS;
  const aligned = (src.byteOffset & 3) === 0 && (dst.byteOffset & 3) === 0 && (inner & 1) === 0;
  for (let m = 0; m < MONTHS; m++) {
    if (p.coveredHours[m] === 0) continue;
    const s0 = j * w + m * inner;
    const d0 = at * w + m * inner;
    if (aligned) {
      const s2 = pairView(src);
      const d2 = pairView(dst);
      const a = s0 >> 1;
      const b = d0 >> 1;
      for (let k = 0; k < inner >> 1; k++) d2[b + k] += s2[a + k];
    } else {
      for (let k = 0; k < inner; k++) dst[d0 + k] += src[s0 + k];
    }
  }
}

function emptyLike(p: ShardPartial, year: number, cells: Int32Array): ShardPartial {
  const n = cells.length;
  const make = <T extends { length: number }>(a: T, ctor: new (len: number) => T): T => new ctor((a.length / p.cells.length) * n);
  return {
    year,
    cells,
    evalKeys: [...p.evalKeys],
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
    histogram: make(p.histogram, Uint16Array),
    failedHours: make(p.failedHours, Uint32Array),
  };
}

/**
 * How a build fits a memory budget, and what it will cost, decided from the plan before anything
 * is computed. Pure: sizes in, choices and estimates out.
 *
 * The budget covers the main thread and every worker. Workers do two kinds of work, one after the
 * other: compute tasks (a piece of a year over a group of tiles read together: the group's block of
 * input fields and its partials' histograms) and merge tiles (one year of a band of cells'
 * histograms, and the band's figures over the whole record). The plan takes the largest compute
 * group and merge band that fit, so that reads are shared by as many tiles as memory allows and
 * the merge holds as few pieces as it can; a budget that cannot hold one tile's work is a
 * catalogued error saying how much is needed.
 *
 * Costs per unit are estimates from the code's array sizes (this file names each) plus measured
 * overheads of this implementation (Node.js heap and modules per thread, from the benchmarks
 * `pipeline-peak-rss` and `memory-vs-cells`); times and disk from measured rates (bench/README).
 */
import { CELL_YEAR_HIST } from '../reduce/merge.ts';
import { histPerMonth } from '../reduce/accumulator.ts';
import { MONTHS } from '../reduce/layout.ts';
import { PERIODS } from '../reduce/figures.ts';
import { MemoryBudgetTooSmall } from './errors.ts';
import { landInRows, type LandCells } from '../model/grid.ts';

const MB = 1024 * 1024;

/** Default budget [B]: fits a machine of 4 GB with room for the system. */
export const DEFAULT_MEMORY_BUDGET = 3 * 1024 * MB;

/** Resident memory of the main thread before any stage's arrays (Node.js, modules, the dataset's metadata) [B]. */
const MAIN_BASE = 300 * MB;
/** Resident memory of a worker thread before its task's arrays (isolate, modules, an open dataset) [B]. */
const WORKER_BASE = 110 * MB;
/**
 * Peak resident memory of the site's Astro processes: a base (the pages' modules, bundling) plus
 * an amount per region of the atlas (the manifest lists each region's files; the pages that list
 * every region are held by part 0) [B]. Fitted to the peaks of sites built in two parts by
 * `site-10000-regions` (2026-12-05, 2 cores): part 0 1,093 MB at 1,000 regions and 1,434 MB at
 * 10,000; part 1 718 MB and 1,210 MB. The first process (part 0, or the only one) and each other.
 */
const SITE_FIRST_BASE = 1_055 * MB;
const SITE_FIRST_PER_REGION = 39 * 1024;
const SITE_OTHER_BASE = 663 * MB;
const SITE_OTHER_PER_REGION = 56 * 1024;

/** Peak resident memory of the site's Astro processes for an atlas of `regions` regions in `parts` processes, together [B]. */
export function siteProcessesBytes(regions: number, parts: number): number {
  return SITE_FIRST_BASE + regions * SITE_FIRST_PER_REGION + Math.max(0, parts - 1) * (SITE_OTHER_BASE + regions * SITE_OTHER_PER_REGION);
}

/** Input fields of a block the reader hands over (canonical float32 fields, with their raw buffers) [–]. */
const BLOCK_FIELDS = 12;
/** Float32 arrays per land cell-hour the tile's physics and reduction use (compute-task.ts) [–]. */
const TILE_ARRAYS = 19;
/** Per-cell-month counts of a partial besides the histograms: evaluations × 3 + exposures × losses + 8 [uint32/float64] [B per cell-month per evaluation] */
const COUNTS_PER_CELL_MONTH = (nEval: number) => (3 * nEval + 8 + 12) * 4;
/**
 * What the sheltered exposure adds (pipeline/work/work-settings.ts countedExposures): per cell-hour
 * its physics output and gathered array (2 float32), per cell-month its capacity-loss views, WBGT
 * sum and maximum [B].
 */
const SHELTER_TILE_ARRAYS = 2;
const SHELTER_PER_CELL_MONTH = (4 + 2) * 4;

export interface MemoryInput {
  budget: number;
  jobs: number;
  /** The grid's land cells (its columns, land cells per row). */
  land: LandCells;
  /** The shard tiles: rows [y0, y1) and land cells. */
  tiles: ReadonlyArray<{ y0: number; y1: number; cells: number }>;
  years: number;
  monthsPerPiece: number;
  evaluations: number;
  /** Exposures the partials count: 2 (sun, shade) or 3 with the shelter (default 2) [–]. */
  exposures?: number;
  /** Combinations summed over all figures (fields per cell and period) [–]. */
  combos: number;
  /** Gridded fields per cell (grid-fields.ts) [–]. */
  gridFields: number;
  /**
   * The publication blocks: bands of whole rows [y0, y1) whose cells' files (tables, calculator
   * tiles) are published together, fixed by the grid alone ({@link publicationBlocks}); a merge
   * band is one or more consecutive blocks.
   */
  blocks: ReadonlyArray<[number, number]>;
  /** Largest block of hours a compute task reads [h]. */
  maxBlockHours: number;
  /**
   * Weathers computed from one read of the inputs: the record and each scenario (default 1). A
   * compute task holds one set of partials per weather it computes, so the plan computes as many
   * of them together as fit ({@link MemoryPlan.variantsPerTask}).
   */
  variants?: number;
  /**
   * The site the build ends with: its regions and the Astro processes it would use (site-parts.ts
   * `siteParts`); absent when the build makes no site (data only, a shard or merge task).
   */
  site?: { regions: number; parts: number };
}

export interface MemoryPlan {
  budget: number;
  /** Consecutive shard tiles computed together (one read feeds them all), per group: tile indices. */
  groups: number[][];
  /** Hours per block read [h]. */
  blockHours: number;
  /** Weathers (the record, scenarios) a compute task computes from one read [–]. */
  variantsPerTask: number;
  /** Merge bands: grid rows [y0, y1). */
  mergeBands: Array<[number, number]>;
  /** Estimated peak of the compute phase and of the merge phase [B]. */
  computePeak: number;
  mergePeak: number;
  /** Astro processes the site is built in: as many as asked that fit the budget (1 without a site) [–]. */
  siteParts: number;
  /** Estimated peak while the site is built: this process and the site's Astro processes (0 without a site) [B]. */
  sitePeak: number;
}

/**
 * How the site fits the budget `budget` [B]: the Astro processes asked for, fewer when their peaks
 * together do not fit, and a catalogued MemoryBudgetTooSmall when one does not fit.
 */
export function planSite(budget: number, site: { regions: number; parts: number } | undefined): { siteParts: number; sitePeak: number } {
  if (!site) return { siteParts: 1, sitePeak: 0 };
  const need = (parts: number) => MAIN_BASE + siteProcessesBytes(site.regions, parts);
  let parts = Math.max(1, site.parts);
  while (parts > 1 && need(parts) > budget) parts--;
  if (need(1) > budget) throw MemoryBudgetTooSmall({ budget, need: need(1), what: `building the site of ${site.regions} regions (one Astro process)` });
  return { siteParts: parts, sitePeak: need(parts) };
}

/**
 * Memory of a compute task over `land` land cells in `rows` grid rows, largest tile `maxTile`,
 * computing `variants` weathers (the record, scenarios) from one read [B].
 */
export function computeTaskBytes(land: number, rows: number, maxTile: number, m: MemoryInput, blockHours: number, variants = 1): number {
  const shelter = (m.exposures ?? 2) > 2;
  const partials =
    variants * land * (m.monthsPerPiece * histPerMonth(1) * 2 + MONTHS * (COUNTS_PER_CELL_MONTH(m.evaluations) + (shelter ? SHELTER_PER_CELL_MONTH : 0)));
  const block = rows * m.land.nx * blockHours * BLOCK_FIELDS * 4;
  const tile = maxTile * blockHours * (TILE_ARRAYS + (shelter ? SHELTER_TILE_ARRAYS : 0)) * 4;
  return partials + block + tile;
}

/** Memory of a merge band of `land` cells [B]: a year of histograms (merged and its partials), the record's figures, normals, piece, tiles. */
export function mergeTileBytes(land: number, rows: number, m: MemoryInput): number {
  const year = land * CELL_YEAR_HIST * 2 * 2;
  const fields = land * PERIODS * m.combos;
  const stacks = fields * m.years * 8;
  const normals = fields * 8 * 11;
  const point = land * m.years * 4500;
  const piece = rows * m.land.nx * m.gridFields * 4;
  return year + stacks + normals + point + piece;
}

/**
 * The publication blocks of a grid: bands of whole multiples of `rowAlign` rows (the map's cell
 * chunks) holding about `target` land cells (config `shards.cellsPerBlock`), rows without land left
 * out. They depend on the grid, its land cells and that setting only, so the published files are
 * the same whatever the memory budget, the number of workers or the machine.
 */
export function publicationBlocks(land: LandCells, rowAlign: number, target: number): Array<[number, number]> {
  const nLat = land.ny;
  const out: Array<[number, number]> = [];
  for (let y0 = 0; y0 < nLat; ) {
    let y1 = Math.min(nLat, y0 + rowAlign);
    let n = landInRows(land, y0, y1);
    while (y1 < nLat) {
      const next = Math.min(nLat, y1 + rowAlign);
      const more = n + landInRows(land, y1, next);
      if (n > 0 && more > target) break;
      n = more;
      y1 = next;
    }
    if (n > 0) out.push([y0, y1]);
    y0 = y1;
  }
  return out;
}

/** Chooses compute groups, block hours and merge bands for the budget; a catalogued error when nothing fits. */
export function planMemory(m: MemoryInput): MemoryPlan {
  const perWorker = (m.budget - MAIN_BASE) / m.jobs - WORKER_BASE;
  // Compute: the fewest groups of consecutive tiles whose task fits, with the longest block that
  // fits; the weathers (record, scenarios) of a tile computed together as far as they fit.
  let blockHours = m.maxBlockHours;
  let variants = Math.max(1, m.variants ?? 1);
  const fits = (from: number, to: number, hours: number, v = variants) => {
    let land = 0;
    let maxTile = 0;
    for (let i = from; i < to; i++) {
      land += m.tiles[i].cells;
      maxTile = Math.max(maxTile, m.tiles[i].cells);
    }
    return computeTaskBytes(land, m.tiles[to - 1].y1 - m.tiles[from].y0, maxTile, m, hours, v) <= perWorker;
  };
  while (variants > 1 && m.tiles.some((_, i) => !fits(i, i + 1, blockHours))) variants--;
  while (blockHours > 24 && m.tiles.some((_, i) => !fits(i, i + 1, blockHours))) blockHours = Math.max(24, Math.floor(blockHours / 2));
  const tooBig = m.tiles.findIndex((_, i) => !fits(i, i + 1, blockHours));
  if (perWorker <= 0 || tooBig >= 0) {
    const t = m.tiles[Math.max(0, tooBig)];
    const need = MAIN_BASE + m.jobs * (WORKER_BASE + computeTaskBytes(t.cells, t.y1 - t.y0, t.cells, m, 24));
    throw MemoryBudgetTooSmall({ budget: m.budget, need, what: `computing a tile of ${t.cells} land cells on ${m.jobs} worker(s)` });
  }
  const groups: number[][] = [];
  for (let i = 0; i < m.tiles.length; ) {
    let j = i + 1;
    while (j < m.tiles.length && fits(i, j + 1, blockHours)) j++;
    groups.push(Array.from({ length: j - i }, (_, k) => i + k));
    i = j;
  }
  // Merge: bands of consecutive publication blocks, as many land cells as fit.
  const mergeBands: Array<[number, number]> = [];
  let mergePeakTile = 0;
  const landOf = (b: readonly [number, number]) => landInRows(m.land, b[0], b[1]);
  for (let i = 0; i < m.blocks.length; ) {
    const [y0] = m.blocks[i];
    let y1 = m.blocks[i][1];
    let land = landOf(m.blocks[i]);
    if (mergeTileBytes(land, y1 - y0, m) > perWorker) {
      const need = MAIN_BASE + m.jobs * (WORKER_BASE + mergeTileBytes(land, y1 - y0, m));
      throw MemoryBudgetTooSmall({
        budget: m.budget,
        need,
        what: `merging grid rows ${y0}-${y1 - 1} (${land} land cells) over ${m.years} years on ${m.jobs} worker(s)`,
      });
    }
    let j = i + 1;
    while (j < m.blocks.length) {
      const more = land + landOf(m.blocks[j]);
      if (mergeTileBytes(more, m.blocks[j][1] - y0, m) > perWorker) break;
      land = more;
      y1 = m.blocks[j][1];
      j++;
    }
    mergeBands.push([y0, y1]);
    mergePeakTile = Math.max(mergePeakTile, mergeTileBytes(land, y1 - y0, m));
    i = j;
  }
  let computePeakTask = 0;
  for (const g of groups) {
    const land = g.reduce((s, i) => s + m.tiles[i].cells, 0);
    const maxTile = Math.max(...g.map((i) => m.tiles[i].cells));
    computePeakTask = Math.max(computePeakTask, computeTaskBytes(land, m.tiles[g[g.length - 1]].y1 - m.tiles[g[0]].y0, maxTile, m, blockHours, variants));
  }
  return {
    budget: m.budget,
    groups,
    blockHours,
    variantsPerTask: variants,
    mergeBands,
    computePeak: MAIN_BASE + m.jobs * (WORKER_BASE + computePeakTask),
    mergePeak: MAIN_BASE + m.jobs * (WORKER_BASE + mergePeakTile),
    ...planSite(m.budget, m.site),
  };
}

/**
 * Parses a memory size: a number with a unit (`3G`, `3GB`, `3 GiB`, `2500M`, `512MB`) [B]. Units
 * are binary (1 G = 1024³ B), as memory is counted. Returns undefined when the text is not a size.
 */
export function parseMemorySize(text: string): number | undefined {
  const m = /^\s*(\d+(?:\.\d+)?)\s*([kKmMgGtT])(?:i?[bB])?\s*$/.exec(text);
  if (!m) return undefined;
  const unit = { k: 1, m: 2, g: 3, t: 4 }[m[2].toLowerCase() as 'k' | 'm' | 'g' | 't'];
  const v = Number(m[1]) * 1024 ** unit;
  return Number.isFinite(v) && v > 0 ? Math.round(v) : undefined;
}

/** A size for people [B → text]: `2.4 GB` (binary units, as the budget is given). */
export function formatBytes(b: number): string {
  if (b >= 1024 ** 3) return `${(b / 1024 ** 3).toFixed(1)} GB`;
  if (b >= MB) return `${(b / MB).toFixed(0)} MB`;
  return `${Math.ceil(b / 1024)} kB`;
}

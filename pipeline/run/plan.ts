/**
 * The shard plan: the build is cut into shards, each one spatial tile (a band of grid rows) ×
 * one local calendar year. Shards are independent; their partials are integer counts, so any
 * partition of the plan merges to identical results (DESIGN.md §3).
 */
import type { Tile } from '../model/grid.ts';

/** One unit of work. */
export interface ShardSpec {
  /** Stable name, e.g. `t03-y2021`: used in logs, partial file names and error messages. */
  id: string;
  tileIndex: number;
  tile: Tile;
  /** Local calendar year [year]. */
  year: number;
  /** Global indices (row-major in the dataset grid) of the land cells of the tile, ascending. */
  cells: Int32Array;
}

/**
 * Land cells aimed at per tile: enough to amortise a block read (a NetCDF-4 chunk usually spans
 * the whole grid, so every tile of a year inflates it again), small enough to balance cores.
 */
export const TARGET_CELLS_PER_TILE = 512;

/**
 * Cuts the grid into bands of whole rows holding about {@link TARGET_CELLS_PER_TILE} land
 * cells each and crosses them with the years. Tiles without land are dropped.
 * @param nLat rows, nLon columns of the grid
 * @param land 1 where a cell is computed (row-major), or undefined for all cells
 * @param cellsPerTile land cells aimed at per tile [cells] (config `shards.cellsPerTile`)
 */
export function planShards(nLat: number, nLon: number, land: Uint8Array | undefined, years: readonly number[], cellsPerTile = TARGET_CELLS_PER_TILE): ShardSpec[] {
  const landInRow = new Int32Array(nLat);
  for (let y = 0; y < nLat; y++) {
    let n = 0;
    for (let x = 0; x < nLon; x++) if (!land || land[y * nLon + x] === 1) n++;
    landInRow[y] = n;
  }
  const tiles: Array<{ tile: Tile; cells: Int32Array }> = [];
  let y0 = 0;
  while (y0 < nLat) {
    let y1 = y0;
    let n = 0;
    while (y1 < nLat && (n === 0 || n + landInRow[y1] <= cellsPerTile)) n += landInRow[y1++];
    if (n > 0) {
      const cells: number[] = [];
      for (let y = y0; y < y1; y++) for (let x = 0; x < nLon; x++) if (!land || land[y * nLon + x] === 1) cells.push(y * nLon + x);
      tiles.push({ tile: { y0, y1, x0: 0, x1: nLon }, cells: Int32Array.from(cells) });
    }
    y0 = y1;
  }
  const shards: ShardSpec[] = [];
  for (const year of years) {
    tiles.forEach((t, i) => shards.push({ id: `t${String(i).padStart(2, '0')}-y${year}`, tileIndex: i, tile: t.tile, year, cells: t.cells }));
  }
  return shards;
}

/** Shards of slice K of N (1-based K), for array jobs: every N-th shard starting at K − 1. */
export function sliceShards(shards: readonly ShardSpec[], k: number, n: number): ShardSpec[] {
  return shards.filter((_, i) => i % n === k - 1);
}

/**
 * The shard plan: the build is cut into shards, each one spatial tile (a band of grid rows) ×
 * one piece of a local calendar year. A local year is cut where the UTC calendar year of the
 * data changes, so that a new year of data (files of one UTC year) touches only the pieces that
 * read it: with local time UTC−10, local 2023 is the piece `y2023` (hours starting in UTC 2023)
 * and the 10-hour piece `y2023-u2024`. Inside a UTC year the pieces are cut further into groups
 * of local months (`shards.monthsPerPiece`, a quarter by default: `y2023-m01` … `y2023-m10`,
 * `y2023-u2024-m12`). Shards are independent; their partials are integer
 * counts, and pieces of one tile and year add up, so any partition of the plan merges to
 * identical results (DESIGN.md §3).
 */
import { type LandCells, rowRange, type Tile } from '../model/grid.ts';
import { localHours } from '../work/index.ts';

const HOUR_MS = 3_600_000;

/**
 * One piece of a local year: the hours [h0, h1) (dataset hour indices) that start in UTC year
 * `utcYear` and fall in one group of `monthsPerPiece` local months.
 */
export interface YearPiece {
  utcYear: number;
  hours: [number, number];
  /** Local months [m0, m1) of the year (0 = January) that the piece's hours of the year fall in. */
  months: [number, number];
}

export { DEFAULT_MONTHS_PER_PIECE, MONTHS_PER_PIECE, TARGET_CELLS_PER_TILE } from '../config/schema.ts';
import { TARGET_CELLS_PER_TILE } from '../config/schema.ts';

/**
 * Hour indices [h0, h1) of the dataset that may belong to local year `year`: the UTC year ± 26 h
 * (wider than any time zone's offset), clipped to the data.
 */
export function hourRangeForYear(time: { start: number; count: number }, year: number): [number, number] {
  const from = Date.UTC(year, 0, 1) - 26 * HOUR_MS;
  const to = Date.UTC(year + 1, 0, 1) + 26 * HOUR_MS;
  const h0 = Math.max(0, Math.ceil((from - time.start) / HOUR_MS));
  const h1 = Math.min(time.count, Math.floor((to - time.start) / HOUR_MS) + 1);
  return [h0, Math.max(h0, h1)];
}

/**
 * The pieces of local year `year`: its hour range cut where the UTC year in which the hours
 * start changes (stamps are hour ends [ms]), and inside each UTC year where the local month
 * enters a new group of `monthsPerPiece` months, keeping the pieces that hold at least one hour
 * of the local year. Hours of the neighbouring local years stay with the first or last piece
 * (the accumulator skips them).
 */
export function yearPieces(time: { start: number; count: number }, year: number, timeZone: string, monthsPerPiece = 12): YearPiece[] {
  const [h0, h1] = hourRangeForYear(time, year);
  const stamp = (h: number) => time.start + h * HOUR_MS;
  const pieces: YearPiece[] = [];
  for (let a = h0; a < h1; ) {
    // An hour belongs to the UTC year it starts in (its stamp is its end).
    const u = new Date(stamp(a) - HOUR_MS).getUTCFullYear();
    const b = Math.min(h1, Math.ceil((Date.UTC(u + 1, 0, 1) + HOUR_MS - time.start) / HOUR_MS));
    const local = localHours(
      Float64Array.from({ length: b - a }, (_, i) => stamp(a + i)),
      timeZone,
    );
    let from = a;
    let group = -1;
    let m0 = 0;
    let m1 = 0;
    for (let h = a; h < b; h++) {
      if (local.year[h - a] !== year) continue;
      const m = local.month[h - a] - 1;
      const g = Math.floor(m / monthsPerPiece);
      if (group >= 0 && g !== group) {
        pieces.push({ utcYear: u, hours: [from, h], months: [m0, m1] });
        from = h;
        group = -1;
      }
      if (group < 0) {
        group = g;
        m0 = m;
      }
      m1 = m + 1;
    }
    if (group >= 0) pieces.push({ utcYear: u, hours: [from, b], months: [m0, m1] });
    a = b;
  }
  return pieces;
}

/** One unit of work. */
export interface ShardSpec {
  /**
   * Stable name, e.g. `t03-y2021-m04` (tile 3, local 2021, the piece from local April) or
   * `t03-y2021-u2022-m12` (its hours in UTC 2022); without `-mMM` when a piece is a whole year.
   * Used in logs, partial file names and error messages.
   */
  id: string;
  tileIndex: number;
  tile: Tile;
  /** Local calendar year [year]. */
  year: number;
  /** UTC year of the hours' time stamps in this piece of the local year [year]. */
  utcYear: number;
  /** Dataset hour indices [h0, h1) of the piece. */
  hours: [number, number];
  /** Local months [m0, m1) of the year (0 = January) the piece's hours of the year fall in. */
  months: [number, number];
  /** Global indices (row-major in the dataset grid) of the land cells of the tile, ascending. */
  cells: Int32Array;
  /**
   * The scenario the shard computes (its id), or undefined for the record itself (the baseline).
   * A scenario's shards are the baseline's with `@<scenario id>` after the name.
   */
  scenario?: string;
}

/** The shards of a scenario: the baseline's, named `<baseline id>@<scenario id>`. */
export function scenarioShards(shards: readonly ShardSpec[], scenario: string): ShardSpec[] {
  return shards.map((s) => ({ ...s, id: `${s.id}@${scenario}`, scenario }));
}

/**
 * Cuts the grid into bands of whole rows holding about {@link TARGET_CELLS_PER_TILE} land
 * cells each and crosses them with the pieces of the years. Tiles without land are dropped.
 * @param land the grid's land cells ({@link landCellsOf})
 * @param pieces the pieces of each local year ({@link yearPieces})
 * @param cellsPerTile land cells aimed at per tile [cells] (config `shards.cellsPerTile`)
 * @param monthsPerPiece the months per piece the pieces were cut with [months], for the names
 */
export function planShards(
  land: LandCells,
  years: readonly number[],
  pieces: (year: number) => YearPiece[],
  cellsPerTile = TARGET_CELLS_PER_TILE,
  monthsPerPiece = 12,
): ShardSpec[] {
  const { ny: nLat, nx: nLon, perRow: landInRow } = land;
  const tiles: Array<{ tile: Tile; cells: Int32Array }> = [];
  let y0 = 0;
  while (y0 < nLat) {
    let y1 = y0;
    let n = 0;
    while (y1 < nLat && (n === 0 || n + landInRow[y1] <= cellsPerTile)) n += landInRow[y1++];
    if (n > 0) {
      const [k0, k1] = rowRange(land, y0, y1);
      tiles.push({ tile: { y0, y1, x0: 0, x1: nLon }, cells: land.ids.slice(k0, k1) });
    }
    y0 = y1;
  }
  const shards: ShardSpec[] = [];
  for (const year of years) {
    for (const piece of pieces(year)) {
      const month = monthsPerPiece < 12 ? `-m${String(piece.months[0] + 1).padStart(2, '0')}` : '';
      const suffix = `${piece.utcYear === year ? '' : `-u${piece.utcYear}`}${month}`;
      tiles.forEach((t, i) =>
        shards.push({
          id: `t${String(i).padStart(2, '0')}-y${year}${suffix}`,
          tileIndex: i,
          tile: t.tile,
          year,
          utcYear: piece.utcYear,
          hours: piece.hours,
          months: piece.months,
          cells: t.cells,
        }),
      );
    }
  }
  return shards;
}

/** Shards of slice K of N (1-based K), for array jobs: every N-th shard starting at K − 1. */
export function sliceShards(shards: readonly ShardSpec[], k: number, n: number): ShardSpec[] {
  return shards.filter((_, i) => i % n === k - 1);
}

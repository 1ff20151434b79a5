/**
 * Per-cell figures in small JSON chunks for the map explorer (`/map/`): `data/atlas-cells.csv`
 * is far too big for a browser to fetch (about 22 MB for the demo), so the same numbers are cut
 * into tiles of grid rows × columns, one file per tile that holds land:
 *
 * - `data/cells/index.json` ({@link CellFiguresIndex}): the grid (to turn a point into a cell
 *   and a cell into its tile), the tile size, the periods, statistics and figures (with their
 *   combination keys, in the order the chunks use), and the list of chunk files;
 * - `data/cells/<chunk>.json` ({@link CellChunk}), chunk id `r<tile row>c<tile col>`: per land
 *   cell its id, centre, and per figure and combination 13 periods (`01`–`12`, `year`) of
 *   `[mean, median, p90, years_used]`; `null` for a value the CSV leaves empty.
 *
 * The figures of atlas-cells.csv (`CELL_TABLE_FIGURES`, pipeline/publish/cell-table.ts) carry the
 * very numbers of its rows (same rounding: 2 decimals, `roundTo`), so a cell's panel on the map
 * equals its CSV rows; mean WBGT and capacity loss are added with the same rounding, and the
 * niche figures of `niche.json` (baseline and latest mean annual temperature, the class).
 * Cell ids are row-major global grid indices `y · nLon + x` with rows south → north, as in
 * atlas-cells.csv and niche.json.
 */
import { join } from 'node:path';
import type { CellFigureNormals, CellNiche } from './figure-normals.ts';
import { PERIODS, type FigureDef } from '../reduce/figures.ts';
import { cellCentre, gridCellCount, isCellOf, type HorizontalGrid } from '../model/grid.ts';
import { writeFileAtomic } from '../model/effects.ts';
import { NICHE_CLASSES } from '../climate/index.ts';
import { CELL_TABLE_FIGURES } from './cell-table.ts';
import { roundTo } from '../formats/csv.ts';
import { periodLabel } from './region-table.ts';
import { CellFigureMissing, CellOutsideGrid, CellTileInvalid } from './cell-figures-errors.ts';

/** Figures held per cell: those of atlas-cells.csv first, then the other mapped figures. */
export const CELL_FIGURES: readonly string[] = [...CELL_TABLE_FIGURES, 'capacity-loss-shift', 'wbgt-mean'];

/** Statistics per period, in the order of each value tuple (then years used). */
export const CELL_STATISTICS = ['mean', 'median', 'p90'] as const;

/**
 * Default tile [grid rows × columns]: 4 × 4 cells hold at most 16 land cells, about 150 kB of
 * JSON (≈ 2,200 numbers per cell), a fetch a phone can afford per click.
 */
export const DEFAULT_CELL_TILE = { rows: 4, cols: 4 };

/** One period's `[mean, median, p90, years_used]` [unit of the figure, …, years]. */
export type CellValues = [number | null, number | null, number | null, number];

export interface CellRecord {
  /** Global grid index y · nLon + x. */
  cell: number;
  /** Cell centre [° N], [° E], 4 decimals as in the CSV. */
  lat: number;
  lon: number;
  /** figure id → per combination (index order of the index's `combos`) → per period. */
  figures: Record<string, CellValues[][]>;
  /** As in niche.json: MAT over the baseline and the latest years [°C], the baseline class. */
  niche: { baselineMat: number | null; latestMat: number | null; baselineClass: string | null };
}

export interface CellChunk {
  id: string;
  cells: CellRecord[];
}

export interface CellFiguresIndex {
  version: 1;
  /** Regular grid: centre of cell (y, x) is (lat0 + y·dLat, lon0 + x·dLon) [° N, ° E]. */
  grid: { nLat: number; nLon: number; lat0: number; lon0: number; dLat: number; dLon: number };
  /** Tile size [rows, columns]: cell (y, x) is in chunk `r${⌊y/rows⌋}c${⌊x/cols⌋}`. */
  tile: { rows: number; cols: number };
  periods: string[];
  statistics: string[];
  figures: Array<{ id: string; label: string; units: string; combos: string[]; inCellTable: boolean }>;
  /** Chunks that exist (tiles with at least one land cell): id, path below the site, cell count. */
  chunks: Array<{ id: string; path: string; cells: number }>;
  /**
   * The per-cell tables, one per band of grid rows [y0, y1) (row 0 the southernmost), and the
   * NetCDF file of every cell: the downloads a cell's figures come from.
   */
  tables: Array<{ path: string; rows: [number, number] }>;
  netcdf: string;
  /** Land cells in all chunks. */
  landCells: number;
}

/** Chunk id of grid cell (y, x) for a tile size. */
export function cellChunkId(y: number, x: number, tile: { rows: number; cols: number }): string {
  return `r${Math.floor(y / tile.rows)}c${Math.floor(x / tile.cols)}`;
}

function step(v: Float64Array): number {
  return v.length > 1 ? (v[v.length - 1] - v[0]) / (v.length - 1) : 0;
}

const finiteOrNull = (v: number): number | null => (Number.isFinite(v) ? v : null);

/** The figures the chunks hold, in {@link CELL_FIGURES} order; a catalogued error names a missing one. */
export function chosenCellFigures<T extends { def: FigureDef }>(figures: readonly T[]): T[] {
  return CELL_FIGURES.map((id) => {
    const fn = figures.find((f) => f.def.id === id);
    if (!fn) throw CellFigureMissing({ figure: id, present: figures.map((f) => f.def.id) });
    return fn;
  });
}

/**
 * The chunks of the per-cell figures of `cells` (pure; see the file comment). `cells` must hold
 * every land cell of each chunk it touches: merge tiles are cut at multiples of the chunk rows.
 */
export function cellFigureChunks(
  figures: readonly CellFigureNormals[],
  cells: Int32Array,
  grid: HorizontalGrid,
  niche: CellNiche,
  tile: { rows: number; cols: number } = DEFAULT_CELL_TILE,
): CellChunk[] {
  checkTile(tile);
  const chosen = chosenCellFigures(figures);
  const byChunk = new Map<string, CellRecord[]>();
  for (let c = 0; c < cells.length; c++) {
    const g = cells[c];
    if (!isCellOf(grid, g)) throw CellOutsideGrid({ cell: g, nGrid: gridCellCount(grid) }, { key: `cells[${c}]` });
    const { row: y, col: x, lat, lon } = cellCentre(grid, g);
    const record: CellRecord = {
      cell: g,
      lat: roundTo(lat, 4),
      lon: roundTo(lon, 4),
      figures: {},
      niche: {
        baselineMat: finiteOrNull(roundTo(niche.baselineMat[c], 2)),
        latestMat: finiteOrNull(roundTo(niche.latestMat[c], 2)),
        baselineClass: Number.isFinite(niche.baselineMat[c]) ? NICHE_CLASSES[niche.baselineClass[c]] : null,
      },
    };
    for (const fn of chosen) {
      const nC = fn.def.combos.length;
      const perCombo: CellValues[][] = [];
      for (let k = 0; k < nC; k++) {
        const periods: CellValues[] = [];
        for (let p = 0; p < PERIODS; p++) {
          const i = (c * PERIODS + p) * nC + k;
          periods.push([
            finiteOrNull(roundTo(fn.cell.mean[i], 2)),
            finiteOrNull(roundTo(fn.cell.median[i], 2)),
            finiteOrNull(roundTo(fn.cell.p90[i], 2)),
            fn.cell.yearsUsed[i],
          ]);
        }
        perCombo.push(periods);
      }
      record.figures[fn.def.id] = perCombo;
    }
    const id = cellChunkId(y, x, tile);
    const list = byChunk.get(id);
    if (list) list.push(record);
    else byChunk.set(id, [record]);
  }
  return [...byChunk.entries()].map(([id, list]) => ({ id, cells: list.sort((p, q) => p.cell - q.cell) })).sort((p, q) => p.cells[0].cell - q.cells[0].cell);
}

function checkTile(tile: { rows: number; cols: number }): void {
  if (!Number.isInteger(tile.rows) || !Number.isInteger(tile.cols) || tile.rows < 1 || tile.cols < 1) {
    throw CellTileInvalid({ rows: tile.rows, cols: tile.cols }, { key: 'tile' });
  }
}

/** A written chunk, as the index lists it. */
export type CellChunkEntry = CellFiguresIndex['chunks'][number];

/** Writes the chunks of some cells as `dataDir/cells/<chunk>.json` and returns their index entries. */
export async function writeCellChunks(dataDir: string, chunks: readonly CellChunk[]): Promise<CellChunkEntry[]> {
  const out: CellChunkEntry[] = [];
  for (const ch of chunks) {
    await writeFileAtomic(join(dataDir, 'cells', `${ch.id}.json`), JSON.stringify(ch));
    out.push({ id: ch.id, path: `data/cells/${ch.id}.json`, cells: ch.cells.length });
  }
  return out;
}

/**
 * The index of the per-cell figures (pure): the grid, the tile size, the periods, statistics and
 * figures, and every tile's chunks (listed by their first cell, as written).
 */
export function cellFiguresIndex(
  defs: readonly FigureDef[],
  grid: HorizontalGrid,
  chunks: ReadonlyArray<CellChunkEntry & { firstCell: number }>,
  tile: { rows: number; cols: number } = DEFAULT_CELL_TILE,
  tables: ReadonlyArray<{ path: string; rows: [number, number] }> = [],
): CellFiguresIndex {
  checkTile(tile);
  const chosen = chosenCellFigures(defs.map((def) => ({ def })));
  const sorted = [...chunks].sort((a, b) => a.firstCell - b.firstCell);
  return {
    version: 1,
    grid: { nLat: grid.lat.length, nLon: grid.lon.length, lat0: grid.lat[0], lon0: grid.lon[0], dLat: step(grid.lat), dLon: step(grid.lon) },
    tile: { rows: tile.rows, cols: tile.cols },
    periods: Array.from({ length: PERIODS }, (_, p) => periodLabel(p)),
    statistics: [...CELL_STATISTICS],
    figures: chosen.map(({ def }) => ({
      id: def.id,
      label: def.label,
      units: def.units,
      combos: [...def.combos],
      inCellTable: CELL_TABLE_FIGURES.includes(def.id),
    })),
    chunks: sorted.map((c) => ({ id: c.id, path: c.path, cells: c.cells })),
    landCells: sorted.reduce((s, c) => s + c.cells, 0),
    tables: [...tables].sort((a, b) => a.rows[0] - b.rows[0]).map((t) => ({ path: t.path, rows: [t.rows[0], t.rows[1]] })),
    netcdf: CELL_NETCDF_PATH,
  };
}

/** Path of the per-cell NetCDF below the site root. */
export const CELL_NETCDF_PATH = 'data/atlas-cells.nc';

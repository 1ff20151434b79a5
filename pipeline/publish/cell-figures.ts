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
import type { FigureNormals, NicheResult } from '../run/climate-step.ts';
import { PERIODS } from '../run/figures.ts';
import type { HorizontalGrid } from '../model/grid.ts';
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

/** The index and chunks of the per-cell figures (pure; see the file comment). */
export function cellFigureChunks(
  figures: readonly FigureNormals[],
  cells: Int32Array,
  grid: HorizontalGrid,
  niche: NicheResult,
  tile: { rows: number; cols: number } = DEFAULT_CELL_TILE,
): { index: CellFiguresIndex; chunks: CellChunk[] } {
  if (!Number.isInteger(tile.rows) || !Number.isInteger(tile.cols) || tile.rows < 1 || tile.cols < 1) {
    throw CellTileInvalid({ rows: tile.rows, cols: tile.cols }, { key: 'tile' });
  }
  const nLat = grid.lat.length;
  const nLon = grid.lon.length;
  const nGrid = nLat * nLon;
  const chosen = CELL_FIGURES.map((id) => {
    const fn = figures.find((f) => f.series.def.id === id);
    if (!fn) throw CellFigureMissing({ figure: id, present: figures.map((f) => f.series.def.id) });
    return fn;
  });
  const byChunk = new Map<string, CellRecord[]>();
  const a = niche.assessment;
  for (let c = 0; c < cells.length; c++) {
    const g = cells[c];
    if (!Number.isInteger(g) || g < 0 || g >= nGrid) throw CellOutsideGrid({ cell: g, nGrid }, { key: `cells[${c}]` });
    const y = Math.floor(g / nLon);
    const x = g % nLon;
    const record: CellRecord = {
      cell: g,
      lat: roundTo(grid.lat[y], 4),
      lon: roundTo(grid.lon[x], 4),
      figures: {},
      niche: {
        baselineMat: finiteOrNull(roundTo(a.baselineMat[c], 2)),
        latestMat: finiteOrNull(roundTo(a.latestMat[c], 2)),
        baselineClass: Number.isFinite(a.baselineMat[c]) ? NICHE_CLASSES[a.baselineClass[c]] : null,
      },
    };
    for (const fn of chosen) {
      const nC = fn.series.def.combos.length;
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
      record.figures[fn.series.def.id] = perCombo;
    }
    const id = cellChunkId(y, x, tile);
    const list = byChunk.get(id);
    if (list) list.push(record);
    else byChunk.set(id, [record]);
  }
  const chunks = [...byChunk.entries()]
    .map(([id, list]) => ({ id, cells: list.sort((p, q) => p.cell - q.cell) }))
    .sort((p, q) => p.cells[0].cell - q.cells[0].cell);
  const index: CellFiguresIndex = {
    version: 1,
    grid: { nLat, nLon, lat0: grid.lat[0], lon0: grid.lon[0], dLat: step(grid.lat), dLon: step(grid.lon) },
    tile: { rows: tile.rows, cols: tile.cols },
    periods: Array.from({ length: PERIODS }, (_, p) => periodLabel(p)),
    statistics: [...CELL_STATISTICS],
    figures: chosen.map((fn) => ({
      id: fn.series.def.id,
      label: fn.series.def.label,
      units: fn.series.def.units,
      combos: [...fn.series.def.combos],
      inCellTable: CELL_TABLE_FIGURES.includes(fn.series.def.id),
    })),
    chunks: chunks.map((ch) => ({ id: ch.id, path: `data/cells/${ch.id}.json`, cells: ch.cells.length })),
    landCells: cells.length,
  };
  return { index, chunks };
}

/** Writes `dataDir/cells/index.json` and one file per chunk, each atomically. */
export async function writeCellFigures(
  dataDir: string,
  figures: readonly FigureNormals[],
  cells: Int32Array,
  grid: HorizontalGrid,
  niche: NicheResult,
  tile: { rows: number; cols: number } = DEFAULT_CELL_TILE,
): Promise<CellFiguresIndex> {
  const { index, chunks } = cellFigureChunks(figures, cells, grid, niche, tile);
  for (const ch of chunks) await writeFileAtomic(join(dataDir, 'cells', `${ch.id}.json`), JSON.stringify(ch));
  await writeFileAtomic(join(dataDir, 'cells', 'index.json'), JSON.stringify(index));
  return index;
}

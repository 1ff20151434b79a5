/**
 * Per-cell histogram tiles for the browser calculator's point estimates:
 * `data/calculator/cells/<chunk>.bin` (format in point-tile-codec.ts) and
 * `data/calculator/cells/index.json` (which chunk holds which cells, the grid, the years).
 *
 * The build hands each merged year to {@link PointTileStore.addYear} right where the year's cell
 * histograms exist (they are dropped after the region histograms are made); the store keeps only
 * the encoded bytes (about 4.3 kB per land cell and year), so memory grows with the published
 * size, not with the raw histograms (187 kB per cell-year as uint16). {@link PointTileStore.write}
 * then cuts the land cells, in row-major order, into runs of about {@link POINT_CHUNK_TARGET_BYTES}
 * each (equal shares of the total), so the calculator fetches one small file for a point.
 */
import { join } from 'node:path';
import { writeFileAtomic } from '../model/effects.ts';
import type { YearCounts } from '../reduce/merge.ts';
import { HIST_LEN, N_EXPOSURES } from '../reduce/layout.ts';
import { ByteWriter, POINT_TILE_VERSION, POINT_YEAR_SIZE, assemblePointChunk, encodeCellYear } from './point-tile-codec.ts';
import { PointTileCellsMismatch, PointTileYearsIncomplete } from './point-tile-errors.ts';

/** Bytes aimed at per chunk file [B]: a chunk holds whole cells, so it may be one cell larger. */
export const POINT_CHUNK_TARGET_BYTES = 256 * 1024;

/** One year's encoded cells: all cells one after the other, and where each starts. */
interface EncodedYear {
  bytes: Uint8Array;
  /** nCells + 1 offsets into `bytes`. */
  offsets: Uint32Array;
}

/** One chunk file as the index lists it. */
export type PointChunkEntry = PointTileIndex['chunks'][number];

/** The index the calculator reads to find a cell's chunk. */
export interface PointTileIndex {
  version: number;
  years: number[];
  layout: string;
  /** The regular grid: cell centre of row 0 / column 0 and the steps [°]; cell id = row × nLon + column. */
  grid: { nLat: number; nLon: number; lat0: number; dLat: number; lon0: number; dLon: number };
  landCells: number;
  chunks: Array<{ path: string; firstCell: number; lastCell: number; cells: number; bytes: number }>;
}

/** Collects the encoded cell histograms of each year and writes the chunks. */
export class PointTileStore {
  private readonly years = new Map<number, EncodedYear>();

  /** @param cells global indices of the land cells, ascending (the order of the merged counts) */
  constructor(readonly cells: Int32Array) {}

  /**
   * Encodes one merged year's cell histograms (`yc.histogram`, whole hours) of the store's cells,
   * which are the cells `from`, `from + 1`, … of `yc` (default 0: all of them). Catalogued errors:
   * PointTileCellsMismatch, PointTileCountTooLarge.
   */
  addYear(yc: YearCounts, from = 0): void {
    const n = this.cells.length;
    const nYc = yc.cells.length;
    if (from < 0 || from + n > nYc || this.cells.some((c, i) => c !== yc.cells[from + i])) {
      throw PointTileCellsMismatch({
        year: yc.year,
        detail: `${nYc} cells given, ${n} land cells expected in the same order${from > 0 ? ` from position ${from}` : ''}`,
      });
    }
    if (yc.histogram.length !== nYc * POINT_YEAR_SIZE) {
      throw PointTileCellsMismatch({ year: yc.year, detail: `histogram holds ${yc.histogram.length} values; ${nYc} cells × ${POINT_YEAR_SIZE} expected` });
    }
    const w = new ByteWriter();
    const offsets = new Uint32Array(n + 1);
    // The merged year is month-major (pipeline/reduce/merge.ts): a cell's slots lie one row of
    // cells apart.
    const stride = nYc * N_EXPOSURES * HIST_LEN;
    for (let c = 0; c < n; c++) {
      offsets[c] = w.length;
      encodeCellYear(yc.histogram, (from + c) * N_EXPOSURES * HIST_LEN, w, this.cells[c], yc.year, stride);
    }
    offsets[n] = w.length;
    this.years.set(yc.year, { bytes: w.bytes(), offsets });
  }

  /**
   * Writes the chunks under `dataDir/calculator/cells/` (`dataDir` is the `data` folder), named
   * `<prefix><nnnn>.bin`, and returns their index entries; {@link writePointTileIndex} writes the
   * index once every tile's chunks are there. `years` must all have been added. Catalogued error:
   * PointTileYearsIncomplete.
   */
  async write(dataDir: string, o: { years: readonly number[]; prefix?: string; targetBytes?: number }): Promise<PointChunkEntry[]> {
    const years = [...o.years].sort((a, b) => a - b);
    const got = [...this.years.keys()].sort((a, b) => a - b);
    if (years.length !== got.length || years.some((y, i) => y !== got[i])) throw PointTileYearsIncomplete({ expected: years, got });
    const encoded = years.map((y) => this.years.get(y)!);
    const target = o.targetBytes ?? POINT_CHUNK_TARGET_BYTES;
    const n = this.cells.length;
    const cellBytes = (c: number) => encoded.reduce((s, e) => s + e.offsets[c + 1] - e.offsets[c], 0);
    const dir = join(dataDir, 'calculator', 'cells');
    const chunks: PointChunkEntry[] = [];
    // As few chunks as the target allows, cut where the running size passes equal shares.
    const sizes = Array.from({ length: n }, (_, c) => cellBytes(c));
    const all = sizes.reduce((s, x) => s + x, 0);
    const nChunks = Math.max(1, Math.ceil(all / target));
    let c0 = 0;
    let before = 0;
    while (c0 < n) {
      const share = (all * (chunks.length + 1)) / nChunks;
      let c1 = c0;
      while (c1 < n && (c1 === c0 || before + sizes[c1] / 2 <= share)) before += sizes[c1++];
      const cells = this.cells.subarray(c0, c1);
      const parts = Array.from(cells, (_, i) => encoded.map((e) => e.bytes.subarray(e.offsets[c0 + i], e.offsets[c0 + i + 1])));
      const file = assemblePointChunk(years.length, cells, parts);
      const name = `${o.prefix ?? ''}${String(chunks.length).padStart(4, '0')}.bin`;
      await writeFileAtomic(join(dir, name), file);
      chunks.push({ path: `data/calculator/cells/${name}`, firstCell: cells[0], lastCell: cells[cells.length - 1], cells: cells.length, bytes: file.length });
      c0 = c1;
    }
    return chunks;
  }
}

/**
 * Writes `dataDir/calculator/cells/index.json` for the chunks of every tile (in any order; listed
 * by first cell) and returns its size [B].
 */
export async function writePointTileIndex(
  dataDir: string,
  o: { years: readonly number[]; grid: { lat: ArrayLike<number>; lon: ArrayLike<number> }; chunks: readonly PointChunkEntry[] },
): Promise<number> {
  const chunks = [...o.chunks].sort((a, b) => a.firstCell - b.firstCell);
  const index: PointTileIndex = {
    version: POINT_TILE_VERSION,
    years: [...o.years].sort((a, b) => a - b),
    layout:
      'per chunk: "HHPT", version, nYears, nCells, cell ids, offsets; per cell × year × month (1-12) × local hour (0-23) × exposure (sun, shade): uint8 first bin, uint8 n bins, counts in unary bit-packed (pipeline/publish/point-tile-codec.ts); bins as in ../index.json',
    grid: gridOf(o.grid),
    landCells: chunks.reduce((s, c) => s + c.cells, 0),
    chunks,
  };
  const json = JSON.stringify(index);
  await writeFileAtomic(join(dataDir, 'calculator', 'cells', 'index.json'), json);
  return Buffer.byteLength(json);
}

/** The regular grid of cell centres (pipeline/model/grid.ts keeps grids regular and ascending). */
function gridOf(g: { lat: ArrayLike<number>; lon: ArrayLike<number> }): PointTileIndex['grid'] {
  const step = (a: ArrayLike<number>) => (a.length > 1 ? (a[a.length - 1] - a[0]) / (a.length - 1) : 0);
  return { nLat: g.lat.length, nLon: g.lon.length, lat0: g.lat[0], dLat: step(g.lat), lon0: g.lon[0], dLon: step(g.lon) };
}

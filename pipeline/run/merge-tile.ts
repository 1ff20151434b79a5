/**
 * One merge tile: a band of grid rows whose partials are merged year by year, its normals and
 * niche computed, and everything that is per cell published or handed on, before the next tile:
 * - per year: the partials of the tile's shards are merged (pipeline/reduce/merge.ts), turned into
 *   figures (pipeline/reduce/figures.ts), the cell histograms encoded for the calculator's point
 *   tiles and added into the tile's regions' histograms (double-double sums, written as records
 *   of the tile's region-part file); then the year's histograms are dropped;
 * - after the years: per-cell normals (pipeline/climate/normals.ts) and the niche, the tile's cell
 *   table (CSV), cell chunks (JSON for the map), niche entries, its rows of every gridded field
 *   (a piece file the publish stage assembles into NetCDF slabs and layers), and each region's
 *   figure sums, highest cells and mean annual temperature sums.
 * Memory: one year of the tile's histograms, and the tile's figures over the record. The tile's
 * land cells are a whole band of rows, cut at multiples of the cell-chunk rows, so no map chunk
 * is split between two tiles.
 */
import { mkdirSync, openSync, closeSync, writeSync } from 'node:fs';
import { join } from 'node:path';
import {
  computeNormals,
  annualCellTrends,
  annualMeanFromMonthlySums,
  assessNiche,
  nicheClassCode,
  MONTHLY_COMPLETENESS,
  type Normals,
} from '../climate/index.ts';
import { YearMerger, CELL_YEAR_HIST, type YearCounts } from '../reduce/merge.ts';
import { HIST_LEN, HOURS, MONTHS, N_EXPOSURES } from '../reduce/layout.ts';
import { figureDefs, yearFigures, shiftHourValues, PERIODS, type FigureDef } from '../reduce/figures.ts';
import { personHoursDensity, personHoursDensityDef } from '../regions/person-hours.ts';
import { addWeightedHistograms, addWeightedMeans, addWorstCells, addYearValues, emptyFigureSums, type RegionTileCells } from '../regions/region-sums.ts';
import { readPartialFileSparse } from './partial-store.ts';
import { RegionPartWriter, RECORD_WORKFORCE, type RegionRecordRef } from '../formats/region-parts.ts';
import { GridPiece, type GridPieceRef } from '../formats/grid-pieces.ts';
import { gridFields, TRENDED } from '../publish/grid-fields.ts';
import { cellTableCsv } from '../publish/cell-table.ts';
import { cellFigureChunks, writeCellChunks, DEFAULT_CELL_TILE, type CellChunkEntry } from '../publish/cell-figures.ts';
import { PointTileStore, type PointChunkEntry } from '../publish/point-tiles.ts';
import { nicheCellsJson } from '../publish/niche-json.ts';
import type { CellFigureNormals, CellNiche } from '../publish/figure-normals.ts';
import { rowsId } from './rows-id.ts';
import { idsInRows } from '../model/grid.ts';

/**
 * A band's part of the workforce (config `workforce`): per band cell the people, the share profile
 * the map uses and the cell's area; per region the band overlaps, people weights.
 */
export interface BandWorkforce {
  /** People assigned to each cell of the band [people]. */
  people: Float64Array;
  /** Each cell's share profile (index into profileWeights), −1 none. */
  profile: Int32Array;
  /** Each cell's area [km²]. */
  areaKm2: Float64Array;
  /** Per profile, per evaluation: the weights of the shares [1] (nProfiles × nEval). */
  profileWeights: Float64Array;
  nEval: number;
  /** The band's regions with `weight` = the cell's people in the region / the region's people [1]. */
  regions: RegionTileCells[];
}

/** What a worker needs to merge one tile (structured-cloneable). */
export interface MergeTileInput {
  /** Name, from its rows: `rows-0000-0031`. */
  id: string;
  /** Grid rows [y0, y1) of the tile. */
  rows: [number, number];
  /** The publication blocks (rows) the tile is made of: its cells' tables and calculator tiles are written per block. */
  blocks: Array<[number, number]>;
  /** Land cells of the tile (global indices, ascending). */
  cells: Int32Array;
  /** Partials may hold cells outside the tile (the tile is part of a shard's tile). */
  subset: boolean;
  years: number[];
  baseline: [number, number];
  latestYear: number;
  /** Per year (in `years` order): the partial files of the shards holding the tile's cells, sorted by shard id. */
  partials: Array<Array<{ id: string; path: string }>>;
  grid: { lat: Float64Array; lon: Float64Array };
  /** The regions the tile overlaps, with their cells in the tile. */
  regions: RegionTileCells[];
  /** The band's people and share profiles, when the atlas has a workforce. */
  workforce?: BandWorkforce;
  /** The staging `data` folder and the build's scratch folder. */
  dataDir: string;
  scratchDir: string;
  /**
   * A slice of a band's regions only (./merge-stage.ts hands a band's regions to several workers
   * when there are fewer bands than workers): the band's partials are merged for these regions'
   * figure sums and means, and nothing per cell (nor the workforce's people-weighted sums, which
   * the band's own task writes) is written ({@link runMergeRegions}).
   */
  regionsOnly?: boolean;
}

/** A file of region parts (pipeline/formats/region-parts.ts) and the records it holds. */
export interface RegionPartsRef {
  path: string;
  records: RegionRecordRef[];
}

/** What the main thread keeps of a merged tile (small). */
export interface MergeTileSummary {
  id: string;
  rows: [number, number];
  cells: number;
  piece: GridPieceRef;
  /** Smallest and largest finite value per gridded field over the tile [unit of the field]. */
  fieldMin: Float64Array;
  fieldMax: Float64Array;
  /** The band's region parts: one file, or one per slice of its regions merged apart. */
  regionParts: RegionPartsRef[];
  cellChunks: Array<CellChunkEntry & { firstCell: number }>;
  pointChunks: PointChunkEntry[];
  /** One per publication block: the table's path below the site and its rows. */
  cellTables: Array<{ path: string; rows: [number, number]; bytes: number }>;
  /** The tile's entries of niche.json, comma-separated JSON objects, in a scratch file. */
  nicheFragment: string;
}

/** A file appended to in pieces of text, flushed every megabyte or so. */
class TextFile {
  private fd: number;
  private parts: string[] = [];
  private pending = 0;
  bytes = 0;
  constructor(path: string) {
    this.fd = openSync(path, 'w');
  }
  add(text: string): void {
    this.parts.push(text);
    this.pending += text.length;
    if (this.pending > 1 << 20) this.flush();
  }
  private flush(): void {
    const b = Buffer.from(this.parts.join(''), 'utf8');
    let done = 0;
    while (done < b.length) done += writeSync(this.fd, b, done, b.length - done);
    this.bytes += b.length;
    this.parts = [];
    this.pending = 0;
  }
  close(): void {
    this.flush();
    closeSync(this.fd);
  }
}

/** The normals of items [a, b) (every array of `Normals` is per item). */
function sliceNormals(n: Normals, a: number, b: number): Normals {
  return {
    ...n,
    nItems: b - a,
    mean: n.mean.subarray(a, b),
    median: n.median.subarray(a, b),
    p90: n.p90.subarray(a, b),
    min: n.min.subarray(a, b),
    max: n.max.subarray(a, b),
    yearsUsed: n.yearsUsed.subarray(a, b),
    yearsMissing: n.yearsMissing.subarray(a, b),
    latest: n.latest.subarray(a, b),
    latestDifference: n.latestDifference.subarray(a, b),
    latestRank: n.latestRank.subarray(a, b),
  };
}

/** Merges one band (see the file comment): its cell outputs, region parts and summary. */
export async function runMergeTile(t: MergeTileInput): Promise<MergeTileSummary> {
  if (t.regionsOnly) throw new RangeError(`merge task ${t.id} is a slice of a band's regions: run it with runMergeRegions`);
  return (await mergeBand(t)) as MergeTileSummary;
}

/**
 * Merges one band for a slice of its regions (`t.regionsOnly`, `t.regions` the slice): the same
 * region parts as the whole band's merge writes for those regions, and nothing else.
 */
export async function runMergeRegions(t: MergeTileInput): Promise<RegionPartsRef> {
  if (!t.regionsOnly) throw new RangeError(`merge task ${t.id} is not a slice of a band's regions`);
  return (await mergeBand(t)) as RegionPartsRef;
}

async function mergeBand(t: MergeTileInput): Promise<MergeTileSummary | RegionPartsRef> {
  const nCells = t.cells.length;
  const nY = t.years.length;
  const rule = MONTHLY_COMPLETENESS;
  // The cells of each publication block: positions [c0, c1) in the tile's cells.
  const nLon = t.grid.lon.length;
  const blockCells = (t.regionsOnly ? [] : t.blocks).map((rows) => {
    const [c0, c1] = idsInRows(t.grid, t.cells, rows[0], rows[1]);
    return { rows, c0, c1, point: new PointTileStore(t.cells.slice(c0, c1)) };
  });
  const regionFile = new RegionPartWriter(join(t.scratchDir, `${t.id}.regions`));
  const hist = t.regions.length > 0 ? new Float64Array(2 * CELL_YEAR_HIST) : new Float64Array(0);
  const histTouched = new Uint8Array(MONTHS * HOURS);
  let defs: FigureDef[] | undefined;
  /** Per figure: values per year × tile cell × field, masked (NaN where a period does not count). */
  let stacks: Float64Array[] = [];
  // Mean annual temperature inputs: per year × month × cell.
  const airSum = new Float64Array(nY * MONTHS * nCells);
  const airHours = new Float64Array(nY * MONTHS * nCells);
  const expectedHours = new Float64Array(nY * MONTHS * nCells);
  // Workforce: shift hours per year × cell × period, for the share of work time lost.
  const wf = t.workforce;
  const shiftStack = wf ? new Float64Array(nY * nCells * PERIODS) : new Float64Array(0);
  try {
    for (let y = 0; y < nY; y++) {
      const files = t.partials[y];
      // One partial file at a time: the year's counts and one piece are held, never every piece.
      const merger = new YearMerger(t.years[y], t.cells, { subset: t.subset });
      for (const f of files) merger.add(readPartialFileSparse(f.path).partial, f.id);
      const yc: YearCounts = merger.finish();
      const figs = yearFigures(yc, rule.maxMissingHours);
      if (wf) {
        const lost = figs.find((f) => f.def.id === 'hours-lost-shift')!;
        figs.push({ def: personHoursDensityDef(), values: personHoursDensity(lost.values, wf.nEval, wf.people, wf.profile, wf.profileWeights, wf.areaKm2) });
        shiftStack.set(shiftHourValues(yc, rule.maxMissingHours), y * nCells * PERIODS);
      }
      if (defs === undefined) {
        defs = figs.map((f) => f.def);
        stacks = figs.map((f) => new Float64Array(nY * f.values.length));
      }
      figs.forEach((f, i) => stacks[i].set(f.values, y * f.values.length));
      for (let c = 0; c < nCells; c++) {
        for (let m = 0; m < MONTHS; m++) {
          const k = (y * MONTHS + m) * nCells + c;
          airSum[k] = yc.airSum[c * MONTHS + m] / 100;
          airHours[k] = yc.airHours[c * MONTHS + m];
          expectedHours[k] = yc.expectedHours[m];
        }
      }
      for (const b of blockCells) b.point.addYear(yc, b.c0);
      // Only the slots a region's cells add to are encoded and cleared again (a region of a few
      // cells touches a small part of the year's ~1.5 MB of pairs).
      const run = N_EXPOSURES * HIST_LEN;
      for (const rc of t.regions) {
        addWeightedHistograms(hist, yc.histogram, nCells, MONTHS * HOURS, run, rc, histTouched);
        regionFile.histogram(rc.region, y, hist, histTouched);
        for (let s = 0; s < histTouched.length; s++) {
          if (histTouched[s] === 0) continue;
          hist.fill(0, 2 * s * run, 2 * (s + 1) * run);
          histTouched[s] = 0;
        }
      }
    }
    defs ??= [...figureDefs([]), ...(wf ? [personHoursDensityDef()] : [])];

    // Normals per cell, the niche.
    const normals: CellFigureNormals[] = defs.map((def, i) => {
      const nItems = nCells * PERIODS * def.combos.length;
      const cell: Normals = computeNormals({ years: t.years, values: stacks[i], nItems }, { baseline: t.baseline, latestYear: t.latestYear, rule });
      return { def, cell };
    });
    // The trend of each cell's annual value (the trend layers): slope per decade and Mann–Kendall p-value per cell × combination.
    const trends = new Map<string, { slope: Float64Array; p: Float64Array }>();
    for (const id of TRENDED) {
      const i = defs.findIndex((d) => d.id === id);
      if (i < 0) continue;
      const nC = defs[i].combos.length;
      const tr = annualCellTrends({ years: t.years, values: stacks[i], nItems: nCells * PERIODS * nC }, nCells, nC, PERIODS);
      trends.set(id, { slope: tr.slopePerDecade, p: tr.pValue });
    }
    const annualMean = annualMeanFromMonthlySums({ years: t.years, nCells, sum: airSum, validHours: airHours, expectedHours });
    const a = assessNiche({ years: t.years, annualMean, nCells, baseline: t.baseline, latest: [t.latestYear, t.latestYear] });
    const niche: CellNiche = a;

    // Region parts: figure sums per year, highest cells, mean annual temperature sums.
    const mats = new Float64Array(2 * nCells);
    for (let c = 0; c < nCells; c++) {
      mats[2 * c] = a.baselineMat[c];
      mats[2 * c + 1] = a.latestMat[c];
    }
    for (const rc of t.regions) {
      const sums = defs.map((def, i) => {
        const nF = PERIODS * def.combos.length;
        const s = emptyFigureSums(nY, nF);
        for (let y = 0; y < nY; y++) addYearValues(s, y, stacks[i].subarray(y * nCells * nF, (y + 1) * nCells * nF), rc);
        addWorstCells(s, normals[i].cell.mean, rc);
        return s;
      });
      regionFile.figures(rc.region, sums);
      const pairs = new Float64Array(8);
      addWeightedMeans(pairs, mats, 2, rc);
      regionFile.means(rc.region, pairs);
    }
    if (wf && !t.regionsOnly) {
      // People-weighted sums (the band's own task writes them for every region of the band). of hours above the limit, hours lost and shift hours per worker.
      const above = defs.findIndex((d) => d.id === 'hours-above-limit-shift');
      const lost = defs.findIndex((d) => d.id === 'hours-lost-shift');
      for (const rc of wf.regions) {
        const sums = [above, lost].map((i) => {
          const nF = PERIODS * defs![i].combos.length;
          const s = emptyFigureSums(nY, nF);
          for (let y = 0; y < nY; y++) addYearValues(s, y, stacks[i].subarray(y * nCells * nF, (y + 1) * nCells * nF), rc);
          return s;
        });
        const shift = emptyFigureSums(nY, PERIODS);
        for (let y = 0; y < nY; y++) addYearValues(shift, y, shiftStack.subarray(y * nCells * PERIODS, (y + 1) * nCells * PERIODS), rc);
        regionFile.figures(rc.region, [...sums, shift], RECORD_WORKFORCE);
      }
    }
    stacks = [];
    if (t.regionsOnly) return { path: regionFile.path, records: regionFile.records };

    // Cell outputs: the table, the map's chunks, the niche entries, the calculator's point tiles.
    mkdirSync(join(t.dataDir, 'cell-tables'), { recursive: true });
    const cellTables: MergeTileSummary['cellTables'] = [];
    const pointChunks: PointChunkEntry[] = [];
    for (const b of blockCells) {
      const id = rowsId(b.rows);
      const table = new TextFile(join(t.dataDir, 'cell-tables', `${id}.csv`));
      const sub = normals.map((n) => ({ def: n.def, cell: sliceNormals(n.cell, b.c0 * PERIODS * n.def.combos.length, b.c1 * PERIODS * n.def.combos.length) }));
      cellTableCsv(sub, t.cells.slice(b.c0, b.c1), t.grid, (s) => table.add(s));
      table.close();
      cellTables.push({ path: `data/cell-tables/${id}.csv`, rows: b.rows, bytes: table.bytes });
      pointChunks.push(...(await b.point.write(t.dataDir, { years: t.years, prefix: `${id}-` })));
    }
    const chunks = cellFigureChunks(normals, t.cells, t.grid, niche, DEFAULT_CELL_TILE);
    const written = await writeCellChunks(t.dataDir, chunks);
    const cellChunks = written.map((w, i) => ({ ...w, firstCell: chunks[i].cells[0].cell }));
    const nicheFragment = join(t.scratchDir, `${t.id}.niche`);
    const nf = new TextFile(nicheFragment);
    nf.add(nicheCellsJson(a, t.cells, t.grid));
    nf.close();

    // The tile's rows of every gridded field.
    const fields = gridFields(defs);
    const piece = new GridPiece(t.rows, nLon, fields.length);
    for (const f of fields) {
      if (f.figure === 'mean-annual-temperature') {
        for (let c = 0; c < nCells; c++) {
          const v = a.baselineMat[c];
          piece.set(f.index, t.cells[c], f.statistic === 'class' ? (Number.isFinite(v) ? nicheClassCode(v) : NaN) : v);
        }
        continue;
      }
      const i = defs.findIndex((d) => d.id === f.figure);
      const n = normals[i];
      const nC = n.def.combos.length;
      if (f.statistic === 'trend' || f.statistic === 'trend-p') {
        const tr = trends.get(f.figure)!;
        const src = f.statistic === 'trend' ? tr.slope : tr.p;
        for (let c = 0; c < nCells; c++) piece.set(f.index, t.cells[c], src[c * nC + f.comboIndex]);
        continue;
      }
      const src = f.statistic === 'mean' ? n.cell.mean : f.statistic === 'median' ? n.cell.median : f.statistic === 'p90' ? n.cell.p90 : n.cell.yearsUsed;
      for (let c = 0; c < nCells; c++) piece.set(f.index, t.cells[c], src[(c * PERIODS + f.period) * nC + f.comboIndex]);
    }
    const fieldMin = new Float64Array(fields.length).fill(NaN);
    const fieldMax = new Float64Array(fields.length).fill(NaN);
    const per = (t.rows[1] - t.rows[0]) * nLon;
    for (let f = 0; f < fields.length; f++) {
      let lo = Infinity;
      let hi = -Infinity;
      const v = piece.values.subarray(f * per, (f + 1) * per);
      for (let i = 0; i < per; i++) {
        const x = v[i];
        if (x < lo) lo = x;
        if (x > hi) hi = x;
      }
      if (lo <= hi) {
        fieldMin[f] = lo;
        fieldMax[f] = hi;
      }
    }
    const pieceRef = piece.write(join(t.scratchDir, `${t.id}.grid`));
    return {
      id: t.id,
      rows: t.rows,
      cells: nCells,
      piece: pieceRef,
      fieldMin,
      fieldMax,
      regionParts: [{ path: regionFile.path, records: regionFile.records }],
      cellChunks,
      pointChunks,
      cellTables,
      nicheFragment,
    };
  } finally {
    regionFile.close();
  }
}

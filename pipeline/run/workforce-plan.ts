/**
 * The workforce part of a build's plan (config `workforce`, issue 17): the shares table checked
 * against the regions and evaluations, the raster checked to cover every region, then streamed
 * onto the land cells (workforce-aggregate.ts); each region's people (Σ people of its land cells ×
 * the share of the cell inside it) and each land cell's share profile for the map (the profile of
 * the region that covers most of the cell; cells outside every region take the default rows).
 * Memory: per land cell the people, a profile index and a share; no per-grid-cell array.
 */
import type { ResolvedConfig } from '../config/load.ts';
import type { WorkforceConfig } from '../config/schema.ts';
import { lowerBound, type HorizontalGrid } from '../model/grid.ts';
import type { Logger } from '../model/effects.ts';
import { readCsvRecords } from '../formats/csv-file.ts';
import { HeathoursError } from '../model/errors.ts';
import { annualShiftHours, type WorkEvaluation, type WorkShift } from '../work/index.ts';
import { describeGridCells, type CellWeights, type Region } from '../regions/index.ts';
import { parseWorkforceShares, type WorkforceShares } from '../regions/workforce-shares.ts';
import { intersectRectangles, regionAreaInRectangleSr, type LonLatRectangle } from '../regions/rectangle-area.ts';
import { WorkforceRasterNotCovering, WorkforceSharesColumns } from '../regions/errors.ts';
import { personHoursDensityDef, workforceRegionDefs } from '../regions/person-hours.ts';
import { regionCellPieces, type CellPiece } from '../regions/cell-pieces.ts';
import type { FigureDef } from '../reduce/figures.ts';
import { aggregateRasterFile, type AggregateOutcome } from './workforce-aggregate.ts';

/** A cell whose share inside a region is at least this counts as wholly inside [1]. */
const WHOLE_CELL = 1 - 1e-9;

/** Share of a region (its part inside the grid) the raster's extent must cover [1]. */
export const REQUIRED_RASTER_COVERAGE = 0.995;

export interface WorkforcePlan {
  config: WorkforceConfig;
  rasterPath: string;
  sharesPath: string;
  shares: WorkforceShares;
  /** People per land cell, in the order of the plan's cells [people]. */
  people: Float64Array;
  /** Share profile of each land cell for the map: a region index, `regions.length` for the default rows, −1 none. */
  profile: Int32Array;
  /** Per profile (regions, then the default), per evaluation: the weights [1] ((nRegions + 1) × nEval). */
  profileWeights: Float64Array;
  /** People of each region [people]: Σ over its land cells of the cell's people inside it. */
  regionPeople: Float64Array;
  /**
   * Per region, per land cell of its (land-masked) weights: the cell's people inside the region
   * [people] — the whole cell's where the region covers it, else the pixels inside the region
   * (each by the share of its area inside).
   */
  regionCellPeople: Float64Array[];
  /** Hours of a year of the shift pattern [h]: the yardstick of a full-time equivalent. */
  annualHours: number;
  /** The aggregation's counts: people off land, outside the grid; pixels. */
  aggregate: Omit<AggregateOutcome, 'cells' | 'people' | 'pieceSums'>;
  /** People on the land cells [people]. */
  peopleOnLand: number;
  /** Region figures and the per-cell figure. */
  regionDefs: FigureDef[];
  densityDef: FigureDef;
  seconds: number;
}

export async function planWorkforce(
  rc: ResolvedConfig,
  grid: HorizontalGrid,
  cells: Int32Array,
  regions: readonly Region[],
  weights: readonly CellWeights[],
  evaluations: readonly WorkEvaluation[],
  shift: WorkShift,
  log: Logger,
): Promise<WorkforcePlan | undefined> {
  const config = rc.config.workforce;
  if (!config || !rc.workforce) return undefined;
  const t0 = Date.now();
  const { raster: rasterPath, shares: sharesPath } = rc.workforce;
  const shares = parseWorkforceShares(
    await readShareRecords(sharesPath),
    sharesPath,
    regions.map((r) => r.id),
    evaluations.map((e) => ({ workloadClass: e.workloadClass.id, acclimatization: e.acclimatization, exposure: e.exposure })),
  );

  // The land cells each region covers only in part: their people come from the pixels inside it.
  const g = describeGridCells(grid);
  const pieces: CellPiece[] = [];
  weights.forEach((w, r) => {
    const partial = Array.from(w.cells).filter((_, j) => w.fraction[j] < WHOLE_CELL);
    pieces.push(...regionCellPieces(regions[r], r, g, partial));
  });
  const agg = await aggregateRasterFile(rasterPath, grid, cells, { check: (r) => checkCoverage(rasterPath, r, grid, regions), pieces });
  const pieceOf = new Map<string, number>();
  pieces.forEach((p, i) => pieceOf.set(`${p.region} ${p.cell}`, i));

  // People of each region, and each land cell's profile for the map.
  const nEval = evaluations.length;
  const regionPeople = new Float64Array(regions.length);
  const regionCellPeople: Float64Array[] = [];
  const profile = new Int32Array(cells.length).fill(shares.fallback ? regions.length : -1);
  const best = new Float64Array(cells.length);
  weights.forEach((w, r) => {
    const mine = new Float64Array(w.cells.length);
    let p = 0;
    for (let j = 0; j < w.cells.length; j++) {
      const k = landIndex(cells, w.cells[j]);
      if (k < 0) continue;
      const piece = w.fraction[j] < WHOLE_CELL ? pieceOf.get(`${r} ${w.cells[j]}`) : undefined;
      // A piece that clipped to nothing (a cell touched within rounding) holds no people.
      mine[j] = w.fraction[j] >= WHOLE_CELL ? agg.people[k] : piece === undefined ? 0 : Math.max(0, agg.pieceSums[piece]);
      p += mine[j];
      if (w.fraction[j] > best[k]) {
        best[k] = w.fraction[j];
        profile[k] = r;
      }
    }
    regionPeople[r] = p;
    regionCellPeople.push(mine);
  });
  const profileWeights = new Float64Array((regions.length + 1) * nEval);
  shares.regions.forEach((pr, r) => profileWeights.set(pr.evalWeights, r * nEval));
  if (shares.fallback) profileWeights.set(shares.fallback.evalWeights, regions.length * nEval);
  let peopleOnLand = 0;
  for (const v of agg.people) peopleOnLand += v;

  const { cells: _c, people, pieceSums: _p, ...counts } = agg;
  const seconds = (Date.now() - t0) / 1000;
  const fmt = (x: number) => Math.round(x).toLocaleString('en-US');
  log.info(
    `workforce: ${config.name} (${config.year}${config.invented ? ', invented' : ''}), ${agg.raster.width} × ${agg.raster.height} pixels of ${agg.raster.dLon.toPrecision(4)}°, ` +
      `${counts.strips} strip(s) of at most ${fmt(counts.peakStripPixels)} pixels in ${seconds.toFixed(1)} s: ${fmt(peopleOnLand)} people on the land cells, ` +
      `${fmt(agg.offLand)} over cells outside the land mask (not counted), ${fmt(agg.outsideGrid)} outside the grid`,
  );
  return {
    config,
    rasterPath,
    sharesPath,
    shares,
    people,
    profile,
    profileWeights,
    regionPeople,
    regionCellPeople,
    annualHours: annualShiftHours(shift),
    aggregate: counts,
    peopleOnLand,
    regionDefs: workforceRegionDefs([...new Set(evaluations.map((e) => e.workloadClass.id))]),
    densityDef: personHoursDensityDef(),
    seconds,
  };
}

/** The share table's records, the header first; an unclosed quote is a catalogued error of the table. */
async function readShareRecords(path: string): Promise<Array<[number, string[]]>> {
  const out: Array<[number, string[]]> = [];
  try {
    for await (const rec of readCsvRecords(path)) out.push(rec);
  } catch (e) {
    if (e instanceof HeathoursError) throw WorkforceSharesColumns({ file: path, detail: e.message }, { file: path });
    throw e;
  }
  return out;
}

/** Every region's part inside the grid must lie (to {@link REQUIRED_RASTER_COVERAGE}) inside the raster's extent. */
function checkCoverage(
  path: string,
  r: Pick<AggregateOutcome['raster'], 'west' | 'dLon' | 'width' | 'top' | 'dLatRow' | 'height'>,
  grid: HorizontalGrid,
  regions: readonly Region[],
): void {
  const g = describeGridCells(grid);
  const gridRect: LonLatRectangle = { west: g.lonEdges[0], east: g.lonEdges[g.nLon], south: g.latEdges[0], north: g.latEdges[g.nLat] };
  const y2 = r.top + r.dLatRow * r.height;
  const east = r.west + r.dLon * r.width;
  const parts: LonLatRectangle[] = [];
  for (let k = Math.ceil((gridRect.west - east) / 360); k <= Math.floor((gridRect.east - r.west) / 360); k++) {
    const x = intersectRectangles({ west: r.west + 360 * k, east: east + 360 * k, south: Math.min(r.top, y2), north: Math.max(r.top, y2) }, gridRect);
    if (x) parts.push(x);
  }
  for (const region of regions) {
    const inGrid = regionAreaInRectangleSr(region, gridRect);
    if (!(inGrid > 0)) continue;
    let covered = 0;
    for (const p of parts) covered += regionAreaInRectangleSr(region, p);
    const share = covered / inGrid;
    if (share < REQUIRED_RASTER_COVERAGE) {
      throw WorkforceRasterNotCovering(
        {
          file: path,
          region: `"${region.id}"`,
          covered: `${(100 * Math.max(0, share)).toFixed(1)} %`,
          extent: `lon ${round(r.west)} … ${round(east)}, lat ${round(Math.min(r.top, y2))} … ${round(Math.max(r.top, y2))}`,
        },
        { file: path },
      );
    }
  }
}

function round(x: number): number {
  return Math.round(x * 1e4) / 1e4;
}

/** Position of a global cell index among the land cells, −1 when it is not a land cell. */
function landIndex(cells: Int32Array, cell: number): number {
  const lo = lowerBound(cells, cell);
  return lo < cells.length && cells[lo] === cell ? lo : -1;
}

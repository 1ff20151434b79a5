/**
 * What the calculator knows about the atlas, fixed at build time (the page reads it from the
 * manifest and the calculator indexes and hands it to the browser in a data attribute): years,
 * baseline, time zone, the work settings the atlas was built with (classes, rest rate, limit
 * model, clothing, shift), the regions with their tiles, and the grid with the cell chunks.
 */
import type { Acclimatization, Exposure, LimitModelId, RestLocation, WorkShift } from '../../../pipeline/work/index.ts';

export interface EstimateClass {
  id: string;
  name: string;
  /** Work metabolic rate [W]. */
  metabolicRate: number;
  description: string;
}

export interface EstimateGrid {
  nLat: number;
  nLon: number;
  /** Centre of row 0 [° N] and column 0 [° E]; steps [°]. Cell id = row × nLon + column. */
  lat0: number;
  dLat: number;
  lon0: number;
  dLon: number;
}

export interface EstimateChunk {
  /** Path below the site root, e.g. `data/calculator/cells/0000.bin`. */
  path: string;
  firstCell: number;
  lastCell: number;
}

export interface EstimateContext {
  /** Years in every tile, ascending [year]. */
  years: number[];
  baseline: [number, number];
  /** IANA zone of the local hours. */
  timeZone: string;
  invented: boolean;
  /** Rest metabolic rate [W]. */
  restRate: number;
  classes: EstimateClass[];
  limitModel: LimitModelId;
  airMovement: boolean;
  /** The atlas's own settings: the calculator's defaults, which reproduce the region tables. */
  defaults: {
    classId: string;
    acclimatization: Acclimatization;
    exposure: Exposure;
    restLocation: RestLocation;
    clothing: { ensemble: string; hood: boolean } | { cav: number };
    shift: WorkShift;
  };
  regions: Array<{ id: string; name: string; path: string }>;
  /** Null when the atlas has no per-cell tiles. */
  cells: { grid: EstimateGrid; chunks: EstimateChunk[] } | null;
}

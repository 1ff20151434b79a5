/**
 * What the publish writers take: each figure's normals (pipeline/climate/normals.ts) over a set of
 * cells or for one region, with the figure's definition (pipeline/reduce/figures.ts).
 */
import type { NicheAssessment, Normals, Trends } from '../climate/index.ts';
import type { FigureDef } from '../reduce/figures.ts';

/** One figure's normals per cell of a set of cells: items (cell · PERIODS + period) · nCombo + combo. */
export interface CellFigureNormals {
  def: FigureDef;
  cell: Normals;
}

/**
 * One figure's normals for one region (items period · nCombo + combo), and per item the highest
 * baseline mean of any cell of the region [unit of the figure].
 */
export interface RegionFigureNormals {
  def: FigureDef;
  region: Normals;
  worstValue: Float64Array;
  /** The trend of the annual value per combination (item k = combo k of period `year`; pipeline/climate/trend.ts); absent: no trend rows. */
  trend?: Trends;
}

/** The niche per cell of a set of cells (pipeline/climate/niche-assessment.ts). */
export type CellNiche = Pick<NicheAssessment, 'baselineMat' | 'latestMat' | 'shift' | 'baselineClass' | 'baselineDistance'>;

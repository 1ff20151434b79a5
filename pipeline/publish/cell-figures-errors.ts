/** Catalogued errors of the per-cell figure chunks (pipeline/publish/cell-figures.ts). */
import { defineError } from '../model/errors.ts';

export const CellTileInvalid = defineError<{ rows: number; cols: number }>({
  code: 'CellTileInvalid',
  title: 'The tile size of the per-cell figure chunks is invalid',
  message: (p) => `tile ${p.rows} rows × ${p.cols} columns: both must be whole numbers of at least 1`,
  hint: () => 'pass a tile of whole grid rows and columns, e.g. { rows: 4, cols: 4 } (the default)',
});

export const CellOutsideGrid = defineError<{ cell: number; nGrid: number }>({
  code: 'CellOutsideGrid',
  title: 'A land cell lies outside the grid of the per-cell figures',
  message: (p) => `land cell ${p.cell} is not an index of the ${p.nGrid}-cell grid (0 … ${p.nGrid - 1})`,
  hint: () => 'the land-cell list must hold row-major global grid indices (y · nLon + x) of the same grid; this is a bug in the caller',
});

export const CellFigureMissing = defineError<{ figure: string; present: string[] }>({
  code: 'CellFigureMissing',
  title: 'A figure the per-cell chunks must hold was not computed',
  message: (p) => `no figure "${p.figure}" among the computed figures (${p.present.join(', ') || 'none'})`,
  hint: () => 'pass the figure normals of pipeline/run/climate-step.ts for every figure of CELL_FIGURES; atlas-cells.csv needs the same ones',
});

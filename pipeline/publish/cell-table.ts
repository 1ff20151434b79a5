/**
 * The per-cell tables (`data/cell-tables/<tile>.csv`, one per merge tile, for spreadsheets): per
 * land cell, period and work evaluation, the baseline mean, median and 90th-percentile year of
 * shift hours above the limit and shift hours lost per worker [h]. One row per cell × period ×
 * figure × evaluation; statistics as columns. Rows are handed to `emit` in pieces, so a tile's
 * table is never one string.
 */
import type { CellFigureNormals } from './figure-normals.ts';
import { PERIODS } from '../reduce/figures.ts';
import { comboColumns } from './combo.ts';
import { csvLine, roundTo } from './csv.ts';
import { periodLabel } from './region-table.ts';

export const CELL_TABLE_FIGURES = ['hours-above-limit-shift', 'hours-lost-shift'];

export const CELL_TABLE_COLUMNS = ['cell_id', 'lat', 'lon', 'period', 'figure', 'workload_class', 'acclimatization', 'exposure', 'mean', 'median', 'p90', 'unit', 'years_used'];

/**
 * Emits the table of `cells` (with a header line when `header`), one cell's rows at a time.
 * @param emit receives consecutive pieces of the CSV text
 */
export function cellTableCsv(figures: readonly CellFigureNormals[], cells: Int32Array, lat: Float64Array, lon: Float64Array, emit: (text: string) => void, header = true): void {
  const nLon = lon.length;
  if (header) emit(csvLine(CELL_TABLE_COLUMNS));
  const chosen = figures.filter((f) => CELL_TABLE_FIGURES.includes(f.def.id));
  for (let c = 0; c < cells.length; c++) {
    const parts: string[] = [];
    const g = cells[c];
    const la = lat[Math.floor(g / nLon)];
    const lo = lon[g % nLon];
    for (let p = 0; p < PERIODS; p++) {
      for (const fn of chosen) {
        const def = fn.def;
        const nC = def.combos.length;
        for (let k = 0; k < nC; k++) {
          const i = (c * PERIODS + p) * nC + k;
          const cc = comboColumns(def.id, def.combos[k]);
          parts.push(csvLine([g, roundTo(la, 4), roundTo(lo, 4), periodLabel(p), def.id, cc.workload_class, cc.acclimatization, cc.exposure,
            roundTo(fn.cell.mean[i], 2), roundTo(fn.cell.median[i], 2), roundTo(fn.cell.p90[i], 2), def.units, fn.cell.yearsUsed[i]]));
        }
      }
    }
    emit(parts.join(''));
  }
}

/**
 * The per-cell tables (`data/cell-tables/<tile>.csv`, one per merge tile, for spreadsheets): per
 * land cell, period and work evaluation, the baseline mean, median and 90th-percentile year of
 * shift hours above the limit and shift hours lost per worker [h]. One row per cell × period ×
 * figure × evaluation; statistics as columns. Rows are handed to `emit` in pieces, so a tile's
 * table is never one string.
 */
import type { CellFigureNormals } from './figure-normals.ts';
import { cellCentre, type HorizontalGrid } from '../model/grid.ts';
import { PERIODS } from '../reduce/figures.ts';
import { comboColumns } from './combo.ts';
import { csvField, csvLine, roundTo } from '../formats/csv.ts';
import { periodLabel } from './region-table.ts';

export const CELL_TABLE_FIGURES = ['hours-above-limit-shift', 'hours-lost-shift'];

export const CELL_TABLE_COLUMNS = [
  'cell_id',
  'lat',
  'lon',
  'period',
  'figure',
  'workload_class',
  'acclimatization',
  'exposure',
  'mean',
  'median',
  'p90',
  'unit',
  'years_used',
];

/** A number as csvLine writes `roundTo(v, 2)`: two decimals at most, trailing zeros dropped, empty when not finite. */
function hundredths(v: number): string {
  return Number.isFinite(v) ? String(Math.round(v * 100) / 100) : '';
}

/**
 * Emits the table of `cells` (with a header line when `header`), one cell's rows at a time. The
 * text of each row equals `csvLine` of its fields: the fields that repeat from cell to cell (period,
 * figure, class, acclimatization, exposure, unit) are quoted once per table, the cell's id and
 * coordinates once per cell.
 * @param emit receives consecutive pieces of the CSV text
 */
export function cellTableCsv(
  figures: readonly CellFigureNormals[],
  cells: Int32Array,
  grid: HorizontalGrid,
  emit: (text: string) => void,
  header = true,
): void {
  if (header) emit(csvLine(CELL_TABLE_COLUMNS));
  const chosen = figures.filter((f) => CELL_TABLE_FIGURES.includes(f.def.id));
  // Per period × chosen figure × combination: the text between the coordinates and the mean, and
  // between the P90 and the years used.
  const middle: string[] = [];
  const unit: string[] = [];
  for (let p = 0; p < PERIODS; p++) {
    for (const fn of chosen) {
      const def = fn.def;
      for (const key of def.combos) {
        const cc = comboColumns(def.id, key);
        middle.push(`,${[periodLabel(p), def.id, cc.workload_class, cc.acclimatization, cc.exposure].map(csvField).join(',')},`);
        unit.push(`,${csvField(def.units)},`);
      }
    }
  }
  for (let c = 0; c < cells.length; c++) {
    const g = cells[c];
    const { lat, lon } = cellCentre(grid, g);
    const head = [g, roundTo(lat, 4), roundTo(lon, 4)].map(csvField).join(',');
    let text = '';
    let r = 0;
    for (let p = 0; p < PERIODS; p++) {
      for (const fn of chosen) {
        const nC = fn.def.combos.length;
        const { mean, median, p90, yearsUsed } = fn.cell;
        for (let k = 0; k < nC; k++, r++) {
          const i = (c * PERIODS + p) * nC + k;
          text += `${head}${middle[r]}${hundredths(mean[i])},${hundredths(median[i])},${hundredths(p90[i])}${unit[r]}${csvField(yearsUsed[i])}\n`;
        }
      }
    }
    emit(text);
  }
}

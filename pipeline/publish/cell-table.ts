/**
 * The atlas-wide table (`data/atlas-cells.csv`): per land cell, period and work evaluation, the
 * baseline mean, median and 90th-percentile year of shift hours above the limit and shift hours
 * lost per worker [h]. One row per cell × period × figure × evaluation; statistics as columns.
 */
import type { FigureNormals } from '../run/climate-step.ts';
import { PERIODS } from '../run/figures.ts';
import { comboColumns } from './combo.ts';
import { csvLine, roundTo } from '../formats/csv.ts';
import { periodLabel } from './region-table.ts';

export const CELL_TABLE_FIGURES = ['hours-above-limit-shift', 'hours-lost-shift'];

export function cellTableCsv(figures: readonly FigureNormals[], cells: Int32Array, lat: Float64Array, lon: Float64Array): string {
  const nLon = lon.length;
  const parts: string[] = [csvLine(['cell_id', 'lat', 'lon', 'period', 'figure', 'workload_class', 'acclimatization', 'exposure', 'mean', 'median', 'p90', 'unit', 'years_used'])];
  const chosen = figures.filter((f) => CELL_TABLE_FIGURES.includes(f.series.def.id));
  for (let c = 0; c < cells.length; c++) {
    const g = cells[c];
    const la = lat[Math.floor(g / nLon)];
    const lo = lon[g % nLon];
    for (let p = 0; p < PERIODS; p++) {
      for (const fn of chosen) {
        const def = fn.series.def;
        const nC = def.combos.length;
        for (let k = 0; k < nC; k++) {
          const i = (c * PERIODS + p) * nC + k;
          const cc = comboColumns(def.id, def.combos[k]);
          parts.push(csvLine([g, roundTo(la, 4), roundTo(lo, 4), periodLabel(p), def.id, cc.workload_class, cc.acclimatization, cc.exposure,
            roundTo(fn.cell.mean[i], 2), roundTo(fn.cell.median[i], 2), roundTo(fn.cell.p90[i], 2), def.units, fn.cell.yearsUsed[i]]));
        }
      }
    }
  }
  return parts.join('');
}

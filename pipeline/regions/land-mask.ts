/**
 * Combines a region's cell weights with a land mask: each cell's area is multiplied by its land
 * value (a 0/1 flag, or a land fraction [1] if the lead prefers fractional land), cells with no
 * land are dropped and the weights are renormalised to sum to 1. `fraction` stays the share of
 * the cell inside the region; `coveredFraction` becomes the share of the region's area that is
 * inside the grid and on land.
 */
import { RegionFieldShape, RegionNoLandCells } from './errors.ts';
import type { CellWeights } from './cell-weights.ts';

/**
 * @param w Cell weights of one region (cell-weights.ts)
 * @param land Per grid cell, row-major, land flag or fraction in 0…1 [1]
 */
export function applyLandMask(w: CellWeights, land: ArrayLike<number>): CellWeights {
  const cells: number[] = [];
  const fraction: number[] = [];
  const area: number[] = [];
  let covered = 0;
  for (let k = 0; k < w.cells.length; k++) {
    const c = w.cells[k];
    if (c >= land.length) {
      throw RegionFieldShape({ detail: `the land mask has ${land.length} cells but region "${w.regionId}" uses cell ${c}` }, { variable: 'land mask' });
    }
    const l = land[c];
    if (!(l > 0)) continue;
    const a = w.area[k] * Math.min(1, l);
    cells.push(c);
    fraction.push(w.fraction[k]);
    area.push(a);
    covered += a;
  }
  if (cells.length === 0) throw RegionNoLandCells({ region: `"${w.regionId}"` }, { file: w.file });
  return {
    ...w,
    cells: Uint32Array.from(cells),
    fraction: Float64Array.from(fraction),
    area: Float64Array.from(area),
    weight: Float64Array.from(area, (a) => a / covered),
    coveredArea: covered,
    coveredFraction: Math.min(1, covered / w.regionArea),
    landMasked: true,
  };
}

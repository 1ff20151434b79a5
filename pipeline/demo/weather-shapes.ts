/**
 * Shapes in space and time of the invented demo weather: the lattice of weather nodes the
 * day-to-day anomalies live on (bilinear weights per cell), the diurnal temperature shape and
 * the sea-breeze cycle, both functions of local solar time [h]. All invented.
 */
import type { CellClimate } from './cell-climate.ts';

/** Node lattice of the day-to-day weather [° N] × [° E]. */
export const NODE_LAT = [15.5, 18.6, 21.7, 24.8];
export const NODE_LON = [-151.0, -147.6, -144.2, -140.8];
export const N_NODES = NODE_LAT.length * NODE_LON.length;

/** Bilinear weights of the node lattice for each cell (clamped at the lattice edges). */
export function latticeWeights(cc: CellClimate): { idx: Int32Array; w: Float32Array } {
  const idx = new Int32Array(4 * cc.nCells);
  const w = new Float32Array(4 * cc.nCells);
  const locate = (x: number, axis: number[]): [number, number] => {
    const n = axis.length;
    if (x <= axis[0]) return [0, 0];
    if (x >= axis[n - 1]) return [n - 2, 1];
    let k = 0;
    while (x > axis[k + 1]) k++;
    return [k, (x - axis[k]) / (axis[k + 1] - axis[k])];
  };
  for (let c = 0; c < cc.nCells; c++) {
    const [a, fy] = locate(cc.lat[c], NODE_LAT);
    const [b, fx] = locate(cc.lon[c], NODE_LON);
    const nl = NODE_LON.length;
    idx[4 * c] = a * nl + b;
    idx[4 * c + 1] = a * nl + b + 1;
    idx[4 * c + 2] = (a + 1) * nl + b;
    idx[4 * c + 3] = (a + 1) * nl + b + 1;
    w[4 * c] = (1 - fy) * (1 - fx);
    w[4 * c + 1] = (1 - fy) * fx;
    w[4 * c + 2] = fy * (1 - fx);
    w[4 * c + 3] = fy * fx;
  }
  return { idx, w };
}

/** Diurnal temperature shape [–]: −1 at 06 local solar time, +1 at 14:30, smooth. */
export function diurnalShape(lst: number): number {
  const h = ((lst % 24) + 24) % 24;
  if (h >= 6 && h < 14.5) return -Math.cos((Math.PI * (h - 6)) / 8.5);
  const since = h >= 14.5 ? h - 14.5 : h + 9.5;
  return Math.cos((Math.PI * since) / 15.5);
}

/** Sea-breeze strength [–]: onshore 09–19 local solar time (peak 14), weak offshore 21–05. */
export function seaBreezeShape(lst: number): number {
  const h = ((lst % 24) + 24) % 24;
  if (h >= 9 && h <= 19) return Math.sin((Math.PI * (h - 9)) / 10);
  const n = h >= 21 ? h - 21 : h + 3;
  return n <= 8 ? -0.3 * Math.sin((Math.PI * n) / 8) : 0;
}

export { expectCatalogued } from '../helpers/catalogued.ts';
import type { HorizontalGrid } from '../../pipeline/model/grid.ts';

/** A regular grid of cell centres: nLat rows from lat0, nLon columns from lon0, spacing d [°]. */
export function grid(lat0: number, nLat: number, lon0: number, nLon: number, d = 1): HorizontalGrid {
  return {
    lat: Float64Array.from({ length: nLat }, (_, j) => lat0 + j * d),
    lon: Float64Array.from({ length: nLon }, (_, i) => lon0 + i * d),
  };
}

type Pos = [number, number];

/** A GeoJSON Feature with a Polygon; rings are closed here if `close`. */
export function polygonFeature(id: string, rings: Pos[][], close = true, name = `Region ${id}`) {
  return {
    type: 'Feature',
    properties: { id, name },
    geometry: { type: 'Polygon', coordinates: rings.map((r) => (close ? [...r, r[0]] : r)) },
  };
}

export function collection(...features: unknown[]) {
  return { type: 'FeatureCollection', features };
}

/** Axis-aligned rectangle ring, counter-clockwise [° E, ° N]. */
export function rect(w: number, s: number, e: number, n: number): Pos[] {
  return [
    [w, s],
    [e, s],
    [e, n],
    [w, n],
  ];
}

/**
 * 1,000 invented regions: a jittered 25 × 40 lattice of quadrilaterals exactly covering 30–45 °E,
 * 10–20 °N (interior vertices moved by up to ±15 % of a step, seeded; outer edges straight), as
 * a GeoJSON FeatureCollection with ids `q-<row>-<column>`. Tiles a 40 × 60 grid of 0.25° cells.
 */
export function jitteredLattice() {
  const d = 0.25;
  const ny = 25;
  const nx = 40;
  const [W, S, E, N] = [30, 10, 30 + 60 * d, 10 + 40 * d];
  let seed = 7;
  const rnd = () => (seed = (seed * 16807) % 2147483647) / 2147483647 - 0.5;
  const vx: number[][] = [];
  const vy: number[][] = [];
  for (let j = 0; j <= ny; j++) {
    vx.push([]);
    vy.push([]);
    for (let i = 0; i <= nx; i++) {
      const edgeX = i === 0 || i === nx;
      const edgeY = j === 0 || j === ny;
      vx[j].push(W + ((E - W) * i) / nx + (edgeX ? 0 : 0.3 * rnd() * ((E - W) / nx)));
      vy[j].push(S + ((N - S) * j) / ny + (edgeY ? 0 : 0.3 * rnd() * ((N - S) / ny)));
    }
  }
  const features = [];
  for (let j = 0; j < ny; j++)
    for (let i = 0; i < nx; i++) {
      const ring: Pos[] = [
        [vx[j][i], vy[j][i]],
        [vx[j][i + 1], vy[j][i + 1]],
        [vx[j + 1][i + 1], vy[j + 1][i + 1]],
        [vx[j + 1][i], vy[j + 1][i]],
      ];
      features.push(polygonFeature(`q-${j}-${i}`, [ring]));
    }
  return collection(...features);
}

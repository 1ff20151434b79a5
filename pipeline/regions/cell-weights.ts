/**
 * Region ↔ grid-cell weights: for each region, every grid cell it overlaps with the share of the
 * cell inside the region and the cell's share of the region, by exact clipping of the polygon
 * against each cell rectangle (clip-rectangle.ts) and exact areas on the sphere
 * (spherical-area.ts). Holes subtract. A region may lie partly outside the grid (the covered
 * share is reported); one that misses it entirely is a RegionOutsideGrid error.
 *
 * Antimeridian: region rings are continuous in longitude (region.ts) and the grid's longitudes are
 * continuous too; each polygon is tried at every 360° offset that overlaps the grid, so a region
 * written as 175…185 or as 175…−175 matches a grid running 170…190 or −180…180 alike.
 */
import { cellIndex, type HorizontalGrid } from '../model/grid.ts';
import { RegionOutsideGrid } from './errors.ts';
import { ClipBuffer, clipHalfPlane } from './clip-rectangle.ts';
import { cellAreaSr, describeGridCells, type GridCells } from './grid-cells.ts';
import type { Region } from './region.ts';
import { planarSignedArea2 } from './ring-prep.ts';
import { EARTH_RADIUS_KM, ringAreaSr } from './spherical-area.ts';

/** A region's cells, sparse, in ascending cell index. */
export interface CellWeights {
  regionId: string;
  file: string;
  /** Cell indices (row · nLon + column) [index]. */
  cells: Uint32Array;
  /** Share of each cell's area inside the region [1], 0 < fraction ≤ 1. */
  fraction: Float64Array;
  /** Area of the region inside each cell [km²] (sphere of radius EARTH_RADIUS_KM). */
  area: Float64Array;
  /** Each cell's share of the region's covered area [1]; sums to 1. Use for area-weighted means. */
  weight: Float64Array;
  /** Area of the whole region [km²]. */
  regionArea: number;
  /** Area of the region inside the grid (and on land, after a mask) [km²]. */
  coveredArea: number;
  /** coveredArea / regionArea [1]. */
  coveredFraction: number;
  /** Whether a land mask was applied (land-mask.ts). */
  landMasked: boolean;
}

/** Shares below this are treated as touching, not overlapping [1]. */
const MIN_FRACTION = 1e-12;

const scratch = { ring: new ClipBuffer(), a: new ClipBuffer(), strip: new ClipBuffer(), b: new ClipBuffer(), piece: new ClipBuffer() };

/**
 * Cell weights of one region on a grid.
 * @param region A parsed region (parse-regions.ts)
 * @param grid The horizontal grid, or its cells from describeGridCells (faster for many regions)
 */
export function regionCellWeights(region: Region, grid: HorizontalGrid | GridCells): CellWeights {
  const g = 'latEdges' in grid ? grid : describeGridCells(grid);
  const { nLon, dLat, dLon, latEdges, lonEdges } = g;
  const lat0 = g.lat[0] - dLat / 2; // unclamped south edge of row 0
  const gridW = lonEdges[0];
  const gridE = lonEdges[nLon];
  const acc = new Map<number, number>();
  let regionSr = 0;

  for (const poly of region.polygons) {
    for (let r = 0; r < poly.rings.length; r++) regionSr += (r === 0 ? 1 : -1) * Math.abs(ringAreaSr(poly.rings[r]));
    const [w, s, e, n] = poly.bbox;
    const j0 = Math.max(0, Math.floor((s - lat0) / dLat));
    const j1 = Math.min(g.nLat - 1, Math.floor((n - lat0) / dLat));
    if (j0 > j1) continue;
    for (let k = Math.ceil((gridW - e) / 360); k <= Math.floor((gridE - w) / 360); k++) {
      const shift = 360 * k;
      if (w + shift >= gridE || e + shift <= gridW) continue;
      for (let r = 0; r < poly.rings.length; r++) {
        const src = poly.rings[r];
        const nc = src.length / 2;
        const sign = (r === 0 ? 1 : -1) * Math.sign(planarSignedArea2(src));
        const ring = scratch.ring.ensure(nc);
        for (let i = 0; i < src.length; i += 2) {
          ring[i] = src[i] + shift;
          ring[i + 1] = src[i + 1];
        }
        for (let j = j0; j <= j1; j++) {
          let m = clipHalfPlane(ring, nc, 1, latEdges[j], true, scratch.a);
          if (m < 3) continue;
          m = clipHalfPlane(scratch.a.data, m, 1, latEdges[j + 1], false, scratch.strip);
          if (m < 3) continue;
          const strip = scratch.strip.data;
          let sw = Infinity,
            se = -Infinity;
          for (let i = 0; i < m; i++) {
            sw = Math.min(sw, strip[2 * i]);
            se = Math.max(se, strip[2 * i]);
          }
          const i0 = Math.max(0, Math.floor((sw - gridW) / dLon));
          const i1 = Math.min(nLon - 1, Math.floor((se - gridW) / dLon));
          for (let i = i0; i <= i1; i++) {
            let q = clipHalfPlane(strip, m, 0, lonEdges[i], true, scratch.b);
            if (q < 3) continue;
            q = clipHalfPlane(scratch.b.data, q, 0, lonEdges[i + 1], false, scratch.piece);
            if (q < 3) continue;
            const a = sign * ringAreaSr(scratch.piece.data, q);
            if (a === 0) continue;
            const cell = cellIndex(g, j, i);
            acc.set(cell, (acc.get(cell) ?? 0) + a);
          }
        }
      }
    }
  }

  const keys = [...acc.keys()].sort((a, b) => a - b);
  const cells: number[] = [];
  const fraction: number[] = [];
  const areaSr: number[] = [];
  for (const cell of keys) {
    const cellSr = cellAreaSr(g, cell);
    const a = acc.get(cell)!;
    const f = a / cellSr;
    if (!(f > MIN_FRACTION)) continue;
    cells.push(cell);
    fraction.push(Math.min(1, f));
    areaSr.push(Math.min(a, cellSr));
  }
  const R2 = EARTH_RADIUS_KM * EARTH_RADIUS_KM;
  const regionArea = regionSr * R2;
  if (cells.length === 0) {
    const [w, s, e, n] = regionBbox(region);
    throw RegionOutsideGrid(
      {
        region: `"${region.id}"`,
        bbox: `lon ${w}…${e}, lat ${s}…${n}`,
        grid: `cells span lon ${gridW}…${gridE}, lat ${latEdges[0]}…${latEdges[g.nLat]}`,
      },
      { file: region.file, key: `features[${region.feature}]` },
    );
  }
  const area = Float64Array.from(areaSr, (a) => a * R2);
  let covered = 0;
  for (const a of area) covered += a;
  const weight = area.map((a) => a / covered);
  return {
    regionId: region.id,
    file: region.file,
    cells: Uint32Array.from(cells),
    fraction: Float64Array.from(fraction),
    area,
    weight,
    regionArea,
    coveredArea: covered,
    coveredFraction: Math.min(1, covered / regionArea),
    landMasked: false,
  };
}

/** [west, south, east, north] over all polygons of a region [° E, ° N]. */
export function regionBbox(region: Region): [number, number, number, number] {
  let w = Infinity,
    s = Infinity,
    e = -Infinity,
    n = -Infinity;
  for (const p of region.polygons) {
    w = Math.min(w, p.bbox[0]);
    s = Math.min(s, p.bbox[1]);
    e = Math.max(e, p.bbox[2]);
    n = Math.max(n, p.bbox[3]);
  }
  return [w, s, e, n];
}

/**
 * Cell weights of many regions on one grid (the grid is described once).
 * @param onRegion Called after each region (for progress)
 */
export function allRegionCellWeights(regions: readonly Region[], grid: HorizontalGrid, onRegion?: () => void): CellWeights[] {
  const g = describeGridCells(grid);
  return regions.map((r) => {
    const w = regionCellWeights(r, g);
    onRegion?.();
    return w;
  });
}

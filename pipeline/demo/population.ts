/**
 * The demo's invented population raster: people per pixel for the invented territory (Quellmar),
 * for the atlas's workforce weighting. INVENTED: no census, survey or real population product is
 * behind any number here; the towns, densities and the offshore settlement are made up.
 *
 * Pixels of 0.02° (about 2 km, not a divisor of the demo's 0.25° cells, so pixels straddle cells)
 * over lon −150.2…−141.6, lat 16.0…24.2: the whole default demo grid. Density [people km⁻²]:
 * a rural density that is highest near the coast and falls with height (the upland) and in the
 * dry basin, plus four Gaussian towns; times each pixel's area on the sphere. People live on the
 * land cells of the default demo grid only (a pixel touching a cell whose land fraction is below
 * the demo's 0.5 threshold holds nobody), except a small settlement offshore, on a sea cell outside
 * every district, so the build has people over sea cells to report.
 */
import { EARTH_RADIUS_KM, rectangleAreaSr } from '../regions/spherical-area.ts';
import { makeCellClimate } from './cell-climate.ts';
import { distanceToRingKm, pointInRing, type LonLat } from './geometry.ts';
import { BASIN, CENTRE, DEFAULT_GRID, OUTLINE, UPLAND, placeGrid } from './territory.ts';

/** File name of the raster in the demo folder. */
export const POPULATION_FILE = 'workforce-people.tif';

/** The raster's pixels: west and north edges [° E, ° N], size [°], columns and rows. */
export const POPULATION_PIXELS = { west: -150.2, north: 24.2, size: 0.02, width: 430, height: 410 } as const;

/** Land-fraction threshold of the demo atlas (content/atlas.yaml `dataset.landSeaMask.threshold`). */
const LAND_THRESHOLD = 0.5;

/** An invented town: centre [° E, ° N], peak density [people km⁻²], Gaussian width [°]. */
interface Town {
  at: LonLat;
  peak: number;
  sigmaDeg: number;
}

/** A point on the way from the island's centre to outline vertex k [° E, ° N]. */
function towards(k: number, t: number): LonLat {
  const v = OUTLINE[k];
  return [CENTRE[0] + t * (v[0] - CENTRE[0]), CENTRE[1] + t * (v[1] - CENTRE[1])];
}

/** Four invented towns: two on the coasts west and north, one on the south-east coast, one in the basin. */
const TOWNS: readonly Town[] = [
  { at: towards(26, 0.8), peak: 2200, sigmaDeg: 0.14 },
  { at: towards(11, 0.78), peak: 1300, sigmaDeg: 0.12 },
  { at: towards(44, 0.8), peak: 1600, sigmaDeg: 0.13 },
  { at: [BASIN.centre[0] + 0.3, BASIN.centre[1] - 0.2], peak: 500, sigmaDeg: 0.18 },
];

/** The invented offshore settlement: centre, density [people km⁻²] and width [°]. */
const OFFSHORE: Town = { at: [-141.95, 20.55], peak: 60, sigmaDeg: 0.03 };

function gaussian(lon: number, lat: number, at: LonLat, sigmaDeg: number): number {
  const dx = (lon - at[0]) * Math.cos((lat * Math.PI) / 180);
  const dy = lat - at[1];
  return Math.exp(-(dx * dx + dy * dy) / (2 * sigmaDeg * sigmaDeg));
}

/** Invented people per km² at a point. */
function density(lon: number, lat: number): number {
  if (!pointInRing(lon, lat, OUTLINE)) return OFFSHORE.peak * gaussian(lon, lat, OFFSHORE.at, OFFSHORE.sigmaDeg);
  const coastKm = distanceToRingKm(lon, lat, OUTLINE);
  const upland = gaussian(lon, lat, UPLAND.centre, UPLAND.sigmaDeg);
  const basin = gaussian(lon, lat, BASIN.centre, BASIN.sigmaDeg);
  let d = (10 + 70 * Math.exp(-coastKm / 25)) * (1 - 0.7 * upland) * (1 - 0.4 * basin);
  for (const t of TOWNS) d += t.peak * gaussian(lon, lat, t.at, t.sigmaDeg);
  return d;
}

/**
 * The raster as the GeoTIFF writer takes it (pipeline/publish/layers/geotiff-write.ts): pixel-centre
 * latitudes ascending, longitudes ascending, values row-major from the south [people per pixel].
 */
export function demoPopulation(): { lat: Float64Array; lon: Float64Array; values: Float32Array } {
  const { west, north, size, width, height } = POPULATION_PIXELS;
  const south = north - height * size;
  // The default demo grid's land cells (rows north to south in the demo's file order).
  const grid = placeGrid(DEFAULT_GRID);
  const land = makeCellClimate(grid).landFraction;
  const r = grid.resolution;
  const gNorth = grid.lat[0] + r / 2;
  const gWest = (grid.lon360[0] > 180 ? grid.lon360[0] - 360 : grid.lon360[0]) - r / 2;
  const onLand = (lon: number, lat: number): boolean => {
    const i = Math.floor((gNorth - lat) / r);
    const j = Math.floor((lon - gWest) / r);
    if (i < 0 || j < 0 || i >= grid.nLat || j >= grid.nLon) return false;
    return land[i * grid.nLon + j] >= LAND_THRESHOLD;
  };
  const lat = Float64Array.from({ length: height }, (_, k) => +(south + (k + 0.5) * size).toFixed(6));
  const lon = Float64Array.from({ length: width }, (_, k) => +(west + (k + 0.5) * size).toFixed(6));
  const values = new Float32Array(width * height);
  const R2 = EARTH_RADIUS_KM * EARTH_RADIUS_KM;
  const eps = 1e-9;
  for (let y = 0; y < height; y++) {
    const s = south + y * size;
    const area = R2 * rectangleAreaSr(0, size, s, s + size);
    for (let x = 0; x < width; x++) {
      const w = west + x * size;
      const cLon = w + size / 2;
      const cLat = s + size / 2;
      const island = pointInRing(cLon, cLat, OUTLINE);
      // A pixel on the island holds people only if all of it lies over land cells of the default grid.
      if (island && !(onLand(w + eps, s + eps) && onLand(w + size - eps, s + eps) && onLand(w + eps, s + size - eps) && onLand(w + size - eps, s + size - eps)))
        continue;
      values[y * width + x] = Math.round(density(cLon, cLat) * area * 10) / 10;
    }
  }
  return { lat, lon, values };
}

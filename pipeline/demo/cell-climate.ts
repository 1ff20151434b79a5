/**
 * The invented climate of each grid cell: static parameters the hourly generator reads
 * (land fraction, height, distance from the coast, how much of the dry basin and of the coast
 * the cell feels, the onshore direction for the sea breeze, and the seasonal means).
 *
 * Every number here is invented for the demo and tuned by eye to a hot, humid trade-wind island
 * with a dry lee basin and a cooler windward upland; none is a description of a real place.
 * Cells are in file order: row i north to south, column j west to east, `c = i·nLon + j`.
 */
import { distanceToRingKm, KM_PER_DEG_LAT, pointInRing } from './geometry.ts';
import { BASIN, OUTLINE, UPLAND, type DemoGrid } from './territory.ts';

/** Per-cell parameters, each a Float32Array of nLat·nLon values. */
export interface CellClimate {
  grid: DemoGrid;
  nCells: number;
  /** Cell-centre latitude [° N] and longitude [° E, −180..180]. */
  lat: Float64Array;
  lon: Float64Array;
  /** Land fraction of the cell [0–1] (ERA5 `lsm` style: area fraction). */
  landFraction: Float32Array;
  /** Grid-box mean surface height [m]. */
  heightM: Float32Array;
  /** Signed distance of the centre from the coastline [km], positive inland. */
  coastDistanceKm: Float32Array;
  /** Weight of the coast (sea air) [0–1]: 1 at the shore, falling inland and offshore. */
  coastal: Float32Array;
  /** Weight of the dry basin [0–1]. */
  basin: Float32Array;
  /** Unit vector pointing inland (onshore wind direction) [–], east and north components. */
  onshoreE: Float32Array;
  onshoreN: Float32Array;
  /** Annual mean 2 m air temperature [°C] and its seasonal half-range [K]. */
  tMean: Float32Array;
  tSeasonAmp: Float32Array;
  /** Day of year of the seasonal temperature peak [d]. */
  tPeakDay: Float32Array;
  /** Half of the clear-sky diurnal temperature range [K]. */
  tDiurnalAmp: Float32Array;
  /** Annual mean dew point [°C] and its seasonal half-range [K]. */
  tdMean: Float32Array;
  tdSeasonAmp: Float32Array;
  /** Mean cloudiness [0–1] and the afternoon convective addition over the upland [0–1]. */
  cloudMean: Float32Array;
  cloudAfternoon: Float32Array;
  /** Wind speed factor on the trade wind [–] (friction over land, exposure on the upland). */
  windFactor: Float32Array;
  /** Local solar time offset from UTC [h] (longitude / 15). */
  solarOffsetH: Float32Array;
}

/** Sub-samples per cell side used to compute the land fraction [–]. */
const LAND_SAMPLES = 8;
/** e-folding distance of the sea's influence inland [km] (invented). */
const COAST_SCALE_KM = 40;
/** Moist tropical lapse rate used for the upland [K m⁻¹] (about 5.5 K/km; common practice). */
export const LAPSE_RATE = 0.0055;

function landFractionOf(latC: number, lonC: number, res: number): number {
  let inside = 0;
  for (let a = 0; a < LAND_SAMPLES; a++) {
    const y = latC + ((a + 0.5) / LAND_SAMPLES - 0.5) * res;
    for (let b = 0; b < LAND_SAMPLES; b++) {
      const x = lonC + ((b + 0.5) / LAND_SAMPLES - 0.5) * res;
      if (pointInRing(x, y, OUTLINE)) inside++;
    }
  }
  return inside / (LAND_SAMPLES * LAND_SAMPLES);
}

function signedCoastKm(lon: number, lat: number): number {
  const d = distanceToRingKm(lon, lat, OUTLINE);
  return pointInRing(lon, lat, OUTLINE) ? d : -d;
}

function gaussian(lon: number, lat: number, centre: readonly [number, number], sigmaDeg: number): number {
  const dx = (lon - centre[0]) * Math.cos((lat * Math.PI) / 180);
  const dy = lat - centre[1];
  return Math.exp(-(dx * dx + dy * dy) / (2 * sigmaDeg * sigmaDeg));
}

/** Computes the static climate parameters of every cell of a grid. */
export function makeCellClimate(grid: DemoGrid): CellClimate {
  const n = grid.nLat * grid.nLon;
  const f32 = () => new Float32Array(n);
  const cc: CellClimate = {
    grid,
    nCells: n,
    lat: new Float64Array(n),
    lon: new Float64Array(n),
    landFraction: f32(),
    heightM: f32(),
    coastDistanceKm: f32(),
    coastal: f32(),
    basin: f32(),
    onshoreE: f32(),
    onshoreN: f32(),
    tMean: f32(),
    tSeasonAmp: f32(),
    tPeakDay: f32(),
    tDiurnalAmp: f32(),
    tdMean: f32(),
    tdSeasonAmp: f32(),
    cloudMean: f32(),
    cloudAfternoon: f32(),
    windFactor: f32(),
    solarOffsetH: f32(),
  };
  const stepKm = 5;
  for (let i = 0; i < grid.nLat; i++) {
    for (let j = 0; j < grid.nLon; j++) {
      const c = i * grid.nLon + j;
      const lat = grid.lat[i];
      const lon = grid.lon360[j] > 180 ? grid.lon360[j] - 360 : grid.lon360[j];
      cc.lat[c] = lat;
      cc.lon[c] = lon;
      const f = landFractionOf(lat, lon, grid.resolution);
      const d = signedCoastKm(lon, lat);
      // Onshore direction: gradient of the signed coast distance (finite differences over 5 km).
      const kx = KM_PER_DEG_LAT * Math.cos((lat * Math.PI) / 180);
      const gE = (signedCoastKm(lon + stepKm / kx, lat) - signedCoastKm(lon - stepKm / kx, lat)) / (2 * stepKm);
      const gN = (signedCoastKm(lon, lat + stepKm / KM_PER_DEG_LAT) - signedCoastKm(lon, lat - stepKm / KM_PER_DEG_LAT)) / (2 * stepKm);
      const g = Math.hypot(gE, gN) || 1;
      const inland = Math.max(0, d);
      const coastal = Math.exp(-Math.abs(d) / COAST_SCALE_KM);
      const interior = 1 - Math.exp(-inland / COAST_SCALE_KM);
      const height = f * UPLAND.peakM * gaussian(lon, lat, UPLAND.centre, UPLAND.sigmaDeg) * (1 - Math.exp(-inland / 30));
      const basin = f * interior * gaussian(lon, lat, BASIN.centre, BASIN.sigmaDeg);
      const up = height / UPLAND.peakM;
      cc.landFraction[c] = f;
      cc.heightM[c] = height;
      cc.coastDistanceKm[c] = d;
      cc.coastal[c] = coastal;
      cc.basin[c] = basin;
      cc.onshoreE[c] = gE / g;
      cc.onshoreN[c] = gN / g;
      // Sea-level climate blended by land fraction (invented values), then the lapse rate.
      const landT = 27.0 + 3.2 * basin + 0.8 * interior * (1 - basin);
      cc.tMean[c] = f * landT + (1 - f) * 25.8 - LAPSE_RATE * height;
      cc.tSeasonAmp[c] = f * (2.6 + 2.0 * basin) + (1 - f) * 2.0;
      cc.tPeakDay[c] = f * (215 - 12 * basin) + (1 - f) * 235;
      cc.tDiurnalAmp[c] = f * (3.2 + 1.6 * interior + 2.6 * basin - 0.8 * up) + (1 - f) * 0.6;
      const landTd = 22.6 - 13.0 * basin - 2.5 * interior * (1 - basin) - 4.0 * up;
      cc.tdMean[c] = f * landTd + (1 - f) * 23.3;
      cc.tdSeasonAmp[c] = f * (2.4 + 1.5 * basin) + (1 - f) * 1.8;
      cc.cloudMean[c] = f * (0.28 - 0.2 * basin + 0.3 * up) + (1 - f) * 0.33;
      cc.cloudAfternoon[c] = f * (0.35 * up + 0.08 * interior * (1 - basin));
      cc.windFactor[c] = f * (0.5 + 0.4 * coastal + 0.35 * up) + (1 - f) * 1.0;
      cc.solarOffsetH[c] = lon / 15;
    }
  }
  return cc;
}

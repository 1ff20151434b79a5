/**
 * Invented change factors for the demo's scenarios: one CF NetCDF-3 file per warming level
 * (`scenarios/warming-level-1.5.nc`, `warming-level-2.0.nc`), in the form people derive from
 * climate-model ensembles for a global warming level (pipeline/read/change-file.ts reads it):
 * `tas` [K], `hurs` [%, percentage points], `rsds` [%] on (time, lat, lon), 12 monthly values
 * on a model calendar (`360_day`, mid-month days), a coarser grid than the atlas (1.25°) in
 * 0–360 longitudes, covering the demo grid with a margin.
 *
 * **Invented.** The numbers come from a smooth made-up pattern, not from any climate model: the
 * local warming is the level times a factor of 1.15 (coast, winter) to 1.5 (the island's interior
 * in summer); relative humidity rises a little at the coast and falls a little inland; solar
 * radiation rises by up to 1 % per degree of level inland. Every change grows with the level, so
 * +2 is hotter than +1.5 everywhere. The files say so in their global attributes.
 */
import { Netcdf3Writer, type Nc3Attr } from '../formats/netcdf3-writer.ts';
import type { DemoGrid } from './territory.ts';
import { CENTRE } from './territory.ts';

/** The demo's warming levels [°C of global warming] and the file of each. */
export const DEMO_WARMING_LEVELS = [1.5, 2] as const;
export const changeFactorFile = (level: number): string => `scenarios/warming-level-${level.toFixed(1)}.nc`;

/** Step of the change files' grid [°]. */
const STEP = 1.25;
/** Points of margin beyond the demo grid on every side [–]. */
const MARGIN = 2;
const FILL = 9.969209968386869e36;

/** The grid of the change file: a multiple of STEP, covering the demo grid and MARGIN points beyond. */
function changeGrid(g: DemoGrid): { lat: Float64Array; lon360: Float64Array } {
  const half = g.resolution / 2;
  const latLo = Math.min(...g.lat) - half;
  const latHi = Math.max(...g.lat) + half;
  const lonLo = Math.min(...g.lon360) - half;
  const lonHi = Math.max(...g.lon360) + half;
  const axis = (lo: number, hi: number) => {
    const a = Math.floor(lo / STEP) - MARGIN;
    const b = Math.ceil(hi / STEP) + MARGIN;
    return Float64Array.from({ length: b - a + 1 }, (_, i) => (a + i) * STEP);
  };
  return { lat: axis(latLo, latHi), lon360: axis(lonLo, lonHi) };
}

/** The invented pattern at a point and month (1–12): changes per degree of warming level. */
function pattern(lat: number, lon: number, month: number): { t: number; rh: number; solar: number } {
  const inland = Math.exp(-(((lon - CENTRE[0]) / 2.2) ** 2) - ((lat - CENTRE[1]) / 1.6) ** 2);
  const summer = 0.5 * (1 - Math.cos((2 * Math.PI * (month - 1)) / 12));
  return { t: 1.15 + 0.25 * inland + 0.1 * summer, rh: 0.3 - 0.8 * inland, solar: 1.0 * inland };
}

/**
 * Writes the invented change file of warming `level` [°C] for the demo grid `g`.
 * @param path where (written to a temporary sibling and renamed)
 */
export function writeDemoChangeFactors(path: string, g: DemoGrid, level: number): void {
  const { lat, lon360 } = changeGrid(g);
  const nLat = lat.length;
  const nLon = lon360.length;
  const text = (name: string, value: string): Nc3Attr => ({ name, value });
  const fill: Nc3Attr = { name: '_FillValue', value: { type: 'float', values: [FILL] } };
  const w = new Netcdf3Writer(path, {
    format: 'classic',
    numRecords: 0,
    dims: [
      { name: 'time', length: 12 },
      { name: 'lat', length: nLat },
      { name: 'lon', length: nLon },
    ],
    attrs: [
      text('Conventions', 'CF-1.8'),
      text(
        'title',
        `INVENTED change factors for a +${level.toFixed(1)} °C global warming level over the invented territory of Quellmar (heathours demo; not from any climate model)`,
      ),
      text('source', 'invented by heathours demo-data: a smooth made-up pattern, not derived from any climate model, observation or real place'),
      text(
        'comment',
        'Monthly changes (future minus baseline) for the delta change method: tas in K, hurs in percentage points of relative humidity, rsds as a relative change in %. Invented for the demo only.',
      ),
      text('history', `heathours demo-data: invented change factors, warming level ${level.toFixed(1)} °C`),
    ],
    vars: [
      {
        name: 'time',
        type: 'double',
        dims: ['time'],
        attrs: [
          text('standard_name', 'time'),
          text('units', 'days since 2000-01-01 00:00:00'),
          text('calendar', '360_day'),
          text('long_name', 'middle of the month of the climatological year'),
        ],
      },
      { name: 'lat', type: 'double', dims: ['lat'], attrs: [text('standard_name', 'latitude'), text('units', 'degrees_north')] },
      { name: 'lon', type: 'double', dims: ['lon'], attrs: [text('standard_name', 'longitude'), text('units', 'degrees_east')] },
      {
        name: 'tas',
        type: 'float',
        dims: ['time', 'lat', 'lon'],
        attrs: [
          text('standard_name', 'air_temperature'),
          text('long_name', 'change of near-surface air temperature (invented)'),
          text('units', 'K'),
          text('units_metadata', 'temperature: difference'),
          fill,
        ],
      },
      {
        name: 'hurs',
        type: 'float',
        dims: ['time', 'lat', 'lon'],
        attrs: [
          text('standard_name', 'relative_humidity'),
          text('long_name', 'change of near-surface relative humidity, percentage points (invented)'),
          text('units', '%'),
          fill,
        ],
      },
      {
        name: 'rsds',
        type: 'float',
        dims: ['time', 'lat', 'lon'],
        attrs: [
          text('standard_name', 'surface_downwelling_shortwave_flux_in_air'),
          text('long_name', 'relative change of surface solar radiation (invented)'),
          text('units', '%'),
          fill,
        ],
      },
    ],
  });
  try {
    w.writeFixed(
      'time',
      Array.from({ length: 12 }, (_, m) => 30 * m + 15),
    );
    w.writeFixed('lat', lat);
    w.writeFixed('lon', lon360);
    for (const which of ['t', 'rh', 'solar'] as const) {
      const values = new Float32Array(12 * nLat * nLon);
      for (let m = 0; m < 12; m++) {
        for (let y = 0; y < nLat; y++) {
          for (let x = 0; x < nLon; x++) {
            const lon = lon360[x] > 180 ? lon360[x] - 360 : lon360[x];
            values[(m * nLat + y) * nLon + x] = level * pattern(lat[y], lon, m + 1)[which];
          }
        }
      }
      w.writeFixed(which === 't' ? 'tas' : which === 'rh' ? 'hurs' : 'rsds', values);
    }
    w.close();
  } catch (e) {
    w.abort();
    throw e;
  }
}

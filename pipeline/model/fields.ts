/**
 * The canonical hourly fields: what `read` hands to `physics`, whatever the source dataset.
 * Names and units are converted once, in `read`; nothing downstream sees source names or units.
 *
 * Layout: time-major, `value[t * nCells + c]`, cells of the block's tile in row-major order
 * (rows south to north, columns west to east).
 */
import type { Tile } from './grid.ts';

/** Canonical field names with their units. */
export const CANONICAL_FIELDS = {
  airTemperature: { units: 'degC', long_name: '2 m air temperature' },
  dewPointTemperature: { units: 'degC', long_name: '2 m dew point temperature' },
  surfacePressure: { units: 'hPa', long_name: 'surface pressure' },
  windSpeed10m: { units: 'm s-1', long_name: '10 m wind speed' },
  solarGlobal: { units: 'W m-2', long_name: 'global horizontal solar irradiance, mean over the hour ending at the stamp' },
  solarDirect: { units: 'W m-2', long_name: 'direct solar irradiance on a horizontal plane, mean over the hour ending at the stamp' },
  thermalDown: { units: 'W m-2', long_name: 'downward thermal irradiance, mean over the hour ending at the stamp' },
  landFraction: { units: '1', long_name: 'land-sea mask (fraction of land)' },
} as const;

export type CanonicalName = keyof typeof CANONICAL_FIELDS;

/** Hourly canonical fields for one tile and one block of hours. */
export interface HourlyBlock {
  tile: Tile;
  /** Cell-centre latitudes of the tile's rows [° N]. */
  lat: Float64Array;
  /** Cell-centre longitudes of the tile's columns [° E]. */
  lon: Float64Array;
  /** End of each hour [ms since 1970-01-01 UTC]. */
  time: Float64Array;
  /** Time-varying fields present in the source, each of length time.length × cells. NaN = missing. */
  fields: Partial<Record<Exclude<CanonicalName, 'landFraction'>, Float32Array>>;
  /** Static land fraction per cell [1], when the dataset has one. */
  landFraction?: Float32Array;
}

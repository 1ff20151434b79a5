/**
 * Per-cell status codes of the physics stage (a `Uint8Array` beside the outputs). Non-zero means
 * the cell-hour's outputs are NaN and the reason is the code; nothing is silently wrong.
 */
export const STATUS = {
  /** Computed; all outputs valid. */
  ok: 0,
  /** An input is missing (NaN). */
  missingInput: 1,
  /** Air temperature outside −40…60 °C. */
  airTemperatureOutOfRange: 2,
  /** Humidity out of range: RH ≤ 0 % or > 100 %, or dew point below −90 °C. */
  humidityOutOfRange: 3,
  /** Surface pressure outside 300–1100 hPa. */
  pressureOutOfRange: 4,
  /** Wind speed negative or above 100 m s⁻¹, or wind height not positive. */
  windOutOfRange: 5,
  /** Solar irradiance below 0 or above 1500 W m⁻². */
  solarOutOfRange: 6,
  /** Cosine of zenith outside −1…1. */
  cosZenithOutOfRange: 7,
  /** Direct-beam fraction outside 0…1. */
  directFractionOutOfRange: 8,
  /** Time outside the years the solar formulas support (1950–2049), or not a valid time. */
  timeOutOfRange: 9,
  /** Latitude outside −90…90 or longitude outside −360…360. */
  positionOutOfRange: 10,
  /** Averaging period negative or longer than 24 h. */
  periodOutOfRange: 11,
  /** The globe-temperature solve did not converge. */
  globeNotConverged: 12,
  /** The wet-bulb solve did not converge. */
  wetBulbNotConverged: 13,
} as const;

export type StatusName = keyof typeof STATUS;

const NAMES: string[] = [];
for (const [k, v] of Object.entries(STATUS)) NAMES[v] = k;

/** The status name of a code (e.g. `pressureOutOfRange`), or `unknown`. */
export function statusName(code: number): string {
  return NAMES[code] ?? 'unknown';
}

/** Accepted input ranges (inclusive) [units in the names]. */
export const INPUT_LIMITS = {
  airTemperatureC: [-40, 60],
  dewPointMinC: -90,
  pressureHpa: [300, 1100],
  windMs: [0, 100],
  solarWm2: [0, 1500],
} as const;

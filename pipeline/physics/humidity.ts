/**
 * Humidity: saturation vapour pressure over liquid water, vapour pressure, relative humidity
 * and dew point. Temperatures [°C], pressures [hPa] unless a name says otherwise.
 */
import { BUCK_1981, MOIST_AIR_FACTOR } from './constants.ts';

const { a: BUCK_A, b: BUCK_B, c: BUCK_C } = BUCK_1981;

/**
 * Saturation vapour pressure, Buck (1981) [hPa]: `6.1121·exp(17.502·T/(T + 240.97))`
 * (docs/methods.md §3.1, as in the Liljegren et al. 2008 reference code, without the moist-air factor).
 * @param t temperature [°C]
 */
export function saturationVaporPressureBuck1981(t: number): number {
  return BUCK_A * Math.exp((BUCK_B * t) / (t + BUCK_C));
}

/**
 * Saturation vapour pressure as the Liljegren model uses it [hPa]: Buck (1981) × 1.004
 * (docs/methods.md §3.1: "correction for moist air, if pressure is not available").
 * @param t temperature [°C]
 */
export function saturationVaporPressureModel(t: number): number {
  return MOIST_AIR_FACTOR * saturationVaporPressureBuck1981(t);
}

/**
 * Saturation vapour pressure, Buck (1996) [hPa]: `6.1121·exp((18.678 − T/234.5)·T/(257.14 + T))`
 * (docs/methods.md §3.1). @param t temperature [°C]
 */
export function saturationVaporPressureBuck1996(t: number): number {
  return 6.1121 * Math.exp(((18.678 - t / 234.5) * t) / (257.14 + t));
}

/**
 * Saturation vapour pressure, Hyland & Wexler (1983) [hPa], the better-accuracy form for general
 * use (ASHRAE Fundamentals ch. 1 eq. 6; docs/methods.md §3.1; 0…200 °C):
 * `ln p_ws[Pa] = C8/T + C9 + C10·T + C11·T² + C12·T³ + C13·ln T` with T [K].
 * @param t temperature [°C]
 */
export function saturationVaporPressureHylandWexler(t: number): number {
  const T = t + 273.15;
  const lnP = -5.8002206e3 / T + 1.3914993 - 4.8640239e-2 * T + 4.1764768e-5 * T * T - 1.4452093e-8 * T * T * T + 6.5459673 * Math.log(T);
  return Math.exp(lnP) / 100;
}

/**
 * Relative humidity from air temperature and dew point [%]: `100·e_s(Td)/e_s(T)` with Buck 1981
 * (docs/methods.md §3.2; the moist-air factor cancels). @param t air temperature [°C]; @param td dew point [°C]
 */
export function relativeHumidityFromDewPoint(t: number, td: number): number {
  return (100 * saturationVaporPressureBuck1981(td)) / saturationVaporPressureBuck1981(t);
}

/**
 * Actual vapour pressure from the dew point as the model uses it [hPa]: `e = 1.004·e_s,Buck81(Td)`
 * (docs/methods.md §3.2). @param td dew point [°C]
 */
export function vaporPressureFromDewPoint(td: number): number {
  return saturationVaporPressureModel(td);
}

/**
 * Dew point from a vapour pressure by inverting the model's Magnus form [°C]
 * (docs/methods.md §3.2, a = 6.1121·1.004, b = 17.502, c = 240.97): `z = ln(e/a)`, `Td = c·z/(b − z)`.
 * @param e vapour pressure [hPa], > 0
 */
export function dewPointFromVaporPressure(e: number): number {
  const z = Math.log(e / (BUCK_A * MOIST_AIR_FACTOR));
  return (BUCK_C * z) / (BUCK_B - z);
}

/**
 * Dew point from air temperature and relative humidity, consistent with the model's
 * saturation vapour pressure [°C]. @param t [°C]; @param rhPct relative humidity [%], > 0
 */
export function dewPointFromRelativeHumidity(t: number, rhPct: number): number {
  return dewPointFromVaporPressure((rhPct / 100) * saturationVaporPressureModel(t));
}

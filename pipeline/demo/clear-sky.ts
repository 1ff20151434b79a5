/**
 * Fast clear-sky and cloud factors for the invented radiation climate of the demo, as lookup
 * tables with linear interpolation (the generator evaluates them ~10⁷ times a year).
 *
 * Formulas (standard engineering approximations, from memory, used only to make invented data
 * look plausible):
 * - relative optical air mass `AM = 1/(μ + 0.50572·(96.07995 − θ)^−1.6364)`, θ the zenith [°]
 *   (Kasten & Young 1989, Appl. Opt. 28:4735, from memory);
 * - clear-sky beam transmittance `τ_b = 0.7^(AM^0.678)` (Meinel & Meinel 1976, from memory),
 *   with AM scaled by surface pressure / 1013.25 hPa;
 * - cloud attenuation of the global flux `1 − 0.75·c^3.4` (Kasten & Czeplak 1980, from memory).
 */

const N_TABLE = 4096;
/** `AM^0.678` at sea level for μ = k/(N_TABLE−1) [–]. */
const AIR_MASS_POW = new Float64Array(N_TABLE);
/** `1 − 0.75·c^3.4` for c = k/(N_TABLE−1) [–]. */
const CLOUD_GLOBAL = new Float64Array(N_TABLE);

for (let k = 0; k < N_TABLE; k++) {
  const mu = Math.max(k / (N_TABLE - 1), 1e-4);
  const zen = (Math.acos(Math.min(1, mu)) * 180) / Math.PI;
  const am = 1 / (mu + 0.50572 * Math.pow(Math.max(96.07995 - zen, 0.5), -1.6364));
  AIR_MASS_POW[k] = Math.pow(am, 0.678);
  CLOUD_GLOBAL[k] = 1 - 0.75 * Math.pow(k / (N_TABLE - 1), 3.4);
}

function lookup(table: Float64Array, x: number): number {
  const p = (x <= 0 ? 0 : x >= 1 ? 1 : x) * (N_TABLE - 1);
  const i = p | 0;
  if (i >= N_TABLE - 1) return table[N_TABLE - 1];
  const f = p - i;
  return table[i] * (1 - f) + table[i + 1] * f;
}

const LN_07 = Math.log(0.7);

/**
 * Clear-sky beam transmittance [–] for a cosine of the zenith [–] and a pressure factor
 * `(p/1013.25 hPa)^0.678` [–].
 */
export function beamTransmittance(cosZenith: number, pressureFactor: number): number {
  return Math.exp(LN_07 * lookup(AIR_MASS_POW, cosZenith) * pressureFactor);
}

/** Fraction of the clear-sky global flux that reaches the ground under cloudiness c [0–1] [–]. */
export function cloudGlobalFactor(cloud: number): number {
  return lookup(CLOUD_GLOBAL, cloud);
}

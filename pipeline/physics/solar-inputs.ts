/**
 * Solar inputs of the model for one cell-hour: the top-of-atmosphere check and cap, and the
 * direct-beam fraction (docs/methods.md §4.3; conventions of test/fixtures/reference/README.md).
 *
 * - Sun up (cos z ≥ 0.00873): top of atmosphere `S_toa = S0·cos z/d²`; solar is capped at
 *   0.85·S_toa; the direct fraction is the given one (ERA5 `fdir/ssrd`, a CSV column) or else the
 *   Liljegren estimate `exp(3 − 1.34 s* − 1.65/s*)` from the capped clearness s*, clipped to [0, 0.9].
 * - Sun down (cos z < 0.00873): any positive solar is kept as it is, all diffuse (f_dir = 0).
 */
import { CZA_MIN, FDIR_MAX, NORMSOLAR_MAX, SOLAR_CONSTANT } from './constants.ts';

/** {@link FDIR_MAX} [–] as a module constant: the per-cell read is then no module binding (a getter call under the tests' TypeScript loader). */
const F_MAX = FDIR_MAX;

/**
 * Liljegren's empirical direct-beam fraction [–] from the clearness index s* [–]
 * (docs/methods.md §4.3): `exp(3 − 1.34 s* − 1.65/s*)` clipped to [0, 0.9]; 0 for s* ≤ 0.
 */
export function directFractionEstimate(clearness: number): number {
  if (!(clearness > 0)) return 0;
  const u = clearness * FD_INV_STEP;
  let f: number;
  if (u < FD_N - 1) {
    const k = u | 0;
    const t = u - k;
    const j = 2 * k;
    const tab = FD_TABLE;
    const t2 = t * t;
    const t3 = t2 * t;
    f = (2 * t3 - 3 * t2 + 1) * tab[j] + (t3 - 2 * t2 + t) * tab[j + 1] + (3 * t2 - 2 * t3) * tab[j + 2] + (t3 - t2) * tab[j + 3];
  } else f = directFractionExact(clearness);
  return f > F_MAX ? F_MAX : f;
}

/** `exp(3 − 1.34 s* − 1.65/s*)` [–] unclipped, for s* > 0 (docs/methods.md §4.3). */
export function directFractionExact(clearness: number): number {
  return Math.exp(3 - 1.34 * clearness - 1.65 / clearness);
}

/**
 * The estimate tabulated over s* ∈ [0, 0.85] (the cap) at 2048 steps with its derivative, read by
 * cubic Hermite (absolute error < 1e−9, test/physics/solver.test.ts): a table read instead of an
 * exponential and a division per sunlit cell.
 */
const FD_N = 2049;
const FD_STEP = NORMSOLAR_MAX / (FD_N - 1);
const FD_INV_STEP = 1 / FD_STEP;
const FD_TABLE = (() => {
  const tab = new Float64Array(2 * FD_N);
  for (let k = 1; k < FD_N; k++) {
    const x = k * FD_STEP;
    const f = directFractionExact(x);
    tab[2 * k] = f;
    tab[2 * k + 1] = f * (-1.34 + 1.65 / (x * x)) * FD_STEP;
  }
  return tab;
})();

/** Solar after the cap [W m⁻²] and the direct fraction [–] the model uses. */
export interface SolarUsed {
  solar: number;
  directFraction: number;
}

/**
 * Caps solar and picks the direct fraction for one cell-hour (rules above).
 * @param solarGlobal global horizontal irradiance, period mean [W m⁻²]
 * @param cosZenith cosine of the zenith the model uses [–]
 * @param distanceAu Earth–Sun distance [AU]
 * @param givenFraction direct fraction from data [–], or NaN/undefined to estimate it
 * @param cosToa cosine for the top-of-atmosphere flux [–] (defaults to `cosZenith`)
 */
export function solarUsed(solarGlobal: number, cosZenith: number, distanceAu: number, givenFraction?: number, cosToa = cosZenith): SolarUsed {
  if (!(cosZenith >= CZA_MIN) || !(cosToa > 0)) return { solar: solarGlobal, directFraction: 0 };
  const toa = (SOLAR_CONSTANT * cosToa) / (distanceAu * distanceAu);
  let s = solarGlobal / toa;
  if (s > NORMSOLAR_MAX) s = NORMSOLAR_MAX;
  const solar = s * toa;
  const given = givenFraction !== undefined && !Number.isNaN(givenFraction);
  return { solar, directFraction: given ? givenFraction : directFractionEstimate(s) };
}

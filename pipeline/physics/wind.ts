/**
 * 2 m wind from a wind measured (or modelled) at another height, by the stability-class power
 * law of EPA-454/R-99-005 §6.2.5 as in the Liljegren et al. 2008 reference code (docs/methods.md §5).
 *
 * Night-time stability needs the vertical temperature difference ΔT, which reanalysis does not
 * provide. Convention: ΔT defaults to 0, i.e. the "ΔT ≥ 0" (stable) column, for gridded data and
 * for point rows without `dt_c` alike, so a grid cell and a station row with the same inputs
 * agree. Calm clear nights over land usually have a surface inversion (ΔT > 0), and the stable
 * column gives the lower 2 m wind, the less optimistic choice at night.
 */
import { MIN_SPEED, REF_HEIGHT, WIND_EXPONENT_RURAL, WIND_EXPONENT_URBAN } from './constants.ts';

/**
 * Stability class 1 (A) … 6 (F) from the solar-radiation/ΔT table (docs/methods.md §5).
 * @param daytime cos z > 0; @param speed measured wind [m s⁻¹]; @param solar solar after the cap [W m⁻²];
 * @param deltaT vertical temperature difference, upper minus lower [°C]
 */
export function stabilityClass(daytime: boolean, speed: number, solar: number, deltaT: number): number {
  if (daytime) {
    const j = solar >= 925 ? 0 : solar >= 675 ? 1 : solar >= 175 ? 2 : 3;
    const i = speed < 2 ? 0 : speed < 3 ? 1 : speed < 5 ? 2 : speed < 6 ? 3 : 4;
    return DAY_TABLE[4 * i + j];
  }
  const i = speed < 2 ? 0 : speed < 2.5 ? 1 : 2;
  return deltaT >= 0 ? NIGHT_STABLE[i] : NIGHT_UNSTABLE[i];
}

/** Day classes by wind row (5) × solar column (4), flattened: index 4·row + column. */
const DAY_TABLE = Uint8Array.of(1, 1, 2, 4, 1, 2, 3, 4, 2, 2, 3, 4, 3, 3, 4, 4, 3, 4, 4, 4);
const NIGHT_UNSTABLE = Uint8Array.of(5, 5, 4);
const NIGHT_STABLE = Uint8Array.of(6, 6, 4);

/**
 * 2 m wind [m s⁻¹]: `max(u_z·(2/z)^p, 0.13)` with p by class and urban/rural set (a negative or
 * NaN speed is passed through for the kernel to reject); at z = 2 m the
 * speed is returned as is (the 0.13 m s⁻¹ floor then applies inside the heat-transfer
 * coefficients). @param speed [m s⁻¹]; @param height [m]; @param stability 1…6; @param urban exponent set
 */
export function windAt2m(speed: number, height: number, stability: number, urban: boolean): number {
  if (height === REF_HEIGHT) return speed;
  const p = (urban ? WIND_EXPONENT_URBAN : WIND_EXPONENT_RURAL)[stability - 1];
  const u = speed * Math.exp(p * Math.log(REF_HEIGHT / height));
  return u > MIN_SPEED ? u : u >= 0 ? MIN_SPEED : u;
}

/** Inputs of the array wind step. */
export interface WindStepInputs {
  /** Wind speed at `height` [m s⁻¹], per cell-hour. */
  windSpeed: ArrayLike<number>;
  /** Cosine of zenith used for day/night [–], per cell-hour. */
  cosZenith: ArrayLike<number>;
  /** Solar irradiance after the cap [W m⁻²], per cell-hour. */
  solar: ArrayLike<number>;
  /** Measurement height [m] (10 for ERA5). */
  height: number;
  /** Urban exponent set: one flag for all, or one per cell (length nCells; index = i % nCells). */
  urban: boolean | Uint8Array;
  /** Vertical temperature difference [°C], default 0 (stable column at night). */
  deltaT?: number;
}

/**
 * Fills `out` [m s⁻¹] with the 2 m wind of n cell-hours (time-major, `nCells` cells per hour),
 * and optionally `stabilityOut` with the class. Returns nothing; NaN in gives NaN out.
 */
export function wind2mStep(inp: WindStepInputs, out: Float32Array | Float64Array, n: number, nCells: number, stabilityOut?: Uint8Array): void {
  const dT = inp.deltaT ?? 0;
  const urbanAll = typeof inp.urban === 'boolean' ? inp.urban : undefined;
  const urbanCells = typeof inp.urban === 'boolean' ? undefined : inp.urban;
  const { windSpeed: W, cosZenith: CZ, solar: S, height } = inp;
  // (2/z)^p per class and exponent set, hoisted: one multiply per cell instead of a power.
  // Index (class − 1) + 6·urban. At z = 2 m the speed is kept as is (see windAt2m).
  const factor = new Float64Array(12);
  for (let k = 0; k < 6; k++) {
    factor[k] = Math.exp(WIND_EXPONENT_RURAL[k] * Math.log(REF_HEIGHT / height));
    factor[6 + k] = Math.exp(WIND_EXPONENT_URBAN[k] * Math.log(REF_HEIGHT / height));
  }
  const atRef = height === REF_HEIGHT;
  // The floor as a local: the loop reads no module binding (a getter call under the tests' TypeScript loader).
  const minSpeed = MIN_SPEED;
  if (stabilityOut === undefined && !atRef) {
    // Without the classes asked for: the factor straight from tables of the class table's rows
    // and columns, the row and column counted from the bounds passed (whole-number arithmetic on
    // the comparisons, no chain of branches per cell-hour). Same factors as stabilityClass gives
    // (test/physics/wind.test.ts); a NaN speed may take another row's factor and still gives NaN.
    const day = new Float64Array(40);
    for (let k = 0; k < 20; k++) {
      day[k] = factor[DAY_TABLE[k] - 1];
      day[20 + k] = factor[DAY_TABLE[k] - 1 + 6];
    }
    const nightClasses = dT >= 0 ? NIGHT_STABLE : NIGHT_UNSTABLE;
    const night = new Float64Array(6);
    for (let k = 0; k < 3; k++) {
      night[k] = factor[nightClasses[k] - 1];
      night[3 + k] = factor[nightClasses[k] - 1 + 6];
    }
    for (let i = 0; i < n; i++) {
      const u = W[i];
      const urban = urbanAll ?? urbanCells![i % nCells] !== 0;
      let f: number;
      if (CZ[i] > 0) {
        const s = S[i];
        // Row: speed bounds 2, 3, 5, 6 m s⁻¹; column: solar bounds 925, 675, 175 W m⁻² (stabilityClass).
        const row = +(u >= 2) + +(u >= 3) + +(u >= 5) + +(u >= 6);
        const col = 3 - +(s >= 175) - +(s >= 675) - +(s >= 925);
        f = day[(urban ? 20 : 0) + 4 * row + col];
      } else f = night[(urban ? 3 : 0) + +(u >= 2) + +(u >= 2.5)];
      const v = u * f;
      // Floor at 0.13 m/s; a negative or NaN speed passes through so the kernel rejects it.
      out[i] = v > minSpeed ? v : v >= 0 ? minSpeed : v;
    }
    return;
  }
  for (let i = 0; i < n; i++) {
    const u = W[i];
    const cls = stabilityClass(CZ[i] > 0, u, S[i], dT);
    const urban = urbanAll ?? urbanCells![i % nCells] !== 0;
    if (atRef) out[i] = u;
    else {
      const v = u * factor[cls - 1 + (urban ? 6 : 0)];
      // Floor at 0.13 m/s; a negative or NaN speed passes through so the kernel rejects it.
      out[i] = v > minSpeed ? v : v >= 0 ? minSpeed : v;
    }
    if (stabilityOut) stabilityOut[i] = cls;
  }
}

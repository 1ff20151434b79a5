/**
 * The geometry step for a block of hours × cells: cosine of the zenith, solar after the cap and
 * the direct-beam fraction, ready for {@link wbgtKernel}. Sun position is computed once per hour,
 * hour angles once per column, latitude terms once per row.
 *
 * Two conventions for the cosine (DESIGN: radiation is a mean over the hour ending at the stamp):
 * - `middle` (default): the apparent (refraction-corrected) cosine at the middle of the period,
 *   the Liljegren et al. 2008 reference convention; the whole-chain check against the reference
 *   rows holds with it. For hours that are sunlit throughout it differs from the period mean by
 *   under 0.3 % of the hour-angle term.
 * - `period-mean`: docs/methods.md §4.2 — the whole-period mean cosine for the top-of-atmosphere cap and
 *   clearness (it pairs with an hour-mean flux), the sunlit-part mean for the beam geometry. Better
 *   behaved in hours that contain sunrise or sunset; no refraction.
 */
import { STATUS } from './status.ts';
import { apparentCosZenithFast, hourAngle, integrateCosines, solarYearSupported, sunState } from './solar-position.ts';
import { directFractionEstimate } from './solar-inputs.ts';
import { CZA_MIN, NORMSOLAR_MAX, SOLAR_CONSTANT } from './constants.ts';

export type CosineConvention = 'middle' | 'period-mean';

export interface GeometryInputs {
  /** End of each hour [ms since 1970 UTC], length nT. */
  time: ArrayLike<number>;
  /** Latitude of each row [° N], length nRows. */
  lat: ArrayLike<number>;
  /** Longitude of each column [° E], length nCols. */
  lon: ArrayLike<number>;
  /** Length of the averaging period [min], default 60. */
  periodMinutes?: number;
  /** Global horizontal irradiance, period mean [W m⁻²], `[t * nCells + row * nCols + col]`. */
  solarGlobal: ArrayLike<number>;
  /** Direct irradiance on a horizontal plane, period mean [W m⁻²] (ERA5 `fdir`), same layout; optional. */
  solarDirect?: ArrayLike<number>;
  convention?: CosineConvention;
}

export interface GeometryOutputs {
  /** Cosine of the zenith for the beam geometry [–]. */
  cosZenith: Float32Array | Float64Array;
  /** Direct-beam fraction [–]. */
  directFraction: Float32Array | Float64Array;
  /** Solar after the cap [W m⁻²]. */
  solar: Float32Array | Float64Array;
  /** Set to `timeOutOfRange` for hours outside 1950–2049; left alone otherwise. */
  status: Uint8Array;
}

/** Counts of the geometry step. */
export interface GeometryCounts {
  /** Cell-hours in hours outside the supported years. */
  timeOutOfRange: number;
}

/** Fills the geometry outputs for every hour × cell of the block. */
export function geometryBlock(inp: GeometryInputs, out: GeometryOutputs): GeometryCounts {
  const nT = inp.time.length;
  const nRows = inp.lat.length;
  const nCols = inp.lon.length;
  const nCells = nRows * nCols;
  const period = inp.periodMinutes ?? 60;
  const mean = inp.convention === 'period-mean';
  const half = (period / 1440) * Math.PI;
  const sinLat = new Float64Array(nRows);
  const cosLat = new Float64Array(nRows);
  for (let r = 0; r < nRows; r++) {
    sinLat[r] = Math.sin((inp.lat[r] * Math.PI) / 180);
    cosLat[r] = Math.cos((inp.lat[r] * Math.PI) / 180);
  }
  const ha = new Float64Array(nCols);
  const cosHa = new Float64Array(nCols);
  const direct = inp.solarDirect;
  const SG = inp.solarGlobal;
  const CZ = out.cosZenith;
  const SU = out.solar;
  const FD = out.directFraction;
  // Imported constants copied into locals: the per-cell loop then reads no module binding (under
  // the TypeScript loader of the tests and benchmarks each such read is a getter call).
  const czMin = CZA_MIN;
  const clearMax = NORMSOLAR_MAX;
  let bad = 0;
  for (let t = 0; t < nT; t++) {
    const base = t * nCells;
    const mid = inp.time[t] - period * 30_000;
    if (!solarYearSupported(mid)) {
      for (let c = 0; c < nCells; c++) {
        out.cosZenith[base + c] = NaN;
        out.directFraction[base + c] = NaN;
        out.solar[base + c] = NaN;
        out.status[base + c] = STATUS.timeOutOfRange;
      }
      bad += nCells;
      continue;
    }
    // Per hour: sun position (declination, right ascension, sidereal time) and the Earth–Sun
    // distance; per column: the hour angle; per row: the latitude terms; per cell: one cosine.
    const s = sunState(mid);
    const toa1 = SOLAR_CONSTANT / (s.distanceAu * s.distanceAu);
    for (let k = 0; k < nCols; k++) {
      ha[k] = hourAngle(s, inp.lon[k]);
      cosHa[k] = Math.cos(ha[k]);
    }
    for (let r = 0; r < nRows; r++) {
      const A = sinLat[r] * s.sinDec;
      const B = cosLat[r] * s.cosDec;
      const rowBase = base + r * nCols;
      for (let k = 0; k < nCols; k++) {
        const i = rowBase + k;
        const sg = SG[i];
        let cz: number;
        let cToa: number;
        if (mean) {
          const pc = integrateCosines(A, B, ha[k], half);
          cz = pc.sunlitMean;
          cToa = pc.mean;
        } else {
          const cg = A + B * cosHa[k];
          cz = cg > -0.0098 ? apparentCosZenithFast(cg) : cg;
          cToa = cz;
        }
        CZ[i] = cz;
        // The cap and direct fraction (solar-inputs.ts `solarUsed`, inlined: no object per cell).
        if (!(cz >= czMin) || !(cToa > 0)) {
          SU[i] = sg;
          FD[i] = 0;
          continue;
        }
        const toa = toa1 * cToa;
        let clear = sg / toa;
        if (clear > clearMax) clear = clearMax;
        SU[i] = clear * toa;
        let f = NaN;
        if (direct !== undefined && sg > 0) {
          const g = direct[i] / sg;
          f = g > 1 ? 1 : g < 0 ? 0 : g;
        }
        FD[i] = f === f ? f : directFractionEstimate(clear);
      }
    }
  }
  return { timeOutOfRange: bad };
}

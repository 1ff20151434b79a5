/**
 * The whole chain for one row of weather (a station, a site): humidity, solar geometry at the
 * middle of the averaging period, the cap and direct fraction, 2 m wind, then the kernel.
 * What `heathours point` runs per row, and what the whole-chain reference check exercises.
 */
import { dewPointFromRelativeHumidity } from './humidity.ts';
import { cosZenithApparentInstant, solarYearSupported, sunState } from './solar-position.ts';
import { solarUsed } from './solar-inputs.ts';
import { stabilityClass, windAt2m } from './wind.ts';
import { wbgtKernel, REFERENCE_GLOBE } from './kernel.ts';
import type { GlobeFactors } from './liljegren-solve.ts';
import { STATUS } from './status.ts';

/** One row's inputs (DESIGN.md §4 point CSV columns). */
export interface PointInput {
  /** End of the averaging period [ms since 1970 UTC]. */
  timeMs: number;
  /** Averaging period [min]. */
  avgMinutes: number;
  /** Latitude [° N], longitude [° E]. */
  lat: number;
  lon: number;
  /** Air temperature [°C]. */
  ta: number;
  /** Relative humidity [%] (used when finite), else dew point [°C]. */
  rh?: number;
  td?: number;
  /** Pressure [hPa]. */
  pressure: number;
  /** Wind [m s⁻¹] at `windHeight` [m]. */
  wind: number;
  windHeight: number;
  /** Urban exponent set. */
  urban: boolean;
  /** Vertical temperature difference for night stability [°C]. */
  dt: number;
  /** Global horizontal solar, period mean [W m⁻²]. */
  solar: number;
  /** Given direct fraction [–] and cosine of zenith [–] (replace the computed ones when finite). */
  directFraction?: number;
  cosZenith?: number;
}

/** One row's outputs; temperatures [°C]; NaN where not computed. */
export interface PointOutput {
  status: number;
  cosZenith: number;
  directFraction: number;
  solarUsed: number;
  wind2m: number;
  stabilityClass: number;
  /** Globe, natural wet bulb, psychrometric wet bulb and WBGT in the sun [°C]. */
  tg: number;
  tnwb: number;
  tpsy: number;
  wbgt: number;
  /** Globe, natural wet bulb and WBGT in the open-sky shade (the sun removed) [°C]. */
  tgShade: number;
  tnwbShade: number;
  wbgtShade: number;
  /** Globe, natural wet bulb and WBGT under a shelter at the air temperature [°C]. */
  tgShelter: number;
  tnwbShelter: number;
  wbgtShelter: number;
  dewPointClamped: boolean;
}

const one = () => new Float64Array(1);
const I = { ta: one(), td: one(), p: one(), u: one(), s: one(), cz: one(), f: one() };
const O = {
  sun: one(),
  shade: one(),
  shelter: one(),
  tg: one(),
  tw: one(),
  tgShade: one(),
  twShade: one(),
  tgShelter: one(),
  twShelter: one(),
  psy: one(),
  status: new Uint8Array(1),
};

function fail(status: number, partial: Partial<PointOutput> = {}): PointOutput {
  return {
    status,
    cosZenith: NaN,
    directFraction: NaN,
    solarUsed: NaN,
    wind2m: NaN,
    stabilityClass: 0,
    tg: NaN,
    tnwb: NaN,
    tpsy: NaN,
    wbgt: NaN,
    tgShade: NaN,
    tnwbShade: NaN,
    wbgtShade: NaN,
    tgShelter: NaN,
    tnwbShelter: NaN,
    wbgtShelter: NaN,
    dewPointClamped: false,
    ...partial,
  };
}

/**
 * Computes one row; never throws for bad values, returns a status instead.
 * @param globe globe diameter factors (`globeFactors(d)`); default the reference implementation's 2-inch globe
 */
export function computePoint(r: PointInput, globe: GlobeFactors = REFERENCE_GLOBE): PointOutput {
  if (!Number.isFinite(r.timeMs)) return fail(STATUS.timeOutOfRange);
  if (!(r.avgMinutes >= 0 && r.avgMinutes <= 1440)) return fail(STATUS.periodOutOfRange);
  if (!(r.lat >= -90 && r.lat <= 90 && r.lon >= -360 && r.lon <= 360)) return fail(STATUS.positionOutOfRange);
  if (!(r.windHeight > 0)) return fail(STATUS.windOutOfRange);
  let td: number;
  if (r.rh !== undefined && !Number.isNaN(r.rh)) {
    if (!(r.rh > 0 && r.rh <= 100)) return fail(STATUS.humidityOutOfRange);
    td = dewPointFromRelativeHumidity(r.ta, r.rh);
  } else if (r.td !== undefined && !Number.isNaN(r.td)) td = r.td;
  else return fail(STATUS.missingInput);
  const mid = r.timeMs - r.avgMinutes * 30_000;
  if (!solarYearSupported(mid)) return fail(STATUS.timeOutOfRange);
  const givenCz = r.cosZenith !== undefined && !Number.isNaN(r.cosZenith);
  if (givenCz && !(r.cosZenith! >= -1 && r.cosZenith! <= 1)) return fail(STATUS.cosZenithOutOfRange);
  const givenF = r.directFraction !== undefined && !Number.isNaN(r.directFraction);
  if (givenF && !(r.directFraction! >= 0 && r.directFraction! <= 1)) return fail(STATUS.directFractionOutOfRange);
  if (!(r.solar >= 0 && r.solar <= 1500)) return fail(STATUS.solarOutOfRange);
  if (!(r.wind >= 0 && r.wind <= 100)) return fail(STATUS.windOutOfRange);
  const cz = givenCz ? r.cosZenith! : cosZenithApparentInstant(mid, r.lat, r.lon);
  const su = solarUsed(r.solar, cz, sunState(mid).distanceAu, givenF ? r.directFraction : undefined);
  const cls = stabilityClass(cz > 0, r.wind, su.solar, r.dt);
  const u2 = windAt2m(r.wind, r.windHeight, cls, r.urban);
  I.ta[0] = r.ta;
  I.td[0] = td;
  I.p[0] = r.pressure;
  I.u[0] = u2;
  I.s[0] = su.solar;
  I.cz[0] = cz;
  I.f[0] = su.directFraction;
  O.status[0] = 0;
  const counts = wbgtKernel(
    { airTemperature: I.ta, dewPointTemperature: I.td, surfacePressure: I.p, wind2m: I.u, solar: I.s, cosZenith: I.cz, directFraction: I.f },
    {
      wbgtSun: O.sun,
      wbgtShade: O.shade,
      globeSun: O.tg,
      wetBulbSun: O.tw,
      globeShade: O.tgShade,
      wetBulbShade: O.twShade,
      wbgtShelter: O.shelter,
      globeShelter: O.tgShelter,
      wetBulbShelter: O.twShelter,
      psychrometric: O.psy,
      status: O.status,
    },
    1,
    0,
    globe,
  );
  const geo = { cosZenith: cz, directFraction: su.directFraction, solarUsed: su.solar, wind2m: u2, stabilityClass: r.windHeight === 2 ? 0 : cls };
  if (O.status[0] !== 0) return fail(O.status[0], geo);
  return {
    status: 0,
    ...geo,
    tg: O.tg[0],
    tnwb: O.tw[0],
    tpsy: O.psy[0],
    wbgt: O.sun[0],
    tgShade: O.tgShade[0],
    tnwbShade: O.twShade[0],
    wbgtShade: O.shade[0],
    tgShelter: O.tgShelter[0],
    tnwbShelter: O.twShelter[0],
    wbgtShelter: O.shelter[0],
    dewPointClamped: counts.dewPointClamped > 0,
  };
}

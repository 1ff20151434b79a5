/**
 * Where the sun is: declination, right ascension, sidereal time, hour angle, cosine of the
 * zenith at an instant and averaged over a period, and the Earth–Sun distance.
 *
 * Sun position ({@link sunState}): the low-accuracy solar coordinates of Meeus (1998),
 * Astronomical Algorithms 2nd ed., ch. 25 (mean longitude, mean anomaly, equation of the centre,
 * eccentricity, apparent longitude with the main nutation and aberration terms, obliquity eq.
 * 22.2 with the nutation correction) and the mean sidereal time of ch. 12 (eq. 12.4) made
 * apparent with the same nutation term: the formulas of NOAA's solar calculator. About 0.01° in
 * position; used for 1900–2100 ({@link SOLAR_FIRST_YEAR}–{@link SOLAR_LAST_YEAR}), checked against
 * the NREL SPA report's example (Reda & Andreas 2008) and PyEphem 4.1.4 (test/physics/sun-position.test.ts).
 * The Julian date comes exactly from the time in ms, not from the spreadsheet's calendar
 * shortcut that limits NOAA's spreadsheet to 1901–2099. The Astronomical Almanac's low-precision
 * formulas (Michalsky 1988, Solar Energy 40:227–235; 1950–2049), which the Liljegren et al. 2008
 * reference code uses, are kept as {@link sunStateAlmanac} for the comparison over their years.
 * Refraction: Michalsky 1988's standard-atmosphere formula
 * (1013.25 hPa, 15 °C). Period means: docs/methods.md §4.2. NOAA's Spencer-series formulas (docs/methods.md
 * §4.1) are kept for comparison and checks.
 *
 * Time is always milliseconds since 1970-01-01 UTC; angles in degrees at the API, radians inside.
 */
import { SOLAR_CONSTANT } from './constants.ts';

const RAD = Math.PI / 180;
const DEG = 180 / Math.PI;
const MS_PER_DAY = 86_400_000;
/** Julian date of the Unix epoch [d]. */
const JD_UNIX_EPOCH = 2_440_587.5;
/** Julian date of J2000.0 [d]. */
const JD_J2000 = 2_451_545.0;

/** First and last calendar year the sun position is used for [year] (Meeus low-accuracy formulas, checked over 1900–2100). */
export const SOLAR_FIRST_YEAR = 1900;
export const SOLAR_LAST_YEAR = 2100;
/** First and last year of the Astronomical Almanac's low-precision formulas (Michalsky 1988) [year]. */
export const ALMANAC_FIRST_YEAR = 1950;
export const ALMANAC_LAST_YEAR = 2049;

/** Sun position at one instant. */
export interface SunState {
  /** Declination [rad]. */
  declination: number;
  /** Right ascension [rad], in [0, 2π). */
  rightAscension: number;
  /** Greenwich mean sidereal time [rad], in [0, 2π). */
  gmst: number;
  /** Earth–Sun distance [AU]. */
  distanceAu: number;
  /** sin(declination) [–] and cos(declination) [–], cached for the per-cell loop. */
  sinDec: number;
  cosDec: number;
}

/** Days since J2000.0 (JD 2451545.0) [d] for a time [ms since 1970 UTC]. */
export function daysSinceJ2000(timeMs: number): number {
  return timeMs / MS_PER_DAY + JD_UNIX_EPOCH - JD_J2000;
}

/** True when the UTC calendar year of `timeMs` [ms since 1970 UTC] lies in 1900–2100. */
export function solarYearSupported(timeMs: number): boolean {
  if (!Number.isFinite(timeMs)) return false;
  const y = new Date(timeMs).getUTCFullYear();
  return y >= SOLAR_FIRST_YEAR && y <= SOLAR_LAST_YEAR;
}

function wrap2pi(x: number): number {
  const r = x % (2 * Math.PI);
  return r < 0 ? r + 2 * Math.PI : r;
}

/**
 * Sun state at an instant, Meeus (1998) low-accuracy formulas, with T in Julian centuries from
 * J2000.0 (UT used for TT: ΔT of a minute or two moves the sun by under 0.001°):
 * - mean longitude `L₀ = 280.46646 + 36000.76983·T + 0.0003032·T²`, mean anomaly
 *   `M = 357.52911 + 35999.05029·T − 0.0001537·T²`, eccentricity
 *   `e = 0.016708634 − 0.000042037·T − 0.0000001267·T²` (eqs. 25.2–25.4) [°, –];
 * - equation of the centre `C = (1.914602 − 0.004817·T − 0.000014·T²)·sin M +
 *   (0.019993 − 0.000101·T)·sin 2M + 0.000289·sin 3M`; true longitude ⊙ = L₀ + C, true anomaly
 *   ν = M + C; distance `R = 1.000001018·(1 − e²)/(1 + e·cos ν)` [AU] (eq. 25.5);
 * - apparent longitude `λ = ⊙ − 0.00569 − 0.00478·sin Ω`, `Ω = 125.04 − 1934.136·T`; obliquity
 *   `ε = ε₀ + 0.00256·cos Ω`, ε₀ = 23°26′21.448″ − 46.8150″·T − 0.00059″·T² + 0.001813″·T³
 *   (eq. 22.2) [°];
 * - `α = atan2(cos ε·sin λ, cos λ)`, `δ = asin(sin ε·sin λ)` (eqs. 25.6, 25.7);
 * - sidereal time `θ₀ = 280.46061837 + 360.98564736629·(JD − 2451545) + 0.000387933·T² − T³/38710000`
 *   (eq. 12.4), made apparent with the nutation in longitude of the same approximation,
 *   `Δψ ≈ −0.00478·sin Ω`: `θ = θ₀ + Δψ·cos ε` [°].
 * @param timeMs instant [ms since 1970 UTC]
 */
export function sunState(timeMs: number): SunState {
  const n = daysSinceJ2000(timeMs);
  const T = n / 36525;
  const L0 = 280.46646 + T * (36000.76983 + 0.0003032 * T);
  const M = (357.52911 + T * (35999.05029 - 0.0001537 * T)) * RAD;
  const e = 0.016708634 - T * (0.000042037 + 0.0000001267 * T);
  const C = Math.sin(M) * (1.914602 - T * (0.004817 + 0.000014 * T)) + Math.sin(2 * M) * (0.019993 - 0.000101 * T) + Math.sin(3 * M) * 0.000289;
  const nu = M + C * RAD;
  const distanceAu = (1.000001018 * (1 - e * e)) / (1 + e * Math.cos(nu));
  const omega = (125.04 - 1934.136 * T) * RAD;
  const nutation = -0.00478 * Math.sin(omega);
  const lambda = (L0 + C - 0.00569 + nutation) * RAD;
  const eps0 = 23 + (26 + (21.448 - T * (46.815 + T * (0.00059 - T * 0.001813))) / 60) / 60;
  const eps = (eps0 + 0.00256 * Math.cos(omega)) * RAD;
  const sinL = Math.sin(lambda);
  const rightAscension = wrap2pi(Math.atan2(Math.cos(eps) * sinL, Math.cos(lambda)));
  const declination = Math.asin(Math.sin(eps) * sinL);
  // θ₀ in degrees: the day count's whole turns are taken out first (360.98564736629·n = 360·n + 0.98564736629·n).
  const theta0 = 280.46061837 + 0.98564736629 * n + 360 * (n - Math.floor(n)) + T * T * (0.000387933 - T / 38710000);
  const gmst = wrap2pi((theta0 + nutation * Math.cos(eps)) * RAD);
  return { declination, rightAscension, gmst, distanceAu, sinDec: Math.sin(declination), cosDec: Math.cos(declination) };
}

/**
 * Sun state at an instant by the Astronomical Almanac's low-precision formulas (Michalsky 1988,
 * eqs. for mean longitude, mean anomaly, ecliptic longitude, obliquity, GMST; docs/methods.md §4.1,
 * also for the distance `d = 1.00014 − 0.01671 cos g − 0.00014 cos 2g`), the formulas of the
 * Liljegren et al. 2008 reference code, documented for 1950–2049. Kept for the comparison with
 * {@link sunState} over those years (test/physics/sun-position.test.ts).
 * @param timeMs instant [ms since 1970 UTC]
 */
export function sunStateAlmanac(timeMs: number): SunState {
  const n = daysSinceJ2000(timeMs);
  const meanLon = wrap2pi((280.46 + 0.9856474 * n) * RAD);
  const g = wrap2pi((357.528 + 0.9856003 * n) * RAD);
  const eclLon = meanLon + (1.915 * Math.sin(g) + 0.02 * Math.sin(2 * g)) * RAD;
  const obliq = (23.439 - 4e-7 * n) * RAD;
  const sinL = Math.sin(eclLon);
  const rightAscension = wrap2pi(Math.atan2(Math.cos(obliq) * sinL, Math.cos(eclLon)));
  const declination = Math.asin(Math.sin(obliq) * sinL);
  // GMST [h] = 6.697375 + 0.0657098242·n + UT hours (n counted from J2000.0 including the day fraction).
  const utHours = (((timeMs % MS_PER_DAY) + MS_PER_DAY) % MS_PER_DAY) / 3_600_000;
  const gmstH = 6.697375 + 0.0657098242 * n + utHours;
  const gmst = wrap2pi(gmstH * 15 * RAD);
  const distanceAu = 1.00014 - 0.01671 * Math.cos(g) - 0.00014 * Math.cos(2 * g);
  return { declination, rightAscension, gmst, distanceAu, sinDec: Math.sin(declination), cosDec: Math.cos(declination) };
}

/** Local hour angle [rad] in (−π, π] for a sun state and a longitude [° E]. */
export function hourAngle(s: SunState, lonDeg: number): number {
  let h = wrap2pi(s.gmst + lonDeg * RAD - s.rightAscension);
  if (h > Math.PI) h -= 2 * Math.PI;
  return h;
}

/**
 * Geometric cosine of the solar zenith at an instant [–] (no refraction):
 * `cos θ = sin φ sin δ + cos φ cos δ cos h` (docs/methods.md §4.1).
 * @param timeMs instant [ms since 1970 UTC]; @param latDeg latitude [° N]; @param lonDeg longitude [° E]
 */
export function cosZenithInstant(timeMs: number, latDeg: number, lonDeg: number): number {
  const s = sunState(timeMs);
  const phi = latDeg * RAD;
  return Math.sin(phi) * s.sinDec + Math.cos(phi) * s.cosDec * Math.cos(hourAngle(s, lonDeg));
}

/**
 * Atmospheric refraction for the standard atmosphere (1013.25 hPa, 15 °C) [°], for a geometric
 * elevation [°]. Michalsky 1988 (the Almanac's formula):
 * `R = 3.51561·(0.1594 + 0.0196 e + 0.00002 e²)/(1 + 0.505 e + 0.0845 e²)` for e ≥ −0.56°; below
 * that no correction (the reference rows' night-time cosines show none is applied).
 */
export function refractionDeg(elevationDeg: number): number {
  const e = elevationDeg;
  if (e < -0.56) return 0;
  return (3.51561 * (0.1594 + 0.0196 * e + 0.00002 * e * e)) / (1 + 0.505 * e + 0.0845 * e * e);
}

/**
 * Cosine of the apparent (refraction-corrected) solar zenith [–] from a geometric cosine [–].
 * The elevation is capped at 90°.
 */
export function apparentCosZenith(cosGeometric: number): number {
  const c = cosGeometric > 1 ? 1 : cosGeometric < -1 ? -1 : cosGeometric;
  const el = Math.asin(c) * DEG;
  if (el < -0.56) return c;
  const R = (3.51561 * (0.1594 + 0.0196 * el + 0.00002 * el * el)) / (1 + 0.505 * el + 0.0845 * el * el);
  if (el + R >= 90) return 1;
  // sin(el + R) = sin el·cos R + cos el·sin R, with cos el = √(1 − c²) ≥ 0 and R ≤ 0.6° (series to
  // R⁵, error < 1e−14): one square root instead of a sine.
  const r = R * RAD;
  const r2 = r * r;
  const cosR = 1 - r2 * (0.5 - r2 / 24);
  const sinR = r * (1 - r2 * (1 / 6 - r2 / 120));
  return c * cosR + Math.sqrt(1 - c * c) * sinR;
}

/** Apparent cosine of the zenith at an instant [–] (Almanac sun + Michalsky refraction). */
export function cosZenithApparentInstant(timeMs: number, latDeg: number, lonDeg: number): number {
  return apparentCosZenith(cosZenithInstant(timeMs, latDeg, lonDeg));
}

/** Cosines of the zenith over an averaging period (docs/methods.md §4.2). */
export interface PeriodCosines {
  /** Whole-interval mean of max(0, cos θ) [–]; pairs with an accumulated (period-mean) flux. */
  mean: number;
  /** Mean of cos θ over the sunlit part only [–]; 0 when the sun never rises in the period. */
  sunlitMean: number;
  /** Fraction of the period with the sun above the horizon [–]. */
  sunlitFraction: number;
}

/**
 * Whole-period and sunlit-part mean cosines (docs/methods.md §4.2): declination at mid-period,
 * hour angle sweeping 15° h⁻¹, `∫cos θ dh = sin φ sin δ (b − a) + cos φ cos δ (sin b − sin a)`
 * over the sunlit part `[a, b] = [h1, h2] ∩ [−h_s, h_s]` (intervals crossing ±π handled by
 * testing the neighbouring days' sunlit windows).
 * @param endTimeMs end of the period [ms since 1970 UTC]; @param periodMinutes its length [min]
 * (0 gives the instant value); @param latDeg [° N]; @param lonDeg [° E]
 */
export function periodCosines(endTimeMs: number, periodMinutes: number, latDeg: number, lonDeg: number): PeriodCosines {
  const mid = endTimeMs - periodMinutes * 30_000;
  const s = sunState(mid);
  const phi = latDeg * RAD;
  const A = Math.sin(phi) * s.sinDec;
  const B = Math.cos(phi) * s.cosDec;
  const hm = hourAngle(s, lonDeg);
  if (periodMinutes <= 0) {
    const c = A + B * Math.cos(hm);
    return c > 0 ? { mean: c, sunlitMean: c, sunlitFraction: 1 } : { mean: 0, sunlitMean: 0, sunlitFraction: 0 };
  }
  return integrateCosines(A, B, hm, (periodMinutes / 1440) * Math.PI);
}

/**
 * Mean cosines for `cos θ = A + B cos h` over hour angles [hm − half, hm + half] [rad].
 * Exported for the gridded geometry step, which reuses A (per row) and hm (per column).
 */
export function integrateCosines(A: number, B: number, hm: number, half: number): PeriodCosines {
  // Sunset hour angle h_s: cos h_s = −A/B (polar day → π, polar night → 0).
  let hs: number;
  if (B <= 1e-12) hs = A > 0 ? Math.PI : 0;
  else {
    const x = -A / B;
    hs = x <= -1 ? Math.PI : x >= 1 ? 0 : Math.acos(x);
  }
  const h1 = hm - half;
  const h2 = hm + half;
  let integral = 0;
  let sunlit = 0;
  if (hs > 0) {
    for (let k = -1; k <= 1; k++) {
      const off = 2 * Math.PI * k;
      const a = Math.max(h1, off - hs);
      const b = Math.min(h2, off + hs);
      if (b > a) {
        integral += A * (b - a) + B * (Math.sin(b) - Math.sin(a));
        sunlit += b - a;
      }
    }
  }
  const width = h2 - h1;
  if (sunlit <= 0) return { mean: 0, sunlitMean: 0, sunlitFraction: 0 };
  const mean = Math.max(0, integral / width);
  return { mean, sunlitMean: Math.max(0, integral / sunlit), sunlitFraction: sunlit / width };
}

/**
 * Whole-interval mean of the cosine of the zenith [–] over the period ending at `endTimeMs`
 * (docs/methods.md §4.2; zero-clamped, so night hours give 0).
 * @param endTimeMs end of the period [ms since 1970 UTC]; @param periodMinutes [min]
 * @param latDeg [° N]; @param lonDeg [° E]
 */
export function cosZenithPeriodMean(endTimeMs: number, periodMinutes: number, latDeg: number, lonDeg: number): number {
  return periodCosines(endTimeMs, periodMinutes, latDeg, lonDeg).mean;
}

/** Earth–Sun distance [AU] at an instant [ms since 1970 UTC] (the sun state of {@link sunState}, docs/methods.md §4.1 eq. 4.5). */
export function earthSunDistanceAu(timeMs: number): number {
  return sunState(timeMs).distanceAu;
}

/**
 * Top-of-atmosphere irradiance on a horizontal plane [W m⁻²]: `S0·max(0, cos θ)/d²`
 * (docs/methods.md §4.3). @param timeMs [ms since 1970 UTC]; @param cosZenith [–]
 */
export function topOfAtmosphereIrradiance(timeMs: number, cosZenith: number): number {
  const d = earthSunDistanceAu(timeMs);
  return (SOLAR_CONSTANT * Math.max(0, cosZenith)) / (d * d);
}

// ---------------------------------------------------------------------------------------------
// NOAA "General Solar Position Calculations" (Spencer 1971 series), docs/methods.md §4.1.

/** NOAA fractional year γ [rad] for a time [ms since 1970 UTC] (365 or 366 days by year). */
export function noaaFractionalYear(timeMs: number): number {
  const d = new Date(timeMs);
  const y = d.getUTCFullYear();
  const leap = (y % 4 === 0 && y % 100 !== 0) || y % 400 === 0;
  const doy = Math.floor((timeMs - Date.UTC(y, 0, 1)) / MS_PER_DAY) + 1;
  const hour = d.getUTCHours() + d.getUTCMinutes() / 60 + d.getUTCSeconds() / 3600;
  return ((2 * Math.PI) / (leap ? 366 : 365)) * (doy - 1 + (hour - 12) / 24);
}

/** NOAA equation of time [min] (docs/methods.md §4.1). @param gamma fractional year [rad] */
export function noaaEquationOfTime(gamma: number): number {
  return 229.18 * (0.000075 + 0.001868 * Math.cos(gamma) - 0.032077 * Math.sin(gamma) - 0.014615 * Math.cos(2 * gamma) - 0.040849 * Math.sin(2 * gamma));
}

/** NOAA declination [rad] (docs/methods.md §4.1). @param gamma fractional year [rad] */
export function noaaDeclination(gamma: number): number {
  return (
    0.006918 -
    0.399912 * Math.cos(gamma) +
    0.070257 * Math.sin(gamma) -
    0.006758 * Math.cos(2 * gamma) +
    0.000907 * Math.sin(2 * gamma) -
    0.002697 * Math.cos(3 * gamma) +
    0.00148 * Math.sin(3 * gamma)
  );
}

/**
 * NOAA cosine of the zenith [–] at an instant: true solar time `tst = 60·h_UTC + EoT + 4λ` [min],
 * hour angle `tst/4 − 180` [°] (docs/methods.md §4.1). @param timeMs [ms since 1970 UTC]
 */
export function noaaCosZenith(timeMs: number, latDeg: number, lonDeg: number): number {
  const gamma = noaaFractionalYear(timeMs);
  const eot = noaaEquationOfTime(gamma);
  const dec = noaaDeclination(gamma);
  const d = new Date(timeMs);
  const minutes = d.getUTCHours() * 60 + d.getUTCMinutes() + d.getUTCSeconds() / 60;
  const tst = minutes + eot + 4 * lonDeg;
  const h = (tst / 4 - 180) * RAD;
  const phi = latDeg * RAD;
  return Math.sin(phi) * Math.sin(dec) + Math.cos(phi) * Math.cos(dec) * Math.cos(h);
}

/**
 * {@link apparentCosZenith} without the arcsine, for the gridded geometry step: the refraction
 * correction Δ = cos θ_app − cos θ [–] is read by cubic Hermite interpolation from two tables
 * built once from the exact form: in c = cos θ for the low sun (c < 0.75, where the elevation is
 * a smooth function of c) and in s = √(1 − c²) for the high sun (where it is a smooth function
 * of s). Below the refraction cut-off (elevation −0.56°) the geometric cosine is kept, and where
 * el + R reaches 90° the result is 1, as in the exact form. Absolute error below 1e−12
 * (test/physics/humidity-and-sun.test.ts), far under the Float32 outputs' resolution.
 * @param cosGeometric geometric cosine of the zenith [–]
 */
export function apparentCosZenithFast(cosGeometric: number): number {
  const c = cosGeometric > 1 ? 1 : cosGeometric < -1 ? -1 : cosGeometric;
  if (!(c >= REFR_C0)) return c;
  let u: number;
  let tab: Float64Array;
  if (c < REFR_C_SPLIT) {
    u = (c - REFR_C0) * REFR_INV_HC;
    tab = REFR_LOW;
  } else {
    const s = Math.sqrt(1 - c * c);
    if (s <= REFR_S_TOP) return 1;
    u = s * REFR_INV_HS;
    tab = REFR_HIGH;
  }
  const k = u | 0;
  const t = u - k;
  const j = 2 * k;
  const t2 = t * t;
  const t3 = t2 * t;
  return c + (2 * t3 - 3 * t2 + 1) * tab[j] + (t3 - 2 * t2 + t) * tab[j + 1] + (3 * t2 - 2 * t3) * tab[j + 2] + (t3 - t2) * tab[j + 3];
}

/** Refraction correction of the exact form as a smooth function of the elevation [° → –] (no clamps). */
function refractionDelta(el: number): number {
  const R = (3.51561 * (0.1594 + 0.0196 * el + 0.00002 * el * el)) / (1 + 0.505 * el + 0.0845 * el * el);
  return Math.sin((el + R) * RAD) - Math.sin(el * RAD);
}
/** d/dx of refractionDelta(el(x)) by a central difference of step h in x (for the table slopes). */
function slope(el: (x: number) => number, x: number, h: number): number {
  return (refractionDelta(el(x + h)) - refractionDelta(el(x - h))) / (2 * h);
}
/** Lowest cosine refracted (elevation −0.56°), split between the two tables, nodes per table. */
const REFR_C0 = Math.sin(-0.56 * RAD);
const REFR_C_SPLIT = 0.75;
const REFR_N = 4096;
const REFR_HC = (REFR_C_SPLIT - REFR_C0) / (REFR_N - 1);
const REFR_INV_HC = 1 / REFR_HC;
/** s = √(1 − c²) at the split (plus one node of margin). */
const REFR_S_MAX = Math.sqrt(1 - REFR_C_SPLIT * REFR_C_SPLIT);
const REFR_HS = REFR_S_MAX / (REFR_N - 2);
const REFR_INV_HS = 1 / REFR_HS;
function buildRefraction(x0: number, h: number, el: (x: number) => number): Float64Array {
  const tab = new Float64Array(2 * REFR_N);
  const d = h * 1e-3;
  for (let k = 0; k < REFR_N; k++) {
    const x = x0 + k * h;
    tab[2 * k] = refractionDelta(el(x));
    tab[2 * k + 1] = slope(el, x, d) * h;
  }
  return tab;
}
const REFR_LOW = buildRefraction(REFR_C0, REFR_HC, (c) => Math.asin(c) * DEG);
const REFR_HIGH = buildRefraction(0, REFR_HS, (s) => Math.acos(s) * DEG);
/** s below which el + R ≥ 90° (the exact form returns 1), by bisection on the exact form. */
const REFR_S_TOP = (() => {
  let lo = 0;
  let hi = 0.01;
  for (let k = 0; k < 200; k++) {
    const m = 0.5 * (lo + hi);
    if (apparentCosZenith(Math.sqrt(1 - m * m)) === 1) lo = m;
    else hi = m;
  }
  return lo;
})();

/**
 * The invented hourly weather of the demo territory, in ERA5 units, for one calendar year.
 *
 * A year holds the hours ending at 01:00 UTC on 1 January through 00:00 UTC on 1 January of the
 * next year (ERA5 stamps an accumulation at the end of its hour, docs/methods.md §2.2), so files of
 * consecutive years join with no gap or overlap. Instantaneous fields (t2m, d2m, u10, v10, sp)
 * are valid at the stamp; radiation (ssrd, fdir, strd) is accumulated over the hour ending at the
 * stamp [J m⁻²], with the sun's geometry averaged over that hour (docs/methods.md §4.2).
 *
 * Randomness is counter-based ({@link normal}): day-to-day weather is an AR(1) series on a 4 × 4
 * lattice of nodes fixed in space (so fields are spatially smooth and every grid sees the same
 * weather), started 40 days before the year from noise keyed by absolute day, so a year depends
 * only on (seed, year) and consecutive years join smoothly. Hourly cloud and gust noise is an
 * AR(1) on the same lattice, started 48 h before the year.
 *
 * The formulas for the radiation climate are standard engineering approximations, written here
 * from memory and used only to make invented data look plausible:
 * - beam transmittance of a clear sky `τ_b = 0.7^(AM^0.678)` (Meinel & Meinel 1976, from memory),
 *   air mass of Kasten & Young 1989 (from memory), scaled by surface pressure;
 * - clear-sky diffuse `S·μ·(0.271 − 0.294 τ_b)` (Liu & Jordan 1960, from memory);
 * - cloud attenuation of the global flux `1 − 0.75 c^3.4` (Kasten & Czeplak 1980, from memory),
 *   of the direct flux `1 − c^1.5` (invented), so fdir ≤ ssrd always;
 * - downward thermal flux: Brutsaert 1975 clear-sky emissivity `1.24 (e/T)^(1/7)` (from memory)
 *   raised toward 1 with cloud (invented).
 */
import { hourAngle, integrateCosines, sunState } from '../physics/solar-position.ts';
import { BUCK_1981, SOLAR_CONSTANT } from '../physics/constants.ts';
import { beamTransmittance, cloudGlobalFactor } from './clear-sky.ts';
import type { CellClimate } from './cell-climate.ts';
import { LAPSE_RATE } from './cell-climate.ts';
import { normal } from './random.ts';
import { diurnalShape, latticeWeights, N_NODES, seaBreezeShape } from './weather-shapes.ts';

/** The time-varying variables of the demo, ERA5 short names. */
export const DEMO_VARIABLES = ['t2m', 'd2m', 'u10', 'v10', 'sp', 'ssrd', 'fdir', 'strd'] as const;
export type DemoVariable = (typeof DEMO_VARIABLES)[number];

/** One block of hours: per variable, values `[t · nCells + c]` in ERA5 units. */
export type DemoBlock = Record<DemoVariable, Float32Array>;

const MS_HOUR = 3_600_000;
const MS_DAY = 86_400_000;
const DAYS_PER_YEAR = 365.2422;
/** Stefan–Boltzmann constant [W m⁻² K⁻⁴] (CODATA 2018). */
const SIGMA = 5.670374419e-8;
/** Gas constant of dry air [J kg⁻¹ K⁻¹] and gravity [m s⁻²] for the hypsometric equation (common practice). */
const R_DRY = 287.05;
const GRAVITY = 9.80665;

/** Half the hour angle swept in one hour [rad] and sin(half)/half [–]. */
const HALF_HOUR_ANGLE = Math.PI / 24;
const SINC_HALF = Math.sin(HALF_HOUR_ANGLE) / HALF_HOUR_ANGLE;
/** ln of the Buck (1981) prefactor [ln hPa] (pipeline/physics/constants.ts BUCK_1981). */
const LN_BUCK_A = Math.log(BUCK_1981.a);

/** Daily AR(1) streams: persistence per day [–] and days of spin-up before the year [d]. */
const DAILY_PHI = 0.75;
const SPIN_UP_DAYS = 40;
const Daily = { Temp: 0, Dew: 1, Cloud: 2, Trade: 3, Direction: 4, Pressure: 5, Count: 6 } as const;
/** Hourly AR(1) streams: persistence per hour [–], spin-up [h]. */
const HOURLY_PHI = 0.8;
const SPIN_UP_HOURS = 48;
const Hourly = { Cloud: 0, GustU: 1, GustV: 2, Count: 3 } as const;
/** Stream ids given to the random number generator (daily ones 0–5, hourly ones 10–12). */
const HOURLY_STREAM0 = 10;

/** First stamp of a year and its number of hours. */
export function yearHours(year: number): { firstStampMs: number; nHours: number } {
  const start = Date.UTC(year, 0, 1);
  const end = Date.UTC(year + 1, 0, 1);
  return { firstStampMs: start + MS_HOUR, nHours: (end - start) / MS_HOUR };
}

/** Derived daily fields per cell, stored per day (from day0) and cell. */
const Derived = { Cloud: 0, TradeU: 1, TradeV: 2, Count: 3 } as const;

/** Generator of one year's hours for one grid; call {@link YearWeather.next} for consecutive blocks. */
export class YearWeather {
  readonly cc: CellClimate;
  readonly seed: number;
  readonly year: number;
  readonly firstStampMs: number;
  readonly nHours: number;
  /** Stamps generated so far [–]. */
  private done = 0;
  private readonly day0: number;
  /** Per stream, per day (from day0) and cell: the daily anomaly [–, unit variance]. */
  private readonly daily: Float32Array[];
  /** Per derived field, per day and cell: daily cloudiness [0–1], trade wind u, v [m s⁻¹]. */
  private readonly derived: Float32Array[];
  private readonly lattice: { idx: Int32Array; w: Float32Array };
  private readonly hourlyState = new Float64Array(Hourly.Count * N_NODES);
  private hourlyIndex: number;
  /** Per cell: cos and sin of the seasonal phase of temperature and dew point. */
  private readonly cosPeak: Float64Array;
  private readonly sinPeak: Float64Array;
  private readonly cosPeakTd: Float64Array;
  private readonly sinPeakTd: Float64Array;
  /** Per cell: `(p/1013.25 hPa)^0.678` for the mean surface pressure at the cell's height [–]. */
  private readonly pressureFactor: Float64Array;

  constructor(cc: CellClimate, seed: number, year: number) {
    this.cc = cc;
    this.seed = seed | 0;
    this.year = year;
    const { firstStampMs, nHours } = yearHours(year);
    this.firstStampMs = firstStampMs;
    this.nHours = nHours;
    this.lattice = latticeWeights(cc);
    this.day0 = Math.floor(Date.UTC(year, 0, 1) / MS_DAY);
    const n = cc.nCells;
    const nDays = nHours / 24 + 2;
    const innov = Math.sqrt(1 - DAILY_PHI * DAILY_PHI);
    const { idx, w } = this.lattice;
    this.daily = [];
    for (let s = 0; s < Daily.Count; s++) {
      const nodeSeries = new Float64Array(nDays * N_NODES);
      for (let k = 0; k < N_NODES; k++) {
        let x = normal(this.seed, s, this.day0 - SPIN_UP_DAYS, k);
        for (let d = this.day0 - SPIN_UP_DAYS + 1; d < this.day0 + nDays; d++) {
          x = DAILY_PHI * x + innov * normal(this.seed, s, d, k);
          if (d >= this.day0) nodeSeries[(d - this.day0) * N_NODES + k] = x;
        }
      }
      const cells = new Float32Array(nDays * n);
      for (let d = 0; d < nDays; d++) {
        for (let c = 0; c < n; c++) {
          let v = 0;
          for (let q = 0; q < 4; q++) v += w[4 * c + q] * nodeSeries[d * N_NODES + idx[4 * c + q]];
          cells[d * n + c] = v;
        }
      }
      this.daily.push(cells);
    }
    // Daily cloudiness (logistic of mean, wet season and anomaly) and trade wind per cell.
    this.derived = Array.from({ length: Derived.Count }, () => new Float32Array(nDays * n));
    for (let d = 0; d < nDays; d++) {
      const wet = Math.cos((2 * Math.PI * (d - 250)) / DAYS_PER_YEAR);
      const trade = Math.cos((2 * Math.PI * (d - 200)) / DAYS_PER_YEAR);
      for (let c = 0; c < n; c++) {
        const i = d * n + c;
        const cm = cc.cloudMean[c];
        const logit = Math.log(cm / (1 - cm)) + 0.35 * wet + 1.1 * this.daily[Daily.Cloud][i];
        this.derived[Derived.Cloud][i] = 1 / (1 + Math.exp(-logit));
        const speed = Math.max(0.5, 6.5 + 1.0 * trade + 1.5 * this.daily[Daily.Trade][i]);
        const toward = ((247.5 + 15 * this.daily[Daily.Direction][i]) * Math.PI) / 180;
        this.derived[Derived.TradeU][i] = speed * Math.sin(toward);
        this.derived[Derived.TradeV][i] = speed * Math.cos(toward);
      }
    }
    const omega = (2 * Math.PI) / DAYS_PER_YEAR;
    this.cosPeak = new Float64Array(n);
    this.sinPeak = new Float64Array(n);
    this.cosPeakTd = new Float64Array(n);
    this.sinPeakTd = new Float64Array(n);
    this.pressureFactor = new Float64Array(n);
    for (let c = 0; c < n; c++) {
      this.cosPeak[c] = Math.cos(omega * cc.tPeakDay[c]);
      this.sinPeak[c] = Math.sin(omega * cc.tPeakDay[c]);
      this.cosPeakTd[c] = Math.cos(omega * (cc.tPeakDay[c] + 10));
      this.sinPeakTd[c] = Math.sin(omega * (cc.tPeakDay[c] + 10));
      this.pressureFactor[c] = Math.exp((0.678 * -GRAVITY * cc.heightM[c]) / (R_DRY * 290));
    }
    // Hourly AR(1) started SPIN_UP_HOURS before the first stamp.
    this.hourlyIndex = Math.round(firstStampMs / MS_HOUR) - SPIN_UP_HOURS;
    for (let s = 0; s < Hourly.Count; s++)
      for (let k = 0; k < N_NODES; k++) this.hourlyState[s * N_NODES + k] = normal(this.seed, HOURLY_STREAM0 + s, this.hourlyIndex, k);
    for (let h = 0; h < SPIN_UP_HOURS - 1; h++) this.stepHourly();
  }

  private stepHourly(): void {
    this.hourlyIndex++;
    const innov = Math.sqrt(1 - HOURLY_PHI * HOURLY_PHI);
    for (let s = 0; s < Hourly.Count; s++)
      for (let k = 0; k < N_NODES; k++) {
        const i = s * N_NODES + k;
        this.hourlyState[i] = HOURLY_PHI * this.hourlyState[i] + innov * normal(this.seed, HOURLY_STREAM0 + s, this.hourlyIndex, k);
      }
  }

  /** Hours left to generate [–]. */
  get remaining(): number {
    return this.nHours - this.done;
  }

  /** Allocates a block buffer for `nHours` hours. */
  allocBlock(nHours: number): DemoBlock {
    const size = nHours * this.cc.nCells;
    const out = {} as DemoBlock;
    for (const v of DEMO_VARIABLES) out[v] = new Float32Array(size);
    return out;
  }

  /**
   * Fills `out` with the next `nHours` hours (ERA5 units: K, m s⁻¹, Pa, J m⁻²) and returns the
   * stamps [ms since 1970 UTC, end of each hour]. No closures in the loops: tsx wraps named
   * closures, which costs microseconds per call.
   */
  next(nHours: number, out: DemoBlock): Float64Array {
    const cc = this.cc;
    const n = cc.nCells;
    const nLon = cc.grid.nLon;
    const { idx, w } = this.lattice;
    const hsState = this.hourlyState;
    const dv = this.daily;
    const dr = this.derived;
    const stamps = new Float64Array(nHours);
    // Per column (local solar time depends on longitude only).
    const nLat = cc.grid.nLat;
    const hmCol = new Float64Array(nLon);
    const cosHmCol = new Float64Array(nLon);
    const aRow = new Float64Array(nLat);
    const bRow = new Float64Array(nLat);
    const hsRow = new Float64Array(nLat);
    const gCol = new Float64Array(nLon);
    const sbCol = new Float64Array(nLon);
    const aftCol = new Float64Array(nLon);
    const tideCol = new Float64Array(nLon);
    const omega = (2 * Math.PI) / DAYS_PER_YEAR;
    const { t2m, d2m, u10, v10, sp: spOut, ssrd: ssrdOut, fdir: fdirOut, strd: strdOut } = out;
    for (let t = 0; t < nHours; t++) {
      if (this.done >= this.nHours) throw new Error(`demo weather: year ${this.year} has only ${this.nHours} hours`);
      const ms = this.firstStampMs + this.done * MS_HOUR;
      stamps[t] = ms;
      this.stepHourly();
      const dayPos = ms / MS_DAY - this.day0;
      const d = Math.floor(dayPos);
      const fr = dayPos - d;
      const doy = (ms - Date.UTC(this.year, 0, 1)) / MS_DAY;
      const cosDoy = Math.cos(omega * doy);
      const sinDoy = Math.sin(omega * doy);
      const tradeSeason = Math.cos(omega * (doy - 200));
      const utcHour = (ms % MS_DAY) / MS_HOUR;
      const sun = sunState(ms - MS_HOUR / 2);
      const toa = SOLAR_CONSTANT / (sun.distanceAu * sun.distanceAu);
      for (let i = 0; i < nLat; i++) {
        const lat = (cc.lat[i * nLon] * Math.PI) / 180;
        aRow[i] = Math.sin(lat) * sun.sinDec;
        bRow[i] = Math.cos(lat) * sun.cosDec;
        const x = -aRow[i] / bRow[i];
        hsRow[i] = x <= -1 ? Math.PI : x >= 1 ? 0 : Math.acos(x);
      }
      for (let j = 0; j < nLon; j++) {
        const lon = cc.lon[j];
        hmCol[j] = hourAngle(sun, lon);
        cosHmCol[j] = Math.cos(hmCol[j]);
        const lst = utcHour + lon / 15;
        const h = ((lst % 24) + 24) % 24;
        gCol[j] = diurnalShape(h);
        sbCol[j] = seaBreezeShape(h);
        aftCol[j] = h > 11 && h < 19 ? Math.sin((Math.PI * (h - 11)) / 8) : 0;
        // Semidiurnal pressure tide, about 1 hPa, peaks near 10 and 22 local time (common practice).
        tideCol[j] = Math.cos((4 * Math.PI * (h - 10)) / 24);
      }
      const base = t * n;
      for (let c = 0; c < n; c++) {
        const jCol = c % nLon;
        const f = cc.landFraction[c];
        const i0 = d * n + c;
        const i1 = i0 + n;
        const fr0 = 1 - fr;
        const aTemp = dv[0][i0] * fr0 + dv[0][i1] * fr;
        const aDew = dv[1][i0] * fr0 + dv[1][i1] * fr;
        const aPres = dv[5][i0] * fr0 + dv[5][i1] * fr;
        const cloudDay = dr[0][i0] * fr0 + dr[0][i1] * fr;
        const tradeU = dr[1][i0] * fr0 + dr[1][i1] * fr;
        const tradeV = dr[2][i0] * fr0 + dr[2][i1] * fr;
        let noiseCloud = 0;
        let noiseU = 0;
        let noiseV = 0;
        for (let q = 0; q < 4; q++) {
          const k = idx[4 * c + q];
          const wq = w[4 * c + q];
          noiseCloud += wq * hsState[k];
          noiseU += wq * hsState[N_NODES + k];
          noiseV += wq * hsState[2 * N_NODES + k];
        }
        const g = gCol[jCol];
        const sb = sbCol[jCol];

        // Cloudiness [0–1]: the day's value, the afternoon build-up over the upland, hourly noise.
        const cm = cc.cloudMean[c];
        let cloud = cloudDay + cc.cloudAfternoon[c] * aftCol[jCol] + 0.07 * noiseCloud;
        cloud = cloud < 0 ? 0 : cloud > 1 ? 1 : cloud;

        // Air temperature [°C].
        const season = cosDoy * this.cosPeak[c] + sinDoy * this.sinPeak[c];
        let ta = cc.tMean[c] + cc.tSeasonAmp[c] * season + cc.tDiurnalAmp[c] * (1 - 0.5 * cloudDay) * g + (0.7 + 0.7 * f) * aTemp - 1.2 * f * (cloudDay - cm);
        if (ta > 42) ta = 42 + 2 * Math.tanh((ta - 42) / 2);

        // Dew point [°C]: seasonal moisture, daily surges, sea-breeze moistening on the coast,
        // afternoon mixing-out in the basin; kept 0.2 K below the air temperature.
        const seasonTd = cosDoy * this.cosPeakTd[c] + sinDoy * this.sinPeakTd[c];
        const basin = cc.basin[c];
        let td =
          cc.tdMean[c] +
          cc.tdSeasonAmp[c] * seasonTd +
          (1.0 + 2.0 * basin) * aDew +
          1.0 * f * cc.coastal[c] * (sb > 0 ? sb : 0) -
          1.5 * basin * (g > 0 ? g : 0);
        if (td > ta - 0.2) td = ta - 0.2;

        // Surface pressure [hPa]: sea-level pressure (season, synoptic anomaly, tide) reduced to
        // the surface height by the hypsometric equation.
        const pSea = 1013.0 - 1.5 * tradeSeason + 1.6 * aPres + 1.0 * tideCol[jCol];
        const z = cc.heightM[c];
        const tColumnK = ta + 273.15 + (LAPSE_RATE * z) / 2;
        const sp = z > 0 ? pSea * Math.exp((-GRAVITY * z) / (R_DRY * tColumnK)) : pSea;

        // 10 m wind [m s⁻¹]: trade wind from the east-north-east, friction over land, daytime
        // mixing, the sea breeze along the onshore direction, hourly gusts.
        const mix = cc.windFactor[c] * (1 + 0.25 * f * (g > 0 ? g : 0));
        const breeze = 4.0 * cc.coastal[c] * sb * (1 - 0.5 * cloud) * (0.8 + 0.2 * season);
        const u = tradeU * mix + breeze * cc.onshoreE[c] + 0.8 * noiseU;
        const v = tradeV * mix + breeze * cc.onshoreN[c] + 0.8 * noiseV;

        // Solar radiation over the hour ending at the stamp [J m⁻²]: hour-mean cosine of the
        // zenith (docs/methods.md §4.2), fast path when the sun is up for the whole hour.
        const rowI = (c - jCol) / nLon;
        const hs = hsRow[rowI];
        const h1 = hmCol[jCol] - HALF_HOUR_ANGLE;
        const h2 = hmCol[jCol] + HALF_HOUR_ANGLE;
        let meanCos = 0;
        let sunlitCos = 0;
        if (h1 >= -hs && h2 <= hs) {
          meanCos = aRow[rowI] + bRow[rowI] * cosHmCol[jCol] * SINC_HALF;
          sunlitCos = meanCos;
        } else if (!((h2 <= -hs || h1 >= hs) && hs <= Math.PI - HALF_HOUR_ANGLE)) {
          const pc = integrateCosines(aRow[rowI], bRow[rowI], hmCol[jCol], HALF_HOUR_ANGLE);
          meanCos = pc.mean;
          sunlitCos = pc.sunlitMean;
        }
        let ssrd = 0;
        let fdir = 0;
        if (meanCos > 0) {
          const tauB = beamTransmittance(sunlitCos, this.pressureFactor[c]) * (0.97 - 0.05 * basin);
          const clearDirect = toa * meanCos * tauB;
          const diffuseT = 0.271 - 0.294 * tauB;
          const clearDiffuse = toa * meanCos * (diffuseT > 0 ? diffuseT : 0);
          const global = (clearDirect + clearDiffuse) * cloudGlobalFactor(cloud);
          const direct = clearDirect * (1 - cloud * Math.sqrt(cloud));
          ssrd = global * 3600;
          fdir = (direct < global ? direct : global) * 3600;
        }

        // Downward thermal radiation over the hour [J m⁻²]; ln e from the Buck (1981) exponent.
        const tk = ta + 273.15;
        const lnE = LN_BUCK_A + (BUCK_1981.b * td) / (td + BUCK_1981.c);
        const eps0 = 1.24 * Math.exp((lnE - Math.log(tk)) / 7);
        const epsC = eps0 + (1 - eps0) * 0.85 * cloud;
        const eps = epsC < 1 ? epsC : 1;
        const o = base + c;
        t2m[o] = tk;
        d2m[o] = td + 273.15;
        u10[o] = u;
        v10[o] = v;
        spOut[o] = sp * 100;
        ssrdOut[o] = ssrd;
        fdirOut[o] = fdir;
        strdOut[o] = eps * SIGMA * tk * tk * tk * tk * 3600;
      }
      this.done++;
    }
    return stamps;
  }
}

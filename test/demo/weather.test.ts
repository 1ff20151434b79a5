import { beforeAll, describe, expect, it } from 'vitest';
import { makeCellClimate, type CellClimate } from '../../pipeline/demo/cell-climate.ts';
import { placeGrid, SMALL_GRID } from '../../pipeline/demo/territory.ts';
import { YearWeather, DEMO_VARIABLES, type DemoBlock } from '../../pipeline/demo/weather.ts';
import { periodCosines, topOfAtmosphereIrradiance } from '../../pipeline/physics/solar-position.ts';
import { relativeHumidityFromDewPoint } from '../../pipeline/physics/humidity.ts';
import { computePoint } from '../../pipeline/physics/point-row.ts';

// Physical consistency of the invented weather (small grid, one whole year). Physical bounds:
// dew point ≤ air temperature (definition), no sunlight while the sun is below the horizon for
// the whole hour and never more than the top-of-atmosphere flux (docs/methods.md §4.2, §4.3),
// direct ≤ global (definition of ERA5 fdir within ssrd, docs/methods.md §2.1).

let cc: CellClimate;
let year: DemoBlock;
let stamps: Float64Array;
const N_HOURS = 8760;

beforeAll(() => {
  cc = makeCellClimate(placeGrid(SMALL_GRID));
  const gen = new YearWeather(cc, 5, 2021);
  year = gen.allocBlock(N_HOURS);
  stamps = gen.next(N_HOURS, year);
});

function cellWhere(pick: (c: number) => number): number {
  let best = -1;
  let bestV = -Infinity;
  for (let c = 0; c < cc.nCells; c++)
    if (pick(c) > bestV) {
      bestV = pick(c);
      best = c;
    }
  return best;
}

const mean = (v: DemoBlock[keyof DemoBlock], c: number, keep: (t: number) => boolean = () => true): number => {
  let s = 0;
  let n = 0;
  for (let t = 0; t < N_HOURS; t++)
    if (keep(t)) {
      s += v[t * cc.nCells + c];
      n++;
    }
  return s / n;
};

describe('invented demo weather, small grid, 2021', () => {
  it('dew point never exceeds air temperature, and air temperature stays within 8–44.5 °C', () => {
    let above = 0;
    let lo = Infinity;
    let hi = -Infinity;
    for (let i = 0; i < year.t2m.length; i++) {
      if (year.d2m[i] > year.t2m[i]) above++;
      lo = Math.min(lo, year.t2m[i] - 273.15);
      hi = Math.max(hi, year.t2m[i] - 273.15);
    }
    expect(above).toBe(0);
    expect(lo).toBeGreaterThan(8);
    expect(hi).toBeLessThan(44.5);
    expect(hi).toBeGreaterThan(38);
  });

  it('ssrd is 0 when the sun is below the horizon for the whole hour, positive when it is well up, and below the top-of-atmosphere flux', () => {
    let darkNonZero = 0;
    let litZero = 0;
    let aboveToa = 0;
    for (let t = 0; t < N_HOURS; t++) {
      for (let c = 0; c < cc.nCells; c++) {
        const pc = periodCosines(stamps[t], 60, cc.lat[c], cc.lon[c]);
        const s = year.ssrd[t * cc.nCells + c];
        if (pc.sunlitFraction === 0 && s !== 0) darkNonZero++;
        if (pc.mean > 0.1 && !(s > 0)) litZero++;
        if (s / 3600 > topOfAtmosphereIrradiance(stamps[t] - 1.8e6, pc.mean) * 1.001 + 1e-6) aboveToa++;
      }
    }
    expect(darkNonZero).toBe(0);
    expect(litZero).toBe(0);
    expect(aboveToa).toBe(0);
  });

  it('fdir never exceeds ssrd, and radiation is never negative', () => {
    let bad = 0;
    for (let i = 0; i < year.ssrd.length; i++) if (year.fdir[i] > year.ssrd[i] || year.fdir[i] < 0 || year.strd[i] <= 0) bad++;
    expect(bad).toBe(0);
  });

  it('the dry basin is drier than the humid coast, and the upland is cooler with surface pressure of 850–900 hPa', () => {
    const basin = cellWhere((c) => cc.basin[c]);
    const upland = cellWhere((c) => cc.heightM[c]);
    const coast = cellWhere((c) => (cc.landFraction[c] >= 0.5 ? cc.coastal[c] : -1));
    const tdBasin = mean(year.d2m, basin);
    const tdCoast = mean(year.d2m, coast);
    expect(tdCoast - tdBasin).toBeGreaterThan(6);
    const rh = (c: number) => relativeHumidityFromDewPoint(mean(year.t2m, c) - 273.15, mean(year.d2m, c) - 273.15);
    expect(rh(basin)).toBeLessThan(rh(coast) - 20);
    expect(mean(year.t2m, upland)).toBeLessThan(mean(year.t2m, coast) - 4);
    const spUp = mean(year.sp, upland) / 100;
    expect(spUp).toBeGreaterThan(850);
    expect(spUp).toBeLessThan(900);
    expect(mean(year.sp, coast) / 100).toBeGreaterThan(1000);
  });

  it('the coast gets an onshore sea breeze in the afternoon (local solar time 13–16) and not before dawn', () => {
    const coast = cellWhere((c) => (cc.landFraction[c] >= 0.5 ? cc.coastal[c] : -1));
    const lstOf = (t: number) => ((((stamps[t] % 86.4e6) / 3.6e6 + cc.lon[coast] / 15) % 24) + 24) % 24;
    const onshore = (t: number) => year.u10[t * cc.nCells + coast] * cc.onshoreE[coast] + year.v10[t * cc.nCells + coast] * cc.onshoreN[coast];
    let aft = 0,
      nA = 0,
      pre = 0,
      nP = 0;
    for (let t = 0; t < N_HOURS; t++) {
      const h = lstOf(t);
      if (h >= 13 && h <= 16) {
        aft += onshore(t);
        nA++;
      }
      if (h >= 2 && h <= 5) {
        pre += onshore(t);
        nP++;
      }
    }
    expect(aft / nA - pre / nP).toBeGreaterThan(0.8);
  });

  it('summer midday WBGT in the sun on the coast is mostly 28–33 °C (Liljegren model of pipeline/physics)', () => {
    const coast = cellWhere((c) => (cc.landFraction[c] >= 0.5 ? cc.coastal[c] : -1));
    const wbgt: number[] = [];
    for (let t = 0; t < N_HOURS; t++) {
      const d = new Date(stamps[t]);
      const lst = (d.getUTCHours() + cc.lon[coast] / 15 + 24) % 24;
      if (d.getUTCMonth() < 6 || d.getUTCMonth() > 8 || lst < 10.5 || lst > 14.5) continue;
      const o = t * cc.nCells + coast;
      const ssrd = year.ssrd[o] / 3600;
      const r = computePoint({
        timeMs: stamps[t],
        avgMinutes: 60,
        lat: cc.lat[coast],
        lon: cc.lon[coast],
        ta: year.t2m[o] - 273.15,
        td: year.d2m[o] - 273.15,
        pressure: year.sp[o] / 100,
        wind: Math.hypot(year.u10[o], year.v10[o]),
        windHeight: 10,
        urban: false,
        dt: 0,
        solar: ssrd,
        directFraction: ssrd > 0 ? year.fdir[o] / year.ssrd[o] : 0,
      });
      if (Number.isFinite(r.wbgt)) wbgt.push(r.wbgt);
    }
    wbgt.sort((a, b) => a - b);
    expect(wbgt.length).toBeGreaterThan(300);
    const median = wbgt[wbgt.length >> 1];
    expect(median).toBeGreaterThan(28);
    expect(median).toBeLessThan(33);
    expect(wbgt.filter((x) => x > 28).length / wbgt.length).toBeGreaterThan(0.5);
    expect(wbgt[wbgt.length - 1]).toBeLessThan(36);
  });

  it('a year depends only on (seed, year): regenerating gives identical values, another seed different ones, and years join without a jump', () => {
    const again = new YearWeather(cc, 5, 2021);
    const b = again.allocBlock(24);
    again.next(24, b);
    for (const v of DEMO_VARIABLES) expect(Array.from(b[v])).toEqual(Array.from(year[v].subarray(0, 24 * cc.nCells)));
    const other = new YearWeather(cc, 6, 2021);
    const o = other.allocBlock(24);
    other.next(24, o);
    expect(Array.from(o.t2m)).not.toEqual(Array.from(b.t2m));
    const next = new YearWeather(cc, 5, 2022);
    const n = next.allocBlock(1);
    next.next(1, n);
    for (let c = 0; c < cc.nCells; c++) {
      expect(Math.abs(n.t2m[c] - year.t2m[(N_HOURS - 1) * cc.nCells + c])).toBeLessThan(2);
      expect(Math.abs(n.sp[c] - year.sp[(N_HOURS - 1) * cc.nCells + c])).toBeLessThan(150);
    }
  });
});

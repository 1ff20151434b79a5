import { describe, it, expect } from 'vitest';
import {
  saturationVaporPressureBuck1981,
  saturationVaporPressureHylandWexler,
  saturationVaporPressureBuck1996,
  relativeHumidityFromDewPoint,
  vaporPressureFromDewPoint,
  dewPointFromVaporPressure,
} from '../../pipeline/physics/humidity.ts';
import {
  cosZenithInstant,
  cosZenithApparentInstant,
  noaaCosZenith,
  noaaDeclination,
  noaaEquationOfTime,
  noaaFractionalYear,
  periodCosines,
  cosZenithPeriodMean,
  solarYearSupported,
  earthSunDistanceAu,
  topOfAtmosphereIrradiance,
  apparentCosZenith,
  apparentCosZenithFast,
} from '../../pipeline/physics/solar-position.ts';

// CRC Handbook of Chemistry and Physics 1992–93, "Vapor pressure of water" [kPa] (docs/methods.md §3.3).
const CRC: [number, number][] = [
  [0, 0.61129],
  [10, 1.2281],
  [20, 2.3388],
  [30, 4.2455],
  [40, 7.3814],
];

describe('saturation vapour pressure', () => {
  it('saturationVaporPressureBuck1981 matches the CRC Handbook table within 0.1 % over 0–40 °C', () => {
    for (const [t, kpa] of CRC) expect(Math.abs(saturationVaporPressureBuck1981(t) / (10 * kpa) - 1)).toBeLessThan(0.001);
  });
  it('saturationVaporPressureHylandWexler and Buck 1996 match the CRC Handbook table within 0.05 % over 0–40 °C', () => {
    for (const [t, kpa] of CRC) {
      expect(Math.abs(saturationVaporPressureHylandWexler(t) / (10 * kpa) - 1)).toBeLessThan(0.0005);
      expect(Math.abs(saturationVaporPressureBuck1996(t) / (10 * kpa) - 1)).toBeLessThan(0.0005);
    }
  });
  it('the model vapour pressure includes the 1.004 factor: esat(303.15 K) = 42.6048 hPa (docs/methods.md §6.9, reference C compiled)', () => {
    expect(vaporPressureFromDewPoint(30)).toBeCloseTo(42.6048, 3);
  });
  it('relativeHumidityFromDewPoint matches the docs/methods.md §3.3 check values (55.08, 56.29, 16.62 %)', () => {
    expect(relativeHumidityFromDewPoint(30, 20)).toBeCloseTo(55.08, 2);
    expect(relativeHumidityFromDewPoint(35, 25)).toBeCloseTo(56.29, 2);
    expect(relativeHumidityFromDewPoint(40, 10)).toBeCloseTo(16.62, 2);
    expect(saturationVaporPressureBuck1981(20)).toBeCloseTo(23.373, 2);
  });
  it('dewPointFromVaporPressure inverts the model vapour pressure to 1e-9 °C (docs/methods.md §3.2)', () => {
    for (const td of [-30, -5, 0, 12.5, 28]) expect(dewPointFromVaporPressure(vaporPressureFromDewPoint(td))).toBeCloseTo(td, 9);
  });
});

describe('solar geometry', () => {
  it('NOAA formulas reproduce the NOAA worked values for 2007-07-15 18:00 UTC, Chicago (EoT −5.81 min, δ 21.63°, cos z 0.9381; docs/methods.md §4.1)', () => {
    const t = Date.UTC(2007, 6, 15, 18);
    const g = noaaFractionalYear(t);
    expect(noaaEquationOfTime(g)).toBeCloseTo(-5.81, 1);
    expect((noaaDeclination(g) * 180) / Math.PI).toBeCloseTo(21.63, 1);
    expect(noaaCosZenith(t, 41.88, -87.63)).toBeCloseTo(0.9381, 3);
  });
  it('the Almanac sun agrees with NOAA within 0.001 in cos z, and with refraction gives the reference 0.9373 (docs/methods.md §4.1)', () => {
    const t = Date.UTC(2007, 6, 15, 18);
    expect(Math.abs(cosZenithInstant(t, 41.88, -87.63) - 0.9381)).toBeLessThan(0.001);
    expect(cosZenithApparentInstant(t, 41.88, -87.63)).toBeCloseTo(0.9373, 3);
    expect(cosZenithInstant(Date.UTC(2024, 2, 20, 12), 0, 0)).toBeCloseTo(0.9994, 3);
    expect(cosZenithInstant(Date.UTC(2024, 5, 21, 12), 23.44, 0)).toBeCloseTo(1, 3);
  });
  it('hour-mean cosines match the docs/methods.md §4.2 table (30 °N 0 °E, doy 172) within 0.002', () => {
    const rows: [number, number, number][] = [
      [6, 0.0915, 0.0968],
      [7, 0.298, 0.298],
      [13, 0.985, 0.985],
      [19, 0.1004, 0.1014],
    ];
    for (const [end, mean, sun] of rows) {
      const pc = periodCosines(Date.UTC(2024, 5, 20, end), 60, 30, 0);
      expect(Math.abs(pc.mean - mean)).toBeLessThan(0.002);
      expect(Math.abs(pc.sunlitMean - sun)).toBeLessThan(0.002);
    }
  });
  it('why the hour mean matters: for the 18–19 UTC hour the instant at the end is about −0.002 but the mean is about 0.10 (docs/methods.md §4.2)', () => {
    const end = Date.UTC(2024, 5, 20, 19);
    expect(Math.abs(cosZenithInstant(end, 30, 0))).toBeLessThan(0.003);
    expect(cosZenithPeriodMean(end, 60, 30, 0)).toBeGreaterThan(0.099);
  });
  it('period means are zero through a polar night and equal the instant for a zero-length period', () => {
    expect(cosZenithPeriodMean(Date.UTC(2010, 11, 21, 12), 60, 85, 0)).toBe(0);
    const t = Date.UTC(2010, 5, 1, 12);
    expect(cosZenithPeriodMean(t, 0, 10, 20)).toBeCloseTo(cosZenithInstant(t, 10, 20), 12);
  });
  it('Earth–Sun distance is near 0.983 AU in early January and 1.017 AU in early July (common practice)', () => {
    expect(earthSunDistanceAu(Date.UTC(2010, 0, 3))).toBeCloseTo(0.9833, 3);
    expect(earthSunDistanceAu(Date.UTC(2010, 6, 4))).toBeCloseTo(1.0167, 3);
    expect(topOfAtmosphereIrradiance(Date.UTC(2010, 0, 3), 1)).toBeCloseTo(1367 / 0.9833 ** 2, 0);
  });
  it('the sun position refuses a time that is not a number (its years: sun-position.test.ts)', () => {
    expect(solarYearSupported(NaN)).toBe(false);
  });
  it('apparentCosZenithFast (tabulated refraction, no arcsine) equals the exact apparentCosZenith within 1e-12 from below the horizon to the zenith', () => {
    // Reference: the exact form in the same file (Michalsky 1988 refraction); dense sweep plus the
    // cut-off at −0.56°, the split between the tables, and the top where the result is 1.
    let worst = 0;
    const check = (c: number) => {
      worst = Math.max(worst, Math.abs(apparentCosZenithFast(c) - apparentCosZenith(c)));
    };
    for (let k = 0; k <= 200_000; k++) check(-0.02 + (1.02 * k) / 200_000 + 1e-9 * Math.sin(k));
    for (const c of [-1, -0.0098, Math.sin((-0.56 * Math.PI) / 180), 0, 0.01, 0.7499999999, 0.75, 0.99999999, 1 - 1e-12, 1, 1.0000001]) check(c);
    expect(worst).toBeLessThan(1e-12);
    expect(apparentCosZenithFast(1)).toBe(1);
    expect(apparentCosZenithFast(-0.5)).toBe(-0.5);
    expect(apparentCosZenithFast(NaN)).toBeNaN();
  });
});

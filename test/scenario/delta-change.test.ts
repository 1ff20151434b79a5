/**
 * The delta change method on single hours (pipeline/physics/delta-change.ts, docs/methods.md §16):
 * relative humidity kept by a uniform warming, the dew point against an outside formula, a zero
 * change leaves the record untouched, and humidity pushed outside the physical range is clamped
 * and counted.
 */
import { describe, expect, it } from 'vitest';
import {
  applyMonthlyChange,
  dewPointAfterRelativeChange,
  dewPointAfterSpecificChange,
  emptyChangeCounts,
  type MonthlyChanges,
} from '../../pipeline/physics/delta-change.ts';
import { dewPointFromRelativeHumidity, relativeHumidityFromDewPoint } from '../../pipeline/physics/humidity.ts';
import { checkCellChange, uniformWarming } from '../../pipeline/scenario/cell-change.ts';
import { expectCatalogued } from '../helpers/catalogued.ts';

const T_GRID = [10, 15, 20, 25, 30, 35, 40, 45, 50];
const RH_GRID = [0.1, 0.2, 0.3, 0.4, 0.5, 0.6, 0.7, 0.8, 0.9, 1.0];

/**
 * Dew point [°C] at air temperature T (rows, T_GRID) and relative humidity RH (columns, RH_GRID)
 * by the formula MetPy documents for `metpy.calc.dewpoint_from_relative_humidity`: e = RH·e_s(T)
 * with Bolton's (1980) e_s = 6.112 hPa·exp(17.67·T/(T + 243.5)), and its inverse
 * T_d = 243.5·ln(e/6.112)/(17.67 − ln(e/6.112)). MetPy itself is not installed here and PyPI is
 * unreachable, so these are NOT MetPy's output: they were computed from that published formula
 * with numpy 1.24.2 (Debian /usr/bin/python3) and pinned to 1e-9 °C.
 */
const BOLTON_TD = [
  [-20.282171594, -11.955860805, -6.79090378, -2.984317926, 0.053676081, 2.593462942, 4.78251527, 6.710481839, 8.436093706, 10.0],
  [-16.41449832, -7.791576334, -2.437018679, 1.512055215, 4.665444498, 7.302846155, 9.576869103, 11.580313336, 13.373990598, 15.0],
  [-12.564965124, -3.641471126, 1.905519924, 5.999361663, 9.270085985, 12.006807824, 14.367333533, 16.447653292, 18.31068608, 20.0],
  [-8.733444685, 0.494527116, 6.236756326, 10.477628814, 13.86761705, 16.705357304, 19.153913293, 21.312503618, 23.24618059, 25.0],
  [-4.919810869, 4.616490199, 10.556734594, 14.946883952, 18.45805415, 21.398503932, 23.936613104, 26.174866225, 28.180474568, 30.0],
  [-1.123938719, 8.724489442, 14.865498565, 19.407154256, 23.041413691, 26.086257021, 28.715437682, 31.03474302, 33.11356845, 35.0],
  [2.654295562, 12.818595682, 19.16309185, 23.85846679, 27.617712029, 30.768625863, 33.490391736, 35.892135909, 38.045462675, 40.0],
  [6.415014624, 16.898879278, 23.449557833, 28.300848515, 32.18696547, 35.445619729, 38.261479966, 40.747046795, 42.97615768, 45.0],
  [10.15833998, 20.965410115, 27.724939675, 32.73432628, 36.749190267, 40.117247869, 43.028707065, 45.59947758, 47.905653903, 50.0],
];

describe('the delta change method, hour by hour', () => {
  it('a uniform warming of 0.5, 1.5, 2 and 4 K keeps relative humidity to 1e-9 (in our RH formula, docs/methods.md eq. 3.4) over T′ 10–50 °C × RH 10–100 %', () => {
    const counts = new Float64Array(2);
    let worst = 0;
    for (const dT of [0.5, 1.5, 2, 4]) {
      for (const tNew of T_GRID) {
        for (const rh of RH_GRID) {
          const t = tNew - dT;
          const td = dewPointFromRelativeHumidity(t, rh * 100);
          const tdNew = dewPointAfterRelativeChange(t, td, tNew, 0, counts);
          worst = Math.max(worst, Math.abs(relativeHumidityFromDewPoint(tNew, tdNew) / 100 - relativeHumidityFromDewPoint(t, td) / 100));
        }
      }
    }
    expect(worst).toBeLessThan(1e-9);
    expect(Array.from(counts)).toEqual([0, 0]);
  });

  it('the new dew point agrees within 0.05 °C with the formula MetPy documents for dewpoint_from_relative_humidity (Bolton 1980; values computed with numpy and pinned, MetPy not run) over T′ 10–50 °C × RH 10–100 %', () => {
    const counts = new Float64Array(2);
    let worst = 0;
    T_GRID.forEach((tNew, i) =>
      RH_GRID.forEach((rh, j) => {
        const t = tNew - 2;
        const td = dewPointFromRelativeHumidity(t, rh * 100);
        worst = Math.max(worst, Math.abs(dewPointAfterRelativeChange(t, td, tNew, 0, counts) - BOLTON_TD[i][j]));
      }),
    );
    expect(worst).toBeLessThan(0.05);
    // Not trivially close: the two Magnus forms differ by a few hundredths at dry, warm points.
    expect(worst).toBeGreaterThan(0.01);
  });

  it('a zero change leaves every field bit for bit as it was, NaN hours included', () => {
    const n = 3;
    const hours = 4;
    const mk = (f: (i: number) => number) => Float32Array.from({ length: n * hours }, (_, i) => f(i));
    const air = mk((i) => 20 + i * 0.37);
    air[5] = NaN;
    const dew = mk((i) => 10 + i * 0.21);
    const fields = {
      airTemperature: air.slice(),
      dewPointTemperature: dew.slice(),
      surfacePressure: mk(() => 1000),
      solarGlobal: mk((i) => i * 10),
      solarDirect: mk((i) => i * 5),
    };
    const change: MonthlyChanges = {
      nCells: n,
      temperature: new Float64Array(12 * n),
      humidityKind: 'relative',
      humidity: new Float64Array(12 * n),
      solar: new Float64Array(12 * n),
    };
    const counts = emptyChangeCounts();
    applyMonthlyChange(fields, n, hours, [7, 7, 7, 8], change, 0, counts);
    expect(Buffer.from(fields.airTemperature.buffer).equals(Buffer.from(air.buffer))).toBe(true);
    expect(Buffer.from(fields.dewPointTemperature.buffer).equals(Buffer.from(dew.buffer))).toBe(true);
    expect(Array.from(fields.solarGlobal)).toEqual(Array.from(mk((i) => i * 10)));
    expect(counts).toEqual({ humidityClampedHigh: 0, humidityClampedLow: 0 });
  });

  it('a humidity change past saturation is clamped to RH 100 % and counted; one below 1 % is clamped to 1 % and counted, never silent', () => {
    const n = 2;
    const change: MonthlyChanges = {
      nCells: n,
      temperature: new Float64Array(12 * n).fill(1),
      humidityKind: 'relative',
      humidity: new Float64Array(12 * n),
      solar: null,
    };
    change.humidity![6 * n + 0] = 40; // July, cell 0: RH 80 % + 40 points → 100 %
    change.humidity![6 * n + 1] = -60; // July, cell 1: RH 30 % − 60 points → 1 %
    const t = [30, 30, 30, 30];
    const td = [
      dewPointFromRelativeHumidity(30, 80),
      dewPointFromRelativeHumidity(30, 30),
      dewPointFromRelativeHumidity(30, 80),
      dewPointFromRelativeHumidity(30, 30),
    ];
    const fields = {
      airTemperature: Float32Array.from(t),
      dewPointTemperature: Float32Array.from(td),
      surfacePressure: new Float32Array(4).fill(1000),
      solarGlobal: new Float32Array(4),
    };
    const counts = emptyChangeCounts();
    applyMonthlyChange(fields, n, 2, [7, 7], change, 0, counts);
    expect(counts).toEqual({ humidityClampedHigh: 2, humidityClampedLow: 2 });
    expect(relativeHumidityFromDewPoint(31, fields.dewPointTemperature[0])).toBeCloseTo(100, 3);
    expect(relativeHumidityFromDewPoint(31, fields.dewPointTemperature[1])).toBeCloseTo(1, 3);
    // Specific humidity doubled in saturated-ish air: clamped at saturation and counted too.
    const c = new Float64Array(2);
    const tdS = dewPointAfterSpecificChange(30, dewPointFromRelativeHumidity(30, 90), 30, 1, 1000, c);
    expect(c[0]).toBe(1);
    expect(tdS).toBeCloseTo(30, 9);
  });

  it('a humidity change outside ±100 points, a specific-humidity change of −1 or less, and a temperature change of 250 K are catalogued errors naming the cell and month', () => {
    const lat = [20, 21];
    const lon = [-146, -145];
    const rel = { ...uniformWarming(2, 1), humidity: new Float64Array(24) };
    rel.humidity[13] = 130;
    expectCatalogued(() => checkCellChange(rel, lat, lon, 'change.nc'), 'HumidityChangeOutOfRange', /130 percentage points.*21° N, -145° E in month 7/);
    const spec = { ...uniformWarming(2, 1), humidityKind: 'specific' as const, humidity: new Float64Array(24) };
    spec.humidity[0] = -1;
    expectCatalogued(() => checkCellChange(spec, lat, lon, 'change.nc'), 'HumidityChangeOutOfRange', /month 1/);
    expectCatalogued(() => checkCellChange(uniformWarming(2, 250), lat, lon, 'change.nc'), 'TemperatureChangeOutOfRange', /250 K/);
  });
});

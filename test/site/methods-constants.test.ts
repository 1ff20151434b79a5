/**
 * The method descriptors the methods page renders (pipeline/physics/methods.ts,
 * pipeline/work/methods.ts, pipeline/climate/methods.ts, pipeline/regions/methods.ts) against the
 * code the pipeline runs:
 * - every constant said to be exported is read back from its module by the name and path given,
 *   independently of the descriptor's own import, and is the same number;
 * - every constant said to be written inside a function is checked by evaluating the method with
 *   the listed values against that function (to rounding, at several inputs);
 * - every decimal number printed in an equation is one of the method's listed constants;
 * - every source cited is in the bibliography, and every physics constant of the code's own
 *   table (PHYSICS_CONSTANTS) is shown with some method.
 * The rendered page is checked against the same exports in methods-page.test.ts.
 */
import { describe, expect, it } from 'vitest';
import { PHYSICS_METHODS } from '../../pipeline/physics/methods.ts';
import { WORK_METHODS } from '../../pipeline/work/methods.ts';
import { CLIMATE_METHODS } from '../../pipeline/climate/methods.ts';
import { REGION_METHODS } from '../../pipeline/regions/methods.ts';
import { SOURCES, SOURCE_IDS, formatMethodNumber, parseMethodNumber, type MethodConstant, type MethodDescriptor } from '../../pipeline/model/sources.ts';
import { PHYSICS_CONSTANTS } from '../../pipeline/physics/constants.ts';
import {
  airThermalConductivity,
  airViscosity,
  atmosphericEmissivity,
  cylinderHeatTransfer,
  latentHeat,
  reynoldsNumber,
  sphereHeatTransfer,
  vaporDiffusivity,
} from '../../pipeline/physics/air-properties.ts';
import { refractionDeg, sunState } from '../../pipeline/physics/solar-position.ts';
import { directFractionExact } from '../../pipeline/physics/solar-inputs.ts';
import { computePoint } from '../../pipeline/physics/point-row.ts';
import { dunne2013Loss } from '../../pipeline/work/capacity-loss.ts';
import { computeNormals } from '../../pipeline/climate/normals.ts';
import { quantileSorted } from '../../pipeline/climate/quantile.ts';
import { resolveExport } from './method-exports.ts';

const GROUPS = [PHYSICS_METHODS, WORK_METHODS, CLIMATE_METHODS, REGION_METHODS];
const METHODS: MethodDescriptor[] = GROUPS.flatMap((g) => g.methods);
const ALL_CONSTANTS: Array<{ method: MethodDescriptor; c: MethodConstant }> = METHODS.flatMap((m) => m.constants.map((c) => ({ method: m, c })));

/** The listed value of the constant `symbol` of method `id`. */
function k(id: string, symbol: string): number {
  const m = METHODS.find((x) => x.id === id);
  const c = m?.constants.find((x) => x.symbol === symbol);
  if (!c) throw new Error(`no constant ${symbol} in ${id}`);
  return c.value;
}

function close(a: number, b: number, rel = 1e-12): boolean {
  return Math.abs(a - b) <= rel * Math.max(1, Math.abs(a), Math.abs(b));
}

const RAD = Math.PI / 180;
const wrap = (x: number) => ((x % 360) + 360) % 360;

/**
 * For each function that holds literal constants: the method computed again from the listed
 * values, compared with the function at several inputs. Keyed by the descriptors' `code`.
 */
const LITERAL_CHECKS: Record<string, () => void> = {
  'pipeline/physics/air-properties.ts airViscosity()': () => {
    const id = 'air-properties';
    for (const T of [250, 290, 320, 350]) {
      const omega = k(id, 'Ω₀') - (k(id, 'Ω₁') * (T / k(id, 'ε/κ') - k(id, 'Ω₂'))) / k(id, 'Ω₃');
      const mu = (k(id, 'μ₀') * Math.sqrt(k(id, 'M_a') * T)) / (k(id, 'σ_LJ') ** 2 * omega);
      expect(close(mu, airViscosity(T)), `T=${T}`).toBe(true);
    }
  },
  'pipeline/physics/air-properties.ts airThermalConductivity()': () => {
    const id = 'air-properties';
    for (const T of [260, 300, 340]) expect(close((k(id, 'c_p') + k(id, 'k₁') * k(id, 'R_air')) * airViscosity(T), airThermalConductivity(T))).toBe(true);
  },
  'pipeline/physics/air-properties.ts vaporDiffusivity()': () => {
    const id = 'air-properties';
    for (const [T, P] of [
      [280, 1013.25],
      [305, 900],
      [330, 1040],
    ]) {
      const tc = k(id, 'T_c,a') * k(id, 'T_c,w');
      const d =
        ((k(id, 'D₀') *
          (T / Math.sqrt(tc)) ** k(id, 'n_D') *
          (k(id, 'P_c,a') * k(id, 'P_c,w')) ** (1 / 3) *
          tc ** (5 / 12) *
          Math.sqrt(1 / k(id, 'M_a') + 1 / k(id, 'M_w'))) /
          (P / k(id, 'P₀'))) *
        1e-4;
      expect(close(d, vaporDiffusivity(T, P), 1e-12), `T=${T}`).toBe(true);
    }
  },
  'pipeline/physics/air-properties.ts latentHeat()': () => {
    const id = 'air-properties';
    for (const T of [270, 300, 330]) expect(close(k(id, 'ΔH₀') - (k(id, 'ΔH₁') * (k(id, 'T_ΔH') - T)) / 30, latentHeat(T))).toBe(true);
  },
  'pipeline/physics/air-properties.ts atmosphericEmissivity()': () => {
    const id = 'atmospheric-emissivity';
    for (const e of [2, 10, 25, 40]) expect(close(k(id, 'a_ε') * e ** k(id, 'b_ε'), atmosphericEmissivity(e))).toBe(true);
  },
  'pipeline/physics/air-properties.ts sphereHeatTransfer()': () => {
    const id = 'heat-transfer';
    for (const [T, P, u] of [
      [300, 1000, 0.05],
      [310, 950, 2],
      [290, 1013, 6],
    ]) {
      const re = reynoldsNumber(k(id, 'D_g'), T, P, u);
      const nu = 2 + k(id, 'a_s') * Math.sqrt(re) * k(id, 'Pr') ** k(id, 'n_s');
      expect(close((nu * airThermalConductivity(T)) / k(id, 'D_g'), sphereHeatTransfer(k(id, 'D_g'), T, P, u))).toBe(true);
    }
    expect(reynoldsNumber(0.05, 300, 1000, 0)).toBe(reynoldsNumber(0.05, 300, 1000, k(id, 'u_min')));
  },
  'pipeline/physics/air-properties.ts cylinderHeatTransfer()': () => {
    const id = 'heat-transfer';
    for (const [T, P, u] of [
      [300, 1000, 0.5],
      [310, 950, 3],
    ]) {
      const re = reynoldsNumber(k(id, 'D_w'), T, P, u);
      const nu = k(id, 'a_c') * re ** k(id, 'm_c') * k(id, 'Pr') ** k(id, 'n_c');
      expect(close((nu * airThermalConductivity(T)) / k(id, 'D_w'), cylinderHeatTransfer(k(id, 'D_w'), T, P, u))).toBe(true);
    }
  },
  'pipeline/physics/solar-position.ts sunState()': () => {
    const id = 'sun-position';
    for (const iso of ['1900-01-01T00:30:00Z', '1944-07-15T18:00:00Z', '2007-07-15T18:00:00Z', '2024-03-20T12:00:00Z', '2100-12-31T23:30:00Z']) {
      const t = Date.parse(iso);
      const days = t / 86_400_000 + 2_440_587.5 - k(id, 'JD₀');
      const T = days / k(id, 'N_c');
      const L0 = k(id, 'L₀,₀') + k(id, 'L₀,₁') * T + k(id, 'L₀,₂') * T * T;
      const M = k(id, 'M₀') + k(id, 'M₁') * T - k(id, 'M₂') * T * T;
      const e = k(id, 'e₀') - k(id, 'e₁') * T - k(id, 'e₂') * T * T;
      const C =
        (k(id, 'C₁,₀') - k(id, 'C₁,₁') * T - k(id, 'C₁,₂') * T * T) * Math.sin(M * RAD) +
        (k(id, 'C₂,₀') - k(id, 'C₂,₁') * T) * Math.sin(2 * M * RAD) +
        k(id, 'C₃') * Math.sin(3 * M * RAD);
      const R = (k(id, 'a_R') * (1 - e * e)) / (1 + e * Math.cos((M + C) * RAD));
      const om = k(id, 'Ω₀') - k(id, 'Ω₁') * T;
      const lam = L0 + C - k(id, 'κ') - k(id, 'ψ₁') * Math.sin(om * RAD);
      const eps = k(id, 'ε₀,₀') - (k(id, 'ε₀,₁') * T + k(id, 'ε₀,₂') * T * T - k(id, 'ε₀,₃') * T ** 3) / 3600 + k(id, 'ε₁') * Math.cos(om * RAD);
      const dec = Math.asin(Math.sin(eps * RAD) * Math.sin(lam * RAD));
      const theta =
        wrap(k(id, 'θ₀,₀') + k(id, 'θ₀,₁') * days + k(id, 'θ₀,₂') * T * T - T ** 3 / k(id, 'θ₀,₃') - k(id, 'ψ₁') * Math.sin(om * RAD) * Math.cos(eps * RAD)) *
        RAD;
      const s = sunState(t);
      expect(Math.abs(s.declination - dec), iso).toBeLessThan(1e-9);
      // Sidereal time grows 361° a day: the day count's rounding (1e−10 d) allows 1e−7 rad here.
      expect(Math.abs(Math.atan2(Math.sin(s.gmst - theta), Math.cos(s.gmst - theta))), iso).toBeLessThan(1e-7);
      expect(close(s.distanceAu, R), iso).toBe(true);
    }
  },
  'pipeline/physics/solar-position.ts refractionDeg()': () => {
    const id = 'refraction';
    for (const e of [-0.5, 0, 2, 10, 45, 85]) {
      const want = (k(id, 'r₀') * (k(id, 'r₁') + k(id, 'r₂') * e + k(id, 'r₃') * e * e)) / (1 + k(id, 'r₄') * e + k(id, 'r₅') * e * e);
      expect(close(want, refractionDeg(e)), `e=${e}`).toBe(true);
    }
    expect(refractionDeg(k(id, 'e_min') - 0.01)).toBe(0);
    expect(refractionDeg(k(id, 'e_min') + 0.01)).toBeGreaterThan(0);
  },
  'pipeline/physics/solar-inputs.ts directFractionExact()': () => {
    const id = 'solar-load';
    for (const s of [0.1, 0.4, 0.7, 0.85]) expect(close(Math.exp(k(id, 'k₀') - k(id, 'k₁') * s - k(id, 'k₂') / s), directFractionExact(s))).toBe(true);
  },
  'pipeline/work/capacity-loss.ts dunne2013Loss()': () => {
    const id = 'capacity-loss-dunne';
    for (const w of [20, 25, 26, 29, 32, 33.5, 40]) {
      const capacity = Math.min(100, Math.max(0, 100 - k(id, 'k') * Math.max(0, w - k(id, 'W₀')) ** (2 / 3)));
      expect(Math.abs(1 - capacity / 100 - dunne2013Loss(w)), `WBGT ${w}`).toBeLessThan(1e-12);
    }
  },
  'pipeline/climate/normals.ts computeNormals()': () => {
    const id = 'quantiles';
    const years = [2001, 2002, 2003, 2004, 2005, 2006, 2007];
    const values = Float64Array.from([40, 43, 48, 52, 55, 57, 66, 72, 74, 88, 89, 95, 97, 97], (v, i) => v + (i % 2) * 3);
    const nItems = 2;
    const n = computeNormals({ years, values, nItems }, { baseline: [2001, 2007] });
    for (let item = 0; item < nItems; item++) {
      const sorted = Float64Array.from(years.map((_, y) => values[y * nItems + item])).sort();
      expect(n.median[item]).toBe(quantileSorted(sorted, k(id, 'p_median')));
      expect(n.p90[item]).toBe(quantileSorted(sorted, k(id, 'p_90')));
    }
  },
};

describe('the constants of the methods page', () => {
  it('read back from their modules by the exported name and path given, each is the number the descriptor shows', async () => {
    let n = 0;
    for (const { method, c } of ALL_CONSTANTS) {
      if (!c.code.includes('#')) continue;
      const v = await resolveExport(c.code);
      expect(typeof v, `${method.id} ${c.symbol} (${c.code})`).toBe('number');
      expect(Object.is(v, c.value), `${method.id} ${c.symbol} (${c.code}) = ${String(v)}, shown ${c.value}`).toBe(true);
      n++;
    }
    expect(n).toBeGreaterThan(80);
  });

  it('written inside a function: the method evaluated with the listed values matches that function', () => {
    const literalCodes = new Set(ALL_CONSTANTS.filter(({ c }) => !c.code.includes('#')).map(({ c }) => c.code));
    expect(literalCodes.size).toBeGreaterThan(5);
    for (const code of literalCodes) {
      expect(LITERAL_CHECKS[code], `no evaluation check for constants written in ${code}`).toBeTypeOf('function');
      LITERAL_CHECKS[code]();
    }
  });

  it('the kernel weights WBGT exactly as the WBGT method shows (sun: wet bulb, globe, air)', () => {
    const id = 'wbgt';
    for (const [ta, rh, solar, wind] of [
      [30, 50, 800, 3],
      [35, 40, 900, 2],
      [25, 80, 0, 1],
      [40, 20, 1000, 4],
    ]) {
      const out = computePoint({
        timeMs: Date.parse('2021-07-15T22:00:00Z'),
        avgMinutes: 60,
        lat: 20,
        lon: -145,
        ta,
        rh,
        pressure: 1005,
        wind,
        windHeight: 10,
        urban: false,
        dt: 0,
        solar,
      });
      expect(out.status).toBe(0);
      const want = k(id, 'w_nw') * out.tnwb + k(id, 'w_g') * out.tg + k(id, 'w_a') * ta;
      expect(Math.abs(out.wbgt - want), `Ta ${ta}`).toBeLessThan(1e-12);
    }
  });

  it('print exactly: every shown value reads back as the same number', () => {
    for (const { method, c } of ALL_CONSTANTS) expect(parseMethodNumber(formatMethodNumber(c.value)), `${method.id} ${c.symbol}`).toBe(c.value);
  });

  it('are the only decimal numbers in the equations: each number printed in an equation is a listed constant of its method', () => {
    for (const m of METHODS) {
      const shown = new Set(m.constants.map((c) => formatMethodNumber(c.value)));
      for (const line of m.equation) {
        // Decimals and powers of ten as formatMethodNumber prints them; small integers are structure (2, 4, ½, 100 %).
        for (const num of line.match(/\u2212?\d+\.\d+(·10[⁻⁰¹²³⁴⁵⁶⁷⁸⁹]+)?|\d+·10[⁻⁰¹²³⁴⁵⁶⁷⁸⁹]+/g) ?? []) {
          if (num === '10⁻⁴') continue;
          expect(shown.has(num), `${m.id}: ${num} in "${line}" is not a listed constant`).toBe(true);
        }
      }
    }
  });

  it('cover the physics stage\u2019s own constants table: each entry of PHYSICS_CONSTANTS is shown with some method', () => {
    const physics = PHYSICS_METHODS.methods.flatMap((m) => m.constants);
    for (const pc of PHYSICS_CONSTANTS)
      expect(
        physics.some((c) => Object.is(c.value, pc.value)),
        `${pc.name} (${pc.value})`,
      ).toBe(true);
  });
});

describe('the bibliography', () => {
  it('has one entry per id, and every source a method cites is in it', () => {
    expect(SOURCES.map((s) => s.id).sort()).toEqual([...SOURCE_IDS].sort());
    for (const m of METHODS) for (const id of m.sources) expect(SOURCE_IDS, m.id).toContain(id);
  });

  it('marks what of each entry was read and what is from memory', () => {
    for (const s of SOURCES) {
      expect(s.checked.length, s.id).toBeGreaterThan(10);
      if (s.doi) expect(s.doi, s.id).toMatch(/^10\.\d{4,}\//);
    }
  });

  it('gives each method an id of its own (anchors on the page)', () => {
    const ids = METHODS.map((m) => m.id);
    expect(new Set(ids).size).toBe(ids.length);
    for (const id of ids) expect(id).toMatch(/^[a-z0-9-]+$/);
  });
});

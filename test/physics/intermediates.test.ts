/**
 * Pinned intermediates at one state (Ta = 30 °C, RH 50 %, P = 1013.25 hPa, u = 1 m/s, film
 * temperature 303.15 K), each computed by hand here from the docs/methods.md §6.3–§6.4 formulas,
 * so a failure points at the step that broke; then the solver's hoisted and tabulated forms
 * against the readable ones.
 */
import { describe, it, expect } from 'vitest';
import * as P from '../../pipeline/physics/air-properties.ts';
import { CellState, prepareCell } from '../../pipeline/physics/liljegren-solve.ts';
import { ES_TABLE, Z_TABLE, W_TABLE, lookup, esExact, zExact, wExact } from '../../pipeline/physics/property-tables.ts';
import { PRANDTL, RATIO, D_GLOBE, D_WICK } from '../../pipeline/physics/constants.ts';
import { saturationVaporPressureModel } from '../../pipeline/physics/humidity.ts';

const T = 303.15;
const p = 1013.25;
const u = 1;
const Rair = 8314.34 / 28.97;
const cp = 1003.5;

describe('pinned intermediates (hand-computed from docs/methods.md §6.3–§6.4)', () => {
  const omega = 1.048 - (0.034 * (T / 97 - 2.9)) / 0.4;
  const mu = (2.6693e-6 * Math.sqrt(28.97 * T)) / (3.617 * 3.617 * omega);
  const rho = (100 * p) / (Rair * T);
  const k = (cp + 1.25 * Rair) * mu;
  const Pr = cp / (cp + 1.25 * Rair);
  it('Prandtl number 0.73665 and RATIO 1613.73 (docs/methods.md §6.2)', () => {
    expect(PRANDTL).toBeCloseTo(0.73665, 4);
    expect(RATIO).toBeCloseTo(1613.73, 1);
  });
  it('viscosity, density, conductivity', () => {
    expect(P.airViscosity(T)).toBeCloseTo(mu, 15);
    expect(mu).toBeGreaterThan(1.8e-5);
    expect(mu).toBeLessThan(1.9e-5); // air near 30 °C, common practice
    expect(P.airDensity(T, p)).toBeCloseTo(rho, 12);
    expect(P.airThermalConductivity(T)).toBeCloseTo(k, 12);
  });
  it('Reynolds and Nusselt numbers and h_g of the 2-inch globe', () => {
    const re = (u * rho * 0.0508) / mu;
    expect(P.reynoldsNumber(D_GLOBE, T, p, u)).toBeCloseTo(re, 8);
    const nu = 2 + 0.6 * Math.sqrt(re) * Math.pow(Pr, 0.3333);
    expect(P.sphereHeatTransfer(D_GLOBE, T, p, u)).toBeCloseTo((nu * k) / 0.0508, 8);
  });
  it('h_w of the wick (Nu = 0.281 Re^0.6 Pr^0.44)', () => {
    const re = (u * rho * 0.007) / mu;
    const nu = 0.281 * Math.pow(re, 0.6) * Math.pow(Pr, 0.44);
    expect(P.cylinderHeatTransfer(D_WICK, T, p, u)).toBeCloseTo((nu * k) / 0.007, 8);
  });
  it('ΔH = 1665134.5 + 2370 T, ε_a = 0.575 e_a^0.143, Sc = μ/(ρ D_v)', () => {
    expect(P.latentHeat(T)).toBeCloseTo(1665134.5 + 2370 * T, 4);
    const ea = 0.5 * saturationVaporPressureModel(30);
    expect(P.atmosphericEmissivity(ea)).toBeCloseTo(0.575 * Math.pow(ea, 0.143), 12);
    const dv = 2.47177e-5 * Math.pow(T / 292.31, 2.334) * (1013.25 / p); // docs/methods.md §6.3 numeric form
    expect(P.vaporDiffusivity(T, p) / dv).toBeCloseTo(1, 4);
    expect(P.schmidtNumber(T, p)).toBeCloseTo(mu / (rho * P.vaporDiffusivity(T, p)), 10);
    expect(P.schmidtNumber(T, 700)).toBeCloseTo(P.schmidtNumber(T, 1013.25), 10); // pressure cancels
  });
  it('the solver’s hoisted wick coefficient C_w·W(T) equals h_w, and Z(T) equals ΔH/RATIO·(Pr/Sc)^0.56', () => {
    const s = new CellState();
    for (const [pp, uu] of [
      [1013.25, 1],
      [700, 0.05],
      [950, 7],
    ]) {
      prepareCell(s, 30, 19, pp, uu, 0, 0, 0.5);
      for (const t of [270, 303.15, 330]) {
        expect((s.cw * wExact(t)) / P.cylinderHeatTransfer(D_WICK, t, pp, uu)).toBeCloseTo(1, 10);
        expect(zExact(t) / ((P.latentHeat(t) / RATIO) * Math.pow(PRANDTL / P.schmidtNumber(t, pp), 0.56))).toBeCloseTo(1, 10);
      }
    }
  });
  it('property tables reproduce e_s, Z and W to a relative 1e-8 over 200–380 K', () => {
    const out = new Float64Array(2);
    for (let t = 200; t < 380; t += 0.0731) {
      for (const [tab, f] of [
        [ES_TABLE, esExact],
        [Z_TABLE, zExact],
        [W_TABLE, wExact],
      ] as const) {
        expect(lookup(tab, t, out, 0)).toBe(true);
        expect(Math.abs(out[0] / f(t) - 1)).toBeLessThan(1e-8);
      }
    }
    expect(lookup(ES_TABLE, 100, out, 0)).toBe(false);
  });
});

import { describe, expect, it } from 'vitest';
import { interpolateCividis, interpolateInferno, interpolateViridis } from 'd3-scale-chromatic';
import { compileStyle } from '../../../pipeline/publish/layers/style.ts';
import { COLOUR_KINDS, DIVERGING_RAMPS, RAMPS, RAMP_FOR_FIGURE, rampInterpolator } from '../../../pipeline/publish/layers/ramps.ts';
import { figureStyle } from '../../../pipeline/publish/layers/figure-style.ts';
import { nicheClassStyle, NICHE_COLOURS } from '../../../pipeline/publish/layers/niche-style.ts';
import { NICHE_CLASSES, NICHE_LABELS, NICHE_NO_CLASS, nicheClassCode } from '../../../pipeline/climate/niche.ts';
import { renderLayerPng } from '../../../pipeline/publish/layers/render-layer-png.ts';
import { cssToRgb, decodePng, hexToRgb, regularGrid } from './helpers.ts';
import { DEFICIENCIES, deltaE, lab, simulate, type Rgb3 } from './colour-vision.ts';

// Outside references: d3-scale-chromatic 3.1.1 interpolators (the ramps themselves); sRGB
// (IEC 61966-2-1), CIELAB (CIE 15:2004) and Machado et al. (2009) deficiency simulation in
// colour-vision.ts; sharp 0.34.5 decodes PNGs.

function near(a: Rgb3, b: Rgb3, tol: number) {
  for (let k = 0; k < 3; k++) expect(Math.abs(a[k] - b[k])).toBeLessThanOrEqual(tol);
}

describe('continuous legend', () => {
  it('has 11 stops with strictly increasing values from min to max, each the d3 viridis colour at that value (within 1 of 255)', () => {
    const { legend } = compileStyle({ kind: 'continuous', ramp: 'viridis', domain: [0, 250], units: 'h', title: 'Hours' });
    expect(legend.kind).toBe('continuous');
    expect(legend.stops).toHaveLength(11);
    expect(legend.stops[0].value).toBe(0);
    expect(legend.stops[10].value).toBe(250);
    for (let i = 1; i < 11; i++) expect(legend.stops[i].value).toBeGreaterThan(legend.stops[i - 1].value);
    legend.stops.forEach((s) => near(hexToRgb(s.color), cssToRgb(interpolateViridis(s.value / 250)), 1));
    expect(legend.domain).toEqual([0, 250]);
    expect(legend.units).toBe('h');
    expect(legend.ramp).toBe('viridis');
    expect(legend.labels[5]).toBe('125');
    expect(legend.noData.color).toBe('transparent');
    expect(legend.noData.meaning).toMatch(/no data/);
    expect(JSON.parse(JSON.stringify(legend))).toEqual(legend); // plain JSON for the manifest
  });

  it('a reversed ramp lists the d3 colour at 1 − t and says reversed', () => {
    const { legend } = compileStyle({ kind: 'continuous', ramp: 'inferno', reverse: true, domain: [10, 20], units: 'h' });
    expect(legend.reversed).toBe(true);
    near(hexToRgb(legend.stops[0].color), cssToRgb(interpolateInferno(1)), 1);
    near(hexToRgb(legend.stops[10].color), cssToRgb(interpolateInferno(0)), 1);
  });

  it('the colours in the PNG are exactly the legend stop colours at the stop values', async () => {
    const style = { kind: 'continuous' as const, ramp: 'cividis' as const, domain: [0, 10] as [number, number], units: 'degC' };
    const g = regularGrid(0.5, 1, 2, 0.5, 1, 11, (_y, x) => x);
    const layer = renderLayerPng(g, style);
    const img = await decodePng(layer.png);
    for (let x = 0; x < 11; x++) {
      expect(img.at(x * 8 + 4, 2).slice(0, 3)).toEqual(hexToRgb(layer.legend.stops[x].color));
      near(hexToRgb(layer.legend.stops[x].color), cssToRgb(interpolateCividis(x / 10)), 1);
    }
  });
});

describe('stepped legend', () => {
  it('5 classes over [0, 100] give edges 0, 20, …, 100 and five flat colours sampled across the ramp', () => {
    const c = compileStyle({ kind: 'continuous', ramp: 'viridis', domain: [0, 100], classes: 5, units: 'h' });
    expect(c.legend.kind).toBe('stepped');
    expect(c.legend.breaks).toEqual([0, 20, 40, 60, 80, 100]);
    expect(c.legend.labels).toEqual(['0 – 20', '20 – 40', '40 – 60', '60 – 80', '80 – 100']);
    c.legend.stops.forEach((s, k) => near(hexToRgb(s.color), cssToRgb(interpolateViridis(k / 4)), 0));
    const hex = (v: number) => {
      const p = c.colourOf(v);
      return `#${[p & 255, (p >>> 8) & 255, (p >>> 16) & 255].map((b) => b.toString(16).padStart(2, '0')).join('')}`;
    };
    // a class's lower edge belongs to it; max belongs to the last class; beyond the domain clamps
    expect(hex(19.999)).toBe(c.legend.stops[0].color);
    expect(hex(20)).toBe(c.legend.stops[1].color);
    expect(hex(100)).toBe(c.legend.stops[4].color);
    expect(hex(1e6)).toBe(c.legend.stops[4].color);
    expect(hex(-5)).toBe(c.legend.stops[0].color);
  });

  it('adjacent classes of every ramp we offer stay apart (ΔE*ab ≥ 5) under simulated protanopia, deuteranopia and tritanopia', () => {
    for (const ramp of Object.keys(RAMPS)) {
      const c = compileStyle({ kind: 'continuous', ramp: ramp as keyof typeof RAMPS, domain: [0, 1], classes: 7, units: '1' });
      const cols = c.legend.stops.map((s) => hexToRgb(s.color));
      for (const [name, m] of Object.entries(DEFICIENCIES)) {
        for (let k = 1; k < cols.length; k++) {
          const d = deltaE(simulate(m, cols[k - 1]), simulate(m, cols[k]));
          expect(d, `${ramp} ${name} classes ${k - 1}/${k}`).toBeGreaterThanOrEqual(5);
        }
      }
    }
  });
});

describe('ramps', () => {
  it('every ramp we offer is ordered in lightness: CIELAB L* is monotonic along t, also under each simulated deficiency', () => {
    for (const [name, f] of Object.entries(RAMPS)) {
      const cols = Array.from({ length: 33 }, (_, i) => cssToRgb(f(i / 32)));
      for (const [vision, m] of [['normal', null], ...Object.entries(DEFICIENCIES)] as [string, number[][] | null][]) {
        const L = cols.map((c) => lab(m ? simulate(m, c) : c)[0]);
        const sign = Math.sign(L[32] - L[0]);
        for (let i = 1; i < L.length; i++) expect((L[i] - L[i - 1]) * sign, `${name} ${vision} at ${i}`).toBeGreaterThan(-0.5);
      }
    }
  });

  it('every figure kind gets a ramp we offer, and hour figures start light (low L* means many hours)', () => {
    for (const [kind, { ramp, reverse }] of Object.entries(RAMP_FOR_FIGURE)) {
      expect([...Object.keys(RAMPS), ...Object.keys(DIVERGING_RAMPS)]).toContain(ramp);
      if (['hoursAboveLimit', 'hoursLost', 'capacityLoss'].includes(kind)) {
        const c = compileStyle(figureStyle(kind as keyof typeof RAMP_FOR_FIGURE, [0, 1], 'h'));
        const lo = lab(hexToRgb(c.legend.stops[0].color))[0];
        const hi = lab(hexToRgb(c.legend.stops[10].color))[0];
        expect(lo, `${kind} reverse=${reverse}`).toBeGreaterThan(hi);
      }
    }
  });

  it('one colour language: every hour figure takes the one hours ramp, every temperature the one temperature ramp, and only a change a diverging ramp', () => {
    for (const k of ['hoursAboveLimit', 'hoursLost', 'capacityLoss'] as const) expect(RAMP_FOR_FIGURE[k]).toEqual(COLOUR_KINDS.hours);
    for (const k of ['meanWbgt', 'meanAnnualTemperature'] as const) expect(RAMP_FOR_FIGURE[k]).toEqual(COLOUR_KINDS.temperature);
    for (const [kind, { ramp }] of Object.entries(RAMP_FOR_FIGURE)) expect(ramp in DIVERGING_RAMPS, kind).toBe(kind === 'change');
    // The temperature ramp holds no colour of the hours ramp: its hottest end (where many hours
    // would be expected) is far from every colour of the hours ramp, and so is its coolest.
    const hours = Array.from({ length: 33 }, (_, i) => lab(cssToRgb(rampInterpolator(COLOUR_KINDS.hours.ramp)(i / 32))));
    for (const t of [0, 0.5, 1]) {
      const c = lab(cssToRgb(rampInterpolator(COLOUR_KINDS.temperature.ramp)(t)));
      const nearest = Math.min(...hours.map((h) => Math.hypot(h[0] - c[0], h[1] - c[1], h[2] - c[2])));
      expect(nearest, `temperature at t = ${t}`).toBeGreaterThan(20);
    }
  });

  it('the change ramp is diverging: near white at no change, darker towards both ends, blue for less and red for more (reversed RdBu)', () => {
    const { ramp, reverse } = COLOUR_KINDS.change;
    const at = (t: number) => cssToRgb(rampInterpolator(ramp)(reverse ? 1 - t : t));
    const L = (t: number) => lab(at(t))[0];
    expect(L(0.5)).toBeGreaterThan(90);
    for (let i = 0; i <= 32; i++) expect(L(i / 32), `t = ${i / 32}`).toBeLessThanOrEqual(L(0.5) + 0.5);
    expect(L(0)).toBeLessThan(L(0.25));
    expect(L(1)).toBeLessThan(L(0.75));
    const [r0, , b0] = at(0);
    const [r1, , b1] = at(1);
    expect(b0).toBeGreaterThan(r0); // less: blue
    expect(r1).toBeGreaterThan(b1); // more: red
    // The two ends stay apart under simulated colour-vision deficiencies (Machado et al. 2009).
    for (const [name, m] of Object.entries(DEFICIENCIES)) expect(deltaE(simulate(m, at(0.1)), simulate(m, at(0.9))), name).toBeGreaterThan(20);
  });

  it('the probability kind (the p-value of a trend, domain 0–1) runs from dark at p = 0 to near white at p = 1, is no colour of the hours ramp, and its ends stay apart under every simulated deficiency (d3-scale-chromatic interpolatePurples, reversed)', () => {
    const { ramp, reverse } = COLOUR_KINDS.probability;
    expect(RAMP_FOR_FIGURE.probability).toEqual(COLOUR_KINDS.probability);
    const c = compileStyle(figureStyle('probability', [0, 1], '1'));
    const stops = c.legend.stops;
    expect(stops[0].value).toBe(0);
    expect(stops[stops.length - 1].value).toBe(1);
    // The legend's colours are d3's own Purples read backwards (t = 1 − p).
    expect(hexToRgb(stops[0].color)).toEqual(cssToRgb(rampInterpolator(ramp)(reverse ? 1 : 0)));
    const L = stops.map((s) => lab(hexToRgb(s.color))[0]);
    expect(L[0]).toBeLessThan(40);
    expect(L[L.length - 1]).toBeGreaterThan(95);
    for (let i = 1; i < L.length; i++) expect(L[i], `stop ${i}`).toBeGreaterThan(L[i - 1]);
    const hours = Array.from({ length: 33 }, (_, i) => lab(cssToRgb(rampInterpolator(COLOUR_KINDS.hours.ramp)(i / 32))));
    for (const t of [0, 0.25, 0.5]) {
      const p = lab(cssToRgb(rampInterpolator(ramp)(reverse ? 1 - t : t)));
      const nearest = Math.min(...hours.map((h) => Math.hypot(h[0] - p[0], h[1] - p[1], h[2] - p[2])));
      expect(nearest, `p = ${t}`).toBeGreaterThan(20);
    }
    for (const [name, m] of Object.entries(DEFICIENCIES))
      expect(deltaE(simulate(m, hexToRgb(stops[0].color)), simulate(m, hexToRgb(stops[stops.length - 1].color))), name).toBeGreaterThan(40);
  });
});

describe('categorical legend (niche classes)', () => {
  it('lists the four classes of pipeline/climate/niche.ts in code order, with their labels and colours', () => {
    const { legend } = compileStyle(nicheClassStyle());
    expect(legend.kind).toBe('categorical');
    expect(legend.domain).toBeNull();
    expect(legend.stops.map((s) => s.value)).toEqual([0, 1, 2, 3]);
    expect(legend.labels).toEqual(NICHE_CLASSES.map((c) => NICHE_LABELS[c]));
    expect(legend.stops.map((s) => s.color)).toEqual(NICHE_CLASSES.map((c) => NICHE_COLOURS[c]));
    expect(legend.stops.map((s) => s.label)).toEqual(legend.labels);
  });

  it('the niche colours stay apart (ΔE*ab ≥ 12 for every pair) under simulated protanopia, deuteranopia and tritanopia', () => {
    const cols = Object.values(NICHE_COLOURS).map(hexToRgb);
    for (const [name, m] of Object.entries(DEFICIENCIES)) {
      for (let i = 0; i < cols.length; i++) {
        for (let j = i + 1; j < cols.length; j++) {
          expect(deltaE(simulate(m, cols[i]), simulate(m, cols[j])), `${name} ${i}/${j}`).toBeGreaterThanOrEqual(12);
        }
      }
    }
  });

  it('a niche layer from climate codes draws each class in its colour and the no-class code transparent', async () => {
    const mats = [12, 22, 27, 30, NaN, 5];
    const g = regularGrid(0.5, 1, 2, 0.5, 1, 3, (y, x) => nicheClassCode(mats[y * 3 + x]));
    expect(g.values[4]).toBe(NICHE_NO_CLASS);
    const layer = renderLayerPng(g, nicheClassStyle());
    const img = await decodePng(layer.png);
    const px = (y: number, x: number) => img.at(x * 8 + 4, y === 0 ? img.height - 2 : 1);
    expect(px(0, 0).slice(0, 3)).toEqual(hexToRgb(NICHE_COLOURS.core));
    expect(px(0, 1).slice(0, 3)).toEqual(hexToRgb(NICHE_COLOURS.second));
    expect(px(0, 2).slice(0, 3)).toEqual(hexToRgb(NICHE_COLOURS.margin));
    expect(px(1, 0).slice(0, 3)).toEqual(hexToRgb(NICHE_COLOURS.outside));
    expect(px(1, 1)).toEqual([0, 0, 0, 0]);
    expect(px(1, 2).slice(0, 3)).toEqual(hexToRgb(NICHE_COLOURS.margin));
  });
});

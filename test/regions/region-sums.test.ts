/**
 * Region sums built tile by tile (pipeline/regions/region-sums.ts, double-double.ts): however a
 * region's cells are cut into tiles and in whatever order the tiles are added, the region's
 * values come out the same to the last bit, and equal the plain area-weighted mean
 * (Σ w·x / Σ w over the cells with a value, the formula of region-stats.ts) to rounding.
 * Checked against Python's math.fsum, a correctly rounded sum (Shewchuk 1997), on a sum where
 * plain float64 addition loses digits.
 */
import { describe, expect, it } from 'vitest';
import { spawnSync } from 'node:child_process';
import { ddAdd, ddValue } from '../../pipeline/regions/double-double.ts';
import {
  addFigureSums,
  addWeightedHistograms,
  addWeightedMeans,
  addWorstCells,
  addYearValues,
  emptyFigureSums,
  regionYearValues,
  weightedMeans,
  type RegionTileCells,
} from '../../pipeline/regions/region-sums.ts';
import { addHistogramPairs } from '../../pipeline/regions/region-sums.ts';

/** A seeded generator (LCG, Numerical Recipes constants). */
function rng(seed: number): () => number {
  let s = seed >>> 0;
  return () => (s = (s * 1664525 + 1013904223) >>> 0) / 2 ** 32;
}

/** Invented region: n cells with weights summing to 1, values per cell × field (some NaN). */
function invented(n: number, nF: number, seed: number) {
  const r = rng(seed);
  const raw = Array.from({ length: n }, () => 0.1 + r());
  const total = raw.reduce((a, b) => a + b, 0);
  const weight = Float64Array.from(raw, (w) => w / total);
  const values = Float64Array.from({ length: n * nF }, () => (r() < 0.05 ? NaN : Math.round(r() * 74400) / 100));
  return { weight, values };
}

/** The cells [a, b) of a region as one tile's share (positions in a tile holding just them). */
function share(weight: Float64Array, a: number, b: number): RegionTileCells {
  return {
    region: 0,
    local: Int32Array.from({ length: b - a }, (_, i) => i),
    cells: Int32Array.from({ length: b - a }, (_, i) => 1000 + a + i),
    weight: weight.slice(a, b),
    histWeight: weight.slice(a, b),
  };
}

describe('region sums built tile by tile', () => {
  it('give the same region values to the last bit for any cut into tiles and any order of adding them, equal to the plain weighted mean to 1e-12', () => {
    const n = 137;
    const nF = 40;
    const { weight, values } = invented(n, nF, 5);
    const partOf = (a: number, b: number) => {
      const s = emptyFigureSums(1, nF);
      addYearValues(s, 0, values.slice(a * nF, b * nF), share(weight, a, b));
      return s;
    };
    const whole = regionYearValues(partOf(0, n));
    for (const cuts of [
      [0, 50, n],
      [0, 1, 2, 90, n],
      [0, 17, 34, 51, 68, 85, 102, 119, n],
    ]) {
      const parts = cuts.slice(0, -1).map((a, i) => partOf(a, cuts[i + 1]));
      for (const order of [parts, [...parts].reverse()]) {
        const acc = emptyFigureSums(1, nF);
        for (const p of order) addFigureSums(acc, p);
        expect(regionYearValues(acc)).toEqual(whole);
      }
    }
    for (let f = 0; f < nF; f++) {
      let sw = 0;
      let swx = 0;
      for (let c = 0; c < n; c++) {
        const x = values[c * nF + f];
        if (x !== x) continue;
        sw += weight[c];
        swx += weight[c] * x;
      }
      expect(Math.abs(whole[f] - swx / sw)).toBeLessThan(1e-12 * Math.abs(swx / sw) + 1e-12);
    }
  });

  it('withhold a region value when the cells with a value hold less than 80 % of its weight', () => {
    const weight = Float64Array.from([0.5, 0.3, 0.2]);
    const s = emptyFigureSums(1, 2);
    // Field 0: the 0.5 cell has no value (50 % left: withheld); field 1: the 0.2 cell has none (80 %: kept).
    addYearValues(s, 0, Float64Array.from([NaN, 10, 4, 4, 6, NaN]), share(weight, 0, 3));
    const v = regionYearValues(s);
    expect(v[0]).toBeNaN();
    expect(v[1]).toBeCloseTo((0.5 * 10 + 0.3 * 4) / 0.8, 12);
  });

  it('keep the highest cell of each field, ties going to the lowest cell, whatever the tiles', () => {
    const weight = Float64Array.from([0.25, 0.25, 0.25, 0.25]);
    const mean = Float64Array.from([3, 7, 7, 1]);
    const a = emptyFigureSums(1, 1);
    addWorstCells(a, mean.slice(2, 4), share(weight, 2, 4));
    const b = emptyFigureSums(1, 1);
    addWorstCells(b, mean.slice(0, 2), share(weight, 0, 2));
    addFigureSums(a, b);
    expect([a.worstValue[0], a.worstCell[0]]).toEqual([7, 1001]);
  });

  it('weighted means (mean annual temperature) and weighted histograms add up across tiles like the whole', () => {
    const { weight, values } = invented(60, 2, 9);
    const whole = new Float64Array(4);
    addWeightedMeans(whole, values, 2, share(weight, 0, 60));
    const parts = new Float64Array(4);
    addWeightedMeans(parts, values.slice(40 * 2), 2, share(weight, 40, 60));
    addWeightedMeans(parts, values.slice(0, 40 * 2), 2, share(weight, 0, 40));
    expect(weightedMeans(parts, 2)).toEqual(weightedMeans(whole, 2));
    // Histograms: 3 slots × 4 bins of 60 cells, slot-major (slot × cell × bin).
    const r = rng(3);
    const hist = Uint16Array.from({ length: 3 * 60 * 4 }, () => (r() < 0.5 ? 0 : Math.floor(r() * 31)));
    const all = new Float64Array(2 * 12);
    addWeightedHistograms(all, hist, 60, 3, 4, share(weight, 0, 60));
    const first = new Float64Array(2 * 12);
    const second = new Float64Array(2 * 12);
    const cells = share(weight, 0, 60);
    addWeightedHistograms(first, hist, 60, 3, 4, {
      ...cells,
      local: cells.local.slice(0, 25),
      cells: cells.cells.slice(0, 25),
      weight: cells.weight.slice(0, 25),
      histWeight: cells.histWeight.slice(0, 25),
    });
    addWeightedHistograms(second, hist, 60, 3, 4, {
      ...cells,
      local: cells.local.slice(25),
      cells: cells.cells.slice(25),
      weight: cells.weight.slice(25),
      histWeight: cells.histWeight.slice(25),
    });
    addHistogramPairs(second, first);
    for (let i = 0; i < 12; i++) expect(ddValue(second, i)).toBe(ddValue(all, i));
  });
});

describe('double-double sums', () => {
  it('equal Python math.fsum (a correctly rounded sum) where plain float64 addition loses digits', () => {
    const xs = [1e16, 1, -1e16, 3.5, 1e-3, 2 ** 53, -(2 ** 53), 0.1, 0.2, 0.3];
    const pair = new Float64Array(2);
    let plain = 0;
    for (const x of xs) {
      ddAdd(pair, 0, x);
      plain += x;
    }
    const py = spawnSync('/usr/bin/python3', ['-c', `import math; print(repr(math.fsum([${xs.map((x) => x.toExponential(20)).join(',')}])))`], {
      encoding: 'utf8',
    });
    expect(py.status, py.stderr).toBe(0);
    const fsum = Number(py.stdout.trim());
    expect(ddValue(pair, 0)).toBe(fsum);
    expect(plain).not.toBe(fsum);
  });
});

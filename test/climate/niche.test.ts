import { describe, expect, it } from 'vitest';
import {
  NICHE_CAVEAT,
  NICHE_CLASSES,
  NICHE_LABELS,
  NICHE_MAIN_MODE_C,
  NICHE_NO_CLASS,
  classifyNiche,
  distanceToMainMode,
  nearNicheBoundary,
  nicheClassCode,
} from '../../pipeline/climate/niche.ts';
import { assessNiche } from '../../pipeline/climate/niche-assessment.ts';

describe('mean annual temperature against the human climate niche', () => {
  it('classifies the boundaries as documented: 11.0 and 15.0 → core, 20.0 and 25.0 → second, 29.0 → outside', () => {
    // Bands: Xu et al. 2020 (major mode 11–15 °C, secondary 20–25 °C); Lenton et al. 2023 (MAT ≥ 29 °C), per docs/methods.md §11.
    expect(classifyNiche(11.0)).toBe('core');
    expect(classifyNiche(15.0)).toBe('core');
    expect(classifyNiche(20.0)).toBe('second');
    expect(classifyNiche(25.0)).toBe('second');
    expect(classifyNiche(29.0)).toBe('outside');
  });

  it('just past each boundary falls in the neighbouring class', () => {
    expect(classifyNiche(10.999)).toBe('margin');
    expect(classifyNiche(15.001)).toBe('margin');
    expect(classifyNiche(19.999)).toBe('margin');
    expect(classifyNiche(25.001)).toBe('margin');
    expect(classifyNiche(28.999)).toBe('margin');
    expect(classifyNiche(-20)).toBe('margin');
    expect(classifyNiche(13)).toBe('core');
    expect(classifyNiche(22.5)).toBe('second');
    expect(classifyNiche(35)).toBe('outside');
  });

  it('NaN has no class (code 255), and codes index NICHE_CLASSES', () => {
    expect(classifyNiche(NaN)).toBeUndefined();
    expect(nicheClassCode(NaN)).toBe(NICHE_NO_CLASS);
    expect(NICHE_CLASSES[nicheClassCode(29.5)]).toBe('outside');
    expect(Object.keys(NICHE_LABELS).sort()).toEqual([...NICHE_CLASSES].sort());
  });

  it('measures distance from a main mode of 13 °C (middle of Xu 2020\'s 11–15 °C, "around ~13 °C")', () => {
    expect(NICHE_MAIN_MODE_C).toBe(13);
    expect(distanceToMainMode(13)).toBe(0);
    expect(distanceToMainMode(29)).toBe(16);
    expect(distanceToMainMode(8.5)).toBe(-4.5);
  });

  it('flags values within 0.5 °C of a boundary as uncertain, inclusive (28.5 and 29.5 yes, 28.4 no)', () => {
    expect(nearNicheBoundary(28.5)).toBe(true);
    expect(nearNicheBoundary(29.5)).toBe(true);
    expect(nearNicheBoundary(28.4)).toBe(false);
    expect(nearNicheBoundary(10.6)).toBe(true);
    expect(nearNicheBoundary(13)).toBe(false);
    expect(nearNicheBoundary(NaN)).toBe(false);
  });

  it('the caveat says grid-box means are not point values and that ~0.5 °C near a boundary is uncertain', () => {
    expect(NICHE_CAVEAT).toMatch(/grid box/);
    expect(NICHE_CAVEAT).toMatch(/not a value at a point/);
    expect(NICHE_CAVEAT).toMatch(/0\.5 °C/);
    expect(NICHE_CAVEAT).toMatch(/other climate datasets/);
  });

  it('assessNiche gives baseline and latest MAT, classes, the shift and year counts per cell', () => {
    // Invented test data: 3 cells, years 1991–2024. Cell 0 warms from 28.6 to 29.2 °C (margin → outside);
    // cell 1 is a steady 13 °C; cell 2 has only 20 baseline years (withheld under the 80 % rule).
    const years = Array.from({ length: 34 }, (_, i) => 1991 + i);
    const nCells = 3;
    const annualMean = new Float64Array(years.length * nCells);
    years.forEach((yr, y) => {
      annualMean[y * nCells + 0] = yr <= 2020 ? 28.6 : 29.2;
      annualMean[y * nCells + 1] = 13;
      annualMean[y * nCells + 2] = yr < 2001 ? NaN : 21;
    });
    const a = assessNiche({ years, annualMean, nCells, baseline: [1991, 2020], latest: [2021, 2024] });
    expect(a.baselineMat[0]).toBeCloseTo(28.6, 12);
    expect(a.latestMat[0]).toBeCloseTo(29.2, 12);
    expect(a.shift[0]).toBeCloseTo(0.6, 12);
    expect(NICHE_CLASSES[a.baselineClass[0]]).toBe('margin');
    expect(NICHE_CLASSES[a.latestClass[0]]).toBe('outside');
    expect(a.baselineNearBoundary[0]).toBe(1);
    expect(a.latestNearBoundary[0]).toBe(1);
    expect(a.baselineDistance[1]).toBe(0);
    expect(NICHE_CLASSES[a.baselineClass[1]]).toBe('core');
    expect(a.baselineNearBoundary[1]).toBe(0);
    expect(a.baselineYears[2]).toBe(20);
    expect(a.baselineMat[2]).toBeNaN();
    expect(a.baselineClass[2]).toBe(NICHE_NO_CLASS);
    expect(a.latestYears[2]).toBe(4);
    expect(NICHE_CLASSES[a.latestClass[2]]).toBe('second');
    expect(a.shift[2]).toBeNaN();
  });
});

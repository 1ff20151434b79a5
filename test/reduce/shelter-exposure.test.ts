import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { parse } from 'yaml';
import { accumulateBlock, createPartial, createScratch, type ShardPartial } from '../../pipeline/reduce/accumulator.ts';
import { mergeYear } from '../../pipeline/reduce/merge.ts';
import { yearFigures } from '../../pipeline/reduce/figures.ts';
import { CENTI, LOSS_VIEWS, MILLI, MONTHS, N_LOSS } from '../../pipeline/reduce/layout.ts';
import { decodePartial, encodePartial, type PartialMeta } from '../../pipeline/formats/partial-file.ts';
import {
  allowableWorkFraction,
  countedExposures,
  kjellstrom2018Loss,
  localHours,
  parseWorkSettings,
  parseWorkloadClasses,
  resolveWorkSettings,
} from '../../pipeline/work/index.ts';
import { HeathoursError } from '../../pipeline/model/errors.ts';
import { EXIT, USAGE_ERRORS, exitCodeOf } from '../../pipeline/commands/exit-codes.ts';

const classes = parseWorkloadClasses(parse(readFileSync(new URL('../../content/workload-classes.yaml', import.meta.url), 'utf8')));
const withShelter = resolveWorkSettings(parseWorkSettings({ exposures: ['sun', 'shade', 'shelter'] }), classes);
const byDefault = resolveWorkSettings(parseWorkSettings(undefined), classes);
const HOUR = 3_600_000;

/** Seeded invented hourly WBGT in sun, shade and shelter (shelter = shade + 0.1 … 0.6 °C) for `nc` cells over `nt` hours of June 2021. */
function inventedBlock(nc: number, nt: number, seed: number) {
  let s = seed >>> 0;
  const rnd = () => (s = (s * 1664525 + 1013904223) >>> 0) / 2 ** 32;
  const time = Float64Array.from({ length: nt }, (_, t) => Date.UTC(2021, 5, 10) + (t + 1) * HOUR);
  const sun = new Float32Array(nt * nc);
  const shade = new Float32Array(nt * nc);
  const shelter = new Float32Array(nt * nc);
  const air = new Float32Array(nt * nc);
  for (let t = 0; t < nt; t++) {
    for (let c = 0; c < nc; c++) {
      const i = t * nc + c;
      const d = Math.sin((((t + 14) % 24) / 24) * 2 * Math.PI);
      shade[i] = 25 + 4 * d + c * 0.5 + 5 * (rnd() - 0.5);
      sun[i] = shade[i] + Math.max(0, 3.5 * d) + rnd();
      shelter[i] = shade[i] + 0.1 + 0.5 * rnd();
      air[i] = shade[i] + 4;
      if (i % 89 === 0) shelter[i] = NaN;
    }
  }
  return { time, sun, shade, shelter, air };
}

function count(evaluations: typeof withShelter.evaluations, general: boolean, nc: number, nt: number, seed: number, shelterArray = true): ShardPartial {
  const b = inventedBlock(nc, nt, seed);
  const p = createPartial(
    2021,
    Int32Array.from({ length: nc }, (_, i) => i),
    evaluations,
  );
  const local = localHours(b.time, 'Etc/GMT+10', withShelter.shift);
  accumulateBlock(
    p,
    { nHours: nt, wbgtSun: b.sun, wbgtShade: b.shade, wbgtShelter: shelterArray ? b.shelter : undefined, airTemperature: b.air, local },
    evaluations,
    createScratch(nt * nc, evaluations, general),
  );
  return p;
}

describe('the sheltered exposure in the reduction', () => {
  it('work.exposures accepts shelter, and a build counts the shelter only when an evaluation works under it', () => {
    expect(withShelter.evaluations.filter((e) => e.exposure === 'shelter').map((e) => e.key)).toContain('moderate.acclimatized.shelter');
    expect(countedExposures(withShelter.evaluations)).toEqual(['sun', 'shade', 'shelter']);
    expect(countedExposures(byDefault.evaluations)).toEqual(['sun', 'shade']);
    expect(createPartial(2021, Int32Array.of(0), byDefault.evaluations).wbgtSum.length).toBe(MONTHS * 2);
    expect(createPartial(2021, Int32Array.of(0), withShelter.evaluations).wbgtSum.length).toBe(MONTHS * 3);
  });

  it('a bad exposure name in work.exposures is the catalogued WorkSettingsInvalid (a usage error, exit code listed), naming the allowed names', () => {
    let err: unknown;
    try {
      parseWorkSettings({ exposures: ['sun', 'roof'] }, 'atlas.yaml');
    } catch (e) {
      err = e;
    }
    expect(err).toBeInstanceOf(HeathoursError);
    const h = err as HeathoursError;
    expect(h.code).toBe('WorkSettingsInvalid');
    expect(h.message).toContain('work.exposures.1');
    expect(h.message).toContain('shelter');
    expect(USAGE_ERRORS).toContain('WorkSettingsInvalid');
    expect(exitCodeOf(h.code)).toBe(EXIT.usage);
  });

  it('the fused path gives exactly the counts of the general path with three exposures (invented data, failed shelter hours included)', () => {
    const a = count(withShelter.evaluations, false, 5, 24 * 12, 7);
    const b = count(withShelter.evaluations, true, 5, 24 * 12, 7);
    for (const k of Object.keys(a) as (keyof ShardPartial)[]) expect(a[k], k).toEqual(b[k]);
    expect(a.failedHours.reduce((x, y) => x + y, 0)).toBeGreaterThan(0);
  });

  it('counts the shelter evaluations, sums, maxima and capacity loss from the shelter WBGT, hour by hour as the work model computes them', () => {
    const nc = 2;
    const nt = 24 * 8;
    const p = count(withShelter.evaluations, false, nc, nt, 3);
    const b = inventedBlock(nc, nt, 3);
    const local = localHours(b.time, 'Etc/GMT+10', withShelter.shift);
    const nE = withShelter.evaluations.length;
    const m = 5; // June
    for (let c = 0; c < nc; c++) {
      let sum = 0;
      let max = -Infinity;
      let loss = 0;
      for (let t = 0; t < nt; t++) {
        const i = t * nc + c;
        if (local.year[t] !== 2021 || Number.isNaN(b.shelter[i])) continue;
        const r = Math.round(b.shelter[i] * CENTI);
        sum += r;
        max = Math.max(max, r);
        if (local.inShift[t] === 1) {
          const v = kjellstrom2018Loss(b.shelter[i] + withShelter.clothingAdjustment, 300);
          if (v > 0) loss += Math.round(v * MILLI);
        }
      }
      const cm = c * MONTHS + m;
      expect(p.wbgtSum[cm * 3 + 2]).toBe(sum);
      expect(p.wbgtMax[cm * 3 + 2]).toBe(max);
      const l300 = LOSS_VIEWS.findIndex((l) => l.id === 'kjellstrom-300w');
      expect(Math.abs(p.capacityLoss[(cm * 3 + 2) * N_LOSS + l300] - loss)).toBeLessThanOrEqual(nt); // float32 vs float64 input: at most 1 milli-hour per hour
      withShelter.evaluations.forEach((ev, e) => {
        if (ev.exposure !== 'shelter') return;
        let above = 0;
        for (let t = 0; t < nt; t++) {
          const i = t * nc + c;
          if (local.year[t] !== 2021 || local.inShift[t] !== 1 || Number.isNaN(b.shelter[i])) continue;
          if (allowableWorkFraction(b.shelter[i], null, ev.kernel) < 1) above++;
        }
        expect(p.aboveShift[cm * nE + e], ev.key).toBe(above);
      });
    }
  });

  it('a block without the shelter WBGT is refused when the partial counts the shelter', () => {
    expect(() => count(withShelter.evaluations, false, 2, 24, 1, false)).toThrow(RangeError);
  });

  it('a partial with the shelter survives the partial file byte for byte, merges, and gives WBGT figures for sun, shade and shelter', () => {
    const p = count(withShelter.evaluations, false, 3, 24 * 5, 9);
    const meta: PartialMeta = { shardId: 't00-y2021', year: 2021, tileIndex: 0, key: 'k', provenance: {}, report: { cellHours: 0, physics: {} } };
    const back = decodePartial(encodePartial(p, meta), 'x.hhp').partial;
    for (const k of Object.keys(p) as (keyof ShardPartial)[]) expect(back[k], k).toEqual(p[k]);
    const yc = mergeYear(2021, p.cells, [back]);
    expect(yc.exposures).toEqual(['sun', 'shade', 'shelter']);
    const figs = yearFigures(yc, 100_000);
    const mean = figs.find((f) => f.def.id === 'wbgt-mean')!;
    expect(mean.def.combos).toEqual(['sun', 'shade', 'shelter']);
    const cap = figs.find((f) => f.def.id === 'capacity-loss-shift')!;
    expect(cap.def.combos.filter((c) => c.endsWith('.shelter'))).toHaveLength(N_LOSS);
    // June mean shelter WBGT of cell 0 = its centi-degree sum / valid hours.
    const cm = 5;
    expect(mean.values[(0 * 13 + 5) * 3 + 2]).toBeCloseTo(yc.wbgtSum[cm * 3 + 2] / yc.validHours[cm] / CENTI, 12);
  });

  it('partials counting different exposures are refused by the merge', () => {
    const a = count(withShelter.evaluations, false, 2, 24, 1);
    const b = createPartial(2021, Int32Array.of(5, 6), byDefault.evaluations);
    expect(() => mergeYear(2021, Int32Array.of(0, 1, 5, 6), [a, { ...b, evalKeys: a.evalKeys }])).toThrow(/exposures/);
  });
});

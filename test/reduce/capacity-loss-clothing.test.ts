/**
 * Capacity loss takes the effective WBGT, WBGT + CAV (the decision of pipeline/reduce/accumulator.ts
 * `lossCav`): the loss functions relate capacity to the WBGT of workers in ordinary work clothes,
 * and the clothing adjustment value is the WBGT increment that makes another ensemble count like
 * ordinary clothes. Checked on three invented shift hours counted with CAV 0 and 3 °C, against
 * the cumulative normal of Kjellstrom et al. (2018) (μ, σ per intensity) evaluated by
 * scipy.stats.norm.cdf (scipy 1.10.1, Debian python3-scipy) and the Dunne et al. (2013) formula
 * evaluated by hand, on both accumulation paths (fused and general).
 */
import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { parse } from 'yaml';
import { accumulateBlock, createPartial, createScratch, buildCav } from '../../pipeline/reduce/accumulator.ts';
import { MONTHS, N_EXPOSURES, N_LOSS, LOSS_VIEWS } from '../../pipeline/reduce/layout.ts';
import { localHours, parseWorkloadClasses, resolveWorkSettings, workSettingsSchema } from '../../pipeline/work/index.ts';

const classes = parseWorkloadClasses(parse(readFileSync(new URL('../../content/workload-classes.yaml', import.meta.url), 'utf8')));
/** Three shift hours (local 11–14 h on Thursday 2021-07-15 in UTC−10), hour ends in UTC. */
const TIME = Float64Array.from([0, 1, 2], (k) => Date.UTC(2021, 6, 15, 22 + k));
/** Invented WBGT in the sun and in the shade [°C], one cell. */
const SUN = Float32Array.from([27, 26, 31]);
const SHADE = Float32Array.from([23, 22, 24]);

/** Capacity-loss milli-hours of July, per exposure (0 sun, 1 shade) × view, for clothing `cav` [°C]. */
function countLoss(cav: number, general: boolean): number[][] {
  const work = resolveWorkSettings(workSettingsSchema.parse({ clothing: { cav } }), classes);
  const p = createPartial(2021, Int32Array.of(0), work.evaluations);
  const scratch = createScratch(3, work.evaluations, general);
  const local = localHours(TIME, 'Etc/GMT+10', work.shift);
  expect(Array.from(local.inShift)).toEqual([1, 1, 1]);
  accumulateBlock(p, { nHours: 3, wbgtSun: SUN, wbgtShade: SHADE, airTemperature: Float32Array.from([30, 29, 33]), local }, work.evaluations, scratch);
  const m = 6; // July
  return [0, 1].map((x) => LOSS_VIEWS.map((_, l) => p.capacityLoss[((0 * MONTHS + m) * N_EXPOSURES + x) * N_LOSS + l]));
}

/** Sum of round(loss·1000) over hours, as the partial counts it. */
const milli = (xs: number[]) => xs.reduce((a, x) => a + Math.round(x * 1000), 0);

// scipy.stats.norm.cdf(w, μ, σ) (scipy 1.10.1) for μ/σ of Kjellstrom et al. 2018: 200 W 35.53/3.94, 300 W 33.49/3.94, 400 W 32.47/4.16.
const NORM_CDF: Record<number, [number, number, number]> = {
  26: [0.007786, 0.02865, 0.059939],
  27: [0.015195, 0.049758, 0.094271],
  29: [0.048723, 0.127228, 0.202103],
  30: [0.080226, 0.187866, 0.27634],
  31: [0.125124, 0.2637, 0.361907],
  34: [0.348888, 0.551496, 0.643485],
};
// Dunne et al. 2013, loss = 1 − (100 − 25·(W − 25)^(2/3))/100, by hand: 26 → 0.25, 27 → 0.39685, 29 → 0.62996, 30 → 0.73100, 31 → 0.82548, 34 → 1 (capacity ≤ 0).
const DUNNE: Record<number, number> = { 26: 0.25, 27: 0.39685, 29: 0.629961, 30: 0.731004, 31: 0.825482, 34: 1 };

function expected(ws: number[]): number[] {
  return [0, 1, 2].map((k) => milli(ws.map((w) => NORM_CDF[w][k]))).concat(milli(ws.map((w) => DUNNE[w])));
}

describe('capacity loss with a clothing adjustment', () => {
  it('with CAV 0 the loss functions see the bare WBGT; with CAV 3 °C they see WBGT + 3 (Kjellstrom et al. 2018 via scipy, Dunne et al. 2013 by hand), on both accumulation paths', () => {
    for (const general of [false, true]) {
      const bare = countLoss(0, general);
      const clothed = countLoss(3, general);
      // Sun hours at 27, 26, 31 °C; with CAV 3: 30, 29, 34 °C.
      for (let l = 0; l < N_LOSS; l++) {
        expect(Math.abs(bare[0][l] - expected([27, 26, 31])[l]), `bare ${LOSS_VIEWS[l].id}`).toBeLessThanOrEqual(1);
        expect(Math.abs(clothed[0][l] - expected([30, 29, 34])[l]), `CAV 3 ${LOSS_VIEWS[l].id}`).toBeLessThanOrEqual(1);
        expect(clothed[0][l], LOSS_VIEWS[l].id).toBeGreaterThan(bare[0][l]);
        expect(clothed[1][l], `shade ${LOSS_VIEWS[l].id}`).toBeGreaterThanOrEqual(bare[1][l]);
      }
      // The 300 W view: 50 + 29 + 264 = 343 milli-h bare, 188 + 127 + 551 = 866 milli-h with CAV 3.
      expect(bare[0][1]).toBe(343);
      expect(clothed[0][1]).toBe(866);
    }
  });

  it('one build has one clothing: evaluations with different adjustments are refused', () => {
    const a = resolveWorkSettings(workSettingsSchema.parse({ clothing: { cav: 0 } }), classes).evaluations;
    const b = resolveWorkSettings(workSettingsSchema.parse({ clothing: { cav: 2 } }), classes).evaluations;
    expect(buildCav(a)).toBe(0);
    expect(buildCav(b)).toBe(2);
    expect(() => buildCav([...a.slice(0, 1), ...b.slice(0, 1)])).toThrow(/one clothing/);
  });
});

/**
 * The fused reduction reads a block in the physics' layout (rows of land cells one after the
 * other, time-major inside a row; `ReduceBlock.cellBase` / `cellStride`) without a copy back to
 * time-major: its counts must equal, array for array, those of the same hours given time-major.
 * The general path refuses such a block. Inputs are invented (seeded diurnal WBGT with noise and
 * NaN hours; hours around local midnight of 31 December, so part of the block is the next year).
 */
import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { parse } from 'yaml';
import { accumulateBlock, createPartial, createScratch, type ShardPartial } from '../../pipeline/reduce/accumulator.ts';
import { localHours, parseWorkloadClasses, resolveWorkSettings, workSettingsSchema } from '../../pipeline/work/index.ts';

const classes = parseWorkloadClasses(parse(readFileSync(new URL('../../content/workload-classes.yaml', import.meta.url), 'utf8')));
const work = resolveWorkSettings(workSettingsSchema.parse(undefined), classes);
const HOUR = 3_600_000;

describe('a block in the physics layout', () => {
  it('gives the counts of the same hours time-major (rows of 3, 1 and 4 cells), and the general path refuses it', () => {
    const runs = [3, 1, 4];
    const nc = 8;
    const nt = 24 * 40;
    let s = 4242;
    const rnd = () => (s = (s * 1664525 + 1013904223) >>> 0) / 2 ** 32;
    const start = Date.UTC(2021, 11, 5);
    const time = Float64Array.from({ length: nt }, (_, t) => start + (t + 1) * HOUR);
    const sun = new Float32Array(nt * nc);
    const shade = new Float32Array(nt * nc);
    const air = new Float32Array(nt * nc);
    for (let t = 0; t < nt; t++) {
      const d = Math.sin((((t + 14) % 24) / 24) * 2 * Math.PI);
      for (let c = 0; c < nc; c++) {
        const i = t * nc + c;
        shade[i] = 26 + 6 * d + c * 0.4 + 6 * (rnd() - 0.5);
        sun[i] = i % 83 === 0 ? NaN : shade[i] + Math.max(0, 4 * d) + rnd();
        air[i] = i % 97 === 0 ? NaN : shade[i] + 3;
      }
    }
    // The physics layout: run r (cells j0 … j0 + nr − 1) at [j0 · nt + t · nr + k].
    const base = new Int32Array(nc);
    const stride = new Int32Array(nc);
    const toRuns = (a: Float32Array) => {
      const out = new Float32Array(nt * nc).fill(Number.NaN);
      let j0 = 0;
      for (const nr of runs) {
        for (let k = 0; k < nr; k++) {
          base[j0 + k] = j0 * nt + k;
          stride[j0 + k] = nr;
          for (let t = 0; t < nt; t++) out[j0 * nt + t * nr + k] = a[t * nc + j0 + k];
        }
        j0 += nr;
      }
      return out;
    };
    const local = localHours(time, 'Etc/GMT+10', work.shift);
    const cells = Int32Array.from({ length: nc }, (_, i) => 40 + i);
    const count = (block: Parameters<typeof accumulateBlock>[1], general = false): ShardPartial => {
      const p = createPartial(2021, cells, work.evaluations);
      accumulateBlock(p, block, work.evaluations, createScratch(nt * nc, work.evaluations, general));
      return p;
    };
    const timeMajor = count({ nHours: nt, wbgtSun: sun, wbgtShade: shade, airTemperature: air, local });
    const strided = count({
      nHours: nt,
      cellBase: base,
      cellStride: stride,
      wbgtSun: toRuns(sun),
      wbgtShade: toRuns(shade),
      airTemperature: toRuns(air),
      local,
    });
    expect(timeMajor.aboveShift.some((x) => x > 0)).toBe(true);
    expect(timeMajor.failedHours.some((x) => x > 0)).toBe(true);
    expect(Array.from(timeMajor.coveredHours).reduce((a, b) => a + b, 0)).toBeLessThan(nt); // some hours are local 2022
    for (const [k, v] of Object.entries(timeMajor)) {
      const w = (strided as unknown as Record<string, unknown>)[k];
      if (ArrayBuffer.isView(v)) {
        const x = w as Uint8Array;
        expect(Buffer.from(v.buffer, v.byteOffset, v.byteLength).equals(Buffer.from(x.buffer, x.byteOffset, x.byteLength)), k).toBe(true);
      } else expect(w, k).toEqual(v);
    }
    expect(() => count({ nHours: nt, cellBase: base, cellStride: stride, wbgtSun: sun, wbgtShade: shade, airTemperature: air, local }, true)).toThrow(
      /needs a time-major block/,
    );
  });
});

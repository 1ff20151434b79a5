/**
 * `wbgt-shelter`: what the opt-in sheltered exposure costs the physics. The WBGT kernel on the
 * block of bench/wbgt.bench.ts (1,000,000 invented cell-hours; for timing only) three ways, runs
 * alternating so each sees the same load of the shared machine:
 *   - `auto` without the shelter: what a sun-and-shade atlas runs (the WebAssembly module where
 *     the runtime has it);
 *   - `js` without the shelter: the JavaScript kernel, which every shelter call falls back to;
 *   - `auto` with the shelter: the JavaScript kernel with the third pass (the WebAssembly module
 *     has no shelter pass).
 * Value: wall clock with the shelter / without it (ratio); the details split it into the fallback
 * to JavaScript and the third pass. Best of 3 runs after a warm-up.
 */
import type { Bench, BenchFigure } from './types.ts';
import { computeHours, type PhysicsArrays } from '../pipeline/physics/block.ts';
import { threadCpuNs } from '../pipeline/infra/thread-cpu.ts';
import { wasmKernel } from '../pipeline/physics/wbgt-wasm.ts';
import { makeArrays } from './wbgt.bench.ts';

const REPS = 3;

type Way = 'wasm-or-js' | 'js' | 'shelter';

export const bench: Bench = {
  names: ['wbgt-shelter'],
  async run() {
    const a: PhysicsArrays = makeArrays();
    const n = a.wbgtSun.length;
    const shelter = new Float32Array(n);
    const call = (way: Way) => {
      a.status.fill(0);
      return computeHours(way === 'shelter' ? { ...a, wbgtShelter: shelter } : a, 0, a.time.length, { kernel: way === 'js' ? 'js' : 'auto' });
    };
    for (const way of ['wasm-or-js', 'js', 'shelter'] as const) call(way); // warm-up
    const wall: Record<Way, number[]> = { 'wasm-or-js': [], js: [], shelter: [] };
    const cpu: Record<Way, number[]> = { 'wasm-or-js': [], js: [], shelter: [] };
    let ok = 0;
    for (let r = 0; r < REPS; r++) {
      for (const way of ['wasm-or-js', 'js', 'shelter'] as const) {
        const c0 = threadCpuNs();
        const t0 = performance.now();
        const c = call(way);
        wall[way].push(performance.now() - t0);
        cpu[way].push(threadCpuNs() - c0);
        if (way === 'shelter') ok = c.ok;
      }
    }
    const best = (x: number[]) => Math.min(...x);
    const ns = (ms: number) => +((ms * 1e6) / n).toFixed(1);
    let sheltered = 0;
    let warmer = 0;
    for (let i = 0; i < n; i++) {
      if (a.status[i] !== 0) continue;
      sheltered++;
      if (shelter[i] >= a.wbgtShade[i] - 1e-4) warmer++;
    }
    const fig: BenchFigure = {
      bench: 'wbgt-shelter',
      value: +(best(wall.shelter) / best(wall['wasm-or-js'])).toFixed(2),
      unit: 'x time',
      cellHours: n,
      withoutShelterNsPerCellHour: ns(best(wall['wasm-or-js'])),
      withoutShelterKernel: wasmKernel() ? 'WebAssembly SIMD module' : 'JavaScript (WebAssembly SIMD unavailable)',
      jsWithoutShelterNsPerCellHour: ns(best(wall.js)),
      withShelterNsPerCellHour: ns(best(wall.shelter)),
      fallbackToJs: +(best(wall.js) / best(wall['wasm-or-js'])).toFixed(2),
      thirdPass: +(best(wall.shelter) / best(wall.js)).toFixed(2),
      cpuRatio: +(best(cpu.shelter) / best(cpu['wasm-or-js'])).toFixed(2),
      shelterAtLeastShade: `${warmer} of ${sheltered} solved cell-hours`,
      ok,
      timing: `best of ${REPS} runs after a warm-up, ways alternating; value = wall clock with the shelter / without; machine shared with other jobs`,
    };
    return [fig];
  },
};

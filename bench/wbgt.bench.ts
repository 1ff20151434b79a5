/**
 * WBGT kernel benchmarks: `wbgt-kernel` (sun + shade WBGT with geometry and wind, one core,
 * ns per cell-hour) and `wbgt-kernel-parallel` (the same on all cores with worker threads over
 * shared arrays, each worker a disjoint range of hours; speed-up over one core, worker start-up
 * excluded and stated). Wall clock and thread CPU time are both reported: the machine is shared.
 *
 * Input: 100 hours × 100 × 100 cells = 1,000,000 cell-hours of seeded, varied synthetic weather
 * (invented; for timing only): 30°S–40°N, two days of July 2010 and December 2010 alternating,
 * air 0–46 °C, dew point 0.5–28 K below, 650–1040 hPa, 10 m wind 0.1–12 m/s, solar from a
 * clearness 0.1–0.95 of the top of atmosphere, a third of the cells with ERA5-style direct solar.
 */
import type { Bench, BenchFigure } from './types.ts';
import { allocatePhysicsArrays, computeHours, type PhysicsArrays } from '../pipeline/physics/block.ts';
import { startPhysicsPool, type PoolRun } from '../pipeline/run/physics-pool.ts';
import { sharedFloat32, sharedUint8 } from '../pipeline/infra/shared-memory.ts';
import { threadCpuNs } from '../pipeline/infra/thread-cpu.ts';
import { cosZenithInstant } from '../pipeline/physics/solar-position.ts';
import { wasmKernel } from '../pipeline/physics/wbgt-wasm.ts';

const NT = 100;
const NY = 100;
const NX = 100;

function mulberry32(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

export function makeArrays(): PhysicsArrays {
  const nCells = NY * NX;
  const rnd = mulberry32(20240521);
  const time = new Float64Array(NT);
  for (let t = 0; t < NT; t++) time[t] = Date.UTC(2010, t % 2 === 0 ? 6 : 11, 10 + Math.floor(t / 48), t % 24);
  const lat = new Float64Array(NY).map((_, i) => -30 + (70 * i) / (NY - 1));
  const lon = new Float64Array(NX).map((_, i) => -120 + (240 * i) / (NX - 1));
  const a = allocatePhysicsArrays(time, lat, lon, sharedFloat32, sharedUint8);
  for (let t = 0; t < NT; t++) {
    for (let y = 0; y < NY; y++) {
      for (let x = 0; x < NX; x++) {
        const i = t * nCells + y * NX + x;
        const ta = 46 * rnd();
        a.airTemperature[i] = ta;
        a.dewPointTemperature[i] = ta - 0.5 - 27.5 * rnd();
        a.surfacePressure[i] = 650 + 390 * rnd();
        a.windSpeed[i] = 0.1 + 11.9 * rnd();
        const cz = cosZenithInstant(time[t] - 1_800_000, lat[y], lon[x]);
        const s = cz > 0 ? (0.1 + 0.85 * rnd()) * 1367 * cz : 0;
        a.solarGlobal[i] = s;
        a.solarDirect![i] = (x % 3 === 0 ? 0.8 * rnd() : NaN) * s;
      }
    }
  }
  return a;
}

function checksum(a: PhysicsArrays): number {
  let s = 0;
  for (let i = 0; i < a.wbgtSun.length; i++) if (a.status[i] === 0) s += a.wbgtSun[i] + a.wbgtShade[i];
  return Math.round(s * 1000) / 1000;
}

/** Best of this many timed runs (single core and parallel alike). */
const REPS = 3;

export const bench: Bench = {
  names: ['wbgt-kernel', 'wbgt-kernel-parallel'],
  async run(only) {
    const a = makeArrays();
    const n = NT * NY * NX;
    const figs: BenchFigure[] = [];
    // Warm-up: the whole block once, so the timed runs see compiled code (TurboFan compiles on
    // background threads, which process-wide CPU time would otherwise count).
    computeHours(a, 0, NT);
    a.status.fill(0);
    computeHours(a, 0, NT, { kernel: 'js' });
    // Timed runs alternate the JavaScript kernel (the before figure) and the default kernel
    // (the WebAssembly module where available), so both see the same load of the shared machine.
    const walls: number[] = [];
    const cpus: number[] = [];
    const jsWalls: number[] = [];
    const jsCpus: number[] = [];
    let c = computeHours(a, 0, 0);
    let sumJs = 0;
    for (let r = 0; r < REPS; r++) {
      for (const kernel of ['js', 'auto'] as const) {
        a.status.fill(0);
        const p0 = process.cpuUsage();
        const c0 = threadCpuNs();
        const t0 = performance.now();
        c = computeHours(a, 0, NT, { kernel });
        const wall = performance.now() - t0;
        const thread = threadCpuNs() - c0;
        const p1 = process.cpuUsage(p0);
        const cpu = Number.isFinite(thread) ? thread : (p1.user + p1.system) * 1e3;
        (kernel === 'js' ? jsWalls : walls).push(wall);
        (kernel === 'js' ? jsCpus : cpus).push(cpu);
        if (kernel === 'js') sumJs = checksum(a);
      }
    }
    const ms1 = Math.min(...walls);
    const cpu1 = Math.min(...cpus);
    const sum1 = checksum(a);
    const msJs = Math.min(...jsWalls);
    const cpuJs = Math.min(...jsCpus);
    const s = c.solved || 1;
    const single = (ms1 * 1e6) / n;
    const perCell = (v: number) => +(v / n).toFixed(1);
    const details = {
      cellHours: n,
      cpuNsPerCellHour: perCell(cpu1),
      timing: `best of ${REPS} runs after a full warm-up run; value = wall clock; cpu = this thread's CPU time (/proc/thread-self/schedstat); machine shared with other jobs`,
      wallNsRuns: walls.map((w) => ((w * 1e6) / n).toFixed(0)).join('/'),
      cpuNsRuns: cpus.map((v) => (v / n).toFixed(0)).join('/'),
      ok: c.ok,
      rejected: c.rejected,
      notConverged: c.notConverged,
      meanIterGlobeShade: +(c.iterations.globeShade / s).toFixed(3),
      meanIterWetBulbShade: +(c.iterations.wetBulbShade / s).toFixed(3),
      meanIterGlobeSun: +(c.iterations.globeSun / s).toFixed(3),
      meanIterWetBulbSun: +(c.iterations.wetBulbSun / s).toFixed(3),
      iterNote: 'evaluations per cell-hour; sun solves are skipped (0) where the solar load is zero, as sun = shade there',
      checksum: sum1,
      kernel: wasmKernel() ? 'WebAssembly SIMD module (pipeline/physics/wbgt-wasm.ts)' : 'JavaScript (WebAssembly SIMD unavailable)',
      jsKernelNsPerCellHour: +((msJs * 1e6) / n).toFixed(1),
      jsKernelCpuNsPerCellHour: perCell(cpuJs),
      speedupOverJs: +(msJs / ms1).toFixed(2),
      cpuSpeedupOverJs: +(cpuJs / cpu1).toFixed(2),
      jsNote: 'the JavaScript kernel (computeHours kernel: js, the kernel before the WebAssembly module), timed in the same run, runs alternating',
      checksumMatchesJs: sumJs === sum1,
    };
    if (!only || only === 'wbgt-kernel') figs.push({ bench: 'wbgt-kernel', value: +single.toFixed(1), unit: 'ns/cell-hour', ...details });
    if (!only || only === 'wbgt-kernel-parallel') {
      const tStart = performance.now();
      const pool = await startPhysicsPool(a);
      const startMs = performance.now() - tStart;
      try {
        a.status.fill(0);
        await pool.run(NT); // warm-up of the workers' JIT, whole block
        let best: (PoolRun & { wall: number }) | undefined;
        for (let r = 0; r < REPS; r++) {
          a.status.fill(0);
          const t1 = performance.now();
          const run = await pool.run(NT);
          const wall = performance.now() - t1;
          if (!best || wall < best.wall) best = { ...run, wall };
        }
        const r = best!;
        const sumP = checksum(a);
        // Both workers busy at once: the shared part of their busy spans over the whole span.
        const overlap = (Math.min(...r.workerEndMs) - Math.max(...r.workerStartMs)) / (Math.max(...r.workerEndMs) - Math.min(...r.workerStartMs));
        const maxCpu = Math.max(...r.workerCpuNs);
        figs.push({
          bench: 'wbgt-kernel-parallel',
          value: +(ms1 / r.wall).toFixed(2),
          unit: 'x speed-up',
          workers: pool.size,
          cellHours: n,
          hoursPerWorker: r.counts.cells > 0 ? `${Math.ceil(NT / pool.size)} (interleaved 4-hour blocks of shared arrays)` : '0',
          nsPerCellHour: +((r.wall * 1e6) / n).toFixed(1),
          singleCoreNs: +single.toFixed(1),
          singleCoreCpuNs: perCell(cpu1),
          cpuBasedSpeedup: +(cpu1 / maxCpu).toFixed(2),
          workerCpuNsPerCellHour: r.workerCpuNs.map((v) => ((v * pool.size) / n).toFixed(0)).join('/'),
          workerWallMs: r.workerMs.map((m) => Math.round(m)).join('/'),
          busyOverlap: +overlap.toFixed(3),
          workerStartMsExcluded: Math.round(startMs),
          timing: `best of ${REPS} after a warm-up run; value = single-core wall / parallel wall; cpuBasedSpeedup = single-core thread CPU / slowest worker's thread CPU (what two free cores would give)`,
          checksum: sumP,
          checksumMatchesSingle: sumP === sum1,
          ok: r.counts.ok,
        });
      } finally {
        await pool.close();
      }
    }
    return figs;
  },
};

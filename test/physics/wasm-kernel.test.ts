/**
 * The WebAssembly WBGT kernel (pipeline/physics/wbgt-wasm.ts, compiled from
 * pipeline/physics/wasm/wbgt-pairs.ts) against the JavaScript kernel (kernel.ts `wbgtKernelJs`,
 * the same computation in plain JavaScript), and through it against the readable solver
 * (liljegren-solve.ts `solveCell`, the form checked against bisection, the reference
 * implementation's table and scipy in solver.test.ts, reference.test.ts, globe-diameter.test.ts):
 * the same doubles bit for bit, the same statuses, the same counts; every case the module does not
 * take (preset statuses, rejected inputs, odd lengths, chunk edges) handed back and computed by
 * the JavaScript kernel; and the JavaScript kernel alone where WebAssembly SIMD is missing.
 */
import { describe, it, expect, vi, afterEach } from 'vitest';
import { wbgtKernel, wbgtKernelJs, type WbgtInputs, type WbgtOutputs } from '../../pipeline/physics/kernel.ts';
import { wasmKernel, loadWasmKernel, wasmKernelRange, CHUNK } from '../../pipeline/physics/wbgt-wasm.ts';
import { CellState, prepareCell, setGlobe, solveCell, globeFactors } from '../../pipeline/physics/liljegren-solve.ts';
import { computeHours } from '../../pipeline/physics/block.ts';
import { D_GLOBE, D_GLOBE_STANDARD, KELVIN } from '../../pipeline/physics/constants.ts';
import { STATUS } from '../../pipeline/physics/status.ts';
import { makeArrays } from '../../bench/wbgt.bench.ts';
import { rng, state } from './stratified-states.ts';

type Arr = Float32Array | Float64Array;
const FIELDS = ['wbgtSun', 'wbgtShade', 'globeSun', 'wetBulbSun', 'globeShade', 'wetBulbShade'] as const;

type Outputs = WbgtOutputs & Record<(typeof FIELDS)[number], Arr>;

function outputs(n: number, kind: 'f32' | 'f64'): Outputs {
  const a = () => (kind === 'f32' ? new Float32Array(n) : new Float64Array(n));
  return { wbgtSun: a(), wbgtShade: a(), globeSun: a(), wetBulbSun: a(), globeShade: a(), wetBulbShade: a(), status: new Uint8Array(n) };
}

function inputsOf(states: ReturnType<typeof state>[], kind: 'f32' | 'f64'): WbgtInputs {
  const from = (f: (s: ReturnType<typeof state>) => number) => (kind === 'f32' ? Float32Array.from(states, f) : Float64Array.from(states, f));
  return {
    airTemperature: from((s) => s.ta),
    dewPointTemperature: from((s) => s.td),
    surfacePressure: from((s) => s.p),
    wind2m: from((s) => s.u),
    solar: from((s) => s.sol),
    cosZenith: from((s) => s.cz),
    directFraction: from((s) => s.fd),
  };
}

/** Number of cells whose outputs or status differ (Object.is: NaN equals NaN, -0 differs from 0). */
function differences(a: Outputs, b: Outputs, n: number): number {
  let d = 0;
  for (let i = 0; i < n; i++) {
    let same = a.status[i] === b.status[i];
    for (const f of FIELDS) same &&= Object.is(a[f][i], b[f][i]);
    if (!same) d++;
  }
  return d;
}

const STATES = (() => {
  const r = rng(20240719);
  return Array.from({ length: 20_000 }, (_, i) => state(r, i % 8));
})();

describe('the WebAssembly kernel', () => {
  it('is available on this Node (WebAssembly SIMD), so the tests below run the module and not the fallback', () => {
    expect(wasmKernel()).not.toBeNull();
  });

  it("gives the JavaScript kernel's doubles bit for bit, with the same statuses and counts, on the seeded benchmark input (1,000,000 cell-hours of geometry, wind and physics in single precision, as the build runs it)", () => {
    const a = makeArrays();
    const n = a.wbgtSun.length;
    const c1 = computeHours(a, 0, 100, { kernel: 'js' });
    const js = FIELDS.map((f) => Float32Array.from(a[f]!));
    const jsStatus = Uint8Array.from(a.status);
    a.status.fill(0);
    for (const f of FIELDS) a[f]!.fill(-999);
    const c2 = computeHours(a, 0, 100, { kernel: 'auto' });
    expect(c2).toEqual(c1);
    expect(c1.ok).toBe(n);
    let diff = 0;
    for (let i = 0; i < n; i++) {
      let same = a.status[i] === jsStatus[i];
      FIELDS.forEach((f, k) => {
        same &&= Object.is(a[f]![i], js[k][i]);
      });
      if (!same) diff++;
    }
    expect(diff).toBe(0);
  });

  for (const kind of ['f64', 'f32'] as const) {
    it(`gives the JavaScript kernel's results bit for bit and stays within 1e-9 °C of the readable solver on 20,000 stratified states (night, calm, saturation, extreme sun; 50.8 and 150 mm globes; ${kind === 'f64' ? 'double' : 'single'}-precision arrays)`, () => {
      const N = STATES.length;
      const inp = inputsOf(STATES, kind);
      const s = new CellState();
      let worst = 0;
      for (const d of [D_GLOBE, D_GLOBE_STANDARD]) {
        const g = globeFactors(d);
        const oJs = outputs(N, kind);
        const oW = outputs(N, kind);
        const cJs = wbgtKernelJs(inp, oJs, N, 0, g);
        const cW = wbgtKernel(inp, oW, N, 0, g);
        expect(cW).toEqual(cJs);
        expect(cW.ok).toBe(N);
        expect(differences(oJs, oW, N)).toBe(0);
        if (kind === 'f32') continue; // single-precision outputs hold the solver's doubles only to ~1e-6
        setGlobe(s, g);
        for (let i = 0; i < N; i++) {
          const x = STATES[i];
          prepareCell(s, x.ta, Math.min(x.td, x.ta), x.p, x.u, x.sol, x.fd, x.cz);
          solveCell(s, false);
          const wbgt = (tw: number, tg: number) => 0.7 * (tw - KELVIN) + 0.2 * (tg - KELVIN) + 0.1 * x.ta;
          const pairs: Array<[number, number]> = [
            [oW.globeShade[i], s.tgShade - KELVIN],
            [oW.wetBulbShade[i], s.twShade - KELVIN],
            [oW.globeSun[i], s.tgSun - KELVIN],
            [oW.wetBulbSun[i], s.twSun - KELVIN],
            [oW.wbgtShade[i], wbgt(s.twShade, s.tgShade)],
            [oW.wbgtSun[i], wbgt(s.twSun, s.tgSun)],
          ];
          for (const [fast, readable] of pairs) {
            const e = Math.abs(fast - readable);
            if (!(e <= 1e-9)) expect.fail(`state ${i} (${JSON.stringify(x)}), D = ${d} m: module ${fast} vs solver ${readable}`);
            worst = Math.max(worst, e);
          }
        }
      }
      expect(worst).toBeLessThanOrEqual(1e-9);
    });
  }

  it('hands back exactly the cells it does not take (status already set, missing or out-of-range inputs, the pad of an odd count), which the JavaScript kernel then computes, across chunk edges and from an offset start', () => {
    const k = wasmKernel()!;
    // Two chunks and a bit (odd), from an offset: the chunk edges and the pad cell are crossed.
    const N = 2 * CHUNK + 7;
    const start = 3;
    const st = Array.from({ length: N }, (_, i) => STATES[i % STATES.length]);
    const inp = inputsOf(st, 'f64') as Record<keyof WbgtInputs, Float64Array>;
    const bad = new Map<number, number>();
    const set = (i: number, f: keyof WbgtInputs, v: number, code: number) => {
      inp[f][i] = v;
      bad.set(i, code);
    };
    set(10, 'airTemperature', NaN, STATUS.missingInput);
    set(CHUNK - 1, 'airTemperature', 61, STATUS.airTemperatureOutOfRange);
    set(CHUNK, 'dewPointTemperature', -95, STATUS.humidityOutOfRange);
    set(CHUNK + 1, 'surfacePressure', 250, STATUS.pressureOutOfRange);
    set(1500, 'wind2m', -1, STATUS.windOutOfRange);
    set(2 * CHUNK - 2, 'solar', 1600, STATUS.solarOutOfRange);
    set(2 * CHUNK + 1, 'cosZenith', 1.5, STATUS.cosZenithOutOfRange);
    set(N - 1, 'directFraction', 1.2, STATUS.directFractionOutOfRange);
    const oJs = outputs(N, 'f64');
    const oW = outputs(N, 'f64');
    // A status set before the kernel (as the geometry step does) is kept and the cell skipped.
    for (const o of [oJs, oW]) o.status[20] = STATUS.timeOutOfRange;
    bad.set(20, STATUS.timeOutOfRange);
    const handed: number[] = [];
    const g = globeFactors(D_GLOBE_STANDARD);
    const w = wasmKernelRange(k, inp, oW, start, N, g, (i) => {
      handed.push(i);
      wbgtKernelJs(inp, oW, i + 1, i, g);
    });
    wbgtKernelJs(inp, oJs, N, start, g);
    // Every bad cell went back; any other cell handed back is one whose solve left the module's
    // regular path (a safeguarded step), and the JavaScript kernel computed it.
    for (const i of bad.keys()) expect(handed).toContain(i);
    expect(handed.length).toBe(N - start - w.ok);
    expect(new Set(handed).size).toBe(handed.length);
    expect(handed.every((i, j) => i >= start && i < N && (j === 0 || i > handed[j - 1]))).toBe(true);
    for (const [i, code] of bad) {
      expect(oW.status[i]).toBe(code);
      expect(oW.wbgtSun[i]).toBeNaN();
    }
    // Cells before the start are left alone by both.
    for (let i = 0; i < start; i++) expect(oW.wbgtSun[i]).toBe(0);
    expect(differences(oJs, oW, N)).toBe(0);
  });

  it('takes short calls (below 8 cells), shelter and psychrometric outputs and plain-array inputs through the JavaScript kernel, with the same results', () => {
    const st = STATES.slice(0, 6);
    for (const inp of [
      inputsOf(st, 'f64'),
      Object.fromEntries(Object.entries(inputsOf(STATES.slice(0, 40), 'f64')).map(([key, v]) => [key, Array.from(v)])) as unknown as WbgtInputs,
    ]) {
      const n = inp.airTemperature.length;
      const a = outputs(n, 'f64');
      const b = outputs(n, 'f64');
      expect(wbgtKernel(inp, a, n)).toEqual(wbgtKernelJs(inp, b, n));
      expect(differences(a, b, n)).toBe(0);
    }
  });
});

describe('without WebAssembly SIMD', () => {
  afterEach(() => {
    vi.unstubAllGlobals();
    vi.resetModules();
  });

  it('the loader gives null where the runtime rejects the module (a compiler without SIMD throws a CompileError) or has no WebAssembly', () => {
    const noSimd = {
      ...WebAssembly,
      Module: function Module() {
        throw new WebAssembly.CompileError('invalid opcode 0xfd (SIMD prefix)');
      },
    } as unknown as typeof WebAssembly;
    expect(loadWasmKernel(noSimd)).toBeNull();
    expect(loadWasmKernel(null)).toBeNull();
    expect(loadWasmKernel(WebAssembly)).not.toBeNull();
  });

  it('wbgtKernel falls back to the JavaScript kernel and gives the same results', async () => {
    const realWasm = WebAssembly;
    vi.stubGlobal('WebAssembly', {
      ...realWasm,
      Module: function Module() {
        throw new realWasm.CompileError('invalid opcode 0xfd (SIMD prefix)');
      },
    });
    vi.resetModules();
    const fresh = await import('../../pipeline/physics/kernel.ts');
    const freshWasm = await import('../../pipeline/physics/wbgt-wasm.ts');
    expect(freshWasm.wasmKernel()).toBeNull();
    const N = 4000;
    const inp = inputsOf(STATES.slice(0, N), 'f32');
    const a = outputs(N, 'f32');
    const b = outputs(N, 'f32');
    expect(fresh.wbgtKernel(inp, a, N)).toEqual(wbgtKernelJs(inp, b, N));
    expect(differences(a, b, N)).toBe(0);
    expect(a.status.every((s) => s === 0)).toBe(true);
  });
});

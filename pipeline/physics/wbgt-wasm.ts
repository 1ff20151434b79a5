/**
 * The WebAssembly path of the WBGT kernel: the shade and sun globe and natural wet-bulb solves of
 * {@link wbgtKernel} (./kernel.ts) run two cells at a time in SIMD lanes by the module compiled
 * from ./wasm/wbgt-pairs.ts (AssemblyScript; the binary is ./wbgt-wasm-binary.ts). Same
 * operations in the same order as the JavaScript kernel, on the same property tables (copied in
 * from ./property-tables.ts) and constants (copied in from the code), so every result is the
 * same double; test/physics/wasm-kernel.test.ts holds the two equal.
 *
 * The module takes only the regular path. A cell it hands back (a status already set, an input
 * out of range, a temperature outside the tables, a safeguarded step, no convergence within its
 * few steps) is computed by the JavaScript kernel, which counts and reports it as before.
 *
 * Work is done in chunks of {@link CHUNK} cells: inputs copied into the module's memory (as
 * doubles, as the JavaScript kernel reads them), outputs copied back (a Float32Array output
 * rounds them as the JavaScript kernel's stores do). Pure computation: no file, thread or process.
 */
import { WBGT_WASM_BASE64 } from './wbgt-wasm-binary.ts';
import { DEW_TABLE, GLOBE_TABLE, ZV_TABLE, ES_TABLE, POW12_TABLE, TABLE_T_MIN, TABLE_STEP, TABLE_N, Y_STEP, Y_N, BUCK_T_OFFSET_K } from './property-tables.ts';
import { CW0, QG_K, INV_PI, EW_SB, CAP, ROOT_TOLERANCE_K, type GlobeFactors } from './liljegren-solve.ts';
import { KELVIN, EMIS_SFC, ALB_SFC, ALB_WICK, CZA_MIN, MIN_SPEED } from './constants.ts';
import { INPUT_LIMITS } from './status.ts';

type Num = Float32Array | Float64Array;

/** Cells per call of the module [–] (even). */
export const CHUNK = 1024;

/** The constants block, in the order of the module's K_* indices. */
const CONSTANTS: readonly number[] = [
  TABLE_T_MIN,
  1 / TABLE_STEP,
  TABLE_N - 1,
  1 / Y_STEP,
  Y_N - 1,
  KELVIN,
  EMIS_SFC,
  ALB_SFC,
  ALB_WICK,
  CZA_MIN,
  MIN_SPEED,
  QG_K,
  INV_PI,
  EW_SB,
  CAP,
  CW0,
  BUCK_T_OFFSET_K,
  ROOT_TOLERANCE_K,
  INPUT_LIMITS.airTemperatureC[0],
  INPUT_LIMITS.airTemperatureC[1],
  INPUT_LIMITS.dewPointMinC,
  INPUT_LIMITS.pressureHpa[0],
  INPUT_LIMITS.pressureHpa[1],
  INPUT_LIMITS.windMs[0],
  INPUT_LIMITS.windMs[1],
  INPUT_LIMITS.solarWm2[0],
  INPUT_LIMITS.solarWm2[1],
];

/** Inputs the module reads, outputs it writes (each `CHUNK` doubles), counts it adds to. */
export interface WasmKernel {
  /** Runs the module on the chunk's first n cells; returns how many cells (with an odd n's pad) it handed back. */
  run(n: number, cg0: number, invEgSb: number, in32: boolean, out32: boolean): number;
  inputs: Float64Array[];
  /** The same inputs in single precision (used when every input array is a Float32Array). */
  inputs32: Float32Array[];
  status: Uint8Array;
  flags: Uint8Array;
  /** WBGT sun, WBGT shade, globe sun, wet bulb sun, globe shade, wet bulb shade [°C]. */
  outputs: Float64Array[];
  /** The same outputs rounded to single precision (written when every output array is a Float32Array). */
  outputs32: Float32Array[];
  /** ok, dew points clamped, iterations globe sun, wet bulb sun, globe shade, wet bulb shade. */
  counts: Float64Array;
}

let instance: WasmKernel | null | undefined;

/** The module, instantiated once per thread ({@link loadWasmKernel}); null where WebAssembly SIMD is not available. */
export function wasmKernel(): WasmKernel | null {
  if (instance === undefined) instance = loadWasmKernel();
  return instance;
}

/**
 * Compiles and instantiates the module with `wasm` (the runtime's WebAssembly namespace) and lays
 * out its memory. Returns null when that fails: no WebAssembly (`wasm` null), or a runtime whose compiler
 * rejects the SIMD instructions (a CompileError), so the caller runs the JavaScript kernel.
 */
export function loadWasmKernel(wasm: typeof WebAssembly | null = globalThis.WebAssembly ?? null): WasmKernel | null {
  if (wasm === null) return null;
  try {
    const bytes = Uint8Array.from(atob(WBGT_WASM_BASE64), (c) => c.charCodeAt(0));
    const inst = new wasm.Instance(new wasm.Module(bytes), {});
    const ex = inst.exports as {
      memory: WebAssembly.Memory;
      layout: (...a: number[]) => void;
      run: (n: number, io: number, cap: number, cg0: number, invEgSb: number, in32: number, out32: number) => number;
    };
    // Layout from 64 KiB (the module keeps its scratch below): constants, the five tables, then
    // the chunk's inputs, status, flags, outputs, counts, single-precision inputs and outputs.
    let at = 65536;
    const take = (bytes: number) => {
      const p = at;
      at += Math.ceil(bytes / 16) * 16;
      return p;
    };
    const pConsts = take(8 * 32);
    const tables = [DEW_TABLE, GLOBE_TABLE, ZV_TABLE, ES_TABLE, POW12_TABLE].map((t) => ({ t, p: take(8 * t.length) }));
    const io = take((7 * 8 + 2 + 6 * 8) * CHUNK + 8 * 8 + (7 + 6) * 4 * CHUNK);
    const pages = Math.ceil(at / 65536) - ex.memory.buffer.byteLength / 65536;
    if (pages > 0) ex.memory.grow(pages);
    const buf = ex.memory.buffer;
    new Float64Array(buf, pConsts, CONSTANTS.length).set(CONSTANTS);
    for (const { t, p } of tables) new Float64Array(buf, p, t.length).set(t);
    ex.layout(pConsts, tables[0].p, tables[1].p, tables[2].p, tables[3].p, tables[4].p);
    const f64 = (k: number) => new Float64Array(buf, io + 8 * CHUNK * k, CHUNK);
    const pStatus = io + 7 * 8 * CHUNK;
    const pOut = pStatus + 2 * CHUNK;
    const pIn32 = pOut + 6 * 8 * CHUNK + 64;
    const pOut32 = pIn32 + 7 * 4 * CHUNK;
    return {
      run: (n, cg0, invEgSb, in32, out32) => ex.run(n, io, CHUNK, cg0, invEgSb, in32 ? 1 : 0, out32 ? 1 : 0),
      inputs: [0, 1, 2, 3, 4, 5, 6].map(f64),
      inputs32: [0, 1, 2, 3, 4, 5, 6].map((k) => new Float32Array(buf, pIn32 + 4 * CHUNK * k, CHUNK)),
      status: new Uint8Array(buf, pStatus, CHUNK),
      flags: new Uint8Array(buf, pStatus + CHUNK, CHUNK),
      outputs: [0, 1, 2, 3, 4, 5].map((k) => new Float64Array(buf, pOut + 8 * CHUNK * k, CHUNK)),
      outputs32: [0, 1, 2, 3, 4, 5].map((k) => new Float32Array(buf, pOut32 + 4 * CHUNK * k, CHUNK)),
      counts: new Float64Array(buf, pOut + 6 * 8 * CHUNK, 8),
    };
  } catch {
    return null;
  }
}

/** Inputs of the WebAssembly path: typed arrays only (./kernel.ts `WbgtInputs`). */
export interface WasmInputs {
  airTemperature: Num;
  dewPointTemperature: Num;
  surfacePressure: Num;
  wind2m: Num;
  solar: Num;
  cosZenith: Num;
  directFraction: Num;
}

/** Outputs of the WebAssembly path (./kernel.ts `WbgtOutputs` without shelter and psychrometric). */
export interface WasmOutputs {
  wbgtSun: Num;
  wbgtShade: Num;
  globeSun?: Num;
  wetBulbSun?: Num;
  globeShade?: Num;
  wetBulbShade?: Num;
  status: Uint8Array;
}

/** What the module computed in one call of {@link wasmKernelRange}. */
export interface WasmCounts {
  ok: number;
  clamped: number;
  itGlobeSun: number;
  itWetBulbSun: number;
  itGlobeShade: number;
  itWetBulbShade: number;
}

/**
 * Runs the module on cells [start, end): writes the outputs of every cell it computed, and calls
 * `handBack(i)` for each cell it left (in ascending order, after the chunk's outputs are written).
 */
export function wasmKernelRange(
  k: WasmKernel,
  inp: WasmInputs,
  out: WasmOutputs,
  start: number,
  end: number,
  globe: GlobeFactors,
  handBack: (i: number) => void,
): WasmCounts {
  const src = [inp.airTemperature, inp.dewPointTemperature, inp.surfacePressure, inp.wind2m, inp.solar, inp.cosZenith, inp.directFraction];
  const dst: Array<Num | undefined> = [out.wbgtSun, out.wbgtShade, out.globeSun, out.wetBulbSun, out.globeShade, out.wetBulbShade];
  const c = k.counts;
  c.fill(0);
  // Single precision in and out where every array is single precision (the build's case): the
  // copies are then plain byte copies, and the module widens and rounds exactly as reads and
  // stores of a Float32Array do.
  const in32 = src.every((a) => a instanceof Float32Array);
  const out32 = dst.every((a) => a === undefined || a instanceof Float32Array);
  const ins = in32 ? k.inputs32 : k.inputs;
  const outs = out32 ? k.outputs32 : k.outputs;
  for (let c0 = start; c0 < end; c0 += CHUNK) {
    const c1 = Math.min(end, c0 + CHUNK);
    const n = c1 - c0;
    for (let j = 0; j < 7; j++) ins[j].set(src[j].subarray(c0, c1));
    k.status.set(out.status.subarray(c0, c1));
    // An odd count: the pad cell is marked so the module leaves it.
    if (n & 1) k.status[n] = 255;
    const back = k.run(n, globe.cg0, globe.invEgSb, in32, out32) - (n & 1);
    for (let j = 0; j < 6; j++) {
      const d = dst[j];
      if (d !== undefined) d.set(n === CHUNK ? outs[j] : outs[j].subarray(0, n), c0);
    }
    if (back > 0) {
      const flags = k.flags;
      for (let i = 0; i < n; i++) if (flags[i] !== 0) handBack(c0 + i);
    }
  }
  return { ok: c[0], clamped: c[1], itGlobeSun: c[2], itWetBulbSun: c[3], itGlobeShade: c[4], itWetBulbShade: c[5] };
}

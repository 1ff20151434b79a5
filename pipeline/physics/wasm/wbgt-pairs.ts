/**
 * AssemblyScript source of the WebAssembly WBGT kernel (compiled by scripts/compile-wasm.ts into
 * ../wbgt-wasm-binary.ts; run by ../wbgt-wasm.ts). Not TypeScript: `f64`, `v128` and the SIMD
 * built-ins are AssemblyScript's, so this folder is outside the project's tsconfig.
 *
 * The same computation as the fused JavaScript kernel (../kernel.ts), cell by cell, with the same
 * operations in the same order (no fused multiply-add exists in WebAssembly's SIMD), so each
 * result is the same double: the Liljegren et al. 2008 globe and natural wet-bulb balances
 * (docs/methods.md §6.5, §6.6, §6.7) in the shade and the sun, solved by Newton from the same first
 * guesses, with the same cubic Hermite table reads (../property-tables.ts), and
 * WBGT = 0.7·Tnw + 0.2·Tg + 0.1·Ta (ISO 7243, docs/methods.md §6.1). Two cells at once in the two
 * lanes of an f64x2: while one lane still iterates, the other's converged root stays put.
 *
 * Only the regular path is here. A cell leaves it (flag 1, its outputs left to the caller,
 * nothing counted) when anything unusual happens: a status already set, an input out of range,
 * a temperature outside the property tables, a safeguarded (bisection) step, vapour pressure at
 * the surface pressure, or no convergence within {@link FAST_ITERATIONS} steps. The caller then
 * runs the JavaScript kernel on that cell, which handles every case.
 *
 * Memory (laid out by ../wbgt-wasm.ts): the constants block at {@link CONSTS} (f64, indices K_*),
 * then the property tables, then the chunk's inputs and outputs; see {@link run}.
 */

/** Byte offsets of the blocks (set by the caller through {@link layout}). */
let CONSTS: usize = 0;
let DT: usize = 0;
let GT: usize = 0;
let ZT: usize = 0;
let ET: usize = 0;
let YT: usize = 0;
/** The chunk's blocks (set by {@link run}): inputs, bytes per input, status in, flags out, outputs, counts. */
let P_IN: usize = 0;
let FCAP: usize = 0;
let P_STATUS: usize = 0;
let P_FLAGS: usize = 0;
let P_OUT: usize = 0;
let P_COUNTS: usize = 0;
/** Single-precision copies of the inputs and outputs (used when {@link run} is told so). */
let P_IN32: usize = 0;
let P_OUT32: usize = 0;
let IN32: bool = false;
let OUT32: bool = false;
/** Cells handed back by the last {@link run}. */
let HANDED_BACK: i32 = 0;

// Indices of the constants block (same order as ../wbgt-wasm.ts CONSTANT_NAMES).
const K_T0 = 0;
const K_INV_STEP = 1;
const K_TN1 = 2;
const K_Y_INV = 3;
const K_YN1 = 4;
const K_KELVIN = 5;
const K_EMIS_SFC = 6;
const K_ALB_SFC = 7;
const K_ALB_WICK = 8;
const K_CZA_MIN = 9;
const K_MIN_SPEED = 10;
const K_QG_K = 11;
const K_INV_PI = 12;
const K_EW_SB = 13;
const K_CAP = 14;
const K_CW0 = 15;
const K_BUCK = 16;
const K_TOL = 17;
const K_TA_MIN = 18;
const K_TA_MAX = 19;
const K_TD_MIN = 20;
const K_P_MIN = 21;
const K_P_MAX = 22;
const K_U_MIN = 23;
const K_U_MAX = 24;
const K_S_MIN = 25;
const K_S_MAX = 26;

/** Newton steps tried here before a cell is handed back (the JavaScript kernel allows 50). */
const FAST_ITERATIONS = 8;

/** Sets where the constants and the tables are [byte offsets]. */
export function layout(consts: usize, dew: usize, globe: usize, zv: usize, es: usize, pow12: usize): void {
  CONSTS = consts;
  DT = dew;
  GT = globe;
  ZT = zv;
  ET = es;
  YT = pow12;
}

@inline function K(i: i32): f64 {
  return load<f64>(CONSTS + (<usize>i << 3));
}
@inline function S(x: f64): v128 {
  return f64x2.splat(x);
}
@inline function add(a: v128, b: v128): v128 {
  return f64x2.add(a, b);
}
@inline function sub(a: v128, b: v128): v128 {
  return f64x2.sub(a, b);
}
@inline function mul(a: v128, b: v128): v128 {
  return f64x2.mul(a, b);
}
@inline function div(a: v128, b: v128): v128 {
  return f64x2.div(a, b);
}
/** Lane-wise `m ? a : b` (m: all-ones or all-zeros lanes). */
@inline function sel(m: v128, a: v128, b: v128): v128 {
  return v128.bitselect(a, b, m);
}
@inline function lo(a: v128, b: v128): v128 {
  return v128.shuffle<f64>(a, b, 0, 2);
}
@inline function hi(a: v128, b: v128): v128 {
  return v128.shuffle<f64>(a, b, 1, 3);
}
/** The f64x2 of the doubles at a0 + off (lane 0) and a1 + off (lane 1) [byte addresses]. */
@inline function pick(a0: usize, a1: usize, off: usize): v128 {
  return v128.load64_lane(a1 + off, v128.load64_zero(a0 + off), 1);
}
/** Two inputs at `ptr`: doubles, or singles widened (exactly) to doubles. */
@inline function input(ptr: usize, in32: bool): v128 {
  return in32 ? f64x2.promote_low_f32x4(v128.load64_zero(ptr)) : v128.load(ptr);
}
/** Number of set lanes of a mask. */
@inline function lanes(m: v128): i32 {
  return <i32>popcnt<i32>(i64x2.bitmask(m));
}

// Scratch of one block of pairs (the module's own memory below 64 KiB): field f of pair j at
// SCRATCH + (f·BLOCK_PAIRS + j)·16, one f64x2 each; then the list of pairs still iterating.
const BLOCK_PAIRS = 32;
const SCRATCH: usize = 1024;
const LIST: usize = SCRATCH + 48 * BLOCK_PAIRS * 16;

// Per pair: inputs and the cell's constants.
const F_TA = 0;
const F_TAK = 1;
const F_TDK = 2;
const F_P = 3;
const F_PEA = 4;
const F_EA = 5;
const F_LRAD = 6;
const F_QG = 7;
const F_QW = 8;
const F_CG = 9;
const F_INVCW = 10;
const F_BAD = 11;
const F_CLAMP = 12;
// The solve in progress (globe or wick): iterate, bracket, lanes still iterating, iterations,
// root, the lanes this pass solves, the constant load.
const F_X = 13;
const F_LO = 14;
const F_HI = 15;
const F_LEFT = 16;
const F_ITS = 17;
const F_ROOT = 18;
const F_ACTIVE = 19;
const F_LOAD = 20;
// Globe: slope and curvature at the root (sun guess).
const F_GSLOPE = 21;
const F_GCURV = 22;
// Wick: slope, 1/h_w and its derivative, curvatures at the shade root (sun guess).
const F_SLOPE0 = 23;
const F_INVHW0 = 24;
const F_DINVHW0 = 25;
const F_WCURV = 26;
const F_WCURV3 = 27;
// Results [K] and iterations.
const F_TGSHADE = 28;
const F_TGSUN = 29;
const F_TWSHADE = 30;
const F_TWSUN = 31;
const F_ITGD = 32;
const F_ITGS = 33;
const F_ITWD = 34;
const F_ITWS = 35;
// e_s'(T_d) [hPa K⁻¹] (the wick's shade guess).
const F_DESTD = 37;

@inline function at(f: i32, j: i32): usize {
  return SCRATCH + ((<usize>(f * BLOCK_PAIRS + j)) << 4);
}
@inline function get(f: i32, j: i32): v128 {
  return v128.load(at(f, j));
}
@inline function put(f: i32, j: i32, v: v128): void {
  v128.store(at(f, j), v);
}

/**
 * Runs the kernel on `n` cells (rounded up to pairs; the buffers hold the extra cell). Inputs
 * (f64, from `io`, `cap` cells each): air temperature, dew point [°C], pressure [hPa], 2 m wind
 * [m s⁻¹], solar [W m⁻²], cos zenith [–], direct fraction [–]; then status bytes in (`cap`),
 * flag bytes out (`cap`: 1 = left to the caller), outputs (f64, `cap` each): WBGT sun, WBGT
 * shade, globe sun, wet bulb sun, globe shade, wet bulb shade [°C]; then 8 f64 counts (added to):
 * ok, dew points clamped, iterations globe sun, wet bulb sun, globe shade, wet bulb shade.
 * `cg0`, `invEgSb`: the globe diameter's factors (liljegren-solve.ts `globeFactors`).
 *
 * The cells go in blocks of {@link BLOCK_PAIRS} pairs, each block in phases (set-up and first
 * guesses; the globe's Newton steps in the shade, then in the sun; the wick's, likewise; the
 * outputs), so the steps of different pairs, which do not depend on each other, overlap in the
 * processor instead of waiting on one cell's chain of divisions.
 */
export function run(n: i32, io: usize, cap: i32, cg0: f64, invEgSb: f64, in32: i32, out32: i32): i32 {
  P_IN = io;
  FCAP = <usize>cap << 3;
  P_STATUS = io + 7 * FCAP;
  P_FLAGS = P_STATUS + <usize>cap;
  P_OUT = P_FLAGS + <usize>cap;
  P_COUNTS = P_OUT + 6 * FCAP;
  P_IN32 = P_COUNTS + 64;
  P_OUT32 = P_IN32 + 7 * (FCAP >> 1);
  IN32 = in32 != 0;
  OUT32 = out32 != 0;
  HANDED_BACK = 0;
  const pairs = (n + 1) >> 1;
  for (let b: i32 = 0; b < pairs; b += BLOCK_PAIRS) {
    const nb = min(BLOCK_PAIRS, pairs - b);
    setup(nb, b, cg0, invEgSb);
    globePass(nb, 0, invEgSb);
    globePass(nb, 1, invEgSb);
    wickShadeGuess(nb);
    wickPass(nb, 0);
    wickPass(nb, 1);
    finish(nb, b);
  }
  return HANDED_BACK;
}

/** Set-up of each pair of the block (kernel.ts cell setup), the globe's shade guess into F_X. */
function setup(nb: i32, b: i32, cg0: f64, invEgSb: f64): void {
  // Doubles (16 bytes a pair) or singles (8 bytes a pair, widened exactly).
  const in32 = IN32;
  const fcap = in32 ? FCAP >> 1 : FCAP;
  const pTA = in32 ? P_IN32 + (<usize>b << 3) : P_IN + (<usize>b << 4);
  const pTD = pTA + fcap;
  const pP = pTD + fcap;
  const pU = pP + fcap;
  const pS = pU + fcap;
  const pCZ = pS + fcap;
  const pFD = pCZ + fcap;
  const sh: usize = in32 ? 3 : 4;
  const pStatus = P_STATUS + (<usize>b << 1);
  const T0 = S(K(K_T0));
  const INV_STEP = S(K(K_INV_STEP));
  const TN1 = S(K(K_TN1));
  const Y_INV = S(K(K_Y_INV));
  const YN1 = S(K(K_YN1));
  const KELVIN = S(K(K_KELVIN));
  const EMIS_SFC = S(K(K_EMIS_SFC));
  const ALB_SFC = S(K(K_ALB_SFC));
  const ALB_WICK = S(K(K_ALB_WICK));
  const CZA_MIN = S(K(K_CZA_MIN));
  const MIN_SPEED = S(K(K_MIN_SPEED));
  const QG_K = S(K(K_QG_K));
  const INV_PI = S(K(K_INV_PI));
  const CAP = S(K(K_CAP));
  const CW0 = S(K(K_CW0));
  const CG = S(cg0);
  const INV_EG_SB = S(invEgSb);
  const TA_MIN = S(K(K_TA_MIN));
  const TA_MAX = S(K(K_TA_MAX));
  const TD_MIN = S(K(K_TD_MIN));
  const P_MIN = S(K(K_P_MIN));
  const P_MAX = S(K(K_P_MAX));
  const U_MIN = S(K(K_U_MIN));
  const U_MAX = S(K(K_U_MAX));
  const S_MIN = S(K(K_S_MIN));
  const S_MAX = S(K(K_S_MAX));
  const ZERO = S(0);
  const ONE = S(1);
  const HALF = S(0.5);
  const C2 = S(2);
  const C3 = S(3);
  const C4 = S(4);
  const C6 = S(6);
  const C12 = S(12);
  const CM2 = S(-2);
  const NEG1 = S(-1);
  const ONE_CAP = add(ONE, CAP);
  const ONE_ALB_WICK = sub(ONE, ALB_WICK);
  for (let j: i32 = 0; j < nb; j++) {
    const q = <usize>j << sh;
    const ta = input(pTA + q, in32);
    let td = input(pTD + q, in32);
    const p = input(pP + q, in32);
    const u = input(pU + q, in32);
    const sol = input(pS + q, in32);
    const cz = input(pCZ + q, in32);
    const fd = input(pFD + q, in32);
    // A lane with a status already set, or an input out of range (NaN fails), goes back.
    const st = load<u16>(pStatus + (<usize>j << 1));
    const bad0: i64 = (st & 0xff) != 0 ? -1 : 0;
    const bad1: i64 = (st >> 8) != 0 ? -1 : 0;
    let bad = i64x2.replace_lane(i64x2.splat(bad0), 1, bad1);
    let inRange = v128.and(f64x2.ge(ta, TA_MIN), f64x2.le(ta, TA_MAX));
    inRange = v128.and(inRange, f64x2.ge(td, TD_MIN));
    inRange = v128.and(inRange, v128.and(f64x2.ge(p, P_MIN), f64x2.le(p, P_MAX)));
    inRange = v128.and(inRange, v128.and(f64x2.ge(u, U_MIN), f64x2.le(u, U_MAX)));
    inRange = v128.and(inRange, v128.and(f64x2.ge(sol, S_MIN), f64x2.le(sol, S_MAX)));
    inRange = v128.and(inRange, v128.and(f64x2.ge(cz, NEG1), f64x2.le(cz, ONE)));
    inRange = v128.and(inRange, v128.and(f64x2.ge(fd, ZERO), f64x2.le(fd, ONE)));
    bad = v128.or(bad, v128.not(inRange));
    const clamp = f64x2.gt(td, ta);
    td = sel(clamp, ta, td);
    const taK = add(ta, KELVIN);
    const ta2 = mul(taK, taK);
    const ta4 = mul(ta2, ta2);
    const tdK = add(td, KELVIN);
    // e_a, e_s'(T_d), ε_a(T_d): DEW_TABLE.
    let ea: v128;
    let desTd: v128;
    let emisAtm: v128;
    {
      let uu = mul(sub(tdK, T0), INV_STEP);
      const inT = v128.and(f64x2.ge(uu, ZERO), f64x2.lt(uu, TN1));
      bad = v128.or(bad, v128.not(inT));
      uu = sel(inT, uu, ZERO);
      const ki = i32x4.trunc_sat_f64x2_s_zero(uu);
      const t = sub(uu, f64x2.convert_low_i32x4_s(ki));
      const a0 = DT + (<usize>i32x4.extract_lane(ki, 0) << 5);
      const a1 = DT + (<usize>i32x4.extract_lane(ki, 1) << 5);
      const t2 = mul(t, t);
      const t3 = mul(t2, t);
      const h00 = add(sub(mul(C2, t3), mul(C3, t2)), ONE);
      const h10 = add(sub(t3, mul(C2, t2)), t);
      const h01 = sub(ONE, h00);
      const h11 = sub(t3, t2);
      const d00 = mul(sub(mul(C6, t2), mul(C6, t)), INV_STEP);
      const d10 = mul(add(sub(mul(C3, t2), mul(C4, t)), ONE), INV_STEP);
      const d11 = mul(sub(mul(C3, t2), mul(C2, t)), INV_STEP);
      const f0 = pick(a0, a1, 0);
      const fm0 = pick(a0, a1, 8);
      const g0 = pick(a0, a1, 16);
      const gm0 = pick(a0, a1, 24);
      const f1 = pick(a0, a1, 32);
      const fm1 = pick(a0, a1, 40);
      const g1 = pick(a0, a1, 48);
      const gm1 = pick(a0, a1, 56);
      ea = add(add(add(mul(h00, f0), mul(h10, fm0)), mul(h01, f1)), mul(h11, fm1));
      desTd = add(add(mul(d00, sub(f0, f1)), mul(d10, fm0)), mul(d11, fm1));
      emisAtm = add(add(add(mul(h00, g0), mul(h10, gm0)), mul(h01, g1)), mul(h11, gm1));
    }
    const lrad = mul(mul(HALF, add(emisAtm, EMIS_SFC)), ta4);
    // Solar loads (zero without solar).
    const sunny = f64x2.gt(sol, ZERO);
    const fdir = sel(f64x2.ge(cz, CZA_MIN), fd, ZERO);
    const beam = f64x2.gt(fdir, ZERO);
    const icz = div(ONE, cz);
    const beamG = sel(beam, mul(fdir, sub(mul(HALF, icz), ONE)), ZERO);
    const tanOverPi = sel(beam, mul(mul(f64x2.sqrt(f64x2.max(ZERO, sub(ONE, mul(cz, cz)))), icz), INV_PI), ZERO);
    const qg = sel(sunny, mul(mul(sol, QG_K), add(add(beamG, ONE), ALB_SFC)), ZERO);
    const qw = sel(sunny, mul(mul(ONE_ALB_WICK, sol), add(add(mul(sub(ONE, fdir), ONE_CAP), mul(fdir, add(tanOverPi, CAP))), ALB_SFC)), ZERO);
    const y = f64x2.sqrt(mul(sel(f64x2.gt(u, MIN_SPEED), u, MIN_SPEED), p));
    const cg = mul(CG, y);
    // (u·P)^0.6 = y^1.2 from POW12_TABLE.
    let y12: v128;
    {
      let uy = mul(y, Y_INV);
      const inT = v128.and(f64x2.ge(uy, S(48)), f64x2.lt(uy, YN1));
      bad = v128.or(bad, v128.not(inT));
      uy = sel(inT, uy, S(48));
      const ki = i32x4.trunc_sat_f64x2_s_zero(uy);
      const t = sub(uy, f64x2.convert_low_i32x4_s(ki));
      const a0 = YT + (<usize>i32x4.extract_lane(ki, 0) << 4);
      const a1 = YT + (<usize>i32x4.extract_lane(ki, 1) << 4);
      const t2 = mul(t, t);
      const t3 = mul(t2, t);
      y12 = add(add(add(
        mul(add(sub(mul(C2, t3), mul(C3, t2)), ONE), pick(a0, a1, 0)),
        mul(add(sub(t3, mul(C2, t2)), t), pick(a0, a1, 8))),
        mul(sub(mul(C3, t2), mul(C2, t3)), pick(a0, a1, 16))),
        mul(sub(t3, t2), pick(a0, a1, 24)));
    }
    const invCw = div(ONE, mul(CW0, y12));
    // The globe's shade guess: h_g and dh_g/dT at T_a (GLOBE_TABLE), quadratic model at Tg = Ta.
    let hg0: v128;
    let dhg0: v128;
    {
      let uu = mul(sub(taK, T0), INV_STEP);
      const inT = v128.and(f64x2.ge(uu, ZERO), f64x2.lt(uu, TN1));
      bad = v128.or(bad, v128.not(inT));
      uu = sel(inT, uu, ZERO);
      const ki = i32x4.trunc_sat_f64x2_s_zero(uu);
      const t = sub(uu, f64x2.convert_low_i32x4_s(ki));
      const a0 = GT + (<usize>i32x4.extract_lane(ki, 0) << 5);
      const a1 = GT + (<usize>i32x4.extract_lane(ki, 1) << 5);
      const t2 = mul(t, t);
      const t3 = mul(t2, t);
      const h00 = add(sub(mul(C2, t3), mul(C3, t2)), ONE);
      const h10 = add(sub(t3, mul(C2, t2)), t);
      const h01 = sub(ONE, h00);
      const h11 = sub(t3, t2);
      const d00 = mul(sub(mul(C6, t2), mul(C6, t)), INV_STEP);
      const d10 = mul(add(sub(mul(C3, t2), mul(C4, t)), ONE), INV_STEP);
      const d11 = mul(sub(mul(C3, t2), mul(C2, t)), INV_STEP);
      const f0 = pick(a0, a1, 0);
      const fm0 = pick(a0, a1, 8);
      const g0 = pick(a0, a1, 16);
      const gm0 = pick(a0, a1, 24);
      const f1 = pick(a0, a1, 32);
      const fm1 = pick(a0, a1, 40);
      const g1 = pick(a0, a1, 48);
      const gm1 = pick(a0, a1, 56);
      const m = add(add(add(mul(h00, f0), mul(h10, fm0)), mul(h01, f1)), mul(h11, fm1));
      const dm = add(add(mul(d00, sub(f0, f1)), mul(d10, fm0)), mul(d11, fm1));
      const r = add(add(add(mul(h00, g0), mul(h10, gm0)), mul(h01, g1)), mul(h11, gm1));
      const dr = add(add(mul(d00, sub(g0, g1)), mul(d10, gm0)), mul(d11, gm1));
      hg0 = add(m, mul(cg, r));
      dhg0 = add(dm, mul(cg, dr));
    }
    const fp0 = add(mul(mul(mul(C4, taK), taK), taK), mul(hg0, INV_EG_SB));
    const fpp0 = add(mul(mul(C12, taK), taK), mul(dhg0, INV_EG_SB));
    const f0 = sub(ta4, lrad);
    const disc0 = sub(mul(fp0, fp0), mul(mul(C2, fpp0), f0));
    const x = add(taK, sel(f64x2.gt(disc0, ZERO), div(mul(CM2, f0), add(fp0, f64x2.sqrt(disc0))), div(f64x2.neg(f0), fp0)));
    put(F_TA, j, ta);
    put(F_TAK, j, taK);
    put(F_TDK, j, tdK);
    put(F_P, j, p);
    put(F_PEA, j, sub(p, ea));
    put(F_EA, j, ea);
    put(F_DESTD, j, desTd);
    put(F_LRAD, j, lrad);
    put(F_QG, j, qg);
    put(F_QW, j, qw);
    put(F_CG, j, cg);
    put(F_INVCW, j, invCw);
    put(F_BAD, j, bad);
    put(F_CLAMP, j, clamp);
    put(F_X, j, x);
  }
}

/**
 * The globe's Newton solve for pass 0 (shade, from the guess in F_X, every good lane) or pass 1
 * (sun, from the sun guess, the lanes with a solar load): the steps of kernel.ts's globe loop,
 * one step of every pair still iterating at a time. Pass 0 ends with the sun guess in F_X.
 */
function globePass(nb: i32, pass: i32, invEgSb: f64): void {
  const T0 = S(K(K_T0));
  const INV_STEP = S(K(K_INV_STEP));
  const TN1 = S(K(K_TN1));
  const tol = S(K(K_TOL));
  const ntol = S(-K(K_TOL));
  const INV_EG_SB = S(invEgSb);
  const ZERO = S(0);
  const ONE = S(1);
  const HALF = S(0.5);
  const C2 = S(2);
  const C3 = S(3);
  const C4 = S(4);
  const C6 = S(6);
  const C12 = S(12);
  const CM2 = S(-2);
  // The pairs with a lane to solve, and each lane's start.
  let m: i32 = 0;
  for (let j: i32 = 0; j < nb; j++) {
    const bad = get(F_BAD, j);
    const active = pass === 0 ? v128.not(bad) : v128.andnot(f64x2.gt(get(F_QG, j), ZERO), bad);
    put(F_ACTIVE, j, active);
    put(F_LEFT, j, active);
    put(F_LO, j, S(-Infinity));
    put(F_HI, j, S(Infinity));
    put(F_ITS, j, ZERO);
    put(F_ROOT, j, get(F_X, j));
    put(F_LOAD, j, pass === 0 ? get(F_LRAD, j) : add(get(F_LRAD, j), get(F_QG, j)));
    store<i32>(LIST + (<usize>m << 2), j);
    m += v128.any_true(active) ? 1 : 0;
  }
  for (let it: i32 = 1; it <= FAST_ITERATIONS && m > 0; it++) {
    const itv = S(<f64>it);
    let m2: i32 = 0;
    for (let k: i32 = 0; k < m; k++) {
      const j = load<i32>(LIST + (<usize>k << 2));
      let x = get(F_X, j);
      let left = get(F_LEFT, j);
      let bad = get(F_BAD, j);
      const taK = get(F_TAK, j);
      const cg = get(F_CG, j);
      const film = mul(HALF, add(x, taK));
      let uu = mul(sub(film, T0), INV_STEP);
      const inT = v128.and(f64x2.ge(uu, ZERO), f64x2.lt(uu, TN1));
      bad = v128.or(bad, v128.andnot(left, inT));
      left = v128.and(left, inT);
      uu = sel(left, uu, ZERO);
      const ki = i32x4.trunc_sat_f64x2_s_zero(uu);
      const t = sub(uu, f64x2.convert_low_i32x4_s(ki));
      const a0 = GT + (<usize>i32x4.extract_lane(ki, 0) << 5);
      const a1 = GT + (<usize>i32x4.extract_lane(ki, 1) << 5);
      const t2 = mul(t, t);
      const t3 = mul(t2, t);
      const h00 = add(sub(mul(C2, t3), mul(C3, t2)), ONE);
      const h10 = add(sub(t3, mul(C2, t2)), t);
      const h01 = sub(ONE, h00);
      const h11 = sub(t3, t2);
      const d00 = mul(sub(mul(C6, t2), mul(C6, t)), INV_STEP);
      const d10 = mul(add(sub(mul(C3, t2), mul(C4, t)), ONE), INV_STEP);
      const d11 = mul(sub(mul(C3, t2), mul(C2, t)), INV_STEP);
      const mf0 = pick(a0, a1, 0);
      const mm0 = pick(a0, a1, 8);
      const rf0 = pick(a0, a1, 16);
      const rm0 = pick(a0, a1, 24);
      const mf1 = pick(a0, a1, 32);
      const mm1 = pick(a0, a1, 40);
      const rf1 = pick(a0, a1, 48);
      const rm1 = pick(a0, a1, 56);
      const mv = add(add(add(mul(h00, mf0), mul(h10, mm0)), mul(h01, mf1)), mul(h11, mm1));
      const dm = add(add(mul(d00, sub(mf0, mf1)), mul(d10, mm0)), mul(d11, mm1));
      const r = add(add(add(mul(h00, rf0), mul(h10, rm0)), mul(h01, rf1)), mul(h11, rm1));
      const dr = add(add(mul(d00, sub(rf0, rf1)), mul(d10, rm0)), mul(d11, rm1));
      const hg = add(mv, mul(cg, r));
      const dhg = add(dm, mul(cg, dr));
      const x2 = mul(x, x);
      const dx = sub(x, taK);
      const f = add(sub(mul(x2, x2), get(F_LOAD, j)), mul(mul(hg, INV_EG_SB), dx));
      const fp = add(mul(mul(C4, x2), x), mul(add(hg, mul(mul(HALF, dhg), dx)), INV_EG_SB));
      const neg = f64x2.lt(f, ZERO);
      const lo_ = sel(neg, x, get(F_LO, j));
      const hi_ = sel(neg, get(F_HI, j), x);
      const xn = sub(x, div(f, fp));
      const newton = v128.and(f64x2.gt(fp, ZERO), v128.and(f64x2.ge(xn, lo_), f64x2.le(xn, hi_)));
      bad = v128.or(bad, v128.andnot(left, newton));
      left = v128.and(left, newton);
      const step = sub(xn, x);
      x = sel(left, xn, x);
      const conv = v128.and(left, v128.and(f64x2.lt(step, tol), f64x2.gt(step, ntol)));
      put(F_ITS, j, sel(conv, itv, get(F_ITS, j)));
      put(F_GSLOPE, j, sel(conv, fp, get(F_GSLOPE, j)));
      put(F_GCURV, j, sel(conv, add(mul(C12, x2), mul(dhg, INV_EG_SB)), get(F_GCURV, j)));
      put(F_ROOT, j, sel(conv, x, get(F_ROOT, j)));
      left = v128.andnot(left, conv);
      put(F_X, j, x);
      put(F_LO, j, lo_);
      put(F_HI, j, hi_);
      put(F_LEFT, j, left);
      put(F_BAD, j, bad);
      store<i32>(LIST + (<usize>m2 << 2), j);
      m2 += v128.any_true(left) ? 1 : 0;
    }
    m = m2;
  }
  for (let j: i32 = 0; j < nb; j++) {
    // Lanes still iterating after the fast steps go back.
    const bad = v128.or(get(F_BAD, j), get(F_LEFT, j));
    put(F_BAD, j, bad);
    const root = get(F_ROOT, j);
    if (pass === 0) {
      put(F_ITGD, j, get(F_ITS, j));
      put(F_TGSHADE, j, root);
      put(F_TGSUN, j, root);
      // Sun guess: a quadratic step off the shade root, then one Newton step on the cubic model.
      const qg = get(F_QG, j);
      const slope = get(F_GSLOPE, j);
      const curv = get(F_GCURV, j);
      const fq = f64x2.neg(qg);
      const disc = sub(mul(slope, slope), mul(mul(C2, curv), fq));
      let d = sel(f64x2.gt(disc, ZERO), div(mul(CM2, fq), add(slope, f64x2.sqrt(disc))), div(f64x2.neg(fq), slope));
      const pc = add(fq, mul(d, add(slope, mul(d, add(mul(HALF, curv), mul(mul(d, C4), root))))));
      const pd = add(slope, mul(d, add(curv, mul(mul(C12, root), d))));
      d = sel(f64x2.gt(pd, ZERO), sub(d, div(pc, pd)), d);
      put(F_X, j, add(root, d));
    } else {
      const active = get(F_ACTIVE, j);
      put(F_ITGS, j, sel(active, get(F_ITS, j), ZERO));
      put(F_TGSUN, j, sel(active, root, get(F_TGSUN, j)));
    }
  }
}

/** The wick's shade guess of each pair (kernel.ts: quadratic + cubic model of G at Tw = Td) into F_X. */
function wickShadeGuess(nb: i32): void {
  const T0 = S(K(K_T0));
  const INV_STEP = S(K(K_INV_STEP));
  const TN1 = S(K(K_TN1));
  const EW_SB = S(K(K_EW_SB));
  const BUCK = S(K(K_BUCK));
  const ZERO = S(0);
  const ONE = S(1);
  const HALF = S(0.5);
  const C1_5 = S(1.5);
  const C2 = S(2);
  const C3 = S(3);
  const C4 = S(4);
  const C6 = S(6);
  const CM2 = S(-2);
  const M4_EW = mul(S(-4), EW_SB);
  const P12_EW = mul(S(12), EW_SB);
  const P24_EW = mul(S(24), EW_SB);
  for (let j: i32 = 0; j < nb; j++) {
    let bad = get(F_BAD, j);
    const tdK = get(F_TDK, j);
    const taK = get(F_TAK, j);
    const pea = get(F_PEA, j);
    const ea = get(F_EA, j);
    const invCw = get(F_INVCW, j);
    const lrad = get(F_LRAD, j);
    const film = mul(HALF, add(tdK, taK));
    let uu = mul(sub(film, T0), INV_STEP);
    const inT = v128.and(f64x2.ge(uu, ZERO), f64x2.lt(uu, TN1));
    bad = v128.or(bad, v128.not(inT));
    uu = sel(inT, uu, ZERO);
    const ki = i32x4.trunc_sat_f64x2_s_zero(uu);
    const t = sub(uu, f64x2.convert_low_i32x4_s(ki));
    const a0 = ZT + (<usize>i32x4.extract_lane(ki, 0) << 5);
    const a1 = ZT + (<usize>i32x4.extract_lane(ki, 1) << 5);
    const t2 = mul(t, t);
    const t3 = mul(t2, t);
    const h00 = add(sub(mul(C2, t3), mul(C3, t2)), ONE);
    const h10 = add(sub(t3, mul(C2, t2)), t);
    const h01 = sub(ONE, h00);
    const h11 = sub(t3, t2);
    const d00 = mul(sub(mul(C6, t2), mul(C6, t)), INV_STEP);
    const d10 = mul(add(sub(mul(C3, t2), mul(C4, t)), ONE), INV_STEP);
    const d11 = mul(sub(mul(C3, t2), mul(C2, t)), INV_STEP);
    const zf0 = pick(a0, a1, 0);
    const zm0 = pick(a0, a1, 8);
    const vf0 = pick(a0, a1, 16);
    const vm0 = pick(a0, a1, 24);
    const zf1 = pick(a0, a1, 32);
    const zm1 = pick(a0, a1, 40);
    const vf1 = pick(a0, a1, 48);
    const vm1 = pick(a0, a1, 56);
    const z = add(add(add(mul(h00, zf0), mul(h10, zm0)), mul(h01, zf1)), mul(h11, zm1));
    const zp = add(add(mul(d00, sub(zf0, zf1)), mul(d10, zm0)), mul(d11, zm1));
    const v = add(add(add(mul(h00, vf0), mul(h10, vm0)), mul(h01, vf1)), mul(h11, vm1));
    const vp = add(add(mul(d00, sub(vf0, vf1)), mul(d10, vm0)), mul(d11, vm1));
    const de = get(F_DESTD, j);
    const l1 = div(de, ea);
    const iw = div(ONE, sub(tdK, BUCK));
    const dde = mul(de, sub(l1, mul(C2, iw)));
    const ddde = mul(de, add(sub(mul(l1, l1), mul(mul(C6, l1), iw)), mul(mul(C6, iw), iw)));
    const iden = div(ONE, pea);
    const dq = mul(de, iden);
    const ddq = mul(add(dde, mul(mul(C2, de), dq)), iden);
    const dddq = mul(add(ddde, mul(mul(C6, dq), add(dde, mul(de, dq)))), iden);
    let g = sub(tdK, taK);
    let gp = add(ONE, mul(z, dq));
    let gpp = add(mul(z, ddq), mul(zp, dq));
    let gppp = add(mul(z, dddq), mul(mul(C1_5, zp), ddq));
    const invHw = mul(invCw, v);
    const dInvHw = mul(mul(HALF, invCw), vp);
    const x2 = mul(tdK, tdK);
    const df = mul(EW_SB, sub(lrad, mul(x2, x2)));
    const ddf = mul(mul(M4_EW, x2), tdK);
    g = sub(g, mul(df, invHw));
    gp = sub(gp, add(mul(ddf, invHw), mul(df, dInvHw)));
    gpp = add(gpp, sub(mul(mul(P12_EW, x2), invHw), mul(mul(C2, ddf), dInvHw)));
    gppp = add(gppp, mul(mul(P24_EW, tdK), invHw));
    const disc = sub(mul(gp, gp), mul(mul(C2, gpp), g));
    let d = sel(f64x2.gt(disc, ZERO), div(mul(CM2, g), add(gp, f64x2.sqrt(disc))), div(f64x2.neg(g), gp));
    const pc = add(g, mul(d, add(gp, mul(d, add(mul(HALF, gpp), mul(d, div(gppp, C6)))))));
    const pd = add(gp, mul(d, add(gpp, mul(mul(HALF, d), gppp))));
    d = sel(f64x2.gt(pd, ZERO), sub(d, div(pc, pd)), d);
    put(F_X, j, sel(v128.and(f64x2.gt(pea, ZERO), f64x2.gt(gp, ZERO)), add(tdK, d), tdK));
    put(F_BAD, j, bad);
  }
}

/**
 * The wick's Newton solve for pass 0 (shade) or pass 1 (sun, with the solar load): the steps of
 * kernel.ts's wet-bulb loop, one step of every pair still iterating at a time. Pass 0 keeps the
 * slope and curvatures at the shade root and ends with the sun guess in F_X.
 */
function wickPass(nb: i32, pass: i32): void {
  const T0 = S(K(K_T0));
  const INV_STEP = S(K(K_INV_STEP));
  const TN1 = S(K(K_TN1));
  const EW_SB = S(K(K_EW_SB));
  const BUCK = S(K(K_BUCK));
  const tol = S(K(K_TOL));
  const ntol = S(-K(K_TOL));
  const ZERO = S(0);
  const ONE = S(1);
  const HALF = S(0.5);
  const C1_5 = S(1.5);
  const C2 = S(2);
  const C3 = S(3);
  const C4 = S(4);
  const C6 = S(6);
  const CM2 = S(-2);
  const M4_EW = mul(S(-4), EW_SB);
  const P12_EW = mul(S(12), EW_SB);
  const P24_EW = mul(S(24), EW_SB);
  let m: i32 = 0;
  for (let j: i32 = 0; j < nb; j++) {
    const bad = get(F_BAD, j);
    const active = pass === 0 ? v128.not(bad) : v128.andnot(f64x2.gt(get(F_QW, j), ZERO), bad);
    put(F_ACTIVE, j, active);
    put(F_LEFT, j, active);
    put(F_LO, j, S(-Infinity));
    put(F_HI, j, S(Infinity));
    put(F_ITS, j, ZERO);
    put(F_ROOT, j, get(F_X, j));
    put(F_LOAD, j, pass === 0 ? ZERO : get(F_QW, j));
    store<i32>(LIST + (<usize>m << 2), j);
    m += v128.any_true(active) ? 1 : 0;
  }
  for (let it: i32 = 1; it <= FAST_ITERATIONS && m > 0; it++) {
    const itv = S(<f64>it);
    let m2: i32 = 0;
    for (let k: i32 = 0; k < m; k++) {
      const j = load<i32>(LIST + (<usize>k << 2));
      let x = get(F_X, j);
      let left = get(F_LEFT, j);
      let bad = get(F_BAD, j);
      const taK = get(F_TAK, j);
      const film = mul(HALF, add(x, taK));
      // e_s(x), e_s'(x): ES_TABLE.
      let ew: v128;
      let dew: v128;
      {
        let uu = mul(sub(x, T0), INV_STEP);
        const inT = v128.and(f64x2.ge(uu, ZERO), f64x2.lt(uu, TN1));
        bad = v128.or(bad, v128.andnot(left, inT));
        left = v128.and(left, inT);
        uu = sel(left, uu, ZERO);
        const ki = i32x4.trunc_sat_f64x2_s_zero(uu);
        const t = sub(uu, f64x2.convert_low_i32x4_s(ki));
        const a0 = ET + (<usize>i32x4.extract_lane(ki, 0) << 4);
        const a1 = ET + (<usize>i32x4.extract_lane(ki, 1) << 4);
        const f0 = pick(a0, a1, 0);
        const m0 = pick(a0, a1, 8);
        const f1 = pick(a0, a1, 16);
        const m1 = pick(a0, a1, 24);
        const t2 = mul(t, t);
        const t3 = mul(t2, t);
        dew = mul(add(add(mul(sub(mul(C6, t2), mul(C6, t)), sub(f0, f1)), mul(add(sub(mul(C3, t2), mul(C4, t)), ONE), m0)), mul(sub(mul(C3, t2), mul(C2, t)), m1)), INV_STEP);
        ew = add(add(add(mul(add(sub(mul(C2, t3), mul(C3, t2)), ONE), f0), mul(add(sub(t3, mul(C2, t2)), t), m0)), mul(add(mul(CM2, t3), mul(C3, t2)), f1)), mul(sub(t3, t2), m1));
      }
      // Z, Z', V, V' at the film temperature: ZV_TABLE.
      let z: v128;
      let zp: v128;
      let v: v128;
      let vp: v128;
      {
        let uu = mul(sub(film, T0), INV_STEP);
        const inT = v128.and(f64x2.ge(uu, ZERO), f64x2.lt(uu, TN1));
        bad = v128.or(bad, v128.andnot(left, inT));
        left = v128.and(left, inT);
        uu = sel(left, uu, ZERO);
        const ki = i32x4.trunc_sat_f64x2_s_zero(uu);
        const t = sub(uu, f64x2.convert_low_i32x4_s(ki));
        const a0 = ZT + (<usize>i32x4.extract_lane(ki, 0) << 5);
        const a1 = ZT + (<usize>i32x4.extract_lane(ki, 1) << 5);
        const t2 = mul(t, t);
        const t3 = mul(t2, t);
        const h00 = add(sub(mul(C2, t3), mul(C3, t2)), ONE);
        const h10 = add(sub(t3, mul(C2, t2)), t);
        const h01 = sub(ONE, h00);
        const h11 = sub(t3, t2);
        const d00 = mul(sub(mul(C6, t2), mul(C6, t)), INV_STEP);
        const d10 = mul(add(sub(mul(C3, t2), mul(C4, t)), ONE), INV_STEP);
        const d11 = mul(sub(mul(C3, t2), mul(C2, t)), INV_STEP);
        const zf0 = pick(a0, a1, 0);
        const zm0 = pick(a0, a1, 8);
        const vf0 = pick(a0, a1, 16);
        const vm0 = pick(a0, a1, 24);
        const zf1 = pick(a0, a1, 32);
        const zm1 = pick(a0, a1, 40);
        const vf1 = pick(a0, a1, 48);
        const vm1 = pick(a0, a1, 56);
        z = add(add(add(mul(h00, zf0), mul(h10, zm0)), mul(h01, zf1)), mul(h11, zm1));
        zp = add(add(mul(d00, sub(zf0, zf1)), mul(d10, zm0)), mul(d11, zm1));
        v = add(add(add(mul(h00, vf0), mul(h10, vm0)), mul(h01, vf1)), mul(h11, vm1));
        vp = add(add(mul(d00, sub(vf0, vf1)), mul(d10, vm0)), mul(d11, vm1));
      }
      const p = get(F_P, j);
      const pea = get(F_PEA, j);
      const invCw = get(F_INVCW, j);
      const den = sub(p, ew);
      // Vapour pressure at or above the surface pressure: the JavaScript kernel's bisection.
      const dpos = f64x2.gt(den, ZERO);
      bad = v128.or(bad, v128.andnot(left, dpos));
      left = v128.and(left, dpos);
      const rden = div(ONE, den);
      const qv = mul(sub(ew, get(F_EA, j)), rden);
      const dq = mul(mul(mul(dew, pea), rden), rden);
      let g = add(sub(x, taK), mul(z, qv));
      let gp = add(add(ONE, mul(mul(HALF, zp), qv)), mul(z, dq));
      const invHw = mul(invCw, v);
      const dInvHw = mul(mul(HALF, invCw), vp);
      const x2 = mul(x, x);
      const df = add(mul(EW_SB, sub(get(F_LRAD, j), mul(x2, x2))), get(F_LOAD, j));
      const ddf = mul(mul(M4_EW, x2), x);
      g = sub(g, mul(df, invHw));
      gp = sub(gp, add(mul(ddf, invHw), mul(df, dInvHw)));
      const neg = f64x2.lt(g, ZERO);
      const lo_ = sel(neg, x, get(F_LO, j));
      const hi_ = sel(neg, get(F_HI, j), x);
      const xn = sub(x, div(g, gp));
      const newton = v128.and(f64x2.gt(gp, ZERO), v128.and(f64x2.ge(xn, lo_), f64x2.le(xn, hi_)));
      bad = v128.or(bad, v128.andnot(left, newton));
      left = v128.and(left, newton);
      const step = sub(xn, x);
      x = sel(left, xn, x);
      const conv = v128.and(left, v128.and(f64x2.lt(step, tol), f64x2.gt(step, ntol)));
      if (v128.any_true(conv)) {
        put(F_ITS, j, sel(conv, itv, get(F_ITS, j)));
        put(F_ROOT, j, sel(conv, x, get(F_ROOT, j)));
        if (pass === 0) {
          // Slope and curvatures at the shade root, for the sun guess.
          put(F_SLOPE0, j, sel(conv, gp, get(F_SLOPE0, j)));
          put(F_INVHW0, j, sel(conv, invHw, get(F_INVHW0, j)));
          put(F_DINVHW0, j, sel(conv, dInvHw, get(F_DINVHW0, j)));
          const de = dew;
          const l1 = div(de, ew);
          const iw = div(ONE, sub(x, BUCK));
          const dde = mul(de, sub(l1, mul(C2, iw)));
          const ddde = mul(de, add(sub(mul(l1, l1), mul(mul(C6, l1), iw)), mul(mul(C6, iw), iw)));
          const pr2 = mul(mul(pea, rden), rden);
          const ddq = mul(pr2, add(dde, mul(mul(mul(C2, de), de), rden)));
          const dddq = mul(pr2, add(ddde, mul(mul(mul(C6, de), rden), add(dde, mul(mul(de, de), rden)))));
          put(F_WCURV, j, sel(conv, add(mul(z, ddq), mul(mul(mul(P12_EW, x), x), invHw)), get(F_WCURV, j)));
          put(F_WCURV3, j, sel(conv, add(add(mul(z, dddq), mul(mul(C1_5, zp), ddq)), mul(mul(P24_EW, x), invHw)), get(F_WCURV3, j)));
        }
        left = v128.andnot(left, conv);
      }
      put(F_X, j, x);
      put(F_LO, j, lo_);
      put(F_HI, j, hi_);
      put(F_LEFT, j, left);
      put(F_BAD, j, bad);
      store<i32>(LIST + (<usize>m2 << 2), j);
      m2 += v128.any_true(left) ? 1 : 0;
    }
    m = m2;
  }
  for (let j: i32 = 0; j < nb; j++) {
    const bad = v128.or(get(F_BAD, j), get(F_LEFT, j));
    put(F_BAD, j, bad);
    const root = get(F_ROOT, j);
    if (pass === 0) {
      put(F_ITWD, j, get(F_ITS, j));
      put(F_TWSHADE, j, root);
      put(F_TWSUN, j, root);
      // Sun guess from the shade root with the solar load (wetBulbGuessFromShade).
      const load = get(F_QW, j);
      const slope0 = get(F_SLOPE0, j);
      const curv = get(F_WCURV, j);
      const curv3 = get(F_WCURV3, j);
      const gps = sub(slope0, mul(load, get(F_DINVHW0, j)));
      const gs = mul(f64x2.neg(load), get(F_INVHW0, j));
      const fp = sel(f64x2.gt(gps, ZERO), gps, slope0);
      const disc = sub(mul(fp, fp), mul(mul(C2, curv), gs));
      let d = sel(f64x2.gt(disc, ZERO), div(mul(CM2, gs), add(fp, f64x2.sqrt(disc))), div(f64x2.neg(gs), fp));
      const pc = add(gs, mul(d, add(fp, mul(d, add(mul(HALF, curv), mul(d, div(curv3, C6)))))));
      const pd = add(fp, mul(d, add(curv, mul(mul(HALF, d), curv3))));
      d = sel(f64x2.gt(pd, ZERO), sub(d, div(pc, pd)), d);
      put(F_X, j, add(root, d));
    } else {
      const active = get(F_ACTIVE, j);
      put(F_ITWS, j, sel(active, get(F_ITS, j), ZERO));
      put(F_TWSUN, j, sel(active, root, get(F_TWSUN, j)));
    }
  }
}

/** Outputs, flags and counts of the block. */
function finish(nb: i32, b: i32): void {
  const fcap = FCAP;
  const pOut = P_OUT;
  const pCounts = P_COUNTS;
  const out32 = OUT32;
  const pOut32 = P_OUT32;
  const fcap4 = fcap >> 1;
  let handedBack: i32 = 0;
  const KELVIN = S(K(K_KELVIN));
  const ZERO = S(0);
  const C0_7 = S(0.7);
  const C0_2 = S(0.2);
  const C0_1 = S(0.1);
  let ok: i32 = 0;
  let clamped: i32 = 0;
  let itGs = ZERO;
  let itWs = ZERO;
  let itGd = ZERO;
  let itWd = ZERO;
  for (let j: i32 = 0; j < nb; j++) {
    const q = <usize>(b + j) << 4;
    const ta = get(F_TA, j);
    const gS = sub(get(F_TGSUN, j), KELVIN);
    const wS = sub(get(F_TWSUN, j), KELVIN);
    const gD = sub(get(F_TGSHADE, j), KELVIN);
    const wD = sub(get(F_TWSHADE, j), KELVIN);
    const wbgtS = add(add(mul(C0_7, wS), mul(C0_2, gS)), mul(C0_1, ta));
    const wbgtD = add(add(mul(C0_7, wD), mul(C0_2, gD)), mul(C0_1, ta));
    if (out32) {
      // Rounded to single precision as a Float32Array store rounds (to nearest, ties to even).
      const q4 = q >> 1;
      v128.store64_lane(pOut32 + q4, f32x4.demote_f64x2_zero(wbgtS), 0);
      v128.store64_lane(pOut32 + fcap4 + q4, f32x4.demote_f64x2_zero(wbgtD), 0);
      v128.store64_lane(pOut32 + 2 * fcap4 + q4, f32x4.demote_f64x2_zero(gS), 0);
      v128.store64_lane(pOut32 + 3 * fcap4 + q4, f32x4.demote_f64x2_zero(wS), 0);
      v128.store64_lane(pOut32 + 4 * fcap4 + q4, f32x4.demote_f64x2_zero(gD), 0);
      v128.store64_lane(pOut32 + 5 * fcap4 + q4, f32x4.demote_f64x2_zero(wD), 0);
    } else {
      v128.store(pOut + q, wbgtS);
      v128.store(pOut + fcap + q, wbgtD);
      v128.store(pOut + 2 * fcap + q, gS);
      v128.store(pOut + 3 * fcap + q, wS);
      v128.store(pOut + 4 * fcap + q, gD);
      v128.store(pOut + 5 * fcap + q, wD);
    }
    const bad = get(F_BAD, j);
    const bits = i64x2.bitmask(bad);
    store<u16>(P_FLAGS + (q >> 3), <u16>((bits & 1) | ((bits & 2) << 7)));
    handedBack += <i32>popcnt<i32>(bits);
    const good = v128.not(bad);
    ok += lanes(good);
    clamped += lanes(v128.and(get(F_CLAMP, j), good));
    itGd = add(itGd, sel(good, get(F_ITGD, j), ZERO));
    itGs = add(itGs, sel(good, get(F_ITGS, j), ZERO));
    itWd = add(itWd, sel(good, get(F_ITWD, j), ZERO));
    itWs = add(itWs, sel(good, get(F_ITWS, j), ZERO));
  }
  HANDED_BACK += handedBack;
  store<f64>(pCounts, load<f64>(pCounts) + <f64>ok);
  store<f64>(pCounts + 8, load<f64>(pCounts + 8) + <f64>clamped);
  store<f64>(pCounts + 16, load<f64>(pCounts + 16) + f64x2.extract_lane(itGs, 0) + f64x2.extract_lane(itGs, 1));
  store<f64>(pCounts + 24, load<f64>(pCounts + 24) + f64x2.extract_lane(itWs, 0) + f64x2.extract_lane(itWs, 1));
  store<f64>(pCounts + 32, load<f64>(pCounts + 32) + f64x2.extract_lane(itGd, 0) + f64x2.extract_lane(itGd, 1));
  store<f64>(pCounts + 40, load<f64>(pCounts + 40) + f64x2.extract_lane(itWd, 0) + f64x2.extract_lane(itWd, 1));
}

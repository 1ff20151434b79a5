/**
 * The seeded, stratified physics states of the kernel tests (test/physics/kernel-vs-solver.test.ts,
 * test/physics/wasm-kernel.test.ts): every eighth state an edge case (night, calm air, saturated
 * or supersaturated air, extreme sun, twilight, very dry heat). Invented inputs, for tests only.
 */

/** Seeded uniform numbers (mulberry32), so the states are the same on every run. */
export function rng(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = Math.imul(a ^ (a >>> 15), a | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

export interface State {
  ta: number;
  td: number;
  p: number;
  u: number;
  sol: number;
  cz: number;
  fd: number;
}

/** One state of a stratum: `kind` picks the edge case. */
export function state(r: () => number, kind: number): State {
  const ta = -35 + 93 * r();
  let td = ta - 40 * r() * r();
  let u = 0.1 + 12 * r();
  let sol = r() < 0.3 ? 0 : 1100 * r();
  let cz = 0.01 + 0.99 * r();
  let fd = 0.9 * r();
  const p = 320 + 770 * r();
  switch (kind) {
    case 0: // night: no sun, the cosine below the horizon
      sol = 0;
      cz = -0.9 * r();
      fd = 0;
      break;
    case 1: // calm: at and below the 0.13 m/s floor
      u = 0.13 * r() * 1.5;
      break;
    case 2: // saturated air (dew point at the air temperature), and above it (clamped)
      td = r() < 0.5 ? ta : ta + 2 * r();
      break;
    case 3: // extreme radiation: the accepted maximum, low sun, all beam
      sol = 1500 - 300 * r();
      cz = r() < 0.5 ? 0.00873 + 0.05 * r() : 0.95 + 0.05 * r();
      fd = 0.9 + 0.1 * r();
      break;
    case 4: // twilight: positive solar with the sun down (kept, all diffuse)
      sol = 40 * r();
      cz = -0.02 + 0.028 * r();
      break;
    case 5: // very dry and hot
      td = ta - 35 - 30 * r();
      break;
    default:
      break;
  }
  if (td < -89) td = -89;
  return { ta, td, p, u, sol, cz, fd };
}

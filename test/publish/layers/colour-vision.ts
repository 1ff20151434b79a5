/**
 * Test-only colour science, written from the published formulas, apart from the code under test:
 * - sRGB ↔ linear RGB and linear RGB → XYZ (D65): IEC 61966-2-1:1999 (sRGB);
 * - XYZ → CIELAB and ΔE*ab (CIE 1976): CIE 15:2004;
 * - simulated protanopia, deuteranopia, tritanopia (severity 1.0, applied to linear RGB):
 *   Machado, Oliveira & Fernandes (2009), IEEE TVCG 15(6):1291–1298, Table 1 (matrices from memory).
 */
export type Rgb3 = [number, number, number];

const toLinear = (c: number) => {
  const v = c / 255;
  return v <= 0.04045 ? v / 12.92 : ((v + 0.055) / 1.055) ** 2.4;
};
const fromLinear = (v: number) => 255 * (v <= 0.0031308 ? 12.92 * v : 1.055 * v ** (1 / 2.4) - 0.055);

export const DEFICIENCIES: Record<string, number[][]> = {
  protanopia: [
    [0.152286, 1.052583, -0.204868],
    [0.114503, 0.786281, 0.099216],
    [-0.003882, -0.048116, 1.051998],
  ],
  deuteranopia: [
    [0.367322, 0.860646, -0.227968],
    [0.280085, 0.672501, 0.047413],
    [-0.01182, 0.04294, 0.968881],
  ],
  tritanopia: [
    [1.255528, -0.076749, -0.178779],
    [-0.078411, 0.930809, 0.147602],
    [0.004733, 0.691367, 0.3039],
  ],
};

/** The colour as seen with a deficiency (sRGB bytes in and out). */
export function simulate(m: number[][], c: Rgb3): Rgb3 {
  const l = c.map(toLinear);
  return m.map((row) => fromLinear(Math.min(1, Math.max(0, row[0] * l[0] + row[1] * l[1] + row[2] * l[2])))) as Rgb3;
}

/** CIELAB (D65 white) of an sRGB colour. */
export function lab(c: Rgb3): Rgb3 {
  const [r, g, b] = c.map(toLinear);
  const x = 0.4124 * r + 0.3576 * g + 0.1805 * b;
  const y = 0.2126 * r + 0.7152 * g + 0.0722 * b;
  const z = 0.0193 * r + 0.1192 * g + 0.9505 * b;
  const f = (t: number) => (t > 216 / 24389 ? Math.cbrt(t) : ((24389 / 27) * t + 16) / 116);
  const fx = f(x / 0.95047);
  const fy = f(y);
  const fz = f(z / 1.08883);
  return [116 * fy - 16, 500 * (fx - fy), 200 * (fy - fz)];
}

/** CIE 1976 colour difference ΔE*ab. */
export function deltaE(a: Rgb3, b: Rgb3): number {
  const p = lab(a);
  const q = lab(b);
  return Math.hypot(p[0] - q[0], p[1] - q[1], p[2] - q[2]);
}

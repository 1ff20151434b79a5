/** Numbers as SVG attributes and data attributes: rounded, so build-time SVG stays small. Pure. */

/** A coordinate [px] to 0.1 px. */
export function px(v: number): string {
  return String(Math.round(v * 10) / 10);
}

/** A value for a data attribute, to `digits` decimals (default 3); '' when not finite (±Infinity kept). */
export function dataNumber(v: number, digits = 3): string {
  if (v === Infinity || v === -Infinity) return String(v);
  if (!Number.isFinite(v)) return '';
  const f = 10 ** digits;
  return String(Math.round(v * f) / f);
}

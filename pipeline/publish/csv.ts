/** Minimal CSV writing (RFC 4180): fields with a comma, quote or line break are quoted. */

export function csvField(v: string | number | undefined | null): string {
  if (v === undefined || v === null) return '';
  if (typeof v === 'number') return Number.isFinite(v) ? String(v) : '';
  return /[",\r\n]/.test(v) ? `"${v.replace(/"/g, '""')}"` : v;
}

export function csvLine(fields: ReadonlyArray<string | number | undefined | null>): string {
  return fields.map(csvField).join(',') + '\n';
}

/** Rounds to `digits` decimals and drops trailing zeros; NaN stays NaN (written empty). */
export function roundTo(v: number, digits: number): number {
  if (!Number.isFinite(v)) return NaN;
  const f = 10 ** digits;
  return Math.round(v * f) / f;
}

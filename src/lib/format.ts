/**
 * Number and date formatting for pages: fixed, locale-independent, with a true minus sign, so
 * what a reader sees is also what a test can parse back.
 */

const MINUS = '\u2212';

/** `x` with `digits` decimals (trailing zeros kept), U+2212 for negatives, "–" when not finite. */
export function formatFixed(x: number, digits: number): string {
  if (!Number.isFinite(x)) return '–';
  const s = x.toFixed(digits);
  return s.startsWith('-') ? (/^-0(\.0+)?$/.test(s) ? s.slice(1) : MINUS + s.slice(1)) : s;
}

/** A decoded value [any unit]: 2 decimals below 100 in magnitude, 1 decimal up to 10 000, else none. */
export function formatValue(x: number): string {
  const a = Math.abs(x);
  return formatFixed(x, a < 100 ? 2 : a < 10000 ? 1 : 0);
}

/** An integer with thin-space thousands separators (U+2009), e.g. 26 280. */
export function formatCount(n: number): string {
  const s = String(Math.round(Math.abs(n)));
  const grouped = s.replace(/\B(?=(\d{3})+(?!\d))/g, '\u2009');
  return n < 0 ? MINUS + grouped : grouped;
}

/** A byte count for people [B, kB, MB, GB; powers of 1000]. */
export function formatBytes(bytes: number): string {
  const units = ['B', 'kB', 'MB', 'GB', 'TB'];
  let v = bytes;
  let i = 0;
  while (v >= 1000 && i < units.length - 1) {
    v /= 1000;
    i += 1;
  }
  return i === 0 ? `${bytes} B` : `${v.toFixed(v < 10 ? 2 : 1)} ${units[i]}`;
}

/** Latitude [° N] as "12.50° N" / "3.25° S". */
export function formatLat(lat: number, digits = 2): string {
  return `${Math.abs(lat).toFixed(digits)}° ${lat < 0 ? 'S' : 'N'}`;
}

/** Longitude [° E] as "60.00° E" / "12.75° W". */
export function formatLon(lon: number, digits = 2): string {
  return `${Math.abs(lon).toFixed(digits)}° ${lon < 0 ? 'W' : 'E'}`;
}

/** An ISO 8601 instant as "2021-01-01 01:00 UTC". */
export function formatUtc(iso: string): string {
  const d = new Date(iso);
  if (Number.isNaN(d.getTime())) return iso;
  return `${d.toISOString().slice(0, 16).replace('T', ' ')} UTC`;
}

/** Canonical unit strings (CF style) as people read them: `degC` → °C, `W m-2` → W/m². */
export function formatUnits(units: string): string {
  const table: Record<string, string> = { degC: '°C', K: 'K', hPa: 'hPa', Pa: 'Pa', 'm s-1': 'm/s', 'W m-2': 'W/m²', '1': '1 (fraction)' };
  return table[units] ?? units;
}

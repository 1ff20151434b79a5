/**
 * The coverage report (coverage.ts) as text: a year × month table per group of variables that
 * share their coverage, then every gap, duplicate, ERA5T run and file on another grid; and the
 * problems that stop a build.
 */
import { basename } from 'node:path';
import type { CoverageReport, VariableCoverage } from './coverage.ts';
import { parseMemberPath } from './zip-archive.ts';

const MONTHS = ['Jan', 'Feb', 'Mar', 'Apr', 'May', 'Jun', 'Jul', 'Aug', 'Sep', 'Oct', 'Nov', 'Dec'];

/**
 * One cell of the table: `ok` when every hour of the month is there once; otherwise `✗` and the
 * hours present; `T` when some are preliminary ERA5T, `D` when some are in two files.
 */
export function monthCell(m: { expected: number; present: number; preliminary: number; duplicated: number }): string {
  const base = m.present === m.expected ? 'ok' : `✗${m.present}`;
  return base + (m.preliminary > 0 ? 'T' : '') + (m.duplicated > 0 ? 'D' : '');
}

/** A file's short name: its base name, or `archive.zip!/member` for an archive member. */
function name(p: string | null): string {
  if (p === null) return 'none';
  const ref = parseMemberPath(p);
  return ref ? `${basename(ref.archive)}!/${ref.member}` : basename(p);
}

/** The report as lines of text. */
export function formatCoverage(r: CoverageReport): string {
  const lines: string[] = [];
  const g = r.grid;
  lines.push(`${r.files.length} file(s)` + (g ? `, grid ${g.lat} × ${g.lon} points, spacing ${Math.abs(g.dLat)}° × ${Math.abs(g.dLon)}°` : ''));
  if (!r.years) {
    lines.push('no time-varying ERA5 variable in these files');
    return lines.join('\n');
  }
  lines.push(`years ${r.years[0]}–${r.years[1]}; an hour is named by its stamp (end of the hour, UTC) and counted in the month it starts in`);
  // Variables with identical tables share one.
  const groups = new Map<string, VariableCoverage[]>();
  for (const v of r.variables) {
    const key = v.months.map(monthCell).join(',');
    const list = groups.get(key);
    if (list) list.push(v);
    else groups.set(key, [v]);
  }
  for (const vs of groups.values()) {
    lines.push('');
    lines.push(`${vs.map((v) => v.variable).join(', ')}: hours present by month (ok: all, ✗n: only n hours, T: some preliminary ERA5T, D: some in two files)`);
    lines.push(['year', ...MONTHS].map((s, i) => (i === 0 ? s.padEnd(6) : s.padStart(7))).join(''));
    const v = vs[0];
    for (let y = r.years[0]; y <= r.years[1]; y++) {
      const row = v.months.filter((m) => m.year === y);
      lines.push([String(y).padEnd(6), ...row.map((m) => monthCell(m).padStart(7))].join(''));
    }
  }
  // One line per finding; variables with the same finding share it.
  const findings = new Map<string, string[]>();
  const add = (variable: string, mark: string, text: string) => {
    const key = `${mark}\0${text}`;
    const list = findings.get(key);
    if (list) list.push(variable);
    else findings.set(key, [variable]);
  };
  for (const v of r.variables) {
    for (const gap of v.gaps) {
      add(
        v.variable,
        '✗',
        `missing ${gap.hours} h, stamps ${gap.from} to ${gap.to}, between ${name(gap.before)} and ${name(gap.after)}; they would be in the download(s) of ${gap.months.join(', ')}`,
      );
    }
    for (const d of v.duplicates) {
      add(
        v.variable,
        '✗',
        `${d.hours} h in two files with the same expver, stamps ${d.from} to ${d.to}: ${name(d.files[0])} and ${name(d.files[1])}; ` +
          (d.differing > 0
            ? `values differ in ${d.differing} of them (largest difference ${round(d.maxDifference)} in the file's units)`
            : 'values agree (within one packing step)'),
      );
    }
    for (const t of v.era5t) {
      add(
        v.variable,
        'T',
        `${t.hours} h preliminary ERA5T (expver 5), stamps ${t.from} to ${t.to}, in ${t.files.map(name).join(', ')}; replace them with final ERA5 when it is published (about 2–3 months later, from memory of the data store's release notes)`,
      );
    }
  }
  if (findings.size > 0) lines.push('');
  for (const [key, vars] of findings) {
    const [mark, text] = key.split('\0');
    lines.push(`${mark} ${vars.join(', ')}: ${text}`);
  }
  for (const o of r.otherGrid)
    lines.push(
      `✗ ${name(o.file)} is on another grid (${o.grid.lat} × ${o.grid.lon} points, spacing ${Math.abs(o.grid.dLat)}°): ${o.detail}; another product (ERA5-Land is 0.1°, ERA5 0.25°) or area? left out of the table`,
    );
  return lines.join('\n');
}

function round(x: number): string {
  return String(Math.round(x * 1e4) / 1e4);
}

/**
 * What stops a build: per variable, missing hours of the built years beyond `maxMissing` (per
 * year and variable), duplicated hours, files on another grid. One line each.
 */
export function coverageProblems(r: CoverageReport, maxMissing: number): string[] {
  const out: string[] = [];
  for (const v of r.variables) {
    const perYear = new Map<number, number>();
    for (const m of v.months) perYear.set(m.year, (perYear.get(m.year) ?? 0) + (m.expected - m.present));
    const over = [...perYear].filter(([, n]) => n > maxMissing);
    if (over.length > 0) {
      const years = new Set(over.map(([y]) => y));
      for (const gap of v.gaps) {
        const y = new Date(Date.parse(gap.from) - 3_600_000).getUTCFullYear();
        const y2 = new Date(Date.parse(gap.to) - 3_600_000).getUTCFullYear();
        if (!years.has(y) && !years.has(y2)) continue;
        out.push(
          `${v.variable}: ${gap.hours} h missing, stamps ${gap.from} to ${gap.to} (between ${name(gap.before)} and ${name(gap.after)}; the download(s) of ${gap.months.join(', ')} would hold them)`,
        );
      }
    }
    for (const d of v.duplicates) {
      out.push(
        `${v.variable}: ${d.hours} h twice with the same expver, stamps ${d.from} to ${d.to}, in ${name(d.files[0])} and ${name(d.files[1])}` +
          (d.differing > 0 ? ` (values differ in ${d.differing} h)` : ' (same values)'),
      );
    }
  }
  for (const o of r.otherGrid) out.push(`${name(o.file)} is on another grid: ${o.detail}`);
  return out;
}

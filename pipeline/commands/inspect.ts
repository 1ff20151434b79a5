/** `heathours inspect FILE... [--json]`: what is in NetCDF files, decoded (pipeline/read/inspect.ts). */
import type { Command } from 'commander';
import type { FileInspection } from '../read/index.ts';
import { startProgress } from '../model/progress.ts';

function fmt(x: number | null): string {
  if (x === null) return '-';
  if (Math.abs(x) >= 1e6 || (Math.abs(x) < 1e-3 && x !== 0)) return x.toExponential(4);
  return String(Math.round(x * 10000) / 10000);
}

/** Plain-text report of one file. */
export function formatInspection(r: FileInspection): string {
  const lines = [`${r.path}`, `  format ${r.format}, layout ${r.layout}, ${r.bytes} bytes`];
  lines.push(`  dimensions: ${r.dimensions.map((d) => `${d.name}=${d.size}${d.unlimited ? ' (unlimited)' : ''}`).join(', ')}`);
  for (const t of r.timeAxes) {
    lines.push(
      t.problem
        ? `  time ${t.variable} (${t.count} steps, units "${t.units ?? ''}"): could not be decoded: ${t.problem.message} [${t.problem.code}]`
        : `  time ${t.variable} (${t.count} steps): ${t.start} … ${t.end}`,
    );
  }
  lines.push('  variables:');
  for (const v of r.variables) {
    lines.push(
      `    ${v.name}(${v.dims.join(', ')}) shape [${v.shape.join(', ')}] ${v.type} units "${v.units ?? ''}" role ${v.role}${v.era5 ? ` (${v.era5})` : ''}` +
        (v.min !== null ? `: min ${fmt(v.min)} max ${fmt(v.max)} mean ${fmt(v.mean)}` : '') +
        `, ${v.fillCount} missing of ${v.count}`,
    );
    for (const p of v.problems) lines.push(`      problem [${p.code}]: ${p.message}`);
  }
  return lines.join('\n');
}

export function register(program: Command): void {
  program
    .command('inspect')
    .description('per variable of each NetCDF file: dims, shape, units, detected role, decoded min/max/mean, fill count; time range')
    .argument('<files...>', 'NetCDF files (classic, 64-bit offset or NetCDF-4)')
    .option('--json', 'one JSON object per file')
    .action(async (files: string[], opts: { json?: boolean }) => {
      const { inspectFile } = await import('../read/index.ts');
      const progress = startProgress('inspect', files.length, { quiet: files.length < 3 || opts.json === true, unit: 'files' });
      for (const f of files) {
        const r = await inspectFile(f);
        process.stdout.write(opts.json ? `${JSON.stringify(r)}\n` : `${formatInspection(r)}\n`);
        progress.tick();
      }
      progress.done();
    });
}

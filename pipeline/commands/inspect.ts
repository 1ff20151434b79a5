/**
 * `heathours inspect FILE|DIR... [--json]`: what is in NetCDF files, decoded (pipeline/read/inspect.ts);
 * with `--coverage`, which hours the files hold as one dataset (pipeline/read/coverage.ts).
 */
import type { Command } from 'commander';
import type { FileInspection } from '../read/index.ts';
import { closeSync, existsSync, openSync, readdirSync, readSync, statSync } from 'node:fs';
import { join } from 'node:path';
import { startProgress } from '../model/progress.ts';
import { UsageError } from '../model/errors.ts';
import { hasHdf5Signature } from '../read/hdf5-struct.ts';

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

/** Whether a folder is a Zarr store: named `*.zarr`, or holding a store's root metadata. */
function isZarrFolder(a: string): boolean {
  return /\.zarr\/?$/i.test(a) || ['.zgroup', '.zmetadata', 'zarr.json'].some((m) => existsSync(join(a, m)));
}

/**
 * Folders stand for their NetCDF files, ZIP archives and `*.zarr` stores (not recursive), sorted;
 * a folder that is a Zarr store, files and URLs pass as they are.
 */
export function expandInputArgs(args: string[]): string[] {
  const out: string[] = [];
  for (const a of args) {
    if (existsSync(a) && statSync(a).isDirectory() && !isZarrFolder(a)) {
      out.push(
        ...readdirSync(a)
          .filter((f) => /\.(nc|nc4|cdf|netcdf|zip|zarr)$/i.test(f))
          .sort()
          .map((f) => join(a, f)),
      );
    } else out.push(a);
  }
  return out;
}

/** Whether a path is a local file that starts with the HDF5 signature (NetCDF-4). */
function isHdf5File(path: string): boolean {
  let fd: number | undefined;
  try {
    fd = openSync(path, 'r');
    const head = Buffer.alloc(8);
    return readSync(fd, head, 0, 8, 0) === 8 && hasHdf5Signature(head);
  } catch {
    return false; // not a local file: the readers say what it is
  } finally {
    if (fd !== undefined) closeSync(fd);
  }
}

export function register(program: Command): void {
  program
    .command('inspect')
    .description(
      'per variable of each NetCDF file: dims, shape, units, detected role, decoded min/max/mean, fill count; time range. With --coverage: which hours of which years the files hold, gaps, duplicates, ERA5T, other grids',
    )
    .argument(
      '<paths...>',
      'NetCDF files (classic, 64-bit offset or NetCDF-4), ZIP archives of them (--coverage), Zarr stores (folders or HTTP(S) URLs), or folders holding them',
    )
    .option('--json', 'one JSON object per file (with --coverage: the coverage report)')
    .option(
      '--coverage',
      'the coverage check of the files as one dataset: hours present per variable by year and month, gaps, duplicates, ERA5T tail, files on another grid',
    )
    .option('--years <first-last>', "with --coverage: the years the table must cover, e.g. 2020-2023 (default: the data's)")
    .action(async (paths: string[], opts: { json?: boolean; coverage?: boolean; years?: string }) => {
      const files = expandInputArgs(paths);
      if (opts.coverage) {
        const { checkCoverage } = await import('../read/coverage.ts');
        const { formatCoverage } = await import('../read/coverage-text.ts');
        let years: [number, number] | undefined;
        if (opts.years !== undefined) {
          const m = /^\s*(\d{4})\s*(?:-\s*(\d{4}))?\s*$/.exec(opts.years);
          if (!m || Number(m[2] ?? m[1]) < Number(m[1]))
            throw UsageError({ message: `--years ${opts.years} is not a year or a range of years`, hint: 'e.g. --years 2020-2023' });
          years = [Number(m[1]), Number(m[2] ?? m[1])];
        }
        const r = await checkCoverage(files, { years });
        process.stdout.write(opts.json ? `${JSON.stringify(r)}\n` : `${formatCoverage(r)}\n`);
        return;
      }
      // NetCDF-4 files are described in JavaScript (hdf5-js-describe.ts), the HDF5 library's
      // worker started only for a file that reader declines. When it is turned off
      // (HEATHOURS_NETCDF4_JSMETA=0), the worker starts while the readers load.
      if (process.env.HEATHOURS_NETCDF4_JSMETA === '0' && files.some(isHdf5File)) (await import('../read/hdf5-meta.ts')).startHdf5Metadata();
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

/**
 * `heathours demo-data --out DIR [--years 2020-2024] [--layout mixed] [--grid default] [--seed N]`:
 * writes the invented demo dataset (pipeline/demo/) and says which files it wrote.
 */
import type { Command } from 'commander';
import { statSync } from 'node:fs';
import { DEFAULT_SEED, type DemoGridChoice, type DemoLayout, DEMO_LAYOUTS } from '../demo/choices.ts';
import { UsageError } from '../model/errors.ts';
import { DemoGridInvalid, DemoLayoutUnknown, DemoSeedInvalid, DemoYearsInvalid } from '../demo/errors.ts';

/** Parses "2020-2024", "2025" or "2020,2022" into years. */
export function parseYears(text: string): number[] {
  const years: number[] = [];
  for (const part of text.split(',')) {
    const m = /^\s*(\d{1,4})\s*(?:-\s*(\d{1,4})\s*)?$/.exec(part);
    if (!m) throw DemoYearsInvalid({ text }, { key: '--years' });
    const a = Number(m[1]);
    const b = m[2] === undefined ? a : Number(m[2]);
    if (b < a || b - a > 200) throw DemoYearsInvalid({ text }, { key: '--years' });
    for (let y = a; y <= b; y++) years.push(y);
  }
  return years;
}

function parseLayout(text: string): DemoLayout {
  if (!(DEMO_LAYOUTS as readonly string[]).includes(text)) throw DemoLayoutUnknown({ layout: text }, { key: '--layout' });
  return text as DemoLayout;
}

/** `default`, `small`, `country`, or a size `NLATxNLON@RESOLUTION` (e.g. `300x300@0.1`). */
export function parseGrid(text: string): DemoGridChoice {
  if (text === 'small' || text === 'default' || text === 'country') return text;
  const m = /^(\d{1,4})x(\d{1,4})@(\d+(?:\.\d+)?)$/.exec(text.trim());
  if (m) return { nLat: Number(m[1]), nLon: Number(m[2]), resolution: Number(m[3]) };
  throw DemoGridInvalid({ grid: text }, { key: '--grid' });
}

function parseSeed(text: string): number {
  if (!/^\d{1,10}$/.test(text) || Number(text) > 2147483647) throw DemoSeedInvalid({ seed: text }, { key: '--seed' });
  return Number(text);
}

function parseJobs(text: string): number {
  if (!/^\d{1,3}$/.test(text) || Number(text) < 1)
    throw UsageError(
      { message: `--jobs "${text}" is not a whole number from 1`, hint: 'pass --jobs 1 to write the years one after another, or the number of cores to use' },
      { key: '--jobs' },
    );
  return Number(text);
}

export function register(program: Command): void {
  program
    .command('demo-data')
    .description(
      'write the invented demo dataset: synthetic ERA5-style NetCDF for an invented territory (no real place or data), and invented change factors for its +1.5 and +2 °C scenarios (scenarios/)',
    )
    .requiredOption('--out <dir>', 'output folder (created if missing)')
    .option('--years <years>', 'years to write: a range 2020-2024, one year 2025, or a list 2020,2022', '2020-2024')
    .option('--layout <layout>', 'legacy (NetCDF-3, packed int16) | netcdf4 (NetCDF-4, float32) | mixed (legacy to 2022, NetCDF-4 after)', 'mixed')
    .option(
      '--grid <grid>',
      'default (32 × 34 cells at 0.25°) | small (8 × 10 cells at 1°) | country (160 × 160 cells at 0.1°, for scale runs without a land-sea mask) | NLATxNLON@RES, e.g. 300x300@0.1',
      'default',
    )
    .option('--seed <n>', 'random seed; the same seed gives the same bytes', String(DEFAULT_SEED))
    .option('--jobs <n>', 'years written at once, each in a worker thread (default: number of cores)')
    .option('--quiet', 'no progress output')
    .action(async (opts: { out: string; years: string; layout: string; grid: string; seed: string; jobs?: string; quiet?: boolean }) => {
      const t0 = Date.now();
      const years = parseYears(opts.years);
      const layout = parseLayout(opts.layout);
      const grid = parseGrid(opts.grid);
      const seed = parseSeed(opts.seed);
      const jobs = opts.jobs === undefined ? undefined : parseJobs(opts.jobs);
      const { writeDemoDataset } = await import('../demo/index.ts');
      const { files, changeFactors, unchanged } = await writeDemoDataset({ outDir: opts.out, years, layout, grid, seed, quiet: opts.quiet, jobs });
      for (const f of files) process.stdout.write(`wrote ${f} (${(statSync(f).size / 1e6).toFixed(1)} MB)\n`);
      for (const f of changeFactors) process.stdout.write(`wrote ${f} (invented change factors for a scenario, ${(statSync(f).size / 1e3).toFixed(0)} kB)\n`);
      for (const f of unchanged) process.stdout.write(`unchanged ${f}\n`);
      process.stdout.write(
        `invented demo data: ${files.length + changeFactors.length} file(s) written in ${((Date.now() - t0) / 1000).toFixed(1)} s (seed ${seed}, layout ${layout})\n`,
      );
    });
}

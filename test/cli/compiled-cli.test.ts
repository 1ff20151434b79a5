/**
 * The shipped command: bin/heathours.mjs running the JavaScript that `npm run compile`
 * (scripts/compile.ts, run by `npm ci` through `prepare`) writes to compiled/. This file compiles
 * first, so it tests the sources as they are now, then runs the command as a user would: help
 * and version, `inspect` against netCDF-C (Debian's python3-netcdf4), a small build on worker
 * threads compared byte for byte with the build from the TypeScript sources, standard
 * input/output for `point`, exit statuses and a reader that closes the pipe.
 * Inputs are made here with Debian's ncgen and the invented demo generator (pipeline/demo).
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { spawn, spawnSync } from 'node:child_process';
import { copyFileSync, existsSync, mkdirSync, readdirSync, readFileSync, statSync, utimesSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { CLI_COMPILED, ROOT } from '../helpers/cli.ts';
import { tempDir, writeFixture } from '../fixtures/read/era5-cdl.ts';
import { inspectFile } from '../../pipeline/read/index.ts';
import { buildAtlas } from '../../pipeline/run/build-atlas.ts';
import { testAtlasYaml } from '../helpers/atlas-yaml.ts';

const PYTHON = '/usr/bin/python3';
const run = (args: string[], input?: string) =>
  spawnSync(process.execPath, [CLI_COMPILED, ...args], {
    encoding: 'utf8',
    input,
    maxBuffer: 64 << 20,
    env: { ...process.env, HEATHOURS_BUILD_TIME: '2026-06-01T00:00:00.000Z' },
  });

let dir = '';

beforeAll(() => {
  const r = spawnSync(process.execPath, ['--import', 'tsx', join(ROOT, 'scripts/compile.ts')], { cwd: ROOT, encoding: 'utf8' });
  expect(r.status, r.stderr).toBe(0);
  dir = tempDir('heathours-compiled-');
}, 120_000);

/** Every .js file under compiled/. */
function compiledFiles(d = join(ROOT, 'compiled')): string[] {
  return readdirSync(d, { withFileTypes: true }).flatMap((e) =>
    e.isDirectory() ? compiledFiles(join(d, e.name)) : e.name.endsWith('.js') ? [join(d, e.name)] : [],
  );
}

describe('the compiled command', () => {
  it('holds the command and one file per worker entry, and loads no TypeScript runner', () => {
    for (const name of ['cli.js', 'workers/shard.js', 'workers/physics.js', 'workers/demo-year.js'])
      expect(existsSync(join(ROOT, 'compiled', name)), name).toBe(true);
    const withTsx = compiledFiles().filter((f) => /(from\s*["']tsx|import\(\s*["']tsx)/.test(readFileSync(f, 'utf8')));
    expect(withTsx).toEqual([]);
    const sources = JSON.parse(readFileSync(join(ROOT, 'compiled/sources.json'), 'utf8')) as { files: string[] };
    expect(sources.files).toContain('pipeline/cli.ts');
    expect(sources.files).toContain('pipeline/run/shard-worker.ts');
  });

  it('starts light: what compiled/cli.js imports before a command runs is under 100 kB of its own code and no package but commander and cli-progress (exceljs, h5wasm, sharp, zod, yaml, the physics tables load in the commands that use them)', () => {
    const seen = new Set<string>();
    const packages = new Set<string>();
    let bytes = 0;
    const walk = (f: string) => {
      if (seen.has(f)) return;
      seen.add(f);
      const text = readFileSync(f, 'utf8');
      bytes += text.length;
      // Static imports and re-exports only (esbuild writes `from "…"`); `import("…")` is lazy.
      for (const m of text.matchAll(/^(?:import|export)\s[^;]*?from\s+"([^"]+)"|^import\s+"([^"]+)"/gms)) {
        const spec = m[1] ?? m[2];
        if (spec.startsWith('.')) walk(join(f, '..', spec));
        else if (!spec.startsWith('node:')) packages.add(spec.split('/')[0]);
      }
    };
    walk(join(ROOT, 'compiled', 'cli.js'));
    expect([...packages].sort()).toEqual(['cli-progress', 'commander']);
    expect(bytes).toBeLessThan(100_000);
  });

  it('--help lists every command and the exit statuses; --version and -v print the package version', () => {
    const help = run(['--help']);
    expect(help.status).toBe(0);
    for (const c of ['errors', 'build', 'demo-data', 'preview', 'inspect', 'point']) expect(help.stdout).toMatch(new RegExp(`\\n  ${c} `));
    expect(help.stdout).toContain('Exit status:');
    expect(help.stderr).toBe('');
    const version = JSON.parse(readFileSync(join(ROOT, 'package.json'), 'utf8')).version as string;
    expect(run(['--version']).stdout.trim()).toBe(version);
    expect(run(['-v']).stdout.trim()).toBe(version);
  });

  it('errors --json gives each error its exit status and hint', () => {
    const r = run(['errors', '--json']);
    expect(r.status).toBe(0);
    const rows = r.stdout
      .trim()
      .split('\n')
      .map((l) => JSON.parse(l) as { code: string; exit: number; hint: string });
    expect(rows.length).toBeGreaterThan(100);
    expect(rows.find((x) => x.code === 'NetcdfGribFile')).toMatchObject({ exit: 3, hint: expect.stringContaining('grib_to_netcdf') });
    expect(rows.find((x) => x.code === 'ConfigNotFound')).toMatchObject({ exit: 2, hint: expect.stringContaining('--config') });
  });

  it('inspect --json of classic and NetCDF-4 files: the same report as the sources, and the min, max and mean netCDF-C computes (python3-netcdf4)', async () => {
    const spec = {
      layout: 'legacy' as const,
      start: '2021-07-01T00:00:00Z',
      hours: 48,
      lat: [12, 11.5, 11, 10.5],
      lon: [100, 100.5, 101],
      vars: ['t2m', 'd2m', 'sp'] as const,
    };
    const files = [
      writeFixture(dir, 'classic', { ...spec, vars: [...spec.vars] }, 'nc3'),
      writeFixture(dir, 'nc4', { ...spec, vars: [...spec.vars], chunkHours: 24 }, 'nc4'),
    ];
    const r = run(['inspect', '--json', ...files]);
    expect(r.status, r.stderr).toBe(0);
    const reports = r.stdout
      .trim()
      .split('\n')
      .map((l) => JSON.parse(l));
    for (let i = 0; i < files.length; i++) expect(reports[i]).toEqual(JSON.parse(JSON.stringify(await inspectFile(files[i]))));
    // netCDF-C (Debian python3-netcdf4, unpacking and masking as CF says) on the same files.
    const py = spawnSync(
      PYTHON,
      [
        '-c',
        `
import sys, json, netCDF4
for path in sys.argv[1:]:
    with netCDF4.Dataset(path) as ds:
        print(json.dumps({n: [float(v[:].min()), float(v[:].max()), float(v[:].mean())] for n, v in ds.variables.items() if n in ('t2m', 'd2m', 'sp')}))
`,
        ...files,
      ],
      { encoding: 'utf8' },
    );
    expect(py.status, py.stderr).toBe(0);
    const ref = py.stdout
      .trim()
      .split('\n')
      .map((l) => JSON.parse(l) as Record<string, [number, number, number]>);
    for (let i = 0; i < files.length; i++) {
      for (const [name, [min, max, mean]] of Object.entries(ref[i])) {
        const v = reports[i].variables.find((x: { name: string }) => x.name === name);
        expect(v.min).toBeCloseTo(min, 3);
        expect(v.max).toBeCloseTo(max, 3);
        expect(Math.abs(v.mean - mean) / Math.abs(mean)).toBeLessThan(1e-6);
      }
    }
  });

  it('a build on two worker threads (demo years and shards, compiled workers) publishes the same bytes as the build from the TypeScript sources', async () => {
    const data = join(dir, 'inputs');
    const demo = run(['demo-data', '--out', data, '--years', '2022-2023', '--layout', 'mixed', '--grid', 'small', '--jobs', '2', '--quiet']);
    expect(demo.status, demo.stderr).toBe(0);
    expect(readdirSync(data).sort()).toEqual(['era5-demo-2022.nc', 'era5-demo-2023.nc', 'era5-demo-lsm.nc', 'scenarios', 'workforce-people.tif']);
    const yaml = `${testAtlasYaml({ id: 'compiled', title: 'Compiled command test atlas (invented data)', years: [2022, 2023] })}`;
    writeFileSync(join(dir, 'atlas.yaml'), yaml);
    const b = run(['build', '--config', join(dir, 'atlas.yaml'), '--out', join(dir, 'out-compiled'), '--data-only', '--jobs', '2', '--no-cache', '--quiet']);
    expect(b.status, b.stderr).toBe(0);
    process.env.HEATHOURS_BUILD_TIME = '2026-06-01T00:00:00.000Z';
    try {
      await buildAtlas({ configPath: join(dir, 'atlas.yaml'), outDir: join(dir, 'out-ts'), jobs: 2, quiet: true, dataOnly: true, cache: false });
    } finally {
      delete process.env.HEATHOURS_BUILD_TIME;
    }
    const regions = readdirSync(join(dir, 'out-ts/data/regions'))
      .filter((f) => f.endsWith('.csv'))
      .sort();
    expect(regions.length).toBeGreaterThan(0);
    expect(
      readdirSync(join(dir, 'out-compiled/data/regions'))
        .filter((f) => f.endsWith('.csv'))
        .sort(),
    ).toEqual(regions);
    const tables = readdirSync(join(dir, 'out-ts/data/cell-tables')).map((t) => `cell-tables/${t}`);
    expect(tables.length).toBeGreaterThan(0);
    for (const f of [...regions.map((r) => `regions/${r}`), ...tables, 'atlas-cells.nc']) {
      expect(readFileSync(join(dir, 'out-compiled/data', f)).equals(readFileSync(join(dir, 'out-ts/data', f))), f).toBe(true);
    }
  }, 240_000);

  it('point reads standard input and writes standard output with -, the same bytes as from and to files', () => {
    const csv = [
      'time_utc,lat,lon,ta_c,rh_pct,pressure_hpa,wind_ms,solar_wm2',
      '2024-07-15T03:00:00Z,25.2,55.3,31.5,55,1005,3.2,650',
      '2024-07-15T09:00:00Z,25.2,55.3,38.0,30,1003,4.0,820',
      '2024-07-15T21:00:00Z,25.2,55.3,29.0,70,1006,1.5,0',
    ].join('\n');
    const inFile = join(dir, 'point-in.csv');
    writeFileSync(inFile, `${csv}\n`);
    const files = run(['point', '--in', inFile, '--out', join(dir, 'point-out.csv'), '--quiet']);
    expect(files.status, files.stderr).toBe(0);
    const streams = run(['point', '--in', '-', '--out', '-', '--quiet'], `${csv}\n`);
    expect(streams.status, streams.stderr).toBe(0);
    expect(streams.stdout).toBe(readFileSync(join(dir, 'point-out.csv'), 'utf8'));
    expect(streams.stdout.split('\r\n')[0]).toContain('wbgt_c');
    expect(streams.stderr).toMatch(/^point: 3 rows, 3 computed/);
  });

  it('exits with 2 for usage and configuration errors and 3 for input data, with the catalogued message', () => {
    const jobs = run(['build', '--jobs', '0']);
    expect(jobs.status).toBe(2);
    expect(jobs.stderr).toContain('error [UsageError]');
    const config = run(['build', '--config', join(dir, 'no-such.yaml')]);
    expect(config.status).toBe(2);
    expect(config.stderr).toContain('error [ConfigNotFound]');
    const grib = join(dir, 'x.grb');
    writeFileSync(grib, 'GRIB....');
    const data = run(['inspect', grib]);
    expect(data.status).toBe(3);
    expect(data.stderr).toContain('error [NetcdfGribFile]');
    expect(run(['inspect', '--no-such-option', grib]).status).toBe(2);
  });

  it('a reader that closes the pipe stops `errors` and `point --out -` quietly with 141, no stack trace', async () => {
    const rows = ['time_utc,lat,lon,ta_c,rh_pct,pressure_hpa,wind_ms,solar_wm2'];
    for (let h = 0; h < 20_000; h++)
      rows.push(
        `2024-07-${String(1 + (Math.floor(h / 24) % 28)).padStart(2, '0')}T${String(h % 24).padStart(2, '0')}:00:00Z,25.2,55.3,31.5,55,1005,3.2,${h % 24 > 6 && h % 24 < 18 ? 600 : 0}`,
      );
    const big = join(dir, 'point-big.csv');
    writeFileSync(big, `${rows.join('\n')}\n`);
    for (const args of [
      ['errors', '--json'],
      ['point', '--in', big, '--out', '-', '--quiet'],
    ]) {
      const child = spawn(process.execPath, [CLI_COMPILED, ...args], { stdio: ['ignore', 'pipe', 'pipe'] });
      let stderr = '';
      child.stderr.on('data', (b) => (stderr += String(b)));
      child.stdout.destroy(); // the reader goes away before the first line
      const code = await new Promise<number | null>((ok) => child.on('close', (c) => ok(c)));
      expect(stderr, args[0]).toBe('');
      expect(code, args[0]).toBe(141);
    }
  }, 60_000);

  it('says when a source changed after compiling, and what to run when compiled/ is missing', () => {
    const src = join(ROOT, 'pipeline/cli.ts');
    const before = statSync(src);
    try {
      const later = new Date(Date.now() + 60_000);
      utimesSync(src, later, later);
      const r = run(['--version']);
      expect(r.status).toBe(0);
      expect(r.stderr).toMatch(/^warning: pipeline\/cli\.ts changed after heathours was compiled; .*npm run compile/);
    } finally {
      utimesSync(src, before.atime, before.mtime);
    }
    const bare = join(dir, 'bare');
    mkdirSync(join(bare, 'bin'), { recursive: true });
    copyFileSync(CLI_COMPILED, join(bare, 'bin/heathours.mjs'));
    const r = spawnSync(process.execPath, [join(bare, 'bin/heathours.mjs'), '--help'], { encoding: 'utf8' });
    expect(r.status).toBe(2);
    expect(r.stderr).toContain('error [NotCompiled] The compiled command is missing');
    expect(r.stderr).toContain('hint: run `npm run compile`');
  });
});

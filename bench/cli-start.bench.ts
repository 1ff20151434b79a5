/**
 * cli-start: how long the shipped command takes as a whole process (start, work, exit), in ms:
 * `heathours --help`, and `heathours inspect --json` of one year of hourly 2 m temperature on a
 * 40 × 60 grid (bench/decode.bench.ts `benchInputs`: invented values; the classic packed-int16
 * file and its NetCDF-4 deflate + shuffle copy made with Debian's nccopy). Beside each: the same
 * command from the TypeScript sources (bin/heathours-ts.mjs, how the command ran before it was
 * compiled), and for `inspect` the anchor: netCDF-C through Debian's python3-netcdf4
 * (/usr/bin/python3) reading the same file and computing each variable's min, max, mean and
 * fill count, as a whole process, with the ratio heathours / netCDF-C. Without python3-netcdf4
 * the anchor is reported as absent.
 *
 * Every command runs RUNS times, round-robin (each round runs every command once), and the median
 * is reported, so a busy moment of this shared machine weighs on all of them alike.
 */
import { spawnSync } from 'node:child_process';
import { createHash } from 'node:crypto';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { ensureCompiled } from './compiled-code.ts';
import { benchInputs } from './decode.bench.ts';
import type { Bench, BenchFigure } from './types.ts';

const ROOT = fileURLToPath(new URL('../', import.meta.url));
const COMPILED = join(ROOT, 'bin/heathours.mjs');
const SOURCES = join(ROOT, 'bin/heathours-ts.mjs');
const PYTHON = '/usr/bin/python3';
const RUNS = 7;

/** netCDF-C through python3-netcdf4: per variable min, max, mean and fill count, decoded as CF says. */
const REFERENCE = `
import sys, netCDF4, numpy as np
for path in sys.argv[1:]:
    with netCDF4.Dataset(path) as ds:
        for name, v in ds.variables.items():
            a = v[:]
            print(name, float(a.min()), float(a.max()), float(a.mean()), int(np.ma.count_masked(a)))
`;

interface Timed {
  ms: number[];
  stdout: string;
}

function once(cmd: string, args: string[], t: Timed, env?: Record<string, string>): void {
  const t0 = performance.now();
  const r = spawnSync(cmd, args, { encoding: 'utf8', maxBuffer: 1 << 26, env: env ? { ...process.env, ...env } : process.env });
  const ms = performance.now() - t0;
  if (r.status !== 0) throw new Error(`${cmd} ${args.join(' ')} failed (${r.status}): ${r.stderr}`);
  t.ms.push(ms);
  t.stdout = r.stdout;
}

const median = (xs: number[]) => {
  const s = [...xs].sort((a, b) => a - b);
  return s.length % 2 ? s[(s.length - 1) / 2] : (s[s.length / 2 - 1] + s[s.length / 2]) / 2;
};
const r0 = (x: number) => Math.round(x);
const r2 = (x: number) => Math.round(x * 100) / 100;
const digest = (s: string) => createHash('sha256').update(s).digest('hex').slice(0, 16);

export const bench: Bench = {
  names: ['cli-start'],
  async run() {
    ensureCompiled();
    const [classic] = benchInputs('classic', [2021]);
    const [netcdf4] = benchInputs('netcdf4', [2021]);
    const reference = spawnSync(PYTHON, ['-c', 'import netCDF4, numpy'], { encoding: 'utf8' }).status === 0;

    const runs: Record<string, [string, string[]] | [string, string[], Record<string, string>]> = {
      node: [process.execPath, ['-e', '0']],
      help: [process.execPath, [COMPILED, '--help']],
      helpTs: [process.execPath, [SOURCES, '--help']],
      classic: [process.execPath, [COMPILED, 'inspect', '--json', classic]],
      classicTs: [process.execPath, [SOURCES, 'inspect', '--json', classic]],
      netcdf4: [process.execPath, [COMPILED, 'inspect', '--json', netcdf4]],
      netcdf4Ts: [process.execPath, [SOURCES, 'inspect', '--json', netcdf4]],
      // The same with the metadata described by the HDF5 library in its worker, as before the JavaScript reader.
      netcdf4Library: [process.execPath, [COMPILED, 'inspect', '--json', netcdf4], { HEATHOURS_NETCDF4_JSMETA: '0' }],
      ...(reference
        ? { classicRef: [PYTHON, ['-c', REFERENCE, classic]] as [string, string[]], netcdf4Ref: [PYTHON, ['-c', REFERENCE, netcdf4]] as [string, string[]] }
        : {}),
    };
    const t: Record<string, Timed> = Object.fromEntries(Object.keys(runs).map((k) => [k, { ms: [], stdout: '' }]));
    for (let round = 0; round < RUNS; round++) for (const [k, [cmd, args, env]] of Object.entries(runs)) once(cmd, args, t[k], env);
    const m = (k: string) => median(t[k].ms);

    const timing = `median of ${RUNS} whole-process runs each, commands interleaved round by round; wall clock on a shared 2-core machine (compare the ratios, measured in the same run)`;
    const figures: BenchFigure[] = [
      {
        bench: 'cli-start',
        value: r0(m('help')),
        unit: 'ms',
        measure: 'heathours --help (compiled)',
        fromSourcesMs: r0(m('helpTs')),
        speedup: r2(m('helpTs') / m('help')),
        nodeAloneMs: r0(m('node')),
        runsMs: t.help.ms.map(r0).join('/'),
        timing,
        checksum: digest(t.help.stdout),
      },
    ];
    for (const kind of ['classic', 'netcdf4'] as const) {
      const file = kind === 'classic' ? classic : netcdf4;
      const report = JSON.parse(t[kind].stdout) as { bytes: number; variables: Array<{ name: string; mean: number | null; fillCount: number }> };
      const t2m = report.variables.find((v) => v.name === 't2m')!;
      const fig: BenchFigure = {
        bench: 'cli-start',
        value: r0(m(kind)),
        unit: 'ms',
        measure: `heathours inspect --json, ${kind} (compiled)`,
        input: `${file.split('/').pop()}: 8760 h x 40 x 60 t2m, ${report.bytes} bytes (invented values)`,
        fromSourcesMs: r0(m(`${kind}Ts`)),
        speedup: r2(m(`${kind}Ts`) / m(kind)),
        runsMs: t[kind].ms.map(r0).join('/'),
        timing,
        checksum: `t2m mean ${t2m.mean?.toFixed(4)}, ${t2m.fillCount} missing`,
      };
      if (kind === 'netcdf4') {
        fig.metadataByLibraryMs = r0(m('netcdf4Library'));
        fig.metadataByLibrary = 'HEATHOURS_NETCDF4_JSMETA=0: the metadata described by HDF5 (h5wasm) in its worker';
        fig.sameOutputWithLibrary = t.netcdf4Library.stdout === t.netcdf4.stdout;
        if (reference) fig.ratioLibraryToNetcdfC = r2(m('netcdf4Library') / m('netcdf4Ref'));
      }
      if (reference) {
        const ref = t[`${kind}Ref`].stdout
          .split('\n')
          .find((l) => l.startsWith('t2m '))!
          .split(' ');
        Object.assign(fig, {
          netcdfCMs: r0(m(`${kind}Ref`)),
          ratioToNetcdfC: r2(m(kind) / m(`${kind}Ref`)),
          ratioFromSourcesToNetcdfC: r2(m(`${kind}Ts`) / m(`${kind}Ref`)),
          netcdfC: `Debian python3-netcdf4 (${pythonNetcdfVersion()}) at ${PYTHON}, whole process: open, read every variable, min/max/mean/fill count`,
          sameMean: Math.abs(Number(ref[3]) - (t2m.mean ?? NaN)) < 1e-3 && Number(ref[4]) === t2m.fillCount,
        });
      } else {
        fig.netcdfC = `absent: ${PYTHON} cannot import netCDF4 (apt-get install python3-netcdf4 for the anchor)`;
      }
      figures.push(fig);
    }
    return figures;
  },
};

function pythonNetcdfVersion(): string {
  const r = spawnSync(PYTHON, ['-c', 'import netCDF4; print(netCDF4.__version__, netCDF4.__netcdf4libversion__)'], { encoding: 'utf8' });
  const [py, lib] = r.stdout.trim().split(' ');
  return `netCDF4 ${py}, netCDF-C ${lib}`;
}

/**
 * decode-netcdf4-vs-reference: the NetCDF-4 reader's decode rate against the reference library
 * reading the same file in the same run, as a ratio (ours ÷ reference, values per second of wall
 * time; CPU ratio beside). Ours: `Dataset.readBlock` month blocks (744 h) of the whole grid, as
 * decode-netcdf4 measures it, with raw chunk reads (pipeline/read/hdf5-chunks.ts: the chunks of
 * each slab shared between this thread and one helper thread, the default of a reader alone on a
 * machine of two or more cores; and in this thread alone beside it: HEATHOURS_NETCDF4_INFLATE=sync)
 * and, before them, with every variable through the HDF5 library (HEATHOURS_NETCDF4_RAW=0, h5wasm).
 * Reference: Debian's python3-netcdf4 (netCDF-C with its HDF5) reading the same variables in the
 * same blocks as stored numbers (no mask, no scaling: less work than ours, which also masks,
 * converts units and reorders rows). Without /usr/bin/python3 and its netCDF4 module the figure
 * says the reference is absent. Inputs: the invented demo year (float32, deflate 1, chunks
 * 168 × 40 × 60) and the bench writer's t2m copied by `nccopy -d1 -s` (deflate 1 + shuffle).
 */
import { execFileSync, spawnSync } from 'node:child_process';
import { openDataset } from '../pipeline/read/index.ts';
import { inflateHelperReady } from '../pipeline/read/inflate-helper.ts';
import { benchInputs, demoInputs, streamAll, type StreamResult } from './decode.bench.ts';
import type { CanonicalName } from '../pipeline/model/fields.ts';
import type { Bench, BenchFigure } from './types.ts';

const PY = '/usr/bin/python3';

/** python3-netcdf4 reading `vars` of `file` in blocks of 744 along the first dimension; best of 3 after a warm-up. */
const REFERENCE = `
import sys, time, netCDF4
path, names = sys.argv[1], sys.argv[2].split(',')
def run():
    d = netCDF4.Dataset(path)
    d.set_auto_maskandscale(False)
    n = 0; w = 0.0; c = 0.0
    for name in names:
        v = d[name]
        for t0 in range(0, v.shape[0], 744):
            w0 = time.perf_counter(); c0 = time.process_time()
            a = v[t0:t0 + 744]
            w += time.perf_counter() - w0; c += time.process_time() - c0
            n += a.size
    d.close()
    return n, w, c
run()
runs = [run() for _ in range(3)]
best = min(runs, key=lambda r: r[1])
print(best[0], best[1], best[2], '/'.join('%.1f' % (r[0] / r[1] / 1e6) for r in runs))
`;

interface Reference {
  values: number;
  seconds: number;
  cpuSeconds: number;
  runs: string;
}

function reference(file: string, names: string[]): Reference | string {
  const probe = spawnSync(PY, ['-c', 'import netCDF4'], { stdio: 'ignore' });
  if (probe.error || probe.status !== 0) return `absent (${PY} with python3-netcdf4 not installed)`;
  const out = execFileSync(PY, ['-c', REFERENCE, file, names.join(',')], { encoding: 'utf8', maxBuffer: 1 << 20 })
    .trim()
    .split(' ');
  return { values: Number(out[0]), seconds: Number(out[1]), cpuSeconds: Number(out[2]), runs: `${out[3]} M/s` };
}

const ALL_FIELDS: CanonicalName[] = ['airTemperature', 'dewPointTemperature', 'surfacePressure', 'windSpeed10m', 'solarGlobal', 'solarDirect', 'thermalDown'];

/** Our rate: warm-up, then best of 3 (as decode-netcdf4), with raw reads on or off, shared with the helper thread or in this thread alone. */
async function ours(
  files: string[],
  require: CanonicalName[],
  raw: boolean,
  inflate: 'helper' | 'sync' = 'helper',
): Promise<{ best: StreamResult; runs: string }> {
  const was = process.env.HEATHOURS_NETCDF4_RAW;
  process.env.HEATHOURS_NETCDF4_RAW = raw ? '1' : '0';
  process.env.HEATHOURS_NETCDF4_INFLATE = inflate;
  try {
    if (inflate === 'helper' && !(await inflateHelperReady())) throw new Error('the inflate helper thread did not start');
    await streamAll(files, { reuse: true, require });
    const runs: StreamResult[] = [];
    for (let i = 0; i < 3; i++) runs.push(await streamAll(files, { reuse: true, require }));
    const best = runs.reduce((a, b) => (b.seconds < a.seconds ? b : a));
    return { best, runs: runs.map((r) => (r.values / r.seconds / 1e6).toFixed(1)).join('/') + ' M/s' };
  } finally {
    delete process.env.HEATHOURS_NETCDF4_INFLATE;
    if (was === undefined) delete process.env.HEATHOURS_NETCDF4_RAW;
    else process.env.HEATHOURS_NETCDF4_RAW = was;
  }
}

/** The source variables a dataset reads for `require`, by their names in the file. */
async function sourceNames(files: string[], require: CanonicalName[]): Promise<{ file: string; names: string[] }> {
  const ds = await openDataset(files, { product: 'era5', require, digests: false });
  // One year: the file that contributes the most variables.
  const file = ds.files.reduce((a, b) => (b.variables.length > a.variables.length ? b : a));
  await ds.close();
  const path = files.find((p) => p === file.name || p.endsWith(`/${file.name}`));
  if (!path) throw new Error(`no input named ${file.name}`);
  return { file: path, names: file.variables };
}

async function figure(label: string, files: string[], require: CanonicalName[]): Promise<Record<string, string | number>> {
  const { file, names } = await sourceNames(files, require);
  const after = await ours(files, require, true);
  const before = await ours(files, require, false);
  const alone = await ours(files, require, true, 'sync');
  const ref = reference(file, names);
  const rate = (r: StreamResult, cpu = false) => r.values / (cpu ? r.cpuSeconds : r.seconds);
  const out: Record<string, string | number> = {
    [`${label}Ours`]: `${(rate(after.best) / 1e6).toFixed(1)} M/s wall, ${(rate(after.best, true) / 1e6).toFixed(1)} M/s CPU (runs ${after.runs})`,
    [`${label}Before`]: `${(rate(before.best) / 1e6).toFixed(1)} M/s wall, ${(rate(before.best, true) / 1e6).toFixed(1)} M/s CPU (HDF5 library, runs ${before.runs})`,
    [`${label}OursOneThread`]: `${(rate(alone.best) / 1e6).toFixed(1)} M/s wall, ${(rate(alone.best, true) / 1e6).toFixed(1)} M/s CPU (HEATHOURS_NETCDF4_INFLATE=sync, runs ${alone.runs})`,
    [`${label}OneThreadRatio`]: typeof ref === 'string' ? ref : Number((rate(alone.best) / (ref.values / ref.seconds)).toFixed(2)),
    [`${label}AfterOverBefore`]: Number((rate(after.best) / rate(before.best)).toFixed(2)),
    [`${label}Checksums`]: `${after.best.checksum.toFixed(3)}/${before.best.checksum.toFixed(3)}/${alone.best.checksum.toFixed(3)}`,
  };
  if (typeof ref === 'string') out[`${label}Reference`] = ref;
  else {
    const refRate = ref.values / ref.seconds;
    out[`${label}Reference`] =
      `${(refRate / 1e6).toFixed(1)} M/s wall, ${(ref.values / ref.cpuSeconds / 1e6).toFixed(1)} M/s CPU (python3-netcdf4, ${names.join(' ')}, runs ${ref.runs})`;
    out[`${label}Ratio`] = Number((rate(after.best) / refRate).toFixed(2));
    out[`${label}CpuRatio`] = Number((rate(after.best, true) / (ref.values / ref.cpuSeconds)).toFixed(2));
    out[`${label}BeforeRatio`] = Number((rate(before.best) / refRate).toFixed(2));
    out[`${label}Values`] = `${after.best.values} ours, ${ref.values} reference`;
  }
  return out;
}

export const bench: Bench = {
  names: ['decode-netcdf4-vs-reference'],
  async run() {
    const demo = await figure('demo', await demoInputs('netcdf4', [2021]), ALL_FIELDS);
    const t2m = await figure('t2m', benchInputs('netcdf4', [2021]), ['airTemperature']);
    const value = typeof demo.demoRatio === 'number' ? demo.demoRatio : Number.NaN;
    const fig: BenchFigure = {
      bench: 'decode-netcdf4-vs-reference',
      value,
      unit: 'ratio',
      input:
        'demo dataset (invented), 1 year hourly, 0.25° 40x60 grid, 8 variables, NetCDF-4 float32 deflate 1 (chunks 168x40x60); and t2m of the bench writer via nccopy -d1 -s; month blocks (744 h) of the whole grid',
      ...demo,
      ...t2m,
      note: "value = our values/s over python3-netcdf4's on the demo file (wall); ours runs on two threads (the reader and its inflate helper; OneThread: the reader alone), netCDF-C on one, CPU counts both of ours; each side best of 3 after a warm-up, in one process run one after the other; reference reads stored numbers only; machine shared (2 cores), timings noisy",
    };
    return [fig];
  },
};

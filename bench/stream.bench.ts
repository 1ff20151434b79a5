/**
 * stream-peak-rss: peak resident memory [MB] of a child process that streams all canonical
 * fields of the demo dataset (pipeline/demo `writeDemoDataset`, invented values, legacy packed
 * classic layout, one file per year, 0.25° 40 × 60 grid) month block by month block through
 * `readBlock`, for 1 and 3 years: memory is bounded by the block, so the figure must not grow
 * with the number of years.
 */
import { spawnSync } from 'node:child_process';
import { fileURLToPath } from 'node:url';
import { demoInputs, streamAll } from './decode.bench.ts';
import type { CanonicalName } from '../pipeline/model/fields.ts';
import type { Bench } from './types.ts';

const ALL: CanonicalName[] = ['airTemperature', 'dewPointTemperature', 'surfacePressure', 'windSpeed10m', 'solarGlobal', 'solarDirect', 'thermalDown'];

if (process.argv[2] === '--stream-child') {
  const r = await streamAll(process.argv.slice(3), { reuse: true, require: ALL });
  process.stdout.write(JSON.stringify({ ...r, maxRssKb: process.resourceUsage().maxRSS }) + '\n');
}

interface ChildResult {
  values: number;
  seconds: number;
  cpuSeconds: number;
  checksum: number;
  maxRssKb: number;
}

function child(files: string[]): ChildResult {
  const r = spawnSync(process.execPath, ['--import', 'tsx', fileURLToPath(import.meta.url), '--stream-child', ...files], { encoding: 'utf8' });
  if (r.status !== 0) throw new Error(`stream child failed: ${r.stderr}`);
  return JSON.parse(r.stdout.trim().split('\n').pop()!);
}

export const bench: Bench = {
  names: ['stream-peak-rss'],
  async run() {
    const one = child(await demoInputs('legacy', [2021]));
    const three = child(await demoInputs('legacy', [2019, 2020, 2021]));
    return [
      {
        bench: 'stream-peak-rss',
        value: Math.round(one.maxRssKb / 1024),
        unit: 'MB',
        input:
          'demo dataset (invented), 1 year hourly, 40x60 grid, 8 ERA5 variables, NetCDF-3 int16 packed, month blocks (744 h x 2400 cells), reused block buffers',
        values1y: one.values,
        readSeconds1y: Math.round(one.seconds * 1000) / 1000,
        cpuSeconds1y: Math.round(one.cpuSeconds * 1000) / 1000,
        checksum1y: one.checksum.toFixed(3),
        peakRss3yMB: Math.round(three.maxRssKb / 1024),
        values3y: three.values,
        checksum3y: three.checksum.toFixed(3),
        note: 'child process maxRSS incl. Node + tsx runtime; shared machine',
      },
    ];
  },
};

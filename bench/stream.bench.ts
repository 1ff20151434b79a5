/**
 * stream-peak-rss: peak resident memory [MB] of a child process that streams hourly t2m of a
 * 0.25° 40 × 60 grid month block by month block (legacy packed classic files, one per year,
 * invented values from bench/decode.bench.ts's generator), for 1 and 3 years: memory is bounded
 * by the block, so the figure must not grow with the number of years.
 */
import { spawnSync } from 'node:child_process';
import { fileURLToPath } from 'node:url';
import { benchInputs, streamAll } from './decode.bench.ts';
import type { Bench } from './types.ts';

if (process.argv[2] === '--stream-child') {
  const r = await streamAll(process.argv.slice(3));
  process.stdout.write(JSON.stringify({ ...r, maxRssKb: process.resourceUsage().maxRSS }) + '\n');
}

function child(files: string[]): { values: number; checksum: number; maxRssKb: number } {
  const r = spawnSync(process.execPath, ['--import', 'tsx', fileURLToPath(import.meta.url), '--stream-child', ...files], { encoding: 'utf8' });
  if (r.status !== 0) throw new Error(`stream child failed: ${r.stderr}`);
  return JSON.parse(r.stdout.trim().split('\n').pop()!);
}

export const bench: Bench = {
  names: ['stream-peak-rss'],
  async run() {
    const one = child(benchInputs('classic', [2021]));
    const three = child(benchInputs('classic', [2019, 2020, 2021]));
    return [{
      bench: 'stream-peak-rss',
      value: Math.round(one.maxRssKb / 1024),
      unit: 'MB',
      input: '1 year hourly t2m, 40x60 grid, NetCDF-3 int16 packed, month blocks (744 h x 2400 cells)',
      values1y: one.values,
      checksum1y: one.checksum.toFixed(3),
      peakRss3yMB: Math.round(three.maxRssKb / 1024),
      values3y: three.values,
      checksum3y: three.checksum.toFixed(3),
      note: 'child process maxRSS incl. Node + tsx runtime; shared machine',
    }];
  },
};

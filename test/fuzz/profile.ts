/**
 * Where a fuzz campaign spends its time: runs `--count` mutants of each named format (one
 * format after the other, so their times do not mix) and prints, per format, the throughput
 * [mutants/s], the median, 90th and 99th percentile and slowest wall time per mutant [ms], the
 * slowest mutants with each step's time and their damage, and the outcome counts.
 *
 *   nice -n 10 npx tsx test/fuzz/profile.ts --format netcdf4 --count 300 --workers 1 --top 10
 *
 * Options: --format (repeatable, default every format), --count (default 300), --seed (default
 * 1, the benchmark's), --workers (default 1), --depth full|quick (default full, the
 * benchmark's), --top (default 10), --dir (default a folder under the system's temporary one,
 * kept: the bases and the mutants with a defect stay there), --mutants (the mutants' folder,
 * default DIR/mutants; e.g. one under /dev/shm).
 */
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { parseArgs } from 'node:util';
import { describeDefect, runCampaign } from './campaign.ts';
import { FORMATS, type FormatId } from './mutate.ts';
import type { TaskResult } from './pool.ts';
import type { Depth } from './targets.ts';

/** The q-quantile of sorted values (nearest rank) [same unit]. */
export function quantile(sorted: readonly number[], q: number): number {
  if (sorted.length === 0) return 0;
  return sorted[Math.min(sorted.length - 1, Math.max(0, Math.ceil(q * sorted.length) - 1))];
}

async function main(): Promise<void> {
  const { values } = parseArgs({
    options: {
      format: { type: 'string', multiple: true },
      count: { type: 'string' },
      seed: { type: 'string' },
      workers: { type: 'string' },
      depth: { type: 'string' },
      top: { type: 'string' },
      dir: { type: 'string' },
      mutants: { type: 'string' },
    },
  });
  const formats = (values.format ?? FORMATS) as FormatId[];
  const bad = formats.find((f) => !FORMATS.includes(f));
  if (bad) {
    process.stderr.write(`unknown format ${bad}; known: ${FORMATS.join(', ')}\n`);
    process.exitCode = 2;
    return;
  }
  const count = Number(values.count ?? 300);
  const seed = Number(values.seed ?? 1);
  const workers = Number(values.workers ?? 1);
  const depth = (values.depth ?? 'full') as Depth;
  const top = Number(values.top ?? 10);
  const dir = values.dir ?? join(tmpdir(), 'heathours-fuzz-profile');
  for (const format of formats) {
    const results: TaskResult[] = [];
    let starts = 0;
    const cpu0 = process.cpuUsage();
    const { summaries, poolSeconds: seconds } = await runCampaign({
      count,
      seed,
      workers,
      timeoutMs: 60_000,
      dir,
      mutantDir: values.mutants,
      formats: [format],
      depth,
      onResult: (r) => results.push(r),
      onWorkerStart: () => starts++,
    });
    const cpu = process.cpuUsage(cpu0);
    const s = summaries[0];
    const ms = results.map((r) => r.ms).sort((a, b) => a - b);
    const counts = Object.entries(s.counts)
      .map(([k, v]) => `${k} ${v}`)
      .join(', ');
    process.stdout.write(
      `\n${format}: ${s.mutants} mutants in ${seconds.toFixed(1)} s wall, bases aside (${(s.mutants / seconds).toFixed(2)} mutants/s, ${workers} worker(s), depth ${depth}, seed ${seed}); ` +
        `process CPU ${((cpu.user + cpu.system) / 1e6).toFixed(1)} s\n` +
        `  per mutant [ms]: median ${quantile(ms, 0.5).toFixed(0)}, p90 ${quantile(ms, 0.9).toFixed(0)}, p99 ${quantile(ms, 0.99).toFixed(0)}, slowest ${quantile(ms, 1).toFixed(0)}\n` +
        `  outcomes: ${counts}; fuzz worker threads started: ${starts}\n`,
    );
    // Where the time went: each step's total by outcome, and what the mutant times do not hold
    // (making and writing mutants, starting workers again, waiting for a worker) [s].
    const byStep = new Map<string, number>();
    for (const r of results) for (const x of r.steps) byStep.set(`${x.step} ${x.outcome}`, (byStep.get(`${x.step} ${x.outcome}`) ?? 0) + x.ms / 1000);
    const inMutants = results.reduce((a, r) => a + r.ms, 0) / 1000;
    process.stdout.write(
      `  time [s]: ${[...byStep]
        .sort((a, b) => b[1] - a[1])
        .map(([k, v]) => `${k} ${v.toFixed(1)}`)
        .join(', ')}; ` + `outside the mutants' own time ${(seconds * workers - inMutants).toFixed(1)} of ${(seconds * workers).toFixed(1)} worker-seconds\n`,
    );
    for (const r of [...results].sort((a, b) => b.ms - a.ms).slice(0, top)) {
      const steps = r.steps.map((x) => `${x.step} ${x.ms.toFixed(0)} ms ${x.outcome}${x.code ? ` [${x.code}]` : ''}`).join(', ');
      process.stdout.write(`  ${r.ms.toFixed(0).padStart(6)} ms  index ${r.index}: ${steps}\n      ${r.recipe.join('; ').slice(0, 300)}\n`);
    }
    for (const d of s.defects.slice(0, 5)) process.stdout.write(`${describeDefect(d)}\n`);
  }
}

if (import.meta.url === `file://${process.argv[1]}`) await main();

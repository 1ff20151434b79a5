/**
 * A fuzzing campaign: `count` mutants of each format under one seed (the truncation sweep
 * first, then random damage, mutate.ts), run on a worker pool (pool.ts), summarised per format
 * as outcome counts and the slowest mutant. Used by the suite's fuzz test (a few hundred
 * mutants per format) and by the `fuzz-readers` benchmark (ten thousand and more).
 */
import { mkdirSync } from 'node:fs';
import { join } from 'node:path';
import { loadBase, prepareBases, type BasePaths } from './bases.ts';
import { FORMATS, truncationPoints, type FormatId } from './mutate.ts';
import { GOOD, OUTCOMES, type Outcome } from './outcome.ts';
import { runFuzzPool, type TaskResult } from './pool.ts';
import type { Depth } from './targets.ts';

export interface CampaignOptions {
  formats?: readonly FormatId[];
  /** Mutants per format [–] (the truncation sweep first); `counts` overrides it per format. */
  count: number;
  counts?: Partial<Record<FormatId, number>>;
  seed: number;
  workers: number;
  /** Time limit per mutant [ms]. */
  timeoutMs: number;
  /** Folder for the bases and the mutants. */
  dir: string;
  /** How much of each NetCDF mutant the build step reads (test/fuzz/targets.ts); default full. */
  depth?: Depth;
  /**
   * A time budget [s]: the formats run one after the other (in the order given), each until its
   * count is reached or its share of the time left is spent (the time left split evenly among
   * the formats still to run, so time a fast format does not need passes on to the next).
   * Without it every mutant runs, the formats interleaved.
   */
  budgetSeconds?: number;
  /** Folder for the mutant files; default `dir`/mutants (a memory-backed folder is faster). */
  mutantDir?: string;
  onResult?: (r: TaskResult) => void;
  /** Called each time a worker thread is started (the first ones and every replacement). */
  onWorkerStart?: () => void;
}

export interface FormatSummary {
  format: FormatId;
  mutants: number;
  counts: Record<Outcome, number>;
  /** Slowest mutant [ms] and which it was. */
  slowestMs: number;
  slowest: string;
  /** Mutants whose outcome is a defect. */
  defects: TaskResult[];
  /** Mutants of the truncation sweep, and how many of them were read without an error. */
  sweep: number;
  sweepRead: number;
  /** Wall time of this format's mutants [s] (with a time budget only: the formats then run apart). */
  seconds?: number;
}

/**
 * Runs a campaign. `seconds` is the whole wall time [s], `poolSeconds` the time spent running
 * mutants (without writing the bases) [s].
 */
export async function runCampaign(o: CampaignOptions): Promise<{ bases: BasePaths; summaries: FormatSummary[]; seconds: number; poolSeconds: number }> {
  const t0 = performance.now();
  const bases = await prepareBases(join(o.dir, 'bases'));
  const tPool = performance.now();
  const workDir = o.mutantDir ?? join(o.dir, 'mutants');
  mkdirSync(workDir, { recursive: true });
  const formats = o.formats ?? FORMATS;
  const n = (f: FormatId) => o.counts?.[f] ?? o.count;
  const pool = { workers: o.workers, timeoutMs: o.timeoutMs, setup: { bases, workDir, depth: o.depth }, onResult: o.onResult, onWorkerStart: o.onWorkerStart };
  const results: TaskResult[] = [];
  const formatSeconds = new Map<FormatId, number>();
  if (o.budgetSeconds === undefined) {
    // Interleaved, so slow and fast formats share the workers evenly.
    const tasks = [];
    const most = Math.max(...formats.map(n));
    for (let i = 0; i < most; i++) for (const format of formats) if (i < n(format)) tasks.push({ format, seed: o.seed, index: i });
    results.push(...(await runFuzzPool(tasks, pool)));
  } else {
    const end = Date.now() + o.budgetSeconds * 1000;
    for (const [k, format] of formats.entries()) {
      const tasks = Array.from({ length: n(format) }, (_, index) => ({ format, seed: o.seed, index }));
      const deadline = Date.now() + (end - Date.now()) / (formats.length - k);
      const t = performance.now();
      results.push(...(await runFuzzPool(tasks, { ...pool, deadline })));
      formatSeconds.set(format, (performance.now() - t) / 1000);
    }
  }
  const poolSeconds = (performance.now() - tPool) / 1000;
  const summaries = formats.map((format) => {
    const mine = results.filter((r) => r.format === format);
    const cuts = truncationPoints(loadBase(format, bases.base[format])).length;
    const sweep = mine.filter((r) => r.index < cuts);
    const counts = Object.fromEntries(OUTCOMES.map((k) => [k, 0])) as Record<Outcome, number>;
    for (const r of mine) counts[r.outcome]++;
    const slow = mine.reduce((a, b) => (b.ms > a.ms ? b : a), mine[0]);
    return {
      format,
      mutants: mine.length,
      counts,
      slowestMs: slow?.ms ?? 0,
      slowest: slow ? `index ${slow.index}: ${slow.recipe.join('; ')}` : '',
      defects: mine.filter((r) => !GOOD.has(r.outcome)),
      sweep: sweep.length,
      sweepRead: sweep.filter((r) => r.outcome === 'read').length,
      seconds: formatSeconds.get(format),
    };
  });
  return { bases, summaries, seconds: (performance.now() - t0) / 1000, poolSeconds };
}

/** How to make one mutant again (printed with every defect). */
export function regenerateCommand(r: Pick<TaskResult, 'format' | 'seed' | 'index'>): string {
  return `npx tsx test/fuzz/regenerate.ts --format ${r.format} --seed ${r.seed} --index ${r.index} --out FILE`;
}

/** A readable report of one defect: seed, mutant, file, recipe, each step's outcome. */
export function describeDefect(r: TaskResult): string {
  return [
    `${r.format} mutant ${r.index} (seed ${r.seed}): ${r.outcome} after ${r.ms.toFixed(0)} ms`,
    `  file: ${r.path}`,
    `  remake: ${regenerateCommand(r)}`,
    `  damage: ${r.recipe.join('; ')}`,
    ...r.steps.map((s) => `  ${s.step}: ${s.outcome}${s.code ? ` [${s.code}]` : ''}${s.message ? `\n    ${s.message.split('\n').join('\n    ')}` : ''}`),
  ].join('\n');
}

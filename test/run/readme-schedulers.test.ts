/**
 * The scheduler examples in README.md are real: the Kubernetes manifests parse, the Indexed Job's
 * slices cover 1..N exactly once (K = completion index + 1, evaluated by /bin/sh), and every
 * `heathours build` flag the examples use is a flag the CLI accepts.
 */
import { describe, expect, it } from 'vitest';
import { execFileSync } from 'node:child_process';
import { readFileSync } from 'node:fs';
import { parseAllDocuments } from 'yaml';
import { Command } from 'commander';
import { register } from '../../pipeline/commands/build.ts';

const README = readFileSync(new URL('../../README.md', import.meta.url), 'utf8');
const blocks = (lang: string) => [...README.matchAll(new RegExp('```' + lang + '\\n([\\s\\S]*?)```', 'g'))].map((m) => m[1]);

describe('the README scheduler examples', () => {
  it('the Kubernetes Indexed Job computes slices 1..N once each and the merge job merges the same folder', () => {
    const docs = blocks('yaml').flatMap((b) => parseAllDocuments(b).map((d) => d.toJS()));
    const shards = docs.find((d) => d?.metadata?.name === 'heathours-shards');
    const merge = docs.find((d) => d?.metadata?.name === 'heathours-merge');
    expect(shards.spec.completionMode).toBe('Indexed');
    const n = shards.spec.completions as number;
    const script = (shards.spec.template.spec.containers[0].args as string[]).join(' ');
    const slices = Array.from({ length: n }, (_, i) =>
      execFileSync('/bin/sh', ['-c', `echo ${script.replace(/^node bin\/heathours\.mjs /, '')}`], { env: { JOB_COMPLETION_INDEX: String(i) } }).toString(),
    );
    expect(slices.map((s) => /--shard (\d+)\/(\d+)/.exec(s)!.slice(1).map(Number))).toEqual(Array.from({ length: n }, (_, i) => [i + 1, n]));
    const partials = /--partials (\S+)/.exec(script)![1];
    const mergeArgs = merge.spec.template.spec.containers[0].command as string[];
    expect(mergeArgs[mergeArgs.indexOf('--merge') + 1]).toBe(partials);
  });

  it('the Slurm array takes K from SLURM_ARRAY_TASK_ID over 1..N and the merge depends on the array', () => {
    const sh = blocks('sh').join('\n');
    const arr = /#SBATCH --array=1-(\d+)/.exec(sh)!;
    expect(sh).toContain(`--shard "\${SLURM_ARRAY_TASK_ID}/${arr[1]}"`);
    expect(sh).toMatch(/--dependency=afterok:"\$jobid"[\s\S]*--merge \/shared\/partials/);
  });

  it('every build flag the examples use is one the CLI accepts', () => {
    const program = new Command();
    register(program);
    const known = new Set(program.commands.find((c) => c.name() === 'build')!.options.map((o) => o.long));
    const used = new Set([...README.matchAll(/heathours(?:\.mjs)?"?,? "?build"?[^\n`]*(?:\\\n[^\n`]*)*/g)].flatMap((m) => [...m[0].matchAll(/--[a-z-]+/g)].map((f) => f[0])));
    for (const d of blocks('yaml').join('\n').matchAll(/"(--[a-z-]+)"/g)) used.add(d[1]);
    expect(used.size).toBeGreaterThan(5);
    for (const f of used) expect(known, f).toContain(f);
  });
});

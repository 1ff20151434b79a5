/**
 * The scheduler examples in README.md: the Kubernetes manifests (not run against a cluster here)
 * parse and have the structure and fields a cluster needs (a check of the fields used: two Indexed
 * Jobs and a Job), the Indexed Jobs' slices cover 1..N exactly once (K = completion index + 1,
 * evaluated by /bin/sh), the Slurm script chains its three steps (test/run/slurm.test.ts runs it),
 * and every `heathours build` flag the examples use is a flag the CLI accepts.
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
  const docs = () =>
    blocks('yaml')
      .flatMap((b) => parseAllDocuments(b).map((d) => d.toJS()))
      .filter((d) => d !== null && typeof d === 'object' && 'kind' in d); // the Kubernetes objects, not the config examples
  /** The `heathours build` arguments of an Indexed Job for completion index i, as /bin/sh expands them. */
  const argsAt = (job: { spec: { template: { spec: { containers: Array<{ args: string[] }> } } } }, i: number) =>
    execFileSync('/bin/sh', ['-c', `echo ${job.spec.template.spec.containers[0].args.join(' ').replace(/^node bin\/heathours\.mjs /, '')}`], {
      env: { JOB_COMPLETION_INDEX: String(i) },
    }).toString();

  it('the Kubernetes manifests have the fields a cluster needs: two Indexed Jobs and a Job, Never restart, requests, the shared volume', () => {
    const jobs = docs();
    expect(jobs.map((d) => d.metadata.name)).toEqual(['heathours-shards', 'heathours-merge', 'heathours-assemble']);
    for (const j of jobs) {
      expect(j.apiVersion).toBe('batch/v1');
      expect(j.kind).toBe('Job');
      const pod = j.spec.template.spec;
      expect(pod.restartPolicy).toBe('Never');
      expect(pod.containers).toHaveLength(1);
      const c = pod.containers[0];
      expect(typeof c.image).toBe('string');
      expect(Array.isArray(c.command)).toBe(true);
      expect(c.resources.requests.cpu).toMatch(/^\d+$/);
      expect(c.resources.requests.memory).toMatch(/^\d+Gi$/);
      expect(c.volumeMounts).toEqual([{ name: 'shared', mountPath: '/shared' }]);
      expect(pod.volumes[0].persistentVolumeClaim.claimName).toBe('heathours-shared');
    }
    for (const j of jobs.slice(0, 2)) {
      expect(j.spec.completionMode).toBe('Indexed');
      expect(j.spec.parallelism).toBeLessThanOrEqual(j.spec.completions);
    }
  });

  it('the Indexed Jobs cover shard slices 1..N and merge slices 1..M once each, on the folder the assemble Job joins', () => {
    const [shards, merge, assemble] = docs();
    const n = shards.spec.completions as number;
    const m = merge.spec.completions as number;
    const s = Array.from({ length: n }, (_, i) => argsAt(shards, i));
    expect(s.map((x) => /--shard (\d+)\/(\d+)/.exec(x)!.slice(1).map(Number))).toEqual(Array.from({ length: n }, (_, i) => [i + 1, n]));
    const t = Array.from({ length: m }, (_, i) => argsAt(merge, i));
    expect(t.map((x) => /--tile (\d+)\/(\d+)/.exec(x)!.slice(1).map(Number))).toEqual(Array.from({ length: m }, (_, i) => [i + 1, m]));
    const partials = /--partials (\S+)/.exec(s[0])![1];
    expect(/--merge (\S+)/.exec(t[0])![1]).toBe(partials);
    const cmd = assemble.spec.template.spec.containers[0].command as string[];
    expect(cmd[cmd.indexOf('--assemble') + 1]).toBe(partials);
  });

  it('the Slurm script submits the shard array, the merge array after it and the assemble step after that, K from SLURM_ARRAY_TASK_ID', () => {
    const m = /<!-- slurm-script[^>]*-->\n```sh\n([\s\S]*?)```/.exec(README);
    expect(m).not.toBeNull();
    const sh = m![1];
    expect(sh).toMatch(/--array=1-"\$SHARDS"[\s\S]*--shard \\\$\{SLURM_ARRAY_TASK_ID\}\/\$SHARDS --partials \$PARTIALS/);
    expect(sh).toMatch(/--array=1-"\$MERGES" --dependency=afterok:"\$shards"[\s\S]*--merge \$PARTIALS --tile \\\$\{SLURM_ARRAY_TASK_ID\}\/\$MERGES/);
    expect(sh).toMatch(/--dependency=afterok:"\$merges"[\s\S]*--assemble \$PARTIALS --out \$SITE/);
    expect(execFileSync('bash', ['-n'], { input: sh }).toString()).toBe('');
  });

  it('every build flag the examples use is one the CLI accepts', () => {
    const program = new Command();
    register(program);
    const known = new Set(program.commands.find((c) => c.name() === 'build')!.options.map((o) => o.long));
    const used = new Set(
      [...README.matchAll(/heathours(?:\.mjs)?"?,? "?build"?[^\n`]*(?:\\\n[^\n`]*)*/g)].flatMap((m) => [...m[0].matchAll(/--[a-z-]+/g)].map((f) => f[0])),
    );
    for (const d of blocks('yaml')
      .join('\n')
      .matchAll(/"(--[a-z-]+)"/g))
      used.add(d[1]);
    for (const d of blocks('sh')
      .join('\n')
      .matchAll(/ (--(?:shard|partials|jobs|memory|merge|tile|assemble|out|config|quiet))\b/g))
      used.add(d[1]);
    expect(used.size).toBeGreaterThan(8);
    for (const f of used) expect(known, f).toContain(f);
  });
});

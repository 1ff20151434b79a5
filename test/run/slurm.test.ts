/**
 * The README's Slurm script, verbatim, on a real one-node Slurm cluster started on this machine
 * (Debian's slurm-wlm and munge, test/helpers/slurm-cluster.ts): the shard array, the merge array
 * after it, then the assemble step, all as Slurm jobs running the installed command. The site they
 * publish is byte-identical to a one-machine build of the same invented small demo; the daemons
 * started are stopped by PID.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { execFileSync, spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { writeDemoDataset } from '../../pipeline/demo/index.ts';
import { startSlurmCluster, type SlurmCluster } from '../helpers/slurm-cluster.ts';
import { testAtlasYaml } from '../helpers/atlas-yaml.ts';
import { readTree, treeDifferences } from '../helpers/file-tree.ts';

const ROOT = new URL('../../', import.meta.url).pathname.replace(/\/$/, '');
const BUILD_TIME = '2026-06-01T00:00:00.000Z';
let dir = '';
let cluster: SlurmCluster | undefined;

/** The README block after the `slurm-script` marker. */
function readmeScript(): string {
  const readme = readFileSync(join(ROOT, 'README.md'), 'utf8');
  const m = /<!-- slurm-script[^>]*-->\n```sh\n([\s\S]*?)```/.exec(readme);
  if (!m) throw new Error('README.md has no Slurm script after a `<!-- slurm-script … -->` marker');
  return m[1];
}

beforeAll(async () => {
  dir = mkdtempSync(join(tmpdir(), 'hh-slurm-'));
  if (!existsSync(join(ROOT, 'compiled', 'cli.js'))) execFileSync('npm', ['run', 'compile'], { cwd: ROOT, stdio: 'ignore' });
  await writeDemoDataset({ outDir: join(dir, 'inputs'), years: [2021, 2022], layout: 'mixed', grid: 'small', quiet: true });
  writeFileSync(
    join(dir, 'atlas.yaml'),
    `${testAtlasYaml({ id: 'slurm', title: 'Slurm test atlas (invented data)', years: [2021, 2022], shards: '{ cellsPerTile: 16, cellsPerBlock: 12 }' })}`,
  );
  cluster = await startSlurmCluster(join(dir, 'slurm'));
}, 300_000);

afterAll(() => {
  cluster?.stop();
});

describe('the README Slurm script on a one-node Slurm cluster', () => {
  it('runs shards, merge and assemble as dependent Slurm jobs and publishes a site byte-identical to a one-machine build', async () => {
    const c = cluster!;
    writeFileSync(join(dir, 'heathours.sh'), readmeScript());
    const env = {
      ...c.env,
      HEATHOURS_BUILD_TIME: BUILD_TIME,
      HEATHOURS: ROOT,
      CONFIG: join(dir, 'atlas.yaml'),
      PARTIALS: join(dir, 'parts'),
      SITE: join(dir, 'site-slurm'),
      SHARDS: '4',
      MERGES: '2',
      CPUS: '1',
    };
    const submit = spawnSync('bash', [join(dir, 'heathours.sh')], { cwd: dir, env, encoding: 'utf8' });
    expect(submit.status, submit.stderr).toBe(0);
    const last = submit.stdout.trim().split('\n').pop()!.trim();
    expect(last).toMatch(/^\d+$/);
    // The three jobs: shard array, merge array, assemble (ids counted up from the first).
    const first = Number(last) - 2;
    const ids = [String(first), String(first + 1), last];
    await c.waitFor(ids, 1_200_000);
    for (const id of ids) {
      const states = c.jobStates(id);
      expect(states.length, `job ${id}`).toBeGreaterThan(0);
      for (const s of states) expect(s, `job ${id}`).toBe('COMPLETED');
    }
    expect(c.jobStates(String(first)).length).toBe(4);
    expect(c.jobStates(String(first + 1)).length).toBe(2);
    expect(
      readdirSync(join(dir, 'parts'))
        .filter((n) => n.startsWith('slice-'))
        .sort(),
    ).toEqual(['slice-1-of-4', 'slice-2-of-4', 'slice-3-of-4', 'slice-4-of-4']);
    expect(readdirSync(join(dir, 'parts', 'bands')).length).toBe(2);
    // One log a task, beside the partials (4 shard tasks + 2 merge tasks + the assemble step);
    // none in the repository, where the script changes directory to run the command.
    expect(readdirSync(join(dir, 'logs')).filter((n) => n.endsWith('.out')).length).toBe(7);
    expect(readdirSync(ROOT).filter((n) => /^slurm-.*\.out$/.test(n))).toEqual([]);

    // The same atlas on one machine.
    const one = spawnSync(
      process.execPath,
      [join(ROOT, 'bin/heathours.mjs'), 'build', '--config', join(dir, 'atlas.yaml'), '--out', join(dir, 'site-one'), '--no-cache', '--quiet'],
      {
        cwd: dir,
        env: { ...process.env, HEATHOURS_BUILD_TIME: BUILD_TIME },
        encoding: 'utf8',
      },
    );
    expect(one.status, one.stderr).toBe(0);
    const a = readTree(join(dir, 'site-one'));
    const b = readTree(join(dir, 'site-slurm'));
    expect(treeDifferences(a, b), 'files missing on one side or whose bytes differ').toEqual([]);
    expect(a.size).toBeGreaterThan(100);
  }, 1_500_000);
});

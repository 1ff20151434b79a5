/**
 * Distributed runs, the partial cache and the yearly rebuild, on the invented small demo
 * (8 × 10 cells at 1°, cut into tiles of about 16 land cells and years into quarters, so there are
 * many shards). Shard
 * commands run as separate processes, as a Kubernetes Indexed Job or a Slurm array would run them.
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { execFile, spawn } from 'node:child_process';
import { cpSync, existsSync, mkdirSync, mkdtempSync, readdirSync, readFileSync, rmSync, statSync, truncateSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { promisify } from 'node:util';
import { writeDemoDataset } from '../../pipeline/demo/index.ts';
import { buildAtlas, type BuildReport } from '../../pipeline/run/build-atlas.ts';
import { expectCataloguedAsync } from '../helpers/catalogued.ts';
import { CLI_TS } from '../helpers/cli.ts';
import { testAtlasYaml } from '../helpers/atlas-yaml.ts';
import { readTree, treeDifferences } from '../helpers/file-tree.ts';

const run = promisify(execFile);
const ROOT = new URL('../../', import.meta.url).pathname;
const CLI = CLI_TS;
const BUILD_TIME = '2026-06-01T00:00:00.000Z';
let dir = '';

function atlasYaml(opts: { years?: [number, number]; baseline?: [number, number]; classesFile?: string; title?: string; inputs?: string } = {}): string {
  const [y0, y1] = opts.years ?? [2021, 2023];
  const [b0, b1] = opts.baseline ?? [2021, 2022];
  return `${testAtlasYaml({ id: 'dist', title: opts.title ?? 'Distributed test atlas (invented data)', years: [y0, y1], baseline: [b0, b1], files: `${opts.inputs ?? 'inputs'}/*.nc`, shards: '{ cellsPerTile: 16, cellsPerBlock: 12 }', classesFile: opts.classesFile ?? join(ROOT, 'content/workload-classes.yaml') })}`;
}

function expectSameTree(a: string, b: string, except: string[] = []): void {
  const ta = readTree(a);
  const tb = readTree(b);
  for (const x of except) {
    ta.delete(x);
    tb.delete(x);
    // The manifest lists every artefact with its digest: drop the excepted one from both.
    for (const t of [ta, tb]) {
      const m = JSON.parse(t.get('manifest.json')!.toString('utf8')) as { artefacts: Array<{ path: string }> };
      m.artefacts = m.artefacts.filter((a) => !a.path.endsWith(`data/${x}`));
      t.set('manifest.json', Buffer.from(JSON.stringify(m)));
    }
  }
  expect(treeDifferences(ta, tb), 'files missing on one side or whose bytes differ').toEqual([]);
}

async function cli(args: string[]): Promise<{ stdout: string; stderr: string }> {
  return run(process.execPath, [CLI, ...args], { cwd: dir, env: { ...process.env, HEATHOURS_BUILD_TIME: BUILD_TIME }, maxBuffer: 32 << 20 });
}

/** Runs `heathours build --shard K/N` for K = 1..N, two processes at a time, then the merge. */
async function distributed(n: number, parts: string, out: string): Promise<void> {
  const ks = Array.from({ length: n }, (_, i) => i + 1);
  while (ks.length > 0) {
    await Promise.all(
      ks.splice(0, 2).map((k) => cli(['build', '--config', 'atlas.yaml', '--shard', `${k}/${n}`, '--partials', parts, '--jobs', '1', '--quiet'])),
    );
  }
  await cli(['build', '--config', 'atlas.yaml', '--merge', parts, '--out', out, '--data-only', '--quiet']);
}

function logged(): { lines: string[]; logger: { info: (m: string) => void; warn: (m: string) => void } } {
  const lines: string[] = [];
  return { lines, logger: { info: (m) => lines.push(m), warn: (m) => lines.push(`warning: ${m}`) } };
}

beforeAll(async () => {
  process.env.HEATHOURS_BUILD_TIME = BUILD_TIME;
  dir = mkdtempSync(join(tmpdir(), 'hh-dist-'));
  await writeDemoDataset({ outDir: join(dir, 'inputs'), years: [2021, 2022, 2023], layout: 'mixed', grid: 'small', quiet: true });
  writeFileSync(join(dir, 'atlas.yaml'), atlasYaml());
  await buildAtlas({ configPath: join(dir, 'atlas.yaml'), outDir: join(dir, 'ref'), jobs: 2, quiet: true, dataOnly: true, cache: false });
}, 300_000);

/** Runs `heathours build --merge DIR --tile K/N` for K = 1..N (two processes at a time), then `--assemble DIR`. */
async function mergeSlices(n: number, parts: string, out: string, only?: number[]): Promise<void> {
  const ks = only ?? Array.from({ length: n }, (_, i) => i + 1);
  while (ks.length > 0) {
    await Promise.all(ks.splice(0, 2).map((k) => cli(['build', '--config', 'atlas.yaml', '--merge', parts, '--tile', `${k}/${n}`, '--jobs', '1', '--quiet'])));
  }
  if (out) await cli(['build', '--config', 'atlas.yaml', '--assemble', parts, '--out', out, '--data-only', '--quiet']);
}

describe('distributed merge: heathours build --merge DIR --tile K/N, then --assemble DIR', () => {
  it('1, 2 and 3 merge processes over the blocks of rows give published outputs byte-identical to a one-machine build', async () => {
    await distributed(4, 'parts-m', 'out-m-whole');
    for (const n of [1, 2, 3]) {
      rmSync(join(dir, 'parts-m', 'bands'), { recursive: true, force: true });
      await mergeSlices(n, 'parts-m', `out-m-${n}`);
      expectSameTree(join(dir, 'ref/data'), join(dir, `out-m-${n}/data`));
    }
    // The grid has several blocks, so the slices really split the work.
    expect(readdirSync(join(dir, 'parts-m', 'bands')).length).toBeGreaterThanOrEqual(2);
  }, 600_000);

  it('the assemble step names missing blocks, refuses bands of another split or build, and publishes nothing; a retried merge task keeps its finished bands', async () => {
    const parts = join(dir, 'parts-m');
    rmSync(join(parts, 'bands'), { recursive: true, force: true });
    await mergeSlices(2, 'parts-m', '', [1]);
    const assemble = (out: string) =>
      buildAtlas({ configPath: join(dir, 'atlas.yaml'), assembleDir: parts, outDir: join(dir, out), jobs: 1, quiet: true, dataOnly: true });
    await expectCataloguedAsync(assemble('out-missing'), 'BandsIncomplete', /1 of the 2 blocks of rows have no merged band/);
    expect(existsSync(join(dir, 'out-missing'))).toBe(false);
    // The one slice of a split into 1 holds both blocks; slice 1 of 2 holds the first: one block in two bands.
    await mergeSlices(1, 'parts-m', '', [1]);
    await expectCataloguedAsync(assemble('out-dup'), 'BandsDuplicated', /is in the bands/);
    rmSync(join(parts, 'bands'), { recursive: true, force: true });
    await mergeSlices(2, 'parts-m', '', [1, 2]);
    // A retried task finds its bands done and keeps them.
    const before = readdirSync(join(parts, 'bands')).map((b) => statSync(join(parts, 'bands', b, 'band.json')).mtimeMs);
    const { lines, logger } = logged();
    await buildAtlas({ configPath: join(dir, 'atlas.yaml'), mergeDir: parts, mergeSlice: { k: 1, n: 2 }, outDir: join(dir, 'unused'), jobs: 1, logger });
    expect(lines.some((l) => /already merged by an earlier run: kept/.test(l))).toBe(true);
    expect(readdirSync(join(parts, 'bands')).map((b) => statSync(join(parts, 'bands', b, 'band.json')).mtimeMs)).toEqual(before);
    // A band of another build (here: its key changed by hand) is foreign.
    const one = readdirSync(join(parts, 'bands'))[0];
    const path = join(parts, 'bands', one, 'band.json');
    const band = JSON.parse(readFileSync(path, 'utf8'));
    writeFileSync(path, JSON.stringify({ ...band, key: 'f'.repeat(64) }));
    await expectCataloguedAsync(assemble('out-foreign'), 'BandsForeign', new RegExp(`band ${one} .*other inputs, configuration or code`));
    expect(existsSync(join(dir, 'out-foreign'))).toBe(false);
  }, 600_000);

  it('a bad --tile value is MergeSliceInvalid, and --tile without --merge a usage error', async () => {
    await expect(cli(['build', '--config', 'atlas.yaml', '--merge', 'parts-m', '--tile', '3/2'])).rejects.toMatchObject({
      stderr: expect.stringMatching(/MergeSliceInvalid/),
    });
    await expect(cli(['build', '--config', 'atlas.yaml', '--tile', '1/2'])).rejects.toMatchObject({
      stderr: expect.stringMatching(/--tile K\/N slices a distributed merge and needs --merge DIR/),
    });
  }, 120_000);
});

describe('distributed runs: heathours build --shard K/N --partials DIR, then --merge DIR', () => {
  it('1, 4 and 8 shard processes give published outputs byte-identical to a one-machine build', async () => {
    for (const n of [1, 4, 8]) {
      await distributed(n, `parts-${n}`, `out-${n}`);
      const slices = readdirSync(join(dir, `parts-${n}`));
      expect(slices.sort()).toEqual(Array.from({ length: n }, (_, i) => `slice-${i + 1}-of-${n}`).sort());
      expectSameTree(join(dir, 'ref/data'), join(dir, `out-${n}/data`));
    }
    const m = JSON.parse(readFileSync(join(dir, 'ref/data/manifest.json'), 'utf8')) as { counts: { shards: number } };
    expect(m.counts.shards, 'enough shards that 8 slices each get some').toBeGreaterThanOrEqual(16);
  }, 600_000);

  it('the merge names missing and duplicated shards, refuses partials of another configuration and damaged ones, and publishes nothing', async () => {
    const base = join(dir, 'parts-4');
    const variant = (name: string, change: (d: string) => void): string => {
      const d = join(dir, name);
      rmSync(d, { recursive: true, force: true });
      cpSync(base, d, { recursive: true });
      change(d);
      return d;
    };
    const cfg = join(dir, 'atlas.yaml');
    const merge = (parts: string, out: string) => buildAtlas({ configPath: cfg, mergeDir: parts, outDir: join(dir, out), quiet: true, dataOnly: true });

    const missing = variant('parts-missing', (d) => rmSync(join(d, 'slice-2-of-4', readdirSync(join(d, 'slice-2-of-4'))[0])));
    await expectCataloguedAsync(merge(missing, 'o-missing'), 'PartialsIncomplete', /1 of \d+ shard\(s\) have no partial.*t\d\d-y20\d\d/);
    const dup = variant('parts-dup', (d) => {
      const f = readdirSync(join(d, 'slice-1-of-4'))[0];
      mkdirSync(join(d, 'again'));
      cpSync(join(d, 'slice-1-of-4', f), join(d, 'again', f));
    });
    await expectCataloguedAsync(merge(dup, 'o-dup'), 'PartialsDuplicated', /shard t\d\d-y20\d\d(-m\d\d)? is in 2 partial files: again\/.*slice-1-of-4\//);
    const bad = variant('parts-bad', (d) => {
      const f = join(d, 'slice-3-of-4', readdirSync(join(d, 'slice-3-of-4'))[0]);
      truncateSync(f, statSync(f).size - 7);
    });
    await expectCataloguedAsync(merge(bad, 'o-bad'), 'PartialCorrupt', /slice-3-of-4.*checksum mismatch/);

    // The same partials against a configuration with another work shift: refused, naming why.
    writeFileSync(join(dir, 'atlas-shift.yaml'), atlasYaml().replace('work:\n', 'work:\n  shift: { start: 6, end: 14 }\n'));
    await expectCataloguedAsync(
      buildAtlas({ configPath: join(dir, 'atlas-shift.yaml'), mergeDir: base, outDir: join(dir, 'o-foreign'), quiet: true, dataOnly: true }),
      'PartialsForeign',
      /does not fit this build: work shift changed/,
    );
    for (const o of ['o-missing', 'o-dup', 'o-bad', 'o-foreign']) expect(existsSync(join(dir, o)), `${o} is not published`).toBe(false);
  }, 300_000);
});

describe('the partial cache and the yearly rebuild', () => {
  it('adding a year recomputes only the shards that read its file, and the result equals a full rebuild', async () => {
    const y = join(dir, 'yearly');
    mkdirSync(join(y, 'inputs'), { recursive: true });
    for (const f of ['era5-demo-2021.nc', 'era5-demo-2022.nc', 'era5-demo-lsm.nc']) cpSync(join(dir, 'inputs', f), join(y, 'inputs', f));
    writeFileSync(join(y, 'atlas.yaml'), atlasYaml({ years: [2021, 2022], baseline: [2021, 2022] }));
    const first = await buildAtlas({ configPath: join(y, 'atlas.yaml'), jobs: 2, quiet: true, dataOnly: true });
    expect(first.computed).toBe(first.shards);

    // A new year of data arrives: its file, and the configuration asks for it.
    cpSync(join(dir, 'inputs', 'era5-demo-2023.nc'), join(y, 'inputs', 'era5-demo-2023.nc'));
    writeFileSync(join(y, 'atlas.yaml'), atlasYaml({ years: [2021, 2023], baseline: [2021, 2022] }));
    const log = logged();
    const second = await buildAtlas({ configPath: join(y, 'atlas.yaml'), jobs: 2, dataOnly: true, logger: log.logger, quiet: true });
    // Local years are UTC−10: local 2022 ends at 2023-01-01 10:00 UTC, in the new file. Its
    // shards are cut where the UTC year changes (plan.ts), and each UTC year into local quarters,
    // so only the 10-hour pieces y2022-u2023-m12 and the new year's four quarters are computed;
    // 2021's five pieces and 2022's four quarters are reused.
    const tiles = second.shards / 14;
    expect(first.shards).toBe(9 * tiles);
    expect(second.computed).toBe(5 * tiles);
    expect(second.reused).toBe(9 * tiles);
    const said = log.lines.join('\n');
    expect(said).toMatch(/shards reused: \d+ — t00-y2021-m01, /);
    expect(said).toMatch(/recomputed \(not computed before\): \d+ — t00-y2022-u2023-m12, /);
    expect(said).not.toMatch(/reused: .*y2023/);
    expectSameTree(join(dir, 'ref/data'), join(y, 'out/data'), ['changes.json']);
    const changes = JSON.parse(readFileSync(join(y, 'out/data/changes.json'), 'utf8'));
    expect(changes.hasPrevious).toBe(true);
    expect(changes.yearsAdded).toEqual([2023]);
    expect(changes.inputs.added).toEqual(['era5-demo-2023.nc']);
    expect(changes.moves.length).toBeGreaterThan(0);
    expect(changes.moves.every((m: { statistic: string }) => m.statistic === 'latest' || m.statistic === 'mean' || m.statistic === 'p90')).toBe(true);

    // Nothing changed: everything is reused. A new title or baseline changes no partial either.
    const third = await buildAtlas({ configPath: join(y, 'atlas.yaml'), jobs: 2, quiet: true, dataOnly: true });
    expect([third.computed, third.reused]).toEqual([0, third.shards]);
    writeFileSync(join(y, 'atlas.yaml'), atlasYaml({ years: [2021, 2023], baseline: [2021, 2023], title: 'Another title (invented data)' }));
    const fourth = await buildAtlas({ configPath: join(y, 'atlas.yaml'), jobs: 2, quiet: true, dataOnly: true });
    expect(fourth.computed).toBe(0);
  }, 300_000);

  it('changing one workload class recomputes every shard and says why', async () => {
    const y = join(dir, 'yearly');
    const classes = readFileSync(join(ROOT, 'content/workload-classes.yaml'), 'utf8');
    expect(classes).toMatch(/metabolicRate: 415\b/);
    writeFileSync(join(y, 'classes.yaml'), classes.replace(/metabolicRate: 415\b/, 'metabolicRate: 430'));
    writeFileSync(join(y, 'atlas.yaml'), atlasYaml({ years: [2021, 2023], classesFile: join(y, 'classes.yaml') }));
    const log = logged();
    const r = await buildAtlas({ configPath: join(y, 'atlas.yaml'), jobs: 2, quiet: true, dataOnly: true, logger: log.logger });
    expect(r.computed).toBe(r.shards);
    expect(log.lines.join('\n')).toMatch(/work evaluations changed \(changed: high\); every class is counted in the same pass over the hourly WBGT/);
  }, 300_000);

  it('a truncated cache entry is caught by its checksum and recomputed; the output is unchanged', async () => {
    const y = join(dir, 'yearly');
    writeFileSync(join(y, 'atlas.yaml'), atlasYaml());
    await buildAtlas({ configPath: join(y, 'atlas.yaml'), jobs: 2, quiet: true, dataOnly: true });
    const cache = join(y, '.heathours-cache/dist');
    const victim = join(cache, 't01-y2022-m04.hhp');
    truncateSync(victim, Math.floor(statSync(victim).size / 2));
    const log = logged();
    const r = await buildAtlas({ configPath: join(y, 'atlas.yaml'), jobs: 2, quiet: true, dataOnly: true, logger: log.logger });
    expect(r.computed).toBe(1);
    expect(log.lines.join('\n')).toMatch(/recomputed \(cache entry damaged: .*t01-y2022-m04\.hhp: checksum mismatch.*\): 1 — t01-y2022-m04/);
    expectSameTree(join(dir, 'ref/data'), join(y, 'out/data'), ['changes.json']);
  }, 300_000);

  it('a build killed mid-way resumes from the partials it finished and gives the same outputs', async () => {
    const k = join(dir, 'killed');
    mkdirSync(k);
    cpSync(join(dir, 'inputs'), join(k, 'inputs'), { recursive: true });
    writeFileSync(join(k, 'atlas.yaml'), atlasYaml());
    const child = spawn(process.execPath, [CLI, 'build', '--config', 'atlas.yaml', '--data-only', '--jobs', '1', '--quiet'], {
      cwd: k,
      env: { ...process.env, HEATHOURS_BUILD_TIME: BUILD_TIME },
      stdio: 'ignore',
    });
    const cache = join(k, '.heathours-cache/dist');
    const done = () => (existsSync(cache) ? readdirSync(cache).filter((f) => f.endsWith('.hhp')).length : 0);
    const t0 = Date.now();
    while (done() < 3 && Date.now() - t0 < 120_000) await new Promise((r) => setTimeout(r, 100));
    child.kill('SIGKILL');
    await new Promise((r) => child.once('exit', r));
    const finished = done();
    expect(finished).toBeGreaterThanOrEqual(3);
    expect(existsSync(join(k, 'out/data/manifest.json')), 'the killed build published nothing').toBe(false);
    const r: BuildReport = await buildAtlas({ configPath: join(k, 'atlas.yaml'), jobs: 2, quiet: true, dataOnly: true });
    expect(r.reused).toBeGreaterThanOrEqual(finished);
    expect(r.computed).toBe(r.shards - r.reused);
    expectSameTree(join(dir, 'ref/data'), join(k, 'out/data'));
    expect(
      readdirSync(cache).filter((f) => f.endsWith('.tmp')),
      'temporary files of the killed writer are cleaned up',
    ).toEqual([]);
  }, 300_000);

  it('a second build on the same output stops with a clear error while the first one runs, and the first finishes intact', async () => {
    const cfg = join(dir, 'atlas.yaml');
    const out = join(dir, 'locked');
    const first = buildAtlas({ configPath: cfg, outDir: out, jobs: 1, quiet: true, dataOnly: true, cache: false });
    const t0 = Date.now();
    while (!existsSync(`${out}.build-lock`) && Date.now() - t0 < 30_000) await new Promise((r) => setTimeout(r, 20));
    await expectCataloguedAsync(
      buildAtlas({ configPath: cfg, outDir: out, jobs: 1, quiet: true, dataOnly: true, cache: false }),
      'BuildLocked',
      /already writing .*locked/,
    );
    await first;
    expectSameTree(join(dir, 'ref/data'), join(out, 'data'));
    expect(existsSync(`${out}.build-lock`)).toBe(false);
  }, 300_000);

  it('a bad --shard value is a catalogued error', async () => {
    for (const bad of ['0/4', '5/4', '2', 'a/b', '1/0']) {
      const r = await cli(['build', '--config', 'atlas.yaml', '--shard', bad, '--partials', 'p']).then(
        () => null,
        (e: { stderr: string; code: number }) => e,
      );
      expect(r?.code, bad).toBeGreaterThan(0);
      expect(r?.stderr, bad).toMatch(/ShardSliceInvalid|is not K\/N/);
    }
  }, 120_000);
});

/**
 * A full disk while a build publishes: the build stops with the catalogued DiskFull, the previous
 * atlas in the output folder is untouched, and no staging or scratch folder is left. The disk is a
 * real small tmpfs (mounted as root, as CI runs; the test says so if mounting is not allowed) filled
 * with a ballast file after a first, successful build. Invented small demo data (pipeline/demo).
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { spawnSync } from 'node:child_process';
import { createHash } from 'node:crypto';
import { mkdirSync, mkdtempSync, readFileSync, readdirSync, statfsSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { writeDemoDataset } from '../../pipeline/demo/index.ts';
import { buildAtlas } from '../../pipeline/run/build-atlas.ts';
import { expectCataloguedAsync } from '../helpers/catalogued.ts';
import { testAtlasYaml } from '../helpers/atlas-yaml.ts';

let dir = '';
let disk = '';

function digestTree(root: string): string {
  const h = createHash('sha256');
  const walk = (d: string) => {
    for (const e of readdirSync(d, { withFileTypes: true }).sort((a, b) => (a.name < b.name ? -1 : 1))) {
      const p = join(d, e.name);
      if (e.isDirectory()) walk(p);
      else h.update(p.slice(root.length)).update(readFileSync(p));
    }
  };
  walk(root);
  return h.digest('hex');
}

beforeAll(async () => {
  dir = mkdtempSync(join(tmpdir(), 'hh-full-'));
  disk = join(dir, 'disk');
  mkdirSync(disk);
  const m = spawnSync('mount', ['-t', 'tmpfs', '-o', 'size=48m', 'tmpfs', disk], { encoding: 'utf8' });
  if (m.status !== 0) throw new Error(`this test mounts a 48 MB tmpfs as a small disk and needs root: mount said ${m.stderr.trim()}`);
  await writeDemoDataset({ outDir: join(dir, 'inputs'), years: [2022, 2023], layout: 'mixed', grid: 'small', quiet: true });
  writeFileSync(join(dir, 'atlas.yaml'), `${testAtlasYaml({ id: 'full', title: 'Disk full test (invented data)', years: [2022, 2023], output: 'disk/out' })}`);
}, 300_000);

afterAll(() => {
  if (disk) spawnSync('umount', [disk]);
});

describe('a disk that fills up while the atlas is published', () => {
  it('stops the build with DiskFull, leaves the previous atlas as it was and no staging or scratch folder', async () => {
    const out = join(disk, 'out');
    await buildAtlas({ configPath: join(dir, 'atlas.yaml'), outDir: out, jobs: 2, quiet: true, dataOnly: true, cache: false });
    const before = digestTree(out);
    // Leave less free space than one more build needs.
    const free = (() => {
      const s = statfsSync(disk);
      return s.bavail * s.bsize;
    })();
    writeFileSync(join(disk, 'ballast'), Buffer.alloc(Math.max(0, free - 2 * 1024 * 1024)));
    const e = await expectCataloguedAsync(
      buildAtlas({ configPath: join(dir, 'atlas.yaml'), outDir: out, jobs: 2, quiet: true, dataOnly: true, cache: false }),
      'DiskFull',
      /no space left on the device/,
    );
    expect(e.hint).toMatch(/free space/);
    expect(digestTree(out)).toBe(before);
    expect(readdirSync(disk).sort()).toEqual(['ballast', 'out']);
  }, 300_000);
});

/**
 * `build` runs the coverage check before anything is computed: on the invented demo with the
 * year 2023 missing and 2022 downloaded twice, it stops with InputsIncomplete naming the missing
 * stamps (a whole year: 365 × 24 = 8760 h, counted from the calendar), the files on both sides,
 * the downloads that would hold them and the duplicated file, and publishes nothing.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { copyFileSync, existsSync, mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { writeDemoDataset } from '../../pipeline/demo/index.ts';
import { buildAtlas } from '../../pipeline/run/build-atlas.ts';
import { expectCataloguedAsync } from '../helpers/catalogued.ts';
import { testAtlasYaml } from '../helpers/atlas-yaml.ts';

let dir = '';

beforeAll(async () => {
  dir = mkdtempSync(join(tmpdir(), 'hh-coverage-build-'));
  await writeDemoDataset({ outDir: join(dir, 'inputs'), years: [2022, 2024], layout: 'legacy', grid: 'small', quiet: true });
  rmSync(join(dir, 'inputs/era5-demo-2023.nc'), { force: true });
  copyFileSync(join(dir, 'inputs/era5-demo-2022.nc'), join(dir, 'inputs/era5-demo-2022-again.nc'));
  writeFileSync(join(dir, 'atlas.yaml'), `${testAtlasYaml({ id: 'small', title: 'Small test atlas (invented data)', years: [2022, 2024] })}`);
}, 300_000);
afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe('the coverage check at the start of build', () => {
  it('a missing year and a duplicated year stop the build with InputsIncomplete naming the hours and files; nothing is published', async () => {
    const err = await expectCataloguedAsync(
      buildAtlas({ configPath: join(dir, 'atlas.yaml'), jobs: 1, quiet: true, dataOnly: true, cache: false }),
      'InputsIncomplete',
      /t2m: 8760 h missing, stamps 2023-01-01T01:00:00Z to 2024-01-01T00:00:00Z \(between era5-demo-2022-again\.nc and era5-demo-2024\.nc; the download\(s\) of 2023-01, .*, 2023-12, 2024-01 would hold them\)/,
    );
    expect(err.message).toMatch(
      /t2m: 8760 h twice with the same expver, stamps 2022-01-01T01:00:00Z to 2023-01-01T00:00:00Z, in era5-demo-2022-again\.nc and era5-demo-2022\.nc \(same values\)/,
    );
    expect(err.message).toContain('(every hour of every built year)');
    expect(existsSync(join(dir, 'out'))).toBe(false);
    expect(readdirSync(dir).filter((f) => f.includes('.stage-'))).toEqual([]);
  }, 300_000);

  it('built years past the data are still YearsOutsideData (checked on the span the coverage found, before completeness)', async () => {
    const cfg = join(dir, 'beyond.yaml');
    writeFileSync(
      cfg,
      readFileSync(join(dir, 'atlas.yaml'), 'utf8').replace('years: [2022, 2024]', 'years: [2022, 2026]').replace('output: out', 'output: out-beyond'),
    );
    await expectCataloguedAsync(buildAtlas({ configPath: cfg, jobs: 1, quiet: true, dataOnly: true, cache: false }), 'YearsOutsideData');
    expect(existsSync(join(dir, 'out-beyond'))).toBe(false);
  }, 300_000);
});

import { describe, expect, it } from 'vitest';
import { spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, readdirSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { writeDemoDataset } from '../../pipeline/demo/index.ts';
import { parseYears } from '../../pipeline/commands/demo-data.ts';
import { HeathoursError, errorCatalogue } from '../../pipeline/model/errors.ts';
import '../../pipeline/commands/catalogue.ts';
import { CLI_TS } from '../helpers/cli.ts';

const BIN = CLI_TS;

async function expectCode(p: Promise<unknown> | (() => unknown), code: string): Promise<HeathoursError> {
  try {
    if (typeof p === 'function') p();
    else await p;
  } catch (e) {
    expect(e).toBeInstanceOf(HeathoursError);
    expect((e as HeathoursError).code).toBe(code);
    expect((e as HeathoursError).hint.length).toBeGreaterThan(10);
    return e as HeathoursError;
  }
  throw new Error(`expected ${code}, nothing was thrown`);
}

describe('demo-data: bad options give catalogued errors and write nothing', () => {
  it('every demo error is in the catalogue', () => {
    const codes = errorCatalogue().map((e) => e.code);
    for (const c of ['DemoYearsInvalid', 'DemoYearOutOfRange', 'DemoLayoutUnknown', 'DemoGridInvalid', 'DemoSeedInvalid', 'DemoOutputUnwritable'])
      expect(codes).toContain(c);
  });

  it('--years 1800 is DemoYearOutOfRange and the output folder stays empty', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'heathours-bad-'));
    const err = await expectCode(
      writeDemoDataset({ outDir: dir, years: parseYears('1800'), layout: 'mixed', grid: 'small', quiet: true }),
      'DemoYearOutOfRange',
    );
    expect(err.message).toMatch(/1800/);
    expect(readdirSync(dir)).toEqual([]);
  });

  it('unreadable --years text is DemoYearsInvalid', async () => {
    await expectCode(() => parseYears('twenty'), 'DemoYearsInvalid');
    await expectCode(() => parseYears('2024-2020'), 'DemoYearsInvalid');
    expect(parseYears('2020-2022,2025')).toEqual([2020, 2021, 2022, 2025]);
  });

  it('--layout foo is DemoLayoutUnknown', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'heathours-bad-'));
    await expectCode(writeDemoDataset({ outDir: dir, years: [2020], layout: 'foo' as 'mixed', grid: 'small', quiet: true }), 'DemoLayoutUnknown');
    expect(readdirSync(dir)).toEqual([]);
  });

  it('a bad grid and a bad seed are catalogued', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'heathours-bad-'));
    await expectCode(
      writeDemoDataset({ outDir: dir, years: [2020], layout: 'mixed', grid: { nLat: 0, nLon: 3, resolution: 1 }, quiet: true }),
      'DemoGridInvalid',
    );
    await expectCode(writeDemoDataset({ outDir: dir, years: [2020], layout: 'mixed', grid: 'small', seed: -1, quiet: true }), 'DemoSeedInvalid');
    expect(readdirSync(dir)).toEqual([]);
  });

  it('an --out inside a regular file is DemoOutputUnwritable, and nothing is created', async () => {
    const base = mkdtempSync(join(tmpdir(), 'heathours-bad-'));
    const file = join(base, 'plain-file');
    writeFileSync(file, 'not a folder');
    const err = await expectCode(
      writeDemoDataset({ outDir: join(file, 'demo'), years: [2020], layout: 'mixed', grid: 'small', quiet: true }),
      'DemoOutputUnwritable',
    );
    expect(err.where.file).toBe(join(file, 'demo'));
    expect(readdirSync(base)).toEqual(['plain-file']);
  });

  it('the CLI prints the catalogued error with its hint and exits with status 2', () => {
    const dir = mkdtempSync(join(tmpdir(), 'heathours-bad-'));
    const out = join(dir, 'demo');
    for (const [args, code] of [
      [['--years', '1800'], 'DemoYearOutOfRange'],
      [['--layout', 'foo'], 'DemoLayoutUnknown'],
      [['--seed', 'x'], 'DemoSeedInvalid'],
      [['--grid', 'huge'], 'DemoGridInvalid'],
      [['--jobs', '0'], 'UsageError'],
    ] as const) {
      const r = spawnSync(process.execPath, [BIN, 'demo-data', '--out', out, ...args], { encoding: 'utf8' });
      expect(r.status).toBe(2);
      expect(r.stderr).toContain(`error [${code}]`);
      expect(r.stderr).toContain('hint:');
    }
    expect(existsSync(out)).toBe(false);
  }, 60_000);
});

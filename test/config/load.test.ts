import { describe, expect, it } from 'vitest';
import { mkdtempSync, writeFileSync, mkdirSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { loadConfig, parseConfig } from '../../pipeline/config/load.ts';
import { expectCatalogued as expectError } from '../helpers/catalogued.ts';

const demoText = readFileSync(new URL('../../content/atlas.yaml', import.meta.url), 'utf8');

describe('atlas configuration', () => {
  it('the shipped demo configuration content/atlas.yaml validates', () => {
    const c = parseConfig(demoText, 'content/atlas.yaml');
    expect(c.id).toBe('demo');
    expect(c.dataset.invented).toBe(true);
    expect(c.baseline[0]).toBeGreaterThanOrEqual(c.years[0]);
  });

  it('an unknown key is a ConfigInvalid error that names the key and the file', () => {
    const err = expectError(() => parseConfig(demoText + '\nyaers: [2020, 2021]\n', 'a.yaml'), 'ConfigInvalid', /unknown key\(s\) "yaers"/);
    expect(err.where.file).toBe('a.yaml');
  });

  it('a misspelt nested key is named with its path', () => {
    const bad = demoText.replace('threshold: 0.5', 'treshold: 0.5');
    expectError(() => parseConfig(bad, 'a.yaml'), 'ConfigInvalid', /dataset\.landSeaMask: unknown key\(s\) "treshold"/);
  });

  it('a configuration naming neither NetCDF files nor Zarr stores is a ConfigInvalid error; Zarr stores alone are enough', () => {
    const noInputs = demoText.replace(/^ {2}files:\n {4}- .*$/m, '  files: []');
    expect(noInputs).not.toBe(demoText);
    expectError(() => parseConfig(noInputs, 'a.yaml'), 'ConfigInvalid', /dataset\.files: name at least one input/);
    const zarrOnly = demoText.replace(/^ {2}files:\n {4}- .*$/m, '  zarr: [stores/era5.zarr, https://example.org/era5.zarr]');
    expect(parseConfig(zarrOnly, 'a.yaml').dataset).toMatchObject({ files: [], zarr: ['stores/era5.zarr', 'https://example.org/era5.zarr'] });
  });

  it('a value of the wrong type is a ConfigInvalid error naming the key', () => {
    const bad = demoText.replace('years: [2020, 2024]', 'years: "2020-2024"');
    expectError(() => parseConfig(bad, 'a.yaml'), 'ConfigInvalid', /years: /);
  });

  it('a baseline outside the years is rejected', () => {
    const bad = demoText.replace('baseline: [2020, 2023]', 'baseline: [1991, 2020]');
    expectError(() => parseConfig(bad, 'a.yaml'), 'ConfigInvalid', /baseline 1991-2020 lies outside years 2020-2024/);
  });

  it('an unknown IANA time zone is rejected', () => {
    const bad = demoText.replace('timeZone: Etc/GMT+10', 'timeZone: Mars/Olympus');
    expectError(() => parseConfig(bad, 'a.yaml'), 'ConfigInvalid', /unknown IANA time zone "Mars\/Olympus"/);
  });

  it('months per piece of a year must divide 12: 5 is a ConfigInvalid error naming shards.monthsPerPiece', () => {
    expectError(
      () => parseConfig(demoText + '\nshards: { monthsPerPiece: 5 }\n', 'a.yaml'),
      'ConfigInvalid',
      /shards\.monthsPerPiece: must be 1, 2, 3, 4, 6 or 12/,
    );
    expect(parseConfig(demoText + '\nshards: { monthsPerPiece: 12 }\n', 'a.yaml').shards.monthsPerPiece).toBe(12);
    expect(parseConfig(demoText, 'a.yaml').shards).toEqual({ cellsPerTile: 1024, cellsPerBlock: 1024, monthsPerPiece: 3 });
  });

  it('regionWorkbooks is a boolean, true by default; "no" is a ConfigInvalid error naming regionWorkbooks', () => {
    expect(parseConfig(demoText, 'a.yaml').regionWorkbooks).toBe(true);
    expect(parseConfig(demoText + '\nregionWorkbooks: false\n', 'a.yaml').regionWorkbooks).toBe(false);
    expectError(() => parseConfig(demoText + '\nregionWorkbooks: "no"\n', 'a.yaml'), 'ConfigInvalid', /regionWorkbooks: /);
  });

  it('broken YAML is a ConfigSyntax error', () => {
    expectError(() => parseConfig('id: [unclosed\n', 'a.yaml'), 'ConfigSyntax');
  });

  it('a second YAML document after "---" (was: silently ignored, its settings lost) is a ConfigSyntax error naming its line', () => {
    const lines = demoText.split('\n').length;
    expectError(
      () => parseConfig(`${demoText}---\nsite:\n  title: second\n`, 'a.yaml'),
      'ConfigSyntax',
      new RegExp(`holds 2 YAML documents \\(the second starts on line ${lines}, after "---"\\)`),
    );
    // One document with an explicit start marker, and a file of comments only, stay as they were.
    expect(parseConfig(`---\n${demoText}`, 'a.yaml').id).toBe('demo');
    expectError(() => parseConfig('# nothing here\n', 'a.yaml'), 'ConfigInvalid');
  });

  it("the demo's data line repeated 5,000 more times (fuzz mutants 3964 and, with a byte order mark and a second document, 4407 of seed 1) ends before any search of the disk: ConfigInvalid naming the pattern listed 5,001 times, ConfigSyntax for the second document (was: 5,001 searches, 2.5 s of CPU)", async () => {
    const line = '    - ../data/demo/*.nc';
    expect(demoText).toContain(`${line}\n`);
    const repeated = demoText.replace(`${line}\n`, `${line}\n`.repeat(5001));
    const dir = mkdtempSync(join(tmpdir(), 'hh-cfg-dup-'));
    for (const [text, code, re] of [
      [repeated, 'ConfigInvalid', /dataset\.files: "\.\.\/data\/demo\/\*\.nc" is listed 5001 times; name each input once/],
      [`\uFEFF${repeated}---\nx: 1\n`, 'ConfigSyntax', new RegExp(`holds 2 YAML documents \\(the second starts on line ${repeated.split('\n').length},`)],
    ] as const) {
      const file = join(dir, 'atlas.yaml');
      writeFileSync(file, text);
      let err: unknown;
      await loadConfig(file).catch((e) => (err = e));
      // Both come from parseConfig, which loadConfig runs before it searches the disk for any
      // input (measured on the mutants alone: 2.5 s → 0.38 s of CPU, the YAML parse of 5,000 lines).
      expectError(
        () => {
          throw err;
        },
        code,
        re,
      );
    }
    expectError(
      () => parseConfig(demoText.replace('files:', 'files: []\n  zarr: [a.zarr, b.zarr, a.zarr]\n  x_files:'), 'a.yaml'),
      'ConfigInvalid',
      /dataset\.zarr: "a\.zarr" is listed 2 times/,
    );
  });

  it('a missing config file, an input pattern that matches nothing and a missing regions folder are each catalogued', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'hh-config-'));
    await expect(loadConfig(join(dir, 'nope.yaml'))).rejects.toMatchObject({ code: 'ConfigNotFound' });
    const cfg = join(dir, 'atlas.yaml');
    // The demo's config without its workforce and scenarios (their files are checked on their own, below).
    const plain = demoText.replace(/^(workforce|scenarios):\n(?:(?: .*|#.*)?\n)*/gm, '');
    writeFileSync(cfg, plain.replace('../data/demo/*.nc', 'inputs/*.nc'));
    await expect(loadConfig(cfg)).rejects.toMatchObject({ code: 'ConfigInputMissing', where: { key: 'dataset.files' } });
    mkdirSync(join(dir, 'inputs'));
    writeFileSync(join(dir, 'inputs', 'a.nc'), 'x');
    await expect(loadConfig(cfg)).rejects.toMatchObject({ code: 'ConfigRegionsMissing', where: { key: 'regions' } });
    mkdirSync(join(dir, 'regions'));
    writeFileSync(join(dir, 'regions', 'r.geojson'), '{}');
    const ok = await loadConfig(cfg);
    expect(ok.inputFiles).toEqual([join(dir, 'inputs', 'a.nc')]);
    expect(ok.regionFiles).toEqual([join(dir, 'regions', 'r.geojson')]);
    // With the demo's workforce block, a raster that is not there is ConfigWorkforceFileMissing naming the key.
    writeFileSync(cfg, demoText.replace('../data/demo/*.nc', 'inputs/*.nc'));
    await expect(loadConfig(cfg)).rejects.toMatchObject({ code: 'ConfigWorkforceFileMissing', where: { key: 'workforce.raster' } });
  });
});

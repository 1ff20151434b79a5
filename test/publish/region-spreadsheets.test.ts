/**
 * Each region's spreadsheet downloads from a real build of the invented small test atlas
 * (test/site/pipeline-data.ts): `data/regions/<id>.wide.csv` (hours with the months across, the
 * unit in every month's header) and `data/regions/<id>.xlsx` (hours and temperatures by month,
 * assumptions, cautions), read back by outside readers — Python's csv module and openpyxl 3.0.9
 * (Debian's python3-openpyxl) — against the tidy table `data/regions/<id>.csv` they come from,
 * and listed in the manifest.
 */
import { execFile } from 'node:child_process';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { promisify } from 'node:util';
import { beforeAll, describe, expect, it } from 'vitest';
import { buildPipelineData } from '../site/pipeline-data.ts';
import { splitCsvRecord } from '../../pipeline/formats/csv.ts';
import { regionWideTables, regionWideTablesOf, wideCsv } from '../../pipeline/publish/region-wide-table.ts';
import { regionTableCsv } from '../../pipeline/publish/region-table.ts';
import { PERIODS } from '../../pipeline/reduce/figures.ts';
import type { RegionFigureNormals } from '../../pipeline/publish/figure-normals.ts';
import { existsSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { writeRegionSpreadsheets, type RegionSheetInfo } from '../../pipeline/publish/region-spreadsheets.ts';

const run = promisify(execFile);
let dataDir = '';

beforeAll(async () => {
  dataDir = (await buildPipelineData()).dataDir;
}, 600_000);

const MONTHS = ['Jan', 'Feb', 'Mar', 'Apr', 'May', 'Jun', 'Jul', 'Aug', 'Sep', 'Oct', 'Nov', 'Dec'];

function tidy(id: string): Map<string, string> {
  const lines = readFileSync(join(dataDir, 'data/regions', `${id}.csv`), 'utf8')
    .trim()
    .split('\n');
  const head = splitCsvRecord(lines[0])!;
  const m = new Map<string, string>();
  for (const l of lines.slice(1)) {
    const r = Object.fromEntries(splitCsvRecord(l)!.map((v, i) => [head[i], v]));
    m.set([r.period, r.figure, r.workload_class, r.acclimatization, r.exposure, r.method, r.statistic].join('|'), r.value);
  }
  return m;
}

describe('region spreadsheets', () => {
  it('the wide CSV, read by Python’s csv module, has one row per figure × class × acclimatization × exposure × method × statistic in hours, the months and the year across with “[h per worker]” in each header, and the tidy table’s values', async () => {
    const id = 'sollent-coast';
    const py = await run('/usr/bin/python3', [
      '-c',
      'import csv, json, sys; print(json.dumps(list(csv.reader(open(sys.argv[1], encoding="utf-8-sig")))))',
      join(dataDir, 'data/regions', `${id}.wide.csv`),
    ]);
    const rows = JSON.parse(py.stdout) as string[][];
    const head = rows[0];
    expect(head.slice(0, 7)).toEqual(['figure', 'figure_label', 'workload_class', 'acclimatization', 'exposure', 'method', 'statistic']);
    expect(head.slice(7, 20)).toEqual([...MONTHS.map((m) => `${m} [h per worker]`), 'Year [h per worker]']);
    const t = tidy(id);
    const hourKeys = new Set([...t.keys()].filter((k) => k.startsWith('01|')).map((k) => k.slice(3)));
    const hoursFigures = ['hours-above-limit-shift', 'hours-above-limit-all', 'hours-lost-shift', 'capacity-loss-shift'];
    expect(rows.length - 1).toBe([...hourKeys].filter((k) => hoursFigures.includes(k.split('|')[0])).length);
    let checked = 0;
    for (const r of rows.slice(1)) {
      expect(hoursFigures).toContain(r[0]);
      expect(r[1].length).toBeGreaterThan(10);
      for (let p = 0; p < 13; p++) {
        const period = p < 12 ? String(p + 1).padStart(2, '0') : 'year';
        const want = t.get([period, r[0], ...r.slice(2, 7)].join('|'))!;
        expect(r[7 + p], `${r[0]} ${r.slice(2, 7).join(' ')} ${period}`).toBe(want);
        checked++;
      }
    }
    expect(checked).toBeGreaterThan(1000);
  });

  it('the workbook, read by openpyxl, holds the hours and temperatures by month (numbers, as in the tidy table), the assumptions with the invented-data label, the build and the work settings, and every caution', async () => {
    const id = 'kell-highlands';
    const py = await run(
      '/usr/bin/python3',
      [
        '-c',
        [
          'import json, sys, openpyxl',
          'wb = openpyxl.load_workbook(sys.argv[1], read_only=True)',
          'print(json.dumps({ws.title: [list(r) for r in ws.iter_rows(values_only=True)] for ws in wb.worksheets}, default=str))',
        ].join('\n'),
        join(dataDir, 'data/regions', `${id}.xlsx`),
      ],
      { maxBuffer: 1 << 26 },
    );
    const book = JSON.parse(py.stdout) as Record<string, Array<Array<string | number | null>>>;
    // The test atlas weights by an invented people raster, so the workforce sheets sit between (pipeline/publish/region-spreadsheets.ts WORKFORCE_SHEETS).
    expect(Object.keys(book)).toEqual([
      'Hours by month',
      'Temperatures by month',
      'Person-hours by month',
      'Full-time equivalents by month',
      'Outdoor time lost by month',
      'Person-hours per km² by month',
      'Assumptions',
      'Cautions',
    ]);
    const t = tidy(id);
    const hours = book['Hours by month'];
    expect(hours[0][7]).toBe('Jan [h per worker]');
    expect(book['Temperatures by month'][0][7]).toBe('Jan [°C]');
    const row = hours.find((r) => r[0] === 'hours-lost-shift' && r[2] === 'moderate' && r[3] === 'acclimatized' && r[4] === 'sun' && r[6] === 'p90')!;
    for (let m = 0; m < 12; m++) {
      const want = Number(t.get([String(m + 1).padStart(2, '0'), 'hours-lost-shift', 'moderate', 'acclimatized', 'sun', 'limit', 'p90'].join('|')));
      expect(row[7 + m]).toBe(want);
      expect(typeof row[7 + m]).toBe('number');
    }
    const wbgt = book['Temperatures by month'].find((r) => r[0] === 'wbgt-mean' && r[4] === 'sun' && r[6] === 'mean')!;
    expect(wbgt[7 + 6]).toBe(Number(t.get(['07', 'wbgt-mean', '', '', 'sun', '', 'mean'].join('|'))));
    const assumptions = JSON.stringify(book.Assumptions);
    expect(assumptions).toContain('INVENTED DATA');
    expect(assumptions).toContain('Kell');
    expect(assumptions).toMatch(/Baseline/);
    expect(assumptions).toMatch(/Limit model/);
    const manifest = JSON.parse(readFileSync(join(dataDir, 'data/manifest.json'), 'utf8')) as {
      buildTime: string;
      work: { cautions: Array<{ text: string }> };
      artefacts: Array<{ path: string; kind: string; description: string }>;
    };
    expect(assumptions).toContain(manifest.buildTime);
    expect(book.Cautions.slice(1).map((r) => r[0])).toEqual(manifest.work.cautions.map((c) => c.text));
    // Both files are listed in the manifest as tables with their own descriptions.
    for (const p of [`data/regions/${id}.wide.csv`, `data/regions/${id}.xlsx`]) {
      const a = manifest.artefacts.find((x) => x.path === p)!;
      expect(a.kind).toBe('table');
      expect(a.description).toMatch(/spreadsheets|workbook/);
    }
  });

  it('regionWideTables keeps hours and temperatures apart and leaves an empty cell empty', () => {
    const text =
      'region_id,period,figure,workload_class,acclimatization,exposure,method,statistic,value,unit,years_used,baseline\n' +
      'x,01,hours-lost-shift,low,acclimatized,sun,limit,mean,1.5,h,3,2001-2003\n' +
      'x,02,hours-lost-shift,low,acclimatized,sun,limit,mean,,h,2,2001-2003\n' +
      'x,01,wbgt-mean,,,sun,,mean,21.25,degC,3,2001-2003\n';
    const [h, c] = regionWideTables(text, new Map([['hours-lost-shift', 'Hours lost']]));
    expect(h.unit).toBe('h');
    expect(h.rows).toHaveLength(1);
    expect(h.rows[0].keys[1]).toBe('Hours lost');
    expect(h.rows[0].values[0]).toBe(1.5);
    expect(Number.isNaN(h.rows[0].values[1])).toBe(true);
    expect(h.rows[0].yearsUsed).toBe(2);
    expect(c.unit).toBe('degC');
    expect(c.header[7]).toBe('Jan [°C]');
  });

  it('a quoted line (a label with a comma) gives the same wide row as the same line split directly, as RFC 4180 reads it', () => {
    const head = 'region_id,period,figure,workload_class,acclimatization,exposure,method,statistic,value,unit,years_used,baseline\n';
    const plain = regionWideTables(head + 'x,01,hours-lost-shift,low,acclimatized,sun,limit,mean,1.5,h,3,2001-2003\n', new Map());
    const quoted = regionWideTables(head + '"x","01","hours-lost-shift","low","acclimatized","sun","limit","mean","1.5","h","3","2001-2003"\n', new Map());
    expect(quoted).toEqual(plain);
    const comma = regionWideTables(head + 'x,01,hours-lost-shift,"low, light",acclimatized,sun,limit,mean,2,h,3,2001-2003\n', new Map());
    expect(comma[0].rows[0].keys[2]).toBe('low, light');
    expect(comma[0].rows[0].values[0]).toBe(2);
  });

  it("regionWideTables gives the same tables from a real region table whether its columns come in the pipeline's order (one slice per line) or in another order (every line split)", () => {
    const text = readFileSync(join(dataDir, 'data/regions', 'varn-shore.csv'), 'utf8');
    const lines = text
      .trim()
      .split('\n')
      .map((l) => l.split(','));
    const order = [11, 0, 10, 9, 8, 7, 6, 5, 4, 3, 2, 1];
    const moved = `${lines.map((f) => order.map((i) => f[i]).join(',')).join('\n')}\n`;
    const labels = new Map([['hours-lost-shift', 'Hours lost']]);
    const own = regionWideTables(text, labels);
    expect(own[0].rows.length).toBeGreaterThan(50);
    expect(regionWideTables(moved, labels)).toEqual(own);
  });

  it('the wide tables made from the figures (the build) equal those read back from the tidy table written of them: empty values, -0, missing years and trends included', () => {
    let seed = 11;
    const rnd = () => (seed = (seed * 1103515245 + 12345) % 2147483648) / 2147483648;
    const value = () => {
      const x = rnd();
      return x < 0.1 ? Number.NaN : x < 0.15 ? Number.POSITIVE_INFINITY : (rnd() - 0.3) * 10 ** Math.floor(rnd() * 8 - 3);
    };
    const defs = [
      { id: 'hours-above-limit', units: 'h', combos: ['light.acclimatized.sun', 'heavy.unacclimatized.shade'] },
      { id: 'mean-temperature', units: 'degC', combos: ['air', 'sun'] },
      { id: 'capacity-loss-shift', units: '%', combos: ['iso.sun'] },
      { id: 'person-hours-lost', units: 'person-h', combos: ['all', 'light'] },
      { id: 'hours-lost-shift', units: 'h', combos: ['light.acclimatized.sun'] },
    ];
    const labels = new Map([
      ['hours-above-limit', 'Hours above'],
      ['mean-temperature', 'Mean "air", °C'],
    ]);
    for (let t = 0; t < 40; t++) {
      const figures = defs.map((def) => {
        const n = PERIODS * def.combos.length;
        const arr = () => Float64Array.from({ length: n }, value);
        const nC = def.combos.length;
        return {
          def,
          region: {
            mean: arr(),
            median: arr(),
            p90: arr(),
            min: arr(),
            max: arr(),
            latest: arr(),
            yearsUsed: Float64Array.from({ length: n }, () => (rnd() < 0.1 ? Number.NaN : Math.floor(rnd() * 30))),
          },
          worstValue: arr(),
          trend:
            rnd() < 0.3
              ? undefined
              : {
                  slopePerDecade: Float64Array.from({ length: nC }, value),
                  pValue: Float64Array.from({ length: nC }, () => rnd() ** 8),
                  years: Float64Array.from({ length: nC }, () => Math.floor(rnd() * 30)),
                },
        } as unknown as RegionFigureNormals;
      });
      const built = t % 2 ? ([1980, 2023] as const) : undefined;
      const read = regionWideTables(regionTableCsv(`r-${t}`, figures, [1991, 2020], 2023, built), labels);
      const made = regionWideTablesOf(figures, labels, [1991, 2020], 2023, built);
      expect(made).toStrictEqual(read);
      expect(made.map(wideCsv)).toEqual(read.map(wideCsv));
    }
  });

  it('with regionWorkbooks false (config), a region gets its wide CSV and no workbook; with the default it gets both', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'hh-wb-'));
    try {
      const text = readFileSync(join(dataDir, 'data/regions', 'sollent-coast.csv'), 'utf8');
      const info: RegionSheetInfo = {
        atlasTitle: 'Test atlas (invented data)',
        invented: true,
        attribution: '',
        buildTime: '2026-01-01T00:00:00.000Z',
        codeVersion: 't',
        configDigest: 'c',
        inputFiles: 1,
        years: [2021, 2023],
        baseline: [2021, 2022],
        timeZone: 'Etc/GMT+10',
        work: [],
        classes: [],
        figureLabels: new Map(),
        statistics: {},
        cautions: [],
      };
      await writeRegionSpreadsheets(dir, { id: 'a', name: 'A' }, regionWideTables(text, info.figureLabels), info, false);
      expect(existsSync(join(dir, 'regions/a.wide.csv'))).toBe(true);
      expect(existsSync(join(dir, 'regions/a.xlsx'))).toBe(false);
      await writeRegionSpreadsheets(dir, { id: 'b', name: 'B' }, regionWideTables(text, info.figureLabels), info);
      expect(existsSync(join(dir, 'regions/b.wide.csv'))).toBe(true);
      expect(existsSync(join(dir, 'regions/b.xlsx'))).toBe(true);
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  });
});

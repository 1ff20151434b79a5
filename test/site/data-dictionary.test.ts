/**
 * The data dictionary (`data/data-dictionary.csv`, pipeline/publish/data-dictionary.ts) of the
 * pipeline-made test atlas: it explains every column and every code that the region tables and
 * the cell tables hold, with a label and the unit in words, and a spreadsheet reads it as UTF-8.
 * Outside check: Python's csv module (Debian's python3) reads the dictionary with the
 * `utf-8-sig` codec, as a spreadsheet-minded reader would, and the tables with plain UTF-8.
 */
import { execFileSync } from 'node:child_process';
import { readFileSync, readdirSync } from 'node:fs';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { buildPipelineData } from './pipeline-data.ts';
import { DATA_DICTIONARY_COLUMNS, DATA_DICTIONARY_PATH, dataDictionaryCsv, figureWords } from '../../pipeline/publish/data-dictionary.ts';
import { CELL_TABLE_COLUMNS } from '../../pipeline/publish/cell-table.ts';
import { REGION_TABLE_COLUMNS } from '../../pipeline/publish/region-table.ts';

let dataDir = '';
let warningsPath = '';

beforeAll(async () => {
  ({ dataDir, warningsPath } = await buildPipelineData());
}, 600_000);

/** Rows of CSV files as Python's csv.DictReader reads them, with the header of each. */
function pythonCsv(paths: string[], encoding: string): Array<{ header: string[]; rows: Array<Record<string, string>> }> {
  const code = [
    'import csv, json, sys',
    'out = []',
    'for p in json.loads(sys.argv[1]):',
    '    with open(p, newline="", encoding=sys.argv[2]) as f:',
    '        r = csv.DictReader(f)',
    '        rows = list(r)',
    '        out.append({"header": r.fieldnames, "rows": rows})',
    'print(json.dumps(out))',
  ].join('\n');
  return JSON.parse(
    execFileSync('/usr/bin/python3', ['-c', code, JSON.stringify(paths), encoding], { encoding: 'utf8', maxBuffer: 256 * 1024 * 1024 }),
  ) as Array<{ header: string[]; rows: Array<Record<string, string>> }>;
}

describe('the data dictionary beside the tables', () => {
  it('starts with a UTF-8 byte-order mark, and Python reads its columns with utf-8-sig', () => {
    const path = join(dataDir, DATA_DICTIONARY_PATH);
    expect([...readFileSync(path).subarray(0, 3)]).toEqual([0xef, 0xbb, 0xbf]);
    const [dict] = pythonCsv([path], 'utf-8-sig');
    expect(dict.header).toEqual([...DATA_DICTIONARY_COLUMNS]);
    expect(dict.rows.every((r) => r.label !== '')).toBe(true);
  });

  it('explains every column, and every code found in the region tables and the cell table, with a label; hour figures carry their unit in words', () => {
    const [dict] = pythonCsv([join(dataDir, DATA_DICTIONARY_PATH)], 'utf-8-sig');
    // The tidy region tables (the wide ones carry their labels and units in their own header) and the cell tables.
    const regionFiles = readdirSync(join(dataDir, 'data/regions'))
      .filter((f) => f.endsWith('.csv') && !f.endsWith('.wide.csv'))
      .map((f) => join(dataDir, 'data/regions', f));
    const cellFiles = readdirSync(join(dataDir, 'data/cell-tables'))
      .filter((f) => f.endsWith('.csv'))
      .map((f) => join(dataDir, 'data/cell-tables', f));
    expect(cellFiles.length).toBeGreaterThan(0);
    const tables = pythonCsv([...regionFiles, ...cellFiles], 'utf-8');
    const columnRow = (table: string, column: string) => dict.rows.find((r) => r.table === table && r.column === column && r.code === '');
    for (const c of REGION_TABLE_COLUMNS) expect(columnRow('regions/<region-id>.csv', c), c).toBeDefined();
    for (const c of CELL_TABLE_COLUMNS) expect(columnRow('cell-tables/rows-<first>-<last>.csv', c), c).toBeDefined();
    // The tables keep their columns and their order.
    for (const t of tables.slice(0, regionFiles.length)) expect(t.header).toEqual([...REGION_TABLE_COLUMNS]);
    for (const t of tables.slice(regionFiles.length)) expect(t.header).toEqual([...CELL_TABLE_COLUMNS]);
    const coded = ['period', 'figure', 'workload_class', 'acclimatization', 'exposure', 'method', 'statistic', 'unit', 'baseline'];
    const codes = new Map(coded.map((c) => [c, new Set<string>()]));
    for (const t of tables) for (const r of t.rows) for (const c of coded) if (r[c] !== undefined && r[c] !== '') codes.get(c)!.add(r[c]);
    let checked = 0;
    for (const [column, values] of codes) {
      for (const v of values) {
        const row = dict.rows.find((r) => r.column === column && r.code === v);
        expect(row, `${column} = ${v}`).toBeDefined();
        expect(row!.label.length, `${column} = ${v}`).toBeGreaterThan(2);
        checked += 1;
      }
    }
    expect(checked).toBeGreaterThan(40);
    const lost = dict.rows.find((r) => r.column === 'figure' && r.code === 'hours-lost-shift')!;
    expect(lost).toMatchObject({ unit: 'h', unit_in_words: 'hours per worker per month or year', label: figureWords('hours-lost-shift').label });
    expect(dict.rows.find((r) => r.column === 'unit' && r.code === 'degC')!.unit_in_words).toBe('degrees Celsius');
    // The workforce rows (the test atlas weights by the demo's invented population): their figures, codes and units are explained too.
    expect(dict.rows.find((r) => r.column === 'figure' && r.code === 'person-hours-lost-shift')).toMatchObject({
      unit: 'person-h',
      unit_in_words: 'person-hours',
    });
    expect(dict.rows.find((r) => r.column === 'figure' && r.code === 'full-time-equivalents-lost')).toMatchObject({ unit: 'FTE' });
    expect(dict.rows.find((r) => r.column === 'workload_class' && r.code === 'all')!.label).toBe('All outdoor work');
    for (const column of ['acclimatization', 'exposure'])
      expect(
        dict.rows.find((r) => r.column === column && r.code === 'by-shares'),
        column,
      ).toBeDefined();
    for (const unit of ['person-h', 'person-h km-2', 'FTE', '%'])
      expect(
        dict.rows.find((r) => r.column === 'unit' && r.code === unit),
        unit,
      ).toBeDefined();
  });

  it("labels the P90 honestly for the test atlas's 2-year baseline: its number of years, and that it is not a 1-in-10 year", () => {
    const [dict] = pythonCsv([join(dataDir, DATA_DICTIONARY_PATH)], 'utf-8-sig');
    const p90 = dict.rows.find((r) => r.column === 'statistic' && r.code === 'p90')!;
    expect(p90.label).toBe('P90 of 2 years (near the highest)');
    expect(p90.description).toContain('it is not a 1-in-10 year');
    expect(p90.description).not.toContain('exceeded in about 1 year in 10');
  });

  it("the build warned about the test atlas's 2-year baseline, once, naming it and the rule", () => {
    const lines = readFileSync(warningsPath, 'utf8')
      .split('\n')
      .filter((l) => /baseline/.test(l));
    expect(lines).toHaveLength(1);
    expect(lines[0]).toMatch(/the baseline 2021–2022 has 2 years, fewer than the 10 a 90th-percentile \(P90\) year needs/);
  });

  it('a label with a comma or a quote is quoted, so a spreadsheet keeps it in one cell (RFC 4180, read back by Python)', () => {
    const text = dataDictionaryCsv({
      figures: [{ id: 'hours-lost-shift', label: 'Lost, "per worker"', units: 'h' }],
      classes: [{ id: 'x', name: 'Odd, "quoted" class', metabolicRate: 300, description: 'a, b' }],
      acclimatization: ['acclimatized'],
      exposures: ['sun'],
      lossViews: [],
      statistics: { mean: 'mean, of the years' },
      baseline: [2021, 2022],
      latestYear: 2023,
    });
    const code = 'import csv, io, json, sys; print(json.dumps(list(csv.DictReader(io.StringIO(sys.stdin.read())))))';
    const rows = JSON.parse(execFileSync('/usr/bin/python3', ['-c', code], { input: text.replace(/^\ufeff/, ''), encoding: 'utf8' })) as Array<
      Record<string, string>
    >;
    expect(rows.find((r) => r.code === 'x')!.label).toBe('Odd, "quoted" class (300 W)');
    expect(rows.find((r) => r.code === 'hours-lost-shift')!.description).toBe('Lost, "per worker"; the year row: sum of the months');
  });
});

/**
 * The pipeline's CSV reader and writer (pipeline/formats/csv.ts), checked against Python's csv
 * module (the standard library of Debian's python3, an independent RFC 4180 implementation):
 * what we write, Python reads field for field, and what Python writes, we read.
 */
import { describe, expect, it } from 'vitest';
import { execFileSync } from 'node:child_process';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { CsvParser, MAX_RECORD_CHARS, csvLine, type CsvRecord } from '../../pipeline/formats/csv.ts';
import { readCsvRecords } from '../../pipeline/formats/csv-file.ts';
import { expectCatalogued } from '../helpers/catalogued.ts';

const dir = mkdtempSync(join(tmpdir(), 'hh-csv-'));
const ROWS = [
  ['site', 'note', 'x'],
  ['Yard, north', 'say "hi"', '1.5'],
  ['two\nlines', '', '-3'],
  ['ünïcödé °C', ' spaced ', '1e3'],
];

function parseAll(text: string, pieces = 1): CsvRecord[] {
  const p = new CsvParser('mem.csv');
  const out: CsvRecord[] = [];
  const step = Math.max(1, Math.ceil(text.length / pieces));
  for (let i = 0; i < text.length; i += step) out.push(...p.push(text.slice(i, i + step)));
  out.push(...p.end());
  return out;
}

describe('CSV reading and writing (RFC 4180)', () => {
  it("what csvLine writes, Python's csv module reads back field for field", () => {
    const path = join(dir, 'ours.csv');
    writeFileSync(path, ROWS.map(csvLine).join(''));
    const py = execFileSync(
      '/usr/bin/python3',
      ['-c', 'import csv,json,sys; print(json.dumps(list(csv.reader(open(sys.argv[1], newline="", encoding="utf-8")))))', path],
      { encoding: 'utf8' },
    );
    expect(JSON.parse(py)).toEqual(ROWS);
  });

  it("what Python's csv module writes (CRLF, a byte order mark added as spreadsheets do), we read, with each record's first line", async () => {
    const path = join(dir, 'python.csv');
    execFileSync('/usr/bin/python3', [
      '-c',
      'import csv,json,sys; f=open(sys.argv[1],"w",newline="",encoding="utf-8-sig"); csv.writer(f).writerows(json.loads(sys.argv[2])); f.close()',
      path,
      JSON.stringify(ROWS),
    ]);
    const recs: CsvRecord[] = [];
    for await (const r of readCsvRecords(path)) recs.push(r);
    expect(recs.map((r) => r[1])).toEqual(ROWS);
    expect(recs.map((r) => r[0])).toEqual([1, 2, 3, 5]);
  });

  it('pieces of any size, LF, CRLF or CR line ends and blank lines give the same records', () => {
    const lf = 'a,b\n1,"x\ny"\n\n2,3\n';
    const want = parseAll(lf).map((r) => r[1]);
    expect(want).toEqual([
      ['a', 'b'],
      ['1', 'x\ny'],
      ['2', '3'],
    ]);
    for (const t of [lf, lf.replace(/\n/g, '\r\n'), lf.replace(/\n/g, '\r'), `\ufeff${lf}`, lf.trimEnd()]) {
      for (const pieces of [1, 3, t.length]) expect(parseAll(t, pieces).map((r) => r[1])).toEqual(want);
    }
  });

  it('an unclosed quote, text after a closing quote, a quote inside an unquoted field and an endless record are CsvMalformed naming the line', () => {
    expectCatalogued(() => parseAll('a,b\n1,"open\n2,3\n'), 'CsvMalformed', /opened on line 2 is never closed[\s\S]*row 2/);
    expectCatalogued(() => parseAll('a,b\n"x"y,1\n'), 'CsvMalformed', /line 2, field 1: text after the closing quote/);
    expectCatalogued(() => parseAll('a,b\nx"y,1\n'), 'CsvMalformed', /line 2, field 1: a quote inside an unquoted field/);
    expectCatalogued(
      () => parseAll(`a,b\n"${'x'.repeat(MAX_RECORD_CHARS)}`),
      'CsvMalformed',
      /longer than \d+ characters \(a quote opened in it is never closed\)/,
    );
  });
});

/**
 * The site stage reads each region table once, as bytes (src/data/region-table-scan.ts), for the
 * rows the pages show and the map layers' values. Claims: on the tables the real pipeline writes
 * (the site-test atlas, record and scenario) it gives the same rows as parseRegionTable and the
 * same value for every layer as regionTableValues (the careful readers the pages used before);
 * it declines (undefined) every table that is not plainly the pipeline's, so those go to the
 * careful readers and their catalogued errors; and a key that several layers share fills all of
 * them. The reference here is the project's own RFC 4180 readers (test/site/region-table.test.ts
 * checks those against hand-written tables).
 */
import { readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { scanRegionTable, WantedKeys } from '../../src/data/region-table-scan.ts';
import { parseRegionTable } from '../../src/data/region-table.ts';
import { regionTableValues, regionValuesReader } from '../../src/data/region-values.ts';
import { loadManifestLayers } from '../../src/data/manifest-layers.ts';
import { DIGEST_KEEP } from '../../src/data/site-digest.ts';
import type { ManifestLayer } from '../../src/data/manifest-layers.ts';
import { buildPipelineData, PIPELINE_DATA_SCENARIO } from './pipeline-data.ts';

let dataDir: string;
let layers: ManifestLayer[];
let scenarioLayers: ManifestLayer[];

beforeAll(async () => {
  ({ dataDir } = await buildPipelineData({ withScenario: true }));
  const m = loadManifestLayers(dataDir)!;
  layers = m.layers;
  scenarioLayers = m.scenarios?.find((s) => s.id === PIPELINE_DATA_SCENARIO.id)?.layers ?? [];
}, 600_000);

/** The careful readers' answer for one table: rows kept and each layer's value (null where none). */
function careful(text: string, id: string, ls: ManifestLayer[]) {
  const reader = regionValuesReader(ls);
  const table = regionTableValues(text, 'table.csv', reader.statistics);
  return {
    rows: parseRegionTable(text, 'table.csv', id, DIGEST_KEEP),
    values: reader.keys.map((k) => {
      const v = k === '' ? undefined : table.get(k);
      // An empty value and a missing row are both "no value" to a layer (regionValuesReader).
      return v === undefined || Number.isNaN(v) ? null : v;
    }),
  };
}

function scanned(text: string, id: string, ls: ManifestLayer[]) {
  const reader = regionValuesReader(ls);
  const buf = Buffer.from(text, 'utf8');
  const s = scanRegionTable(buf, buf.length, id, DIGEST_KEEP, new WantedKeys(reader.keys));
  return s && { rows: s.rows, values: reader.keys.map((k, i) => (k === '' || Number.isNaN(s.values[i]) ? null : s.values[i])) };
}

describe('one pass over the bytes of a region table', () => {
  it('gives the rows and layer values of the careful readers on every table of the test atlas, record and scenario', () => {
    const tables: Array<[string, ManifestLayer[]]> = [
      [join(dataDir, 'data', 'regions'), layers],
      [join(dataDir, 'data', 'scenarios', PIPELINE_DATA_SCENARIO.id, 'regions'), scenarioLayers],
    ];
    let compared = 0;
    for (const [dir, ls] of tables) {
      expect(ls.length).toBeGreaterThan(10);
      for (const f of readdirSync(dir).filter((n) => n.endsWith('.csv') && !n.endsWith('.wide.csv'))) {
        const id = f.slice(0, -4);
        const text = readFileSync(join(dir, f), 'utf8');
        const want = careful(text, id, ls);
        const got = scanned(text, id, ls);
        expect(got).toBeDefined();
        expect(got!.rows).toEqual(want.rows);
        expect(got!.values).toEqual(want.values);
        expect(want.rows.length).toBeGreaterThan(100);
        expect(want.values.filter((v) => v !== null).length).toBeGreaterThan(10);
        compared++;
      }
    }
    expect(compared).toBeGreaterThanOrEqual(10);
  });

  it("declines tables that are not plainly the pipeline's, leaving them to the careful readers", () => {
    const dir = join(dataDir, 'data', 'regions');
    const f = readdirSync(dir).find((n) => n.endsWith('.csv') && !n.endsWith('.wide.csv'))!;
    const id = f.slice(0, -4);
    const text = readFileSync(join(dir, f), 'utf8');
    const lines = text.split('\n');
    // A row the digest keeps (hours lost, mean) to damage.
    const at = lines.findIndex((l) => l.split(',')[2] === 'hours-lost-shift' && l.split(',')[7] === 'mean');
    expect(at).toBeGreaterThan(0);
    const edit = (fn: (fields: string[]) => string[] | string) => {
      const copy = [...lines];
      const out = fn(copy[at].split(','));
      copy[at] = typeof out === 'string' ? out : out.join(',');
      return copy.join('\n');
    };
    const damaged: Record<string, string> = {
      'CRLF line ends': text.replaceAll('\n', '\r\n'),
      'a quoted field': edit((c) => c.map((x, i) => (i === 9 ? `"${x}"` : x))),
      'a byte past ASCII': edit((c) => c.map((x, i) => (i === 11 ? `${x}é` : x))),
      'one field too many': edit((c) => [...c, 'x']),
      'one field too few': edit((c) => c.slice(0, -1)),
      "another region's id": edit((c) => ['elsewhere', ...c.slice(1)]),
      'a period that is no month': edit((c) => c.map((x, i) => (i === 1 ? '13' : x))),
      'a value that is no number': edit((c) => c.map((x, i) => (i === 8 ? '1.2.3' : x))),
      'an infinite value': edit((c) => c.map((x, i) => (i === 8 ? 'Infinity' : x))),
      'years used that are no whole number': edit((c) => c.map((x, i) => (i === 10 ? '2.5' : x))),
      'another header': text.replace('region_id,', 'region,'),
    };
    for (const [what, t] of Object.entries(damaged)) expect(scanned(t, id, layers), what).toBeUndefined();
    // The careful readers read the first two as the same table; the others end in their catalogued errors.
    expect(careful(damaged['CRLF line ends'], id, layers)).toEqual(careful(text, id, layers));
    expect(() => careful(damaged["another region's id"], id, layers)).toThrow(/row \d+, column region_id/);
    expect(() => careful(damaged['a value that is no number'], id, layers)).toThrow(/value/);
  });

  it('fills every layer that shares a key, and leaves keys the table lacks empty (NaN)', () => {
    const text =
      'region_id,period,figure,workload_class,acclimatization,exposure,method,statistic,value,unit,years_used,baseline\n' +
      'r1,year,hours-lost-shift,low,acclimatized,sun,limit,mean,12.5,h,2,2021-2022\n';
    const key = 'year|hours-lost-shift|low|acclimatized|sun|limit|mean';
    const buf = Buffer.from(text);
    const s = scanRegionTable(buf, buf.length, 'r1', () => false, new WantedKeys([key, '', key, 'year|hours-lost-shift|high|acclimatized|sun|limit|mean']))!;
    expect(Array.from(s.values)).toEqual([12.5, NaN, 12.5, NaN]);
    expect(s.rows).toEqual([]);
  });
});

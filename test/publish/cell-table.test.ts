/**
 * The per-cell table (pipeline/publish/cell-table.ts) writes, row for row, what `csvLine` writes
 * for the row's fields (pipeline/formats/csv.ts: numbers as they print, two decimals at most for
 * the statistics, non-finite ones empty, fields with a comma or quote quoted), although it quotes
 * the repeating fields once per table; read back with the project's CSV parser, every field is the
 * value it came from. Inputs are invented normals (seeded, with NaN, negative zero, large values
 * and halves that round).
 */
import { describe, expect, it } from 'vitest';
import { cellTableCsv, CELL_TABLE_COLUMNS } from '../../pipeline/publish/cell-table.ts';
import { csvLine, roundTo, CsvParser } from '../../pipeline/formats/csv.ts';
import { comboColumns } from '../../pipeline/publish/combo.ts';
import { periodLabel } from '../../pipeline/publish/region-table.ts';
import { figureDefs, PERIODS } from '../../pipeline/reduce/figures.ts';
import type { CellFigureNormals } from '../../pipeline/publish/figure-normals.ts';
import type { Normals } from '../../pipeline/climate/index.ts';

function inventedNormals(nCells: number, nC: number, seed: number): Normals {
  let s = seed >>> 0;
  const rnd = () => (s = (s * 1664525 + 1013904223) >>> 0) / 2 ** 32;
  const n = nCells * PERIODS * nC;
  const pick = (i: number) => {
    const r = rnd();
    if (i % 17 === 0) return NaN;
    if (i % 19 === 0) return -0;
    if (i % 23 === 0) return 1.005 + Math.floor(r * 10); // halves at the second decimal
    if (i % 29 === 0) return 123456.789 * r;
    return Math.round(r * 40000) / 100 - 50;
  };
  const f = () => Float64Array.from({ length: n }, (_, i) => pick(i));
  return { nItems: n, mean: f(), median: f(), p90: f(), yearsUsed: Uint16Array.from({ length: n }, (_, i) => i % 31) } as unknown as Normals;
}

describe('the per-cell table', () => {
  it("equals csvLine of every row's fields, and parses back to them (a unit with a comma quoted)", () => {
    const keys = ['heavy.acclimatized.sun', 'heavy.unacclimatized.shade', 'light.acclimatized.sun'];
    const defs = figureDefs(keys);
    const figures: CellFigureNormals[] = defs.map((def, k) => ({
      def: def.id === 'hours-lost-shift' ? { ...def, units: 'h, per worker' } : def,
      cell: inventedNormals(3, def.combos.length, 7 + k),
    }));
    const cells = Int32Array.of(5, 17, 40);
    const lat = Float64Array.from({ length: 8 }, (_, i) => -10.123456 + 0.25 * i);
    const lon = Float64Array.from({ length: 6 }, (_, i) => 170.00004 + 0.25 * i);
    const pieces: string[] = [];
    cellTableCsv(figures, cells, { lat, lon }, (t) => pieces.push(t));
    expect(pieces.length).toBe(1 + cells.length);
    let want = csvLine(CELL_TABLE_COLUMNS);
    const rows: Array<Array<string | number>> = [];
    for (let c = 0; c < cells.length; c++) {
      const g = cells[c];
      for (let p = 0; p < PERIODS; p++) {
        for (const fn of figures.filter((f) => f.def.id === 'hours-above-limit-shift' || f.def.id === 'hours-lost-shift')) {
          fn.def.combos.forEach((key, k) => {
            const i = (c * PERIODS + p) * fn.def.combos.length + k;
            const cc = comboColumns(fn.def.id, key);
            const row = [
              g,
              roundTo(lat[Math.floor(g / 6)], 4),
              roundTo(lon[g % 6], 4),
              periodLabel(p),
              fn.def.id,
              cc.workload_class,
              cc.acclimatization,
              cc.exposure,
              roundTo(fn.cell.mean[i], 2),
              roundTo(fn.cell.median[i], 2),
              roundTo(fn.cell.p90[i], 2),
              fn.def.units,
              fn.cell.yearsUsed[i],
            ];
            rows.push(row);
            want += csvLine(row);
          });
        }
      }
    }
    const got = pieces.join('');
    expect(got).toBe(want);
    expect(got).toContain('"h, per worker"');
    const parser = new CsvParser('t.csv');
    const parsed = [...parser.push(got), ...parser.end()].map((r) => r[1]);
    expect(parsed.length).toBe(rows.length + 1);
    rows.forEach((row, j) => expect(parsed[j + 1], `row ${j}`).toEqual(row.map((v) => (typeof v === 'number' ? (Number.isFinite(v) ? String(v) : '') : v))));
  });
});

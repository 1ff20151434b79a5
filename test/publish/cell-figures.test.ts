/**
 * The per-cell figure chunks of the map explorer (pipeline/publish/cell-figures.ts). On a data
 * folder made by the real pipeline (the invented small demo, test/site/pipeline-data.ts) every
 * row of the per-cell tables (data/cell-tables/*.csv) is checked against the chunks, the niche figures against
 * niche.json, and the added mean WBGT and capacity loss against the published GeoTIFF layers,
 * read with geotiff.js 3.0.5 (a general-purpose reader, not our writer).
 */
import { readFileSync, readdirSync } from 'node:fs';
import { mkdtemp, readdir, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { fromArrayBuffer } from 'geotiff';
import { buildPipelineData } from '../site/pipeline-data.ts';
import {
  CELL_FIGURES,
  cellChunkId,
  cellFigureChunks,
  cellFiguresIndex,
  writeCellChunks,
  type CellChunk,
  type CellFiguresIndex,
  type CellRecord,
} from '../../pipeline/publish/cell-figures.ts';
import type { CellFigureNormals, CellNiche } from '../../pipeline/publish/figure-normals.ts';
import type { Manifest } from '../../pipeline/publish/manifest.ts';
import { PERIODS, type FigureDef } from '../../pipeline/reduce/figures.ts';
import { readCellTables } from '../helpers/cell-tables.ts';
import { expectCatalogued } from '../helpers/catalogued.ts';

let dataDir = '';
let index: CellFiguresIndex;
const byCell = new Map<number, { record: CellRecord; chunk: string }>();

function parseCsv(text: string): Array<Record<string, string>> {
  const [head, ...rows] = text.trim().split('\n');
  const cols = head.split(',');
  return rows.map((r) => Object.fromEntries(r.split(',').map((v, i) => [cols[i], v])));
}

/** A CSV field as the chunk holds it: empty → null, else the number. */
const csvValue = (s: string): number | null => (s === '' ? null : Number(s));

beforeAll(async () => {
  dataDir = join((await buildPipelineData()).dataDir, 'data');
  index = JSON.parse(readFileSync(join(dataDir, 'cells/index.json'), 'utf8')) as CellFiguresIndex;
  for (const entry of index.chunks) {
    const chunk = JSON.parse(readFileSync(join(dataDir, entry.path.replace(/^data\//, '')), 'utf8')) as CellChunk;
    expect(chunk.id).toBe(entry.id);
    expect(chunk.cells).toHaveLength(entry.cells);
    for (const record of chunk.cells) {
      expect(byCell.has(record.cell), `cell ${record.cell} in two chunks`).toBe(false);
      byCell.set(record.cell, { record, chunk: chunk.id });
    }
  }
}, 300_000);

describe('per-cell figure chunks of a real pipeline build (invented small demo)', () => {
  it('every row of the per-cell tables equals its cell, figure, combination and period in the chunks', () => {
    const rows = parseCsv(readCellTables(dataDir));
    expect(rows.length).toBeGreaterThan(10_000);
    const figureOf = new Map(index.figures.map((f) => [f.id, f]));
    let nonZero = 0;
    for (const r of rows) {
      const hit = byCell.get(Number(r.cell_id));
      expect(hit, `cell ${r.cell_id}`).toBeDefined();
      const { record } = hit!;
      expect(record.lat).toBe(Number(r.lat));
      expect(record.lon).toBe(Number(r.lon));
      const fig = figureOf.get(r.figure)!;
      expect(fig.inCellTable).toBe(true);
      expect(fig.units).toBe(r.unit);
      const k = fig.combos.indexOf(`${r.workload_class}.${r.acclimatization}.${r.exposure}`);
      const p = index.periods.indexOf(r.period);
      expect(k).toBeGreaterThanOrEqual(0);
      expect(p).toBeGreaterThanOrEqual(0);
      const got = record.figures[r.figure][k][p];
      expect(got, `${r.cell_id} ${r.figure} ${r.period}`).toEqual([csvValue(r.mean), csvValue(r.median), csvValue(r.p90), Number(r.years_used)]);
      if ((got[0] ?? 0) > 0) nonZero += 1;
    }
    // The comparison is not trivially between zeros.
    expect(nonZero).toBeGreaterThan(1000);
    // The chunks hold exactly the CSV's cells.
    expect(new Set(rows.map((r) => Number(r.cell_id)))).toEqual(new Set(byCell.keys()));
    expect(index.landCells).toBe(byCell.size);
  });

  it('each cell sits in the chunk its row and column give, and the index lists exactly the chunk files written', () => {
    for (const [cell, { chunk }] of byCell) {
      const y = Math.floor(cell / index.grid.nLon);
      const x = cell % index.grid.nLon;
      expect(chunk).toBe(cellChunkId(y, x, index.tile));
      const { record } = byCell.get(cell)!;
      expect(record.lat).toBeCloseTo(index.grid.lat0 + y * index.grid.dLat, 9);
      expect(record.lon).toBeCloseTo(index.grid.lon0 + x * index.grid.dLon, 9);
    }
    const files = readdirSync(join(dataDir, 'cells')).sort();
    expect(files).toEqual(['index.json', ...index.chunks.map((c) => `${c.id}.json`)].sort());
    expect(index.chunks.length).toBeGreaterThan(1);
  });

  it('the niche figures of every cell equal niche.json', () => {
    const niche = JSON.parse(readFileSync(join(dataDir, 'niche.json'), 'utf8')) as {
      cells: Array<{ cell: number; baselineMat: number | null; latestMat: number | null; baselineClass: string | null }>;
    };
    expect(niche.cells).toHaveLength(byCell.size);
    for (const n of niche.cells) {
      expect(byCell.get(n.cell)!.record.niche).toEqual({ baselineMat: n.baselineMat, latestMat: n.latestMat, baselineClass: n.baselineClass });
    }
  });

  it('mean WBGT and capacity loss per cell equal the published GeoTIFF layers (2-decimal rounding)', async () => {
    const manifest = JSON.parse(readFileSync(join(dataDir, 'manifest.json'), 'utf8')) as Manifest;
    const picks = manifest.layers.filter(
      (l) => (l.figure === 'wbgt-mean' || l.figure === 'capacity-loss-shift') && l.statistic === 'mean' && (l.period === '07' || l.period === 'year'),
    );
    expect(picks.length).toBe(2 * (2 + 8));
    for (const layer of picks) {
      const bytes = readFileSync(join(dataDir, layer.tif.replace(/^data\//, '')));
      const image = await (await fromArrayBuffer(bytes.buffer.slice(bytes.byteOffset, bytes.byteOffset + bytes.byteLength))).getImage();
      const [band] = (await image.readRasters()) as unknown as Float32Array[];
      const fig = index.figures.find((f) => f.id === layer.figure)!;
      const k = fig.combos.indexOf(layer.combo);
      const p = index.periods.indexOf(layer.period);
      for (const [cell, { record }] of byCell) {
        const y = Math.floor(cell / index.grid.nLon);
        const x = cell % index.grid.nLon;
        // GeoTIFF rows run north → south.
        const tifValue = band[(index.grid.nLat - 1 - y) * index.grid.nLon + x];
        const v = record.figures[layer.figure][k][p][0];
        expect(v, `${layer.id} cell ${cell}`).not.toBeNull();
        expect(Math.abs(v! - tifValue), `${layer.id} cell ${cell}`).toBeLessThanOrEqual(0.005 + 1e-5 * Math.abs(tifValue));
      }
    }
  });

  it('the manifest lists the chunk files as JSON artefacts with their sizes', () => {
    const manifest = JSON.parse(readFileSync(join(dataDir, 'manifest.json'), 'utf8')) as Manifest;
    const listed = manifest.artefacts.filter((a) => a.path.startsWith('data/cells/'));
    expect(listed.map((a) => a.path).sort()).toEqual(['data/cells/index.json', ...index.chunks.map((c) => c.path)].sort());
    for (const a of listed) {
      expect(a.kind).toBe('json');
      expect(a.bytes).toBe(readFileSync(join(dataDir, a.path.replace(/^data\//, ''))).length);
    }
  });
});

/** A hand-made 3 × 5 grid with two figures of one combination each. */
function tinyInput(): { figures: CellFigureNormals[]; cells: Int32Array; grid: { lat: Float64Array; lon: Float64Array }; niche: CellNiche } {
  const cells = Int32Array.from([1, 7, 13]); // (y, x) = (0, 1), (1, 2), (2, 3)
  const nItems = cells.length * PERIODS;
  const normals = (offset: number) => {
    const mean = Float64Array.from({ length: nItems }, (_, i) => offset + i + 0.123);
    mean[5] = NaN;
    return { mean, median: mean.map((v) => v + 1), p90: mean.map((v) => v + 2), yearsUsed: Uint16Array.from({ length: nItems }, () => 3) };
  };
  const figures = CELL_FIGURES.map((id, j) => ({
    def: { id, label: id, units: 'h', combos: ['only'], annual: 'sum' },
    cell: normals(100 * j),
  })) as unknown as CellFigureNormals[];
  const niche = {
    baselineMat: Float64Array.from([12.345, NaN, 30]),
    latestMat: Float64Array.from([12.5, NaN, 30.25]),
    baselineClass: Uint8Array.from([0, 255, 3]),
  } as unknown as CellNiche;
  return { figures, cells, grid: { lat: Float64Array.from([10, 10.5, 11]), lon: Float64Array.from([60, 60.5, 61, 61.5, 62]) }, niche };
}

const defsOf = (figures: readonly CellFigureNormals[]): FigureDef[] => figures.map((f) => f.def);

describe('cellFigureChunks on a hand-made grid', () => {
  it('cuts the cells into 2 × 2 tiles, rounds to 2 decimals, and writes a missing value as null', () => {
    const t = tinyInput();
    const chunks = cellFigureChunks(t.figures, t.cells, t.grid, t.niche, { rows: 2, cols: 2 });
    const ix = cellFiguresIndex(
      defsOf(t.figures),
      t.grid,
      chunks.map((c) => ({ id: c.id, path: `data/cells/${c.id}.json`, cells: c.cells.length, firstCell: c.cells[0].cell })),
      { rows: 2, cols: 2 },
    );
    expect(chunks.map((c) => [c.id, c.cells.map((r) => r.cell)])).toEqual([
      ['r0c0', [1]],
      ['r0c1', [7]],
      ['r1c1', [13]],
    ]);
    expect(ix.grid).toEqual({ nLat: 3, nLon: 5, lat0: 10, lon0: 60, dLat: 0.5, dLon: 0.5 });
    const second = chunks[1].cells[0];
    expect(second.lat).toBe(10.5);
    expect(second.lon).toBe(61);
    // Item (cell 1, period 0) of the first figure: 0 + 13 + 0.123 → 13.12.
    expect(second.figures[CELL_FIGURES[0]][0][0]).toEqual([13.12, 14.12, 15.12, 3]);
    expect(chunks[0].cells[0].figures[CELL_FIGURES[0]][0][5]).toEqual([null, null, null, 3]);
    expect(chunks[0].cells[0].niche).toEqual({ baselineMat: 12.35, latestMat: 12.5, baselineClass: 'core' });
    expect(second.niche).toEqual({ baselineMat: null, latestMat: null, baselineClass: null });
    expect(chunks[2].cells[0].niche.baselineClass).toBe('outside');
    expect(ix.periods).toEqual(['01', '02', '03', '04', '05', '06', '07', '08', '09', '10', '11', '12', 'year']);
  });

  it('writes the chunks atomically, leaving no temporary file, and indexes chunks given in any order by their first cell', async () => {
    const t = tinyInput();
    const dir = await mkdtemp(join(tmpdir(), 'hh-cells-'));
    try {
      const chunks = cellFigureChunks(t.figures, t.cells, t.grid, t.niche, { rows: 2, cols: 2 });
      const entries = await writeCellChunks(dir, chunks);
      expect((await readdir(join(dir, 'cells'))).sort()).toEqual(['r0c0.json', 'r0c1.json', 'r1c1.json']);
      expect(entries.map((e) => e.path)).toEqual(['data/cells/r0c0.json', 'data/cells/r0c1.json', 'data/cells/r1c1.json']);
      const withFirst = entries.map((e, i) => ({ ...e, firstCell: chunks[i].cells[0].cell })).reverse();
      const ix = cellFiguresIndex(defsOf(t.figures), t.grid, withFirst, { rows: 2, cols: 2 });
      expect(ix.chunks.map((c) => c.id)).toEqual(['r0c0', 'r0c1', 'r1c1']);
      expect(ix.landCells).toBe(3);
    } finally {
      await rm(dir, { recursive: true, force: true });
    }
  });

  it('rejects a tile of zero or fractional rows with CellTileInvalid', () => {
    const t = tinyInput();
    expectCatalogued(() => cellFigureChunks(t.figures, t.cells, t.grid, t.niche, { rows: 0, cols: 2 }), 'CellTileInvalid', /0 rows/);
    expectCatalogued(() => cellFigureChunks(t.figures, t.cells, t.grid, t.niche, { rows: 2, cols: 1.5 }), 'CellTileInvalid');
  });

  it('rejects a land cell outside the grid with CellOutsideGrid', () => {
    const t = tinyInput();
    expectCatalogued(() => cellFigureChunks(t.figures, Int32Array.from([1, 15, 13]), t.grid, t.niche), 'CellOutsideGrid', /cell 15 .*15-cell grid/);
  });

  it('rejects figures without hours lost with CellFigureMissing', () => {
    const t = tinyInput();
    const without = t.figures.filter((f) => f.def.id !== 'hours-lost-shift');
    expectCatalogued(() => cellFigureChunks(without, t.cells, t.grid, t.niche), 'CellFigureMissing', /hours-lost-shift/);
  });
});

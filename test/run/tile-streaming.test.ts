/**
 * The build works tile by tile within a memory budget: a grid built with a small budget (many
 * shard tiles, several compute groups, several merge bands) publishes the same atlas as the same
 * grid built as one big tile, and a budget that cannot hold one tile is a catalogued error.
 * Invented demo data (pipeline/demo) on a 24 × 30 grid at 0.5°, one legacy and one NetCDF-4 year.
 * The country-size version of this check (160 × 160 cells) runs in `npm run bench`
 * (`country-build`).
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { mkdtempSync, readFileSync, readdirSync, writeFileSync, existsSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { writeDemoDataset } from '../../pipeline/demo/index.ts';
import { buildAtlas, type BuildReport } from '../../pipeline/run/build-atlas.ts';
import { loadConfig } from '../../pipeline/config/load.ts';
import { planBuild } from '../../pipeline/run/plan-stage.ts';
import { parsePointChunk, cellHistograms } from '../../pipeline/publish/point-tile-codec.ts';
import type { PointTileIndex } from '../../pipeline/publish/point-tiles.ts';
import type { Manifest } from '../../pipeline/publish/manifest.ts';
import { readCellTables } from '../helpers/cell-tables.ts';
import { expectCataloguedAsync } from '../helpers/catalogued.ts';
import { testAtlasYaml } from '../helpers/atlas-yaml.ts';

let dir = '';
const lines: string[] = [];
let small: BuildReport;

function yaml(extra: string): string {
  return `${testAtlasYaml({ id: 'streaming', title: 'Tile streaming test (invented data)', years: [2022, 2023] })}${extra}`;
}

/** The budget that splits this grid: enough for a band of 4 rows, not for one compute group of every tile. */
const SMALL_BUDGET = '575M';

beforeAll(async () => {
  dir = mkdtempSync(join(tmpdir(), 'hh-stream-'));
  await writeDemoDataset({ outDir: join(dir, 'inputs'), years: [2022, 2023], layout: 'mixed', grid: { nLat: 24, nLon: 30, resolution: 0.5 }, quiet: true });
  writeFileSync(join(dir, 'small.yaml'), yaml(`memory: ${SMALL_BUDGET}\nshards: { cellsPerTile: 16, cellsPerBlock: 32 }\n`));
  writeFileSync(join(dir, 'big.yaml'), yaml('memory: 16G\nshards: { cellsPerTile: 100000 }\n'));
  process.env.HEATHOURS_BUILD_TIME = '2026-01-01T00:00:00Z';
  const logger = { info: (m: string) => lines.push(m), warn: (m: string) => lines.push(m) };
  small = await buildAtlas({ configPath: join(dir, 'small.yaml'), outDir: join(dir, 'out-small'), jobs: 2, dataOnly: true, cache: false, logger });
  await buildAtlas({ configPath: join(dir, 'big.yaml'), outDir: join(dir, 'out-big'), jobs: 2, quiet: true, dataOnly: true, cache: false });
}, 600_000);

describe('a build within a small memory budget', () => {
  it('really is cut: several shard tiles, compute groups and merge bands, where the big budget has one of each', async () => {
    const plan = async (name: string) => {
      const p = await planBuild(await loadConfig(join(dir, `${name}.yaml`)), { jobs: 2 }, { info: () => {}, warn: () => {} });
      await p.close();
      return p;
    };
    const s = await plan('small');
    const b = await plan('big');
    expect(s.tiles.length).toBeGreaterThan(4);
    expect(s.memory.groups.length).toBeGreaterThan(1);
    expect(s.bands.length).toBeGreaterThan(1);
    expect(b.tiles.length).toBe(1);
    expect(b.memory.groups.length).toBe(1);
    expect(b.bands.length).toBe(1);
    // Every group's tiles are consecutive, and every land cell is in exactly one band.
    for (const g of s.memory.groups) g.forEach((t, i) => i > 0 && expect(t).toBe(g[i - 1] + 1));
    expect(s.bands.reduce((n, band) => n + band.cells.length, 0)).toBe(s.land.ids.length);
    expect(s.memory.mergePeak).toBeLessThanOrEqual(s.memory.budget);
    expect(s.memory.computePeak).toBeLessThanOrEqual(s.memory.budget);
  });

  it('publishes the same region tables, region summaries and calculator tiles as one big tile, byte for byte', () => {
    const regions = readdirSync(join(dir, 'out-big/data/regions')).sort();
    // Per region: the tidy table, the wide table, the workbook and the summary.
    expect(regions.length).toBe(20);
    for (const f of regions) expect(readFileSync(join(dir, 'out-small/data/regions', f)), f).toEqual(readFileSync(join(dir, 'out-big/data/regions', f)));
    for (const f of readdirSync(join(dir, 'out-big/data/calculator')).filter((n) => n.endsWith('.bin'))) {
      expect(readFileSync(join(dir, 'out-small/data/calculator', f)), f).toEqual(readFileSync(join(dir, 'out-big/data/calculator', f)));
    }
  }, 120_000);

  it("publishes the same per-cell figures: tables, map chunks, NetCDF, layers and niche, and every cell's calculator histograms", () => {
    const data = (name: string) => join(dir, `out-${name}/data`);
    expect(readCellTables(data('small'))).toBe(readCellTables(data('big')));
    // Blocks of 32 cells against one block of the whole grid: the tables are cut differently, and hold the same rows.
    expect(readdirSync(join(data('small'), 'cell-tables')).length).toBeGreaterThan(1);
    expect(readdirSync(join(data('big'), 'cell-tables')).length).toBe(1);
    for (const f of readdirSync(join(data('big'), 'cells'))) {
      if (f === 'index.json') continue;
      expect(readFileSync(join(data('small'), 'cells', f)), f).toEqual(readFileSync(join(data('big'), 'cells', f)));
    }
    for (const f of ['atlas-cells.nc', 'niche.json', 'regions.geojson'])
      expect(readFileSync(join(data('small'), f)), f).toEqual(readFileSync(join(data('big'), f)));
    const layers = (name: string) =>
      (JSON.parse(readFileSync(join(data(name), 'manifest.json'), 'utf8')) as Manifest).layers.map((l) => `${l.id} ${l.pngSha256} ${l.tifSha256}`);
    expect(layers('small')).toEqual(layers('big'));
    // The calculator's per-cell tiles are cut per band, so compare cell by cell.
    const cells = (name: string) => {
      const index = JSON.parse(readFileSync(join(data(name), 'calculator/cells/index.json'), 'utf8')) as PointTileIndex;
      const out = new Map<number, string>();
      for (const c of index.chunks) {
        const chunk = parsePointChunk(new Uint8Array(readFileSync(join(data(name), c.path.replace(/^data\//, '')))), c.path);
        for (const cell of chunk.cells)
          out.set(
            cell,
            cellHistograms(chunk, cell)!
              .map((h) => Array.from(h).join(','))
              .join('|'),
          );
      }
      return out;
    };
    const a = cells('small');
    const b = cells('big');
    expect(a.size).toBe(b.size);
    for (const [cell, h] of b) expect(a.get(cell), `cell ${cell}`).toBe(h);
  }, 300_000);

  it('says before computing what it chose and what it will need: memory, time and disk', () => {
    const plan = lines.find((l) => l.includes('plan:'));
    expect(plan).toMatch(/compute tasks \(\d+ group\(s\) of tiles read together, blocks of \d+ h\), \d+ merge band\(s\)/);
    expect(lines.find((l) => l.includes('memory budget'))).toMatch(/memory budget 575 MB: estimated peak \d+ MB/);
    const estimate = lines.find((l) => l.includes('estimate:'))!;
    expect(estimate).toMatch(/M land cell-hours; about .* on 2 worker\(s\)/);
    expect(estimate).toMatch(/disk: .* published, .* of partials, .* of scratch; peak memory/);
    // Said before the first shard was computed.
    expect(lines.indexOf(estimate)).toBeLessThan(lines.findIndex((l) => l.startsWith('computing') || l.includes('] computing')));
    expect(small.estimate.bytes.output).toBeGreaterThan(0);
  });

  it('leaves no scratch or staging folder behind', () => {
    expect(readdirSync(dir).filter((f) => f.includes('.scratch-') || f.includes('.stage-'))).toEqual([]);
  });
});

describe('a memory budget that cannot hold one tile', () => {
  it('is MemoryBudgetTooSmall, saying how much is needed, before anything is computed or published', async () => {
    writeFileSync(join(dir, 'tiny.yaml'), yaml('memory: 200M\n'));
    const e = await expectCataloguedAsync(
      buildAtlas({ configPath: join(dir, 'tiny.yaml'), outDir: join(dir, 'out-tiny'), jobs: 2, quiet: true, dataOnly: true, cache: false }),
      'MemoryBudgetTooSmall',
      /200 MB is too small .* about \d+ MB are needed/,
    );
    expect(e.hint).toMatch(/--memory/);
    expect(existsSync(join(dir, 'out-tiny'))).toBe(false);
  });

  it('a budget that is not a size is MemoryBudgetInvalid naming the key', async () => {
    writeFileSync(join(dir, 'words.yaml'), yaml('memory: lots\n'));
    const e = await expectCataloguedAsync(
      buildAtlas({ configPath: join(dir, 'words.yaml'), outDir: join(dir, 'out-words'), jobs: 1, quiet: true, dataOnly: true, cache: false }),
      'MemoryBudgetInvalid',
      /"lots" is not a memory size/,
    );
    expect(e.where.key).toBe('memory');
    await expectCataloguedAsync(
      buildAtlas({
        configPath: join(dir, 'big.yaml'),
        outDir: join(dir, 'out-words'),
        jobs: 1,
        memory: '3 bananas',
        quiet: true,
        dataOnly: true,
        cache: false,
      }),
      'MemoryBudgetInvalid',
      /3 bananas/,
    );
  });
});

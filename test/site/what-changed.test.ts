/**
 * The home page's "since the previous build" section, from data/changes.json: a first build says
 * so; after a yearly update it lists the added year and file and the figures that moved most, as
 * compareBuilds (pipeline/publish/changes.ts) found them. The previous build here is the real
 * pipeline output with its 2023 year taken away and its annual values lowered by a tenth
 * (invented change), so the moves are known.
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { cpSync, mkdtempSync, readFileSync, readdirSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { buildPipelineData } from './pipeline-data.ts';
import { buildTestSite } from './browser.ts';
import { compareBuilds, tablesInMemory, type BuildChanges, type BuildFacts } from '../../pipeline/publish/changes.ts';

let firstHtml = '';
let updatedHtml = '';
let changes: BuildChanges;

function facts(dataDir: string, transform: (csv: string) => string = (c) => c): BuildFacts {
  const m = JSON.parse(readFileSync(join(dataDir, 'data/manifest.json'), 'utf8'));
  const gj = JSON.parse(readFileSync(join(dataDir, 'data/regions.geojson'), 'utf8')) as { features: Array<{ properties: { id: string; name: string } }> };
  const tables = new Map<string, string>();
  for (const f of readdirSync(join(dataDir, 'data/regions')).filter((f) => f.endsWith('.csv'))) {
    tables.set(f.replace(/\.csv$/, ''), transform(readFileSync(join(dataDir, 'data/regions', f), 'utf8')));
  }
  return { buildTime: m.buildTime, codeVersion: m.codeVersion, configDigest: m.configDigest, years: m.years, baseline: m.baseline, inputs: m.inputs, regionTables: tablesInMemory(tables), regionNames: new Map(gj.features.map((f) => [f.properties.id, f.properties.name])) };
}

beforeAll(async () => {
  const pd = await buildPipelineData();
  firstHtml = readFileSync(join((await buildTestSite(pd.dataDir)).distDir, 'index.html'), 'utf8');
  const next = facts(pd.dataDir);
  const lowered = (csv: string) =>
    csv.split('\n').map((line) => {
      const c = line.split(',');
      if (c[1] === 'year' && c[9] === 'h' && c[8] !== '') c[8] = String(Math.round(Number(c[8]) * 0.9 * 100) / 100);
      return c.join(',');
    }).join('\n');
  const prev = { ...facts(pd.dataDir, lowered), years: [2021, 2022] as [number, number], inputs: next.inputs.filter((f) => f.name !== 'era5-demo-2023.nc'), buildTime: '2025-06-01T00:00:00.000Z' };
  changes = compareBuilds(prev, next);
  const dir = mkdtempSync(join(tmpdir(), 'hh-changes-'));
  cpSync(pd.dataDir, dir, { recursive: true });
  writeFileSync(join(dir, 'data/changes.json'), JSON.stringify(changes));
  updatedHtml = readFileSync(join((await buildTestSite(dir)).distDir, 'index.html'), 'utf8');
}, 600_000);

describe('what changed since the previous build, on the home page', () => {
  it('a first build says there is nothing to compare with yet', () => {
    expect(firstHtml).toContain('Since the previous build');
    expect(firstHtml).toContain('This is the first build into this folder');
  });

  it('after the update it lists the year and file added and the largest moves in the order compareBuilds gives', () => {
    const section = updatedHtml.slice(updatedHtml.indexOf('id="what-changed"'));
    expect(section).toContain('Years added: 2023.');
    expect(section).toContain('1 added (era5-demo-2023.nc)');
    const rows = [...section.slice(0, section.indexOf('</table>')).matchAll(/<tr><td>(.*?)<\/td><td>(.*?)<\/td>.*?<td>([^<]*) h<\/td><td>([^<]*) h<\/td><td>([^<]*) h<\/td><\/tr>/g)];
    const hourMoves = changes.moves.filter((m) => m.unit === 'h').slice(0, 8);
    expect(rows.length).toBe(hourMoves.length);
    expect(hourMoves.length).toBeGreaterThan(0);
    rows.forEach((r, i) => {
      // Shown to one decimal: within half a unit of the last digit (a value ending in 5 rounds either way).
      expect(Math.abs(Number(r[4].replace('\u2212', '-')) - hourMoves[i].after)).toBeLessThanOrEqual(0.05 + 1e-6);
      expect(Math.abs(Number(r[5].replace('+', '').replace('\u2212', '-')) - hourMoves[i].change)).toBeLessThanOrEqual(0.05 + 1e-6);
    });
    // Region names are escaped like every other text (the odd-name region is HTML).
    expect(section).not.toContain('<script>alert(2)</script>');
  });
});

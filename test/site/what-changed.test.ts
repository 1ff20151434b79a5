/**
 * The home page's "since the previous build" section, from data/changes.json: a first build says
 * so; after a yearly update it leads with the normals a bid uses (how many moved, by how much, the
 * largest in words: region names, figure labels, class names, honest P90 labels, never raw ids),
 * says whether the baseline is the same, and shows the latest year apart. The previous build
 * here is the real pipeline output with its 2023 year taken away and its annual values lowered
 * by a tenth (an invented change), so the moves are known. The wording itself is tested on
 * compareBuilds results without a site build (src/lib/changes-words.ts).
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { cpSync, mkdtempSync, readFileSync, readdirSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { buildPipelineData } from './pipeline-data.ts';
import { buildTestSite } from './browser.ts';
import { compareBuilds, tablesInMemory, type BuildChanges, type BuildFacts } from '../../pipeline/publish/changes.ts';
import { figureWords } from '../../pipeline/publish/data-dictionary.ts';
import { baselineWords, normalsMovedWords } from '../../src/lib/changes-words.ts';

let firstHtml = '';
let updatedHtml = '';
let changes: BuildChanges;
let same: BuildChanges;
let classNames: Map<string, string>;

function facts(dataDir: string, transform: (csv: string) => string = (c) => c): BuildFacts {
  const m = JSON.parse(readFileSync(join(dataDir, 'data/manifest.json'), 'utf8'));
  const gj = JSON.parse(readFileSync(join(dataDir, 'data/regions.geojson'), 'utf8')) as { features: Array<{ properties: { id: string; name: string } }> };
  const tables = new Map<string, string>();
  for (const f of readdirSync(join(dataDir, 'data/regions')).filter((f) => f.endsWith('.csv'))) {
    tables.set(f.replace(/\.csv$/, ''), transform(readFileSync(join(dataDir, 'data/regions', f), 'utf8')));
  }
  return {
    buildTime: m.buildTime,
    codeVersion: m.codeVersion,
    configDigest: m.configDigest,
    years: m.years,
    baseline: m.baseline,
    inputs: m.inputs,
    regionTables: tablesInMemory(tables),
    regionNames: new Map(gj.features.map((f) => [f.properties.id, f.properties.name])),
  };
}

beforeAll(async () => {
  const pd = await buildPipelineData();
  firstHtml = readFileSync(join((await buildTestSite(pd.dataDir)).distDir, 'index.html'), 'utf8');
  classNames = new Map(
    (JSON.parse(readFileSync(join(pd.dataDir, 'data/manifest.json'), 'utf8')).work.classes as Array<{ id: string; name: string }>).map((c) => [c.id, c.name]),
  );
  const next = facts(pd.dataDir);
  const lowered = (csv: string) =>
    csv
      .split('\n')
      .map((line) => {
        const c = line.split(',');
        if (c[1] === 'year' && c[9] === 'h' && c[8] !== '') c[8] = String(Math.round(Number(c[8]) * 0.9 * 100) / 100);
        return c.join(',');
      })
      .join('\n');
  const prev = {
    ...facts(pd.dataDir, lowered),
    years: [2021, 2022] as [number, number],
    inputs: next.inputs.filter((f) => f.name !== 'era5-demo-2023.nc'),
    buildTime: '2025-06-01T00:00:00.000Z',
  };
  changes = compareBuilds(prev, next);
  same = compareBuilds({ ...next, buildTime: '2025-06-01T00:00:00.000Z' }, next);
  const dir = mkdtempSync(join(tmpdir(), 'hh-changes-'));
  cpSync(pd.dataDir, dir, { recursive: true });
  writeFileSync(join(dir, 'data/changes.json'), JSON.stringify(changes));
  updatedHtml = readFileSync(join((await buildTestSite(dir)).distDir, 'index.html'), 'utf8');
}, 900_000);

/** The text of an HTML fragment: tags dropped, entities of Astro's escaping decoded, spaces folded. */
const text = (html: string) =>
  html
    .replace(/<[^>]+>/g, ' ')
    .replace(/&lt;/g, '<')
    .replace(/&gt;/g, '>')
    .replace(/&quot;/g, '"')
    .replace(/&#39;/g, "'")
    .replace(/&amp;/g, '&')
    .replace(/\s+/g, ' ')
    .trim();

describe('what changed since the previous build, on the home page', () => {
  it('a first build says there is nothing to compare with yet', () => {
    expect(firstHtml).toContain('Since the previous build');
    expect(firstHtml).toContain('This is the first build into this folder');
  });

  it('leads with the normals a bid uses: how many moved and by how much, and that the baseline is unchanged', () => {
    const section = updatedHtml.slice(updatedHtml.indexOf('id="what-changed"'));
    const lead = text(section.slice(section.indexOf('id="changes-normals"'), section.indexOf('</p>', section.indexOf('id="changes-normals"'))));
    expect(changes.normals.moved).toBeGreaterThan(0);
    expect(lead).toContain(`${changes.normals.moved} of ${changes.normals.compared} moved, by up to`);
    expect(lead).toContain('The baseline (2021–2022) is unchanged; the normals moved because the figures were recomputed.');
    expect(section.indexOf('id="changes-normals"')).toBeLessThan(section.indexOf('id="changes-latest"'));
    expect(section.indexOf('id="changes-latest"')).toBeLessThan(section.indexOf('data-key="years"'));
    expect(text(section)).toContain('Years added: 2023.');
    expect(text(section)).toContain('1 added (era5-demo-2023.nc)');
  });

  it('lists the largest moves of the normals in words, in the order compareBuilds gives: no raw figure or class id, honest P90 labels', () => {
    const section = updatedHtml.slice(updatedHtml.indexOf('id="change-normals"'));
    const table = section.slice(0, section.indexOf('</table>'));
    const rows = [...table.matchAll(/<tr data-figure="([^"]+)" data-statistic="([^"]+)">(.*?)<\/tr>/g)].map((m) => ({
      figure: m[1],
      statistic: m[2],
      cells: [...m[3].matchAll(/<td[^>]*>(.*?)<\/td>/g)].map((c) => text(c[1])),
    }));
    expect(rows.length).toBe(changes.normals.moves.length);
    rows.forEach((r, i) => {
      const m = changes.normals.moves[i];
      expect([r.figure, r.statistic]).toEqual([m.figure, m.statistic]);
      expect(r.cells[0]).toBe(m.regionName);
      expect(r.cells[1]).toBe(figureWords(m.figure).label);
      expect(r.cells[2]).toContain(classNames.get(m.workloadClass)!);
      expect(r.cells[3]).toBe(m.statistic === 'p90' ? 'P90 of 2 years (near the highest)' : 'Baseline mean');
      // Shown to one decimal: within half a unit of the last digit (a value ending in 5 rounds either way).
      expect(Math.abs(Number(r.cells[5].replace('\u2212', '-')) - m.after)).toBeLessThanOrEqual(0.05 + 1e-6);
      expect(Math.abs(Number(r.cells[6].replace('+', '').replace('\u2212', '-')) - m.change)).toBeLessThanOrEqual(0.05 + 1e-6);
      expect(r.cells[7]).toMatch(/^(h per worker per year|shift h per year)$/);
    });
    const shown = rows.flatMap((r) => r.cells).join(' | ');
    for (const id of ['hours-lost-shift', 'hours-above-limit-shift', 'very-high', 'unacclimatized.sun']) expect(shown).not.toContain(id);
    // Region names are escaped like every other text (the odd-name region is HTML).
    expect(updatedHtml.slice(updatedHtml.indexOf('id="what-changed"'))).not.toContain('<script>alert(2)</script>');
  });

  it("keeps the latest year apart: its moves are folded and called one year's weather", () => {
    const section = updatedHtml.slice(updatedHtml.indexOf('id="changes-latest"'));
    expect(changes.latest.length).toBeGreaterThan(0);
    expect(changes.latest.every((m) => m.statistic === 'latest')).toBe(true);
    expect(text(section.slice(0, section.indexOf('</p>')))).toContain("describe one year's weather");
    expect(section).toContain('<details class="change-latest"');
  });

  it('an unchanged rebuild says no normal moved and the baseline is the same; a new baseline says every normal was recomputed', () => {
    expect(normalsMovedWords(same.normals)).toBe(`none of the ${same.normals.compared} moved.`);
    expect(same.normals.compared).toBe(changes.normals.compared);
    expect(baselineWords(same, [2021, 2022])).toBe('The baseline (2021–2022) is unchanged.');
    const moved = { ...same, baselineChanged: true, previous: { ...same.previous!, baseline: [2020, 2021] as [number, number] } };
    expect(baselineWords(moved, [2021, 2022])).toBe('The baseline changed from 2020–2021 to 2021–2022, so every normal was recomputed.');
    const code = { ...changes, codeChanged: true, inputs: { ...changes.inputs, changed: ['a.nc'] } };
    expect(baselineWords(code, [2021, 2022])).toBe(
      'The baseline (2021–2022) is unchanged; the normals moved because input files changed, the heathours version changed.',
    );
  });
});

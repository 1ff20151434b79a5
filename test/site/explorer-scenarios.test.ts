/**
 * The map's what-if climates (src/lib/explorer-scenarios.ts): each scenario layer under its
 * baseline twin's id and view, with the scenario's own files, legend and values path, its words,
 * and the caveat (the manifest's, else the pipeline's SCENARIO_CAVEAT: one source of the text).
 * The first part uses small hand-written manifests and catalogues (invented paths and legends, for
 * this test only); the second the test atlas with a 2 K warming that the pipeline built
 * (test/site/pipeline-data.ts), against its own region tables.
 */
import { describe, expect, it } from 'vitest';
import { explorerScenarios, scenarioCaveat, scenarioLayersPath, scenarioValuesPath, scenarioWords } from '../../src/lib/explorer-scenarios.ts';
import { SCENARIO_CAVEAT } from '../../pipeline/scenario/describe.ts';
import type { ManifestLayers } from '../../src/data/manifest-layers.ts';
import type { ExplorerCatalogue } from '../../src/components/map/explorer/catalogue.ts';
import { manifestLayer } from './manifest-layer.ts';

const corners = [
  [0, 1],
  [1, 1],
  [1, 0],
  [0, 0],
] as [[number, number], [number, number], [number, number], [number, number]];
const legend = (max: number) => ({
  kind: 'continuous',
  units: 'h',
  ramp: 'Reds',
  reversed: false,
  domain: [0, max],
  stops: [{ value: 0, color: '#ffffff' }],
  labels: [],
  outOfDomain: 'clamped',
  noData: { color: 'transparent', meaning: 'sea' },
});
const mLayer = (root: string, stat: string, period: string, max: number) => {
  const l = manifestLayer(root, stat, period);
  return { ...l, mapImages: [{ path: l.png, coordinates: corners }], legend: legend(max) };
};
const cLayer = (stat: string, period: string, legendIndex: number, n: number) => ({
  id: `hours-lost-shift/moderate.acclimatized.sun/${stat}-${period}`,
  figure: 'hours-lost-shift',
  view: { workloadClass: 'moderate', acclimatization: 'acclimatized', exposure: 'sun' },
  statistic: stat,
  period,
  units: 'h',
  images: [{ path: `data/layers/hours-lost-shift/moderate.acclimatized.sun/${stat}-${period}.png`, coordinates: corners }],
  legend: legendIndex,
  tif: `data/layers/hours-lost-shift/moderate.acclimatized.sun/${stat}-${period}.tif`,
  values: `map/values/${n}.json`,
});

function inputs(withScenario = true) {
  const manifest = {
    layers: [mLayer('data/', 'mean', '07', 100), mLayer('data/', 'mean', 'year', 500), mLayer('data/', 'trend', 'year', 5)],
    scenarioCaveat: 'A what-if, not a forecast (test caveat).',
    scenarios: withScenario
      ? [
          {
            id: 'warm-2k',
            name: 'Uniform warming of 2 K',
            dataPath: 'data/scenarios/warm-2k/',
            words: { kind: 'Uniform warming', what: 'Every hour 2 K warmer.', source: 'The configuration', caveat: 'x' },
            layers: [
              mLayer('data/scenarios/warm-2k/', 'mean', '07', 200),
              mLayer('data/scenarios/warm-2k/', 'mean', 'year', 800),
              mLayer('data/scenarios/warm-2k/', 'p90', 'year', 900),
            ],
          },
        ]
      : undefined,
  } as unknown as ManifestLayers;
  // A catalogue without the trend layer: a scenario layer whose view the catalogue lacks is left out.
  const catalogue = { layers: [cLayer('mean', '07', 0, 0), cLayer('mean', 'year', 1, 1)], legends: [legend(100), legend(500)] } as unknown as ExplorerCatalogue;
  return { manifest, catalogue };
}

describe("the map explorer's scenario list", () => {
  it("gives each scenario layer its baseline twin's id and view with the scenario's own files, legend and values path", () => {
    const { manifest, catalogue } = inputs();
    const list = explorerScenarios(manifest, catalogue);
    expect(list).toHaveLength(1);
    const sc = list[0];
    expect([sc.id, sc.name, sc.kind, sc.what, sc.source]).toEqual([
      'warm-2k',
      'Uniform warming of 2 K',
      'Uniform warming',
      'Every hour 2 K warmer.',
      'The configuration',
    ]);
    expect(sc.layersFile).toBe(scenarioLayersPath('warm-2k'));
    expect(sc.layersFile).toBe('map/scenarios/warm-2k.json');
    expect(sc.cellsIndex).toBe('data/scenarios/warm-2k/cells/index.json');
    // The P90 layer has no baseline twin in the catalogue: left out.
    expect(sc.layers.map((l) => l.id)).toEqual(catalogue.layers.map((l) => l.id));
    sc.layers.forEach((l, i) => {
      expect(l.view).toEqual(catalogue.layers[i].view);
      expect(l.images[0].path.startsWith('data/scenarios/warm-2k/')).toBe(true);
      expect(l.tif.startsWith('data/scenarios/warm-2k/')).toBe(true);
      expect(l.values).toBe(scenarioValuesPath('warm-2k', i));
      expect(l.values).toBe(`map/scenarios/warm-2k/values/${i}.json`);
    });
    expect(sc.legends.map((g) => g.domain)).toEqual([
      [0, 200],
      [0, 800],
    ]);
    expect(sc.layers.map((l) => l.legend)).toEqual([0, 1]);
    // The words the page writes at build time carry no layers.
    expect(scenarioWords(manifest)).toEqual([
      {
        id: 'warm-2k',
        name: 'Uniform warming of 2 K',
        kind: 'Uniform warming',
        what: 'Every hour 2 K warmer.',
        source: 'The configuration',
        layersFile: sc.layersFile,
        cellsIndex: sc.cellsIndex,
      },
    ]);
  });

  it("is empty without scenarios; the caveat is the manifest's, else the pipeline's own (what-if, not a forecast; day-to-day weather kept, monthly means changed)", () => {
    const { manifest, catalogue } = inputs(false);
    expect(explorerScenarios(manifest, catalogue)).toEqual([]);
    expect(scenarioWords(manifest)).toEqual([]);
    expect(scenarioWords(null)).toEqual([]);
    expect(scenarioCaveat(inputs().manifest)).toBe('A what-if, not a forecast (test caveat).');
    const bare = { ...manifest, scenarioCaveat: undefined } as unknown as ManifestLayers;
    expect(scenarioCaveat(bare)).toBe(SCENARIO_CAVEAT);
    expect(SCENARIO_CAVEAT).toMatch(/^A what-if, not a forecast/);
    expect(SCENARIO_CAVEAT).toMatch(/day-to-day and hour-to-hour weather is kept and only monthly means change/);
  });
});

describe("the map explorer's scenario values, from data the pipeline built", () => {
  it("gives each scenario layer the scenario region table's value, and more hours lost than the baseline for a 2 K warming", async () => {
    const { buildPipelineData, PIPELINE_DATA_SCENARIO } = await import('./pipeline-data.ts');
    const { loadExplorerCatalogue, loadExplorerScenarios, loadExplorerValues, loadScenarioValues } = await import('../../src/data/explorer.ts');
    const { existsSync, readFileSync } = await import('node:fs');
    const { join } = await import('node:path');
    const { dataDir } = await buildPipelineData({ withScenario: true });
    const catalogue = loadExplorerCatalogue(dataDir);
    const list = loadExplorerScenarios(dataDir);
    expect(list.map((s) => s.id)).toEqual([PIPELINE_DATA_SCENARIO.id]);
    const sc = list[0];
    // Every layer of the record's map has its twin in the scenario (the scenario publishes the record's layers).
    expect(sc.layers.map((l) => l.id)).toEqual(catalogue.layers.map((l) => l.id));
    // Its per-cell figures are published where the map looks for them.
    expect(existsSync(join(dataDir, sc.cellsIndex))).toBe(true);
    const values = loadScenarioValues(sc.id, dataDir);
    expect(values).toHaveLength(sc.layers.length);
    // The default layer: its value for the first region, read straight from the scenario's region table.
    const li = sc.layers.findIndex(
      (l) =>
        l.figure === 'hours-lost-shift' &&
        l.statistic === 'mean' &&
        l.period === 'year' &&
        l.view.workloadClass === 'moderate' &&
        l.view.acclimatization === 'acclimatized' &&
        l.view.exposure === 'sun',
    );
    expect(li).toBeGreaterThanOrEqual(0);
    const region = catalogue.regions[0].id;
    const csv = readFileSync(join(dataDir, 'data', 'scenarios', sc.id, 'regions', `${region}.csv`), 'utf8').split('\n');
    const cols = csv[0].split(',');
    const at = (k: string) => cols.indexOf(k);
    const row = csv
      .slice(1)
      .map((l) => l.split(','))
      .find(
        (c) =>
          c[at('period')] === 'year' &&
          c[at('figure')] === 'hours-lost-shift' &&
          c[at('workload_class')] === 'moderate' &&
          c[at('acclimatization')] === 'acclimatized' &&
          c[at('exposure')] === 'sun' &&
          c[at('statistic')] === 'mean',
      )!;
    expect(values[li][0]).toBe(Number(row[at('value')]));
    // Warming never lowers hours lost: every region's scenario value ≥ the baseline's.
    const base = loadExplorerValues(dataDir)[sc.layers[li].id];
    values[li].forEach((v, r) => expect(v!).toBeGreaterThanOrEqual(base[r]!));
    // A uniform warming of 2 K raises each region's mean annual air temperature by 2 K (every hour + 2 K, by definition of the scenario).
    const mat = sc.layers.findIndex((l) => l.figure === 'mean-annual-temperature');
    const baseMat = loadExplorerValues(dataDir)[sc.layers[mat].id];
    values[mat].forEach((v, r) => expect(v!).toBeCloseTo(baseMat[r]! + PIPELINE_DATA_SCENARIO.warming, 5));
    // The home page's ranking in the scenario reads the same tables: the annual hours lost of each region.
    const { loadRegionAnnuals, comboKey } = await import('../../src/data/region-annual.ts');
    const annuals = loadRegionAnnuals(catalogue.regions, dataDir, false, sc.id);
    const baseAnnuals = loadRegionAnnuals(catalogue.regions, dataDir, false);
    const key = comboKey('moderate', 'acclimatized', 'sun');
    annuals.forEach((a, r) => {
      expect(a.hoursLost.get(key) ?? null).toBe(values[li][r]);
      expect(a.hoursLost.get(key)!).toBeGreaterThanOrEqual(baseAnnuals[r].hoursLost.get(key)!);
    });
    expect(annuals.some((a, r) => a.hoursLost.get(key)! > baseAnnuals[r].hoursLost.get(key)!)).toBe(true);
  }, 600_000);
});

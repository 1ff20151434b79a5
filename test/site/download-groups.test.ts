/**
 * The downloads page's grouping (src/lib/downloads.ts) with scenarios: every artefact listed
 * exactly once, a scenario's layers and files in its own group and never among the baseline's.
 * The manifest here is a small hand-written one (invented paths and sizes, for this test only).
 */
import { describe, expect, it } from 'vitest';
import { downloadGroups } from '../../src/lib/downloads.ts';
import type { ManifestArtefact, SiteManifest } from '../../src/data/manifest.ts';
import { manifestLayer } from './manifest-layer.ts';

const SHA = 'a'.repeat(64);
const art = (path: string, kind: ManifestArtefact['kind'], bytes: number): ManifestArtefact => ({ path, kind, description: path, bytes, sha256: SHA });
const layer = (root: string, stat: 'mean' | 'p90', period: string) => manifestLayer(root, stat, period);
const layerFiles = (root: string, stat: 'mean' | 'p90', period: string) => [
  art(layer(root, stat, period).png, 'layer-png', 100),
  art(layer(root, stat, period).tif, 'layer-geotiff', 1000),
];

function manifest(): SiteManifest {
  const baseLayers = [layer('data/', 'mean', 'year'), layer('data/', 'p90', 'year')];
  const scenLayers = [layer('data/scenarios/warm-2k/', 'mean', 'year'), layer('data/scenarios/warm-2k/', 'mean', '07')];
  const artefacts = [
    art('data/regions/north.csv', 'table', 50),
    art('data/inventory.json', 'json', 10),
    ...layerFiles('data/', 'mean', 'year'),
    ...layerFiles('data/', 'p90', 'year'),
    art('data/scenarios/warm-2k/regions/north.csv', 'table', 60),
    art('data/scenarios/warm-2k/cells/index.json', 'json', 7),
    ...layerFiles('data/scenarios/warm-2k/', 'mean', 'year'),
    ...layerFiles('data/scenarios/warm-2k/', 'mean', '07'),
  ];
  return {
    figures: [{ id: 'hours-lost-shift', label: 'Hours lost', units: 'h', combos: ['moderate.acclimatized.sun'] }],
    work: { classes: [{ id: 'moderate', name: 'Moderate', metabolicRate: 300, description: '' }] },
    layers: baseLayers,
    artefacts,
    scenarios: [
      {
        id: 'warm-2k',
        name: 'Uniform warming of 2 K',
        dataPath: 'data/scenarios/warm-2k/',
        words: {
          kind: 'Uniform warming',
          what: 'Every hour 2 K warmer, relative humidity kept.',
          source: 'Set in the configuration',
          caveat: 'A what-if, not a forecast.',
        },
        layers: scenLayers,
      },
    ],
  } as unknown as SiteManifest;
}

describe('downloads grouping with scenarios', () => {
  it("puts a scenario's layers and files in its own group and lists every artefact exactly once", () => {
    const m = manifest();
    const g = downloadGroups(m);
    expect(g.scenarios.map((s) => s.id)).toEqual(['warm-2k']);
    const sc = g.scenarios[0];
    expect(sc.layerCount).toBe(2);
    expect(sc.figures[0].combos[0].periods).toEqual(['07', 'year']);
    expect(sc.files.map((a) => a.path)).toEqual(['data/scenarios/warm-2k/regions/north.csv', 'data/scenarios/warm-2k/cells/index.json']);
    // 2 layers × (100 + 1000) bytes + 60 + 7
    expect(sc.bytes).toBe(2267);
    expect(sc.kind).toBe('Uniform warming');
    // The baseline's groups hold no scenario file.
    const listed = [
      ...g.tables.map((a) => a.path),
      ...g.others.map((a) => a.path),
      ...g.figures.flatMap((f) => f.combos.flatMap((c) => [...c.cells.values()].flatMap((d) => [d.tif.path, d.png.path]))),
    ];
    expect(listed.some((p) => p.startsWith('data/scenarios/'))).toBe(false);
    expect(g.figures[0].layerCount).toBe(2);
    const scenarioListed = [
      ...sc.files.map((a) => a.path),
      ...sc.figures.flatMap((f) => f.combos.flatMap((c) => [...c.cells.values()].flatMap((d) => [d.tif.path, d.png.path]))),
    ];
    const all = [...listed, ...scenarioListed].sort();
    expect(all).toEqual(m.artefacts.map((a) => a.path).sort());
  });

  it('gives no scenario group for a manifest without scenarios', () => {
    const m = { ...manifest(), scenarios: undefined } as unknown as SiteManifest;
    const g = downloadGroups(m);
    expect(g.scenarios).toEqual([]);
    // Without a scenario list its files are plain other files (tables stay tables).
    expect(g.tables.map((a) => a.path)).toContain('data/scenarios/warm-2k/regions/north.csv');
  });
});

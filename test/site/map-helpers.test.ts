/**
 * The map explorer's pure parts (src/components/map/explorer/, src/lib/explorer-catalogue.ts,
 * src/lib/csv-parse.ts) and its build-time readers (src/data/manifest-layers.ts,
 * src/data/region-values.ts), in Node. Outside references: d3-geo's geoContains and
 * geoDistance for "which region holds / is nearest to a point"; °F = °C × 9/5 + 32 by definition.
 */
import { cpSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { geoArea, geoContains, geoDistance, geoInterpolate } from 'd3-geo';
import type { Feature, MultiPolygon, Polygon } from 'geojson';
import { buildPipelineData } from './pipeline-data.ts';
import { loadManifestLayers } from '../../src/data/manifest-layers.ts';
import { loadRegions } from '../../src/data/regions.ts';
import { regionLayerValues } from '../../src/data/region-values.ts';
import { explorerCatalogue } from '../../src/lib/explorer-catalogue.ts';
import { parseCsv, parseCsvObjects } from '../../src/lib/csv-parse.ts';
import { parseViewState, viewQuery, type ViewState } from '../../src/components/map/explorer/view-state.ts';
import { resolveView, layerForPeriod } from '../../src/components/map/explorer/layer-choice.ts';
import { cellAt, cellCentre, cellPolygon, chunkOfCell, moveCell, type CellGrid } from '../../src/components/map/explorer/cell-grid.ts';
import { distanceToOutlineKm, outlineHolds, regionsForPoint } from '../../src/components/map/explorer/nearest-region.ts';
import { formatLayerValue, labelInUnit, legendTickLabel } from '../../src/components/map/explorer/value-format.ts';
import { cellChunkId } from '../../pipeline/publish/cell-figures.ts';
import { searchMap } from '../../src/components/map/explorer/map-search.ts';
import { layerUnitWords, legendRangeNote } from '../../src/components/map/explorer/legend-range.ts';
import { describeLayer, trendNote } from '../../src/components/map/explorer/describe-view.ts';
import { labelPoint } from '../../src/lib/label-point.ts';
import type { ExplorerCatalogue } from '../../src/components/map/explorer/catalogue.ts';
import { expectCatalogued } from '../helpers/catalogued.ts';

let dataDir = '';
let catalogue: ExplorerCatalogue;
let values: Record<string, Array<number | null>>;

beforeAll(async () => {
  dataDir = (await buildPipelineData()).dataDir;
  // The catalogue the site builds (src/data/explorer.ts: every layer, the trend layers among them).
  const manifest = loadManifestLayers(dataDir)!;
  const layers = manifest.layers;
  catalogue = explorerCatalogue(manifest, loadRegions(dataDir));
  values = regionLayerValues(
    dataDir,
    catalogue.regions.map((r) => r.id),
    layers,
  );
}, 300_000);

describe('the explorer catalogue of a real pipeline build', () => {
  it('holds every manifest layer once, with its images, GeoTIFF and an equal legend', () => {
    const manifest = JSON.parse(readFileSync(join(dataDir, 'data/manifest.json'), 'utf8')) as {
      layers: Array<{ id: string; tif: string; mapImages: Array<{ path: string }>; legend: unknown }>;
    };
    const shown = manifest.layers;
    expect(shown.some((l) => l.id.endsWith('/trend-year'))).toBe(true);
    expect(shown.some((l) => l.id.endsWith('/trend-p-year'))).toBe(true);
    expect(catalogue.layers.map((l) => l.id)).toEqual(shown.map((l) => l.id));
    shown.forEach((l, i) => {
      const c = catalogue.layers[i];
      expect(c.tif).toBe(l.tif);
      expect(c.images.map((m) => m.path)).toEqual(l.mapImages.map((m) => m.path));
      expect(catalogue.legends[c.legend]).toEqual(l.legend);
    });
    // Months of one view share a legend, so the catalogue is much smaller than the manifest.
    expect(catalogue.legends.length).toBeLessThan(manifest.layers.length / 5);
  });

  it('names one values file per layer (map/values/<n>.json, n its place in the catalogue) and carries no value per region itself, so it does not grow with layers × regions', () => {
    expect(catalogue.layers.map((l) => l.values)).toEqual(catalogue.layers.map((_, i) => `map/values/${i}.json`));
    expect(JSON.stringify(catalogue)).not.toMatch(/regionValues/);
  });

  it("gives each region the value of its region table's row for the layer, and the niche figures of its summary", () => {
    const ids = catalogue.regions.map((r) => r.id);
    let compared = 0;
    for (const [r, id] of ids.entries()) {
      const rows = parseCsvObjects(readFileSync(join(dataDir, `data/regions/${id}.csv`), 'utf8'));
      const summary = JSON.parse(readFileSync(join(dataDir, `data/regions/${id}.json`), 'utf8'));
      for (const layer of catalogue.layers) {
        const got = values[layer.id][r];
        if (layer.figure === 'mean-annual-temperature') expect(got).toBe(summary.niche.baselineMat);
        else if (layer.figure === 'niche-class') expect(got).toBe(['core', 'second', 'margin', 'outside'].indexOf(summary.niche.baselineClass));
        // Person-hours per km² mixes every class, acclimatization and exposure by the workforce shares: one row a period.
        else if (layer.figure === 'person-hours-lost-density') {
          const row = rows.find((x) => x.period === layer.period && x.figure === layer.figure && x.statistic === layer.statistic)!;
          expect(row, `${id} ${layer.id}`).toBeDefined();
          expect(got).toBe(row.value === '' ? null : Number(row.value));
        } else {
          const v = layer.view;
          const row = rows.find(
            (x) =>
              x.period === layer.period &&
              x.figure === layer.figure &&
              x.statistic === layer.statistic &&
              x.workload_class === (v.workloadClass ?? '') &&
              x.acclimatization === (v.acclimatization ?? '') &&
              x.exposure === (v.exposure ?? '') &&
              x.method === (v.loss ?? (layer.figure.startsWith('hours-') ? 'limit' : '')),
          )!;
          expect(row, `${id} ${layer.id}`).toBeDefined();
          expect(got).toBe(row.value === '' ? null : Number(row.value));
          compared += 1;
        }
      }
    }
    expect(compared).toBeGreaterThan(5000);
  });

  it('offers our own labels, the published choices only, and a default view that is a published layer', () => {
    expect(catalogue.figures.map((f) => f.label)).toEqual([
      'Hours above the limit',
      'Hours lost to rest breaks',
      'Mean WBGT',
      'Capacity loss',
      'Mean annual temperature',
      'Human climate niche class',
      'Person-hours lost per km²',
    ]);
    expect(catalogue.choices.workloadClass.map((c) => c.id)).toEqual(['low', 'moderate', 'high', 'very-high']);
    expect(catalogue.choices.workloadClass[1].label).toBe('Moderate work rate (300 W)');
    expect(catalogue.choices.statistic.map((c) => c.id)).toEqual(['mean', 'p90', 'trend', 'trend-p', 'baseline', 'class']);
    expect(catalogue.choices.statistic.find((c) => c.id === 'trend')!.label).toBe('Trend per decade (Theil–Sen)');
    expect(catalogue.choices.statistic.find((c) => c.id === 'trend-p')!.label).toBe('Trend p-value (Mann–Kendall)');
    // The test atlas has 3 years built (2021–2023): fewer than a trend needs, which the map says.
    expect(catalogue.years).toEqual([2021, 2023]);
    const trendLayer = resolveView(catalogue, parseViewState('?stat=trend', catalogue)).layer!;
    expect(trendLayer.id).toBe('hours-lost-shift/moderate.acclimatized.sun/trend-year');
    expect(trendNote(catalogue, trendLayer)).toBe('A trend needs at least 15 years; this record has 3 (2021–2023), so the layer has no values.');
    expect(trendNote(catalogue, resolveView(catalogue, parseViewState('', catalogue)).layer!)).toBeNull();
    expect(describeLayer(catalogue, trendLayer).statistic).toBe('Trend per decade (Theil–Sen), years built 2021–2023');
    expect(
      layerUnitWords(
        catalogue.figures.find((f) => f.id === 'hours-lost-shift'),
        trendLayer,
      ),
    ).toBe('change of the yearly value per decade (h decade-1)');
    const pLayer = resolveView(catalogue, parseViewState('?stat=trend-p', catalogue)).layer!;
    expect(pLayer.id).toBe('hours-lost-shift/moderate.acclimatized.sun/trend-p-year');
    expect(catalogue.legends[pLayer.legend].domain).toEqual([0, 1]);
    expect(layerUnitWords(undefined, pLayer)).toBe('probability from 0 to 1 (Mann–Kendall p-value of the trend)');
    // The region values of a trend layer: the region tables' trend rows, empty below 15 years.
    expect(values[trendLayer.id].every((v) => v === null)).toBe(true);
    // The test atlas's baseline has 2 years: its P90 says so (pipeline/publish/baseline-length.ts).
    expect(catalogue.choices.statistic[1].label).toBe('P90 of 2 years (near the highest)');
    expect(catalogue.baselineYears).toBe(2);
    expect(catalogue.baselineWarning).toMatch(/^the baseline 2021–2022 has 2 years/);
    expect(catalogue.figures.find((f) => f.id === 'hours-lost-shift')!.unitWords).toEqual({
      month: 'hours per worker per month',
      year: 'hours per worker per year',
    });
    expect(catalogue.choices.period.map((c) => c.id)).toEqual(['01', '02', '03', '04', '05', '06', '07', '08', '09', '10', '11', '12', 'year']);
    const r = resolveView(catalogue, parseViewState('', catalogue));
    expect(r.layer?.id).toBe('hours-lost-shift/moderate.acclimatized.sun/mean-year');
    expect(catalogue.invented).toBe(true);
  });
});

describe('the view in the URL', () => {
  it('round-trips every part of the view through the query, keeping other parameters', () => {
    const state: ViewState = {
      figure: 'hours-above-limit-shift',
      workloadClass: 'high',
      acclimatization: 'unacclimatized',
      exposure: 'shade',
      loss: 'dunne-heavy',
      statistic: 'p90',
      period: '08',
      centre: [-146.25, 20.5],
      zoom: 5.5,
      cell: 33,
      region: 'drovan-basin',
      scenario: 'warm-2k',
    };
    const q = viewQuery(state, '?units=F&layer=old');
    expect(new URLSearchParams(q).get('units')).toBe('F');
    expect(parseViewState(q, catalogue)).toEqual(state);
  });

  it('ignores a centre without a zoom, a negative cell, a latitude beyond the Mercator limit and an unknown region', () => {
    const s = parseViewState('?lon=1&lat=2&cell=-3&region=nowhere', catalogue);
    expect(s.centre).toBeUndefined();
    expect(s.cell).toBeUndefined();
    expect(s.region).toBeUndefined();
    expect(parseViewState('?lon=1&lat=89&zoom=3', catalogue).centre).toBeUndefined();
    // A scenario id that is not a slug is dropped (the page also drops an id it does not offer).
    expect(parseViewState('?scenario=%3Cb%3E', catalogue).scenario).toBeUndefined();
    expect(viewQuery({ ...s, scenario: undefined }, '?scenario=warm-2k')).not.toContain('scenario');
  });

  it('settles a wish nobody published on the nearest published layer and keeps choices the figure lacks', () => {
    // Capacity loss has no P90 and no workload class: the mean is shown, the class is kept for later.
    const r = resolveView(catalogue, {
      ...parseViewState('?layer=capacity-loss-shift&stat=p90&class=high&loss=kjellstrom-400w&exposure=shade&month=05', catalogue),
    });
    expect(r.layer?.id).toBe('capacity-loss-shift/kjellstrom-400w.shade/mean-05');
    expect(r.state.statistic).toBe('mean');
    expect(r.state.workloadClass).toBe('high');
    expect(r.options.workloadClass).toEqual([]);
    // Mean annual temperature exists for the whole year only.
    const mat = resolveView(catalogue, parseViewState('?layer=mean-annual-temperature&month=07', catalogue));
    expect(mat.layer?.id).toBe('mean-annual-temperature/air/baseline-year');
    expect(mat.options.period).toEqual(['year']);
    expect(layerForPeriod(catalogue, mat.state, '07')).toBeUndefined();
    // An unknown figure falls back to the first one.
    expect(resolveView(catalogue, parseViewState('?layer=nonsense', catalogue)).state.figure).toBe('hours-above-limit-shift');
  });
});

describe('cells on the map', () => {
  const g: CellGrid = { nLat: 8, nLon: 10, lat0: 17, lon0: -150, dLat: 1, dLon: 1 };

  it('finds the cell holding a point, also when its longitude is given 360° off, and none outside the grid', () => {
    expect(cellAt(g, -147.2, 17.4)).toEqual({ y: 0, x: 3, id: 3 });
    expect(cellAt(g, 360 - 147.2, 17.4)).toEqual({ y: 0, x: 3, id: 3 });
    expect(cellAt(g, -150.49, 24.49)?.id).toBe(70);
    expect(cellAt(g, -150.51, 20)).toBeNull();
    expect(cellAt(g, -145, 24.51)).toBeNull();
    expect(cellCentre(g, 23)).toEqual([-147, 19]);
    expect(cellPolygon(g, 23).geometry.coordinates[0]).toEqual([
      [-147.5, 18.5],
      [-146.5, 18.5],
      [-146.5, 19.5],
      [-147.5, 19.5],
      [-147.5, 18.5],
    ]);
  });

  it('moves the cursor one cell at a time and stops at the grid edge', () => {
    expect(moveCell(g, 23, 1, 0)).toBe(24);
    expect(moveCell(g, 23, 0, 1)).toBe(33);
    expect(moveCell(g, 0, -1, -1)).toBe(0);
    expect(moveCell(g, 79, 1, 1)).toBe(79);
  });

  it('puts a cell in the chunk the publisher wrote it to', () => {
    const index = { grid: g, tile: { rows: 3, cols: 4 } };
    for (let id = 0; id < 80; id++) expect(chunkOfCell(index, id)).toBe(cellChunkId(Math.floor(id / 10), id % 10, index.tile));
  });
});

describe('which region holds or is nearest to a point', () => {
  /** d3-geo wants clockwise exteriors; GeoJSON's are counter-clockwise: flip a polygon bigger than a hemisphere. */
  function d3Shape(f: Feature<Polygon | MultiPolygon>): Feature<Polygon | MultiPolygon> {
    const polys = f.geometry.type === 'Polygon' ? [f.geometry.coordinates] : f.geometry.coordinates;
    return {
      ...f,
      geometry: {
        type: 'MultiPolygon',
        coordinates: polys.map((rings) => (geoArea({ type: 'Polygon', coordinates: rings }) > 2 * Math.PI ? rings.map((r) => [...r].reverse()) : rings)),
      },
    };
  }

  it('agrees with d3-geo on the demo regions for a lattice of points, inside and out', () => {
    const fc = loadRegions(dataDir);
    const shapes = fc.features.map((f) => ({ id: f.properties.id, geometry: f.geometry as Polygon | MultiPolygon }));
    let inside = 0;
    let outside = 0;
    for (let lat = 16.3; lat <= 24.7; lat += 0.4) {
      for (let lon = -150.7; lon <= -140.3; lon += 0.4) {
        for (const f of fc.features) {
          const ours = outlineHolds(f.geometry as Polygon, [lon, lat]);
          expect(ours, `${f.properties.id} at ${lon}, ${lat}`).toBe(geoContains(d3Shape(f as Feature<Polygon>), [lon, lat]));
        }
        const r = regionsForPoint(shapes, [lon, lat]);
        if (r.holding.length > 0) inside += 1;
        else {
          outside += 1;
          // Nearest by d3-geo: great-circle distance to the densely sampled outline.
          const d3Nearest = fc.features
            .map((f) => {
              let best = Infinity;
              const ring = (f.geometry as Polygon).coordinates[0];
              for (let i = 0; i + 1 < ring.length; i++) {
                const at = geoInterpolate(ring[i] as [number, number], ring[i + 1] as [number, number]);
                for (let k = 0; k <= 40; k++) best = Math.min(best, geoDistance([lon, lat], at(k / 40)));
              }
              return { id: f.properties.id, km: best * 6371.0088 };
            })
            .sort((a, b) => a.km - b.km)[0];
          expect(r.nearest?.id).toBe(d3Nearest.id);
          expect(Math.abs(r.nearest!.km - d3Nearest.km)).toBeLessThanOrEqual(0.01 * d3Nearest.km + 0.5);
        }
      }
    }
    expect(inside).toBeGreaterThan(50);
    expect(outside).toBeGreaterThan(50);
  });

  it('treats a hole as outside and measures 1° of latitude as 111.2 km', () => {
    const square: Polygon = {
      type: 'Polygon',
      coordinates: [
        [
          [0, 0],
          [4, 0],
          [4, 4],
          [0, 4],
          [0, 0],
        ],
        [
          [1, 1],
          [1, 3],
          [3, 3],
          [3, 1],
          [1, 1],
        ],
      ],
    };
    expect(outlineHolds(square, [0.5, 0.5])).toBe(true);
    expect(outlineHolds(square, [2, 2])).toBe(false);
    expect(distanceToOutlineKm(square, [2, 5])).toBeCloseTo(111.195, 2);
  });
});

describe('values and labels in the reader’s unit', () => {
  it('writes temperatures in °F as °C × 9/5 + 32, hours with their unit, class codes by name', () => {
    expect(formatLayerValue(25, 'degC', 'F')).toBe('77.0 °F');
    expect(formatLayerValue(-1.25, 'degC', 'C', undefined, 2)).toBe('\u22121.25 °C');
    expect(formatLayerValue(12.345, 'h', 'F', undefined, 2)).toBe('12.35 h');
    expect(formatLayerValue(null, 'h', 'C')).toBe('–');
    expect(labelInUnit('Main band of lived-in climates (11–15 °C)', 'F')).toBe('Main band of lived-in climates (51.8–59 °F)');
    expect(labelInUnit('Hotter than almost any lived-in climate (29 °C and above)', 'F')).toBe('Hotter than almost any lived-in climate (84.2 °F and above)');
    const wbgt = catalogue.legends[catalogue.layers.find((l) => l.figure === 'wbgt-mean')!.legend];
    expect(legendTickLabel(wbgt, 0, 'F')).toBe(((wbgt.stops[0].value * 9) / 5 + 32).toFixed(1));
  });
});

describe('reading the pipeline’s tables for the map page', () => {
  let work = '';
  beforeAll(() => {
    work = mkdtempSync(join(tmpdir(), 'hh-map-data-'));
    cpSync(dataDir, work, { recursive: true });
  });
  afterAll(() => rmSync(work, { recursive: true, force: true }));

  it('parses quoted CSV fields with commas, quotes and line breaks', () => {
    expect(parseCsv('a,b\n"x, y","say ""hi"""\n"two\nlines",\n')).toEqual([
      ['a', 'b'],
      ['x, y', 'say "hi"'],
      ['two\nlines', ''],
    ]);
  });

  it('fails with SiteDataMissing when a region table is absent', () => {
    const layers = loadManifestLayers(work)!.layers;
    rmSync(join(work, 'data/regions/varn-shore.csv'));
    expectCatalogued(() => regionLayerValues(work, ['varn-shore'], layers), 'SiteDataMissing', /varn-shore\.csv/);
  });

  it('fails with SiteDataInvalid naming the row of a value that is not a number', () => {
    const path = join(work, 'data/regions/tessick-coast.csv');
    const lines = readFileSync(path, 'utf8').split('\n');
    lines[3] = lines[3].replace(/^((?:[^,]*,){8})[^,]*/, '$1twelve');
    writeFileSync(path, lines.join('\n'));
    const err = expectCatalogued(() => regionLayerValues(work, ['tessick-coast'], loadManifestLayers(work)!.layers), 'SiteDataInvalid', /twelve/);
    expect(err.where.row).toBe(4);
  });

  it('fails with SiteDataInvalid naming the key of a layer without map images', () => {
    const path = join(work, 'data/manifest.json');
    const m = JSON.parse(readFileSync(path, 'utf8'));
    m.layers[2].mapImages = [];
    writeFileSync(path, JSON.stringify(m));
    const err = expectCatalogued(() => loadManifestLayers(work), 'SiteDataInvalid');
    expect(err.where.key).toBe('layers.2.mapImages');
  });

  it('gives no catalogue (null) for a data folder without a manifest', () => {
    rmSync(join(work, 'data/manifest.json'));
    expect(loadManifestLayers(work)).toBeNull();
  });
});

describe('the map search box (map-search.ts)', () => {
  const regions = [
    { id: 'sollent-coast', name: 'Sollent Coast', bbox: [0, 0, 1, 1], label: [0.5, 0.5] },
    { id: 'tessick-coast', name: 'Tessick Coast', bbox: [0, 0, 1, 1], label: [0.5, 0.5] },
    { id: 'varn-shore', name: 'Várn Shore', bbox: [0, 0, 1, 1], label: [0.5, 0.5] },
  ] as ExplorerCatalogue['regions'];

  it('reads latitude then longitude in decimal degrees, with or without hemisphere letters, in either order when the letters say so', () => {
    for (const t of ['20.5, -145.25', '20.5 -145.25', '20.5 N 145.25 W', '20.5°N, 145.25°W', '145.25 W 20.5 N', '20.5; \u2212145.25']) {
      expect(searchMap(t, regions), t).toEqual({ kind: 'point', lat: 20.5, lon: -145.25 });
    }
    expect(searchMap('3.25 S 60 E', regions)).toEqual({ kind: 'point', lat: -3.25, lon: 60 });
  });

  it('finds a region by its name, ignoring case and accents, by a unique start or part of it', () => {
    expect(searchMap('sollent coast', regions)).toEqual({ kind: 'region', id: 'sollent-coast', name: 'Sollent Coast' });
    expect(searchMap('varn', regions)).toEqual({ kind: 'region', id: 'varn-shore', name: 'Várn Shore' });
    expect(searchMap('tess', regions)).toMatchObject({ kind: 'region', id: 'tessick-coast' });
    expect(searchMap('shore', regions)).toMatchObject({ kind: 'region', id: 'varn-shore' });
  });

  it('says what is wrong: no text, two regions that match, no match, an impossible latitude, two latitudes, a sign with a hemisphere', () => {
    expect(searchMap('  ', regions)).toMatchObject({ kind: 'none', message: expect.stringMatching(/region name or a latitude/) });
    expect(searchMap('coast', regions)).toMatchObject({ kind: 'none', message: '2 regions match: Sollent Coast, Tessick Coast. Type more of the name.' });
    expect(searchMap('Atlantis', regions)).toMatchObject({ kind: 'none', message: expect.stringMatching(/No region is named like “Atlantis”/) });
    expect(searchMap('95, 10', regions)).toMatchObject({ kind: 'none', message: expect.stringMatching(/Latitude 95 is not between/) });
    expect(searchMap('20 N 21 S', regions)).toMatchObject({ kind: 'none', message: expect.stringMatching(/one latitude/) });
    expect(searchMap('-20 N 3 E', regions)).toMatchObject({ kind: 'none', message: expect.stringMatching(/no minus sign/) });
  });
});

describe('the legend range note (legend-range.ts)', () => {
  const legend = (domain: [number, number], units = 'h') =>
    ({
      kind: 'continuous',
      units,
      domain,
      stops: [],
      labels: [],
      ramp: 'Reds',
      reversed: false,
      outOfDomain: 'clamped',
      noData: { color: 'transparent', meaning: '' },
    }) as never;

  it('states the unit in words and which views share the range', () => {
    expect(legendRangeNote(legend([0, 130]), { figure: 'hours-lost-shift', period: '07', unitWords: 'hours per worker per month' }, 'C')).toBe(
      'Unit: hours per worker per month. Colours span 0–130 h, a range shared by the twelve months of this view, so they compare; the whole year has its own.',
    );
    expect(legendRangeNote(legend([0, 650]), { figure: 'hours-lost-shift', period: 'year', unitWords: 'hours per worker per year' }, 'C')).toContain(
      'the range of the whole year',
    );
  });

  it("says when the range changed from the view shown before (same figure), in the reader's temperature unit", () => {
    const note = legendRangeNote(legend([0, 650]), { figure: 'hours-lost-shift', period: 'year', unitWords: 'hours per worker per year' }, 'C', {
      figure: 'hours-lost-shift',
      units: 'h',
      domain: [0, 130],
    });
    expect(note).toContain('The range changed with this view (it was 0–130 h): compare colours only within one range.');
    expect(
      legendRangeNote(legend([0, 130]), { figure: 'hours-lost-shift', period: '08', unitWords: 'u' }, 'C', {
        figure: 'hours-lost-shift',
        units: 'h',
        domain: [0, 130],
      }),
    ).not.toContain('changed');
    expect(
      legendRangeNote(legend([0, 130]), { figure: 'hours-above-limit-shift', period: '08', unitWords: 'u' }, 'C', {
        figure: 'hours-lost-shift',
        units: 'h',
        domain: [0, 650],
      }),
    ).not.toContain('changed');
    // 20–30 °C shown in °F: 68.0–86.0 °F (°F = °C × 9/5 + 32).
    expect(
      legendRangeNote(legend([20, 30], 'degC'), { figure: 'wbgt-mean', period: '07', unitWords: 'degrees Celsius (WBGT)' }, 'F', {
        figure: 'wbgt-mean',
        units: 'degC',
        domain: [10, 30],
      }),
    ).toContain('Colours span 68.0–86.0 °F');
  });
});

describe('region names on the map (label-point.ts)', () => {
  it('puts each name inside its outline, also for a U-shaped region whose centroid lies outside it and for a ring with a hole (d3-geo geoContains)', () => {
    const u: Polygon = {
      type: 'Polygon',
      coordinates: [
        [
          [0, 0],
          [3, 0],
          [3, 3],
          [2, 3],
          [2, 1],
          [1, 1],
          [1, 3],
          [0, 3],
          [0, 0],
        ],
      ],
    };
    const holed: Polygon = {
      type: 'Polygon',
      coordinates: [
        [
          [0, 0],
          [4, 0],
          [4, 4],
          [0, 4],
          [0, 0],
        ],
        [
          [1, 1],
          [1, 3],
          [3, 3],
          [3, 1],
          [1, 1],
        ],
      ],
    };
    const multi: MultiPolygon = {
      type: 'MultiPolygon',
      coordinates: [
        [
          [
            [10, 10],
            [10.5, 10],
            [10.5, 10.5],
            [10, 10],
          ],
        ],
        u.coordinates,
      ],
    };
    // d3-geo wants exterior rings clockwise (spherical winding): rewind a polygon that would enclose more than half the sphere.
    const forD3 = (g: Polygon | MultiPolygon): Feature => {
      const polys = g.type === 'Polygon' ? [g.coordinates] : g.coordinates;
      return {
        type: 'Feature',
        properties: {},
        geometry: {
          type: 'MultiPolygon',
          coordinates: polys.map((rings) => (geoArea({ type: 'Polygon', coordinates: rings }) > 2 * Math.PI ? rings.map((r) => [...r].reverse()) : rings)),
        },
      };
    };
    expect(geoContains(forD3(u), [1.5, 2])).toBe(false); // the notch of the U: its centroid's side
    expect(geoContains(forD3(holed), [2, 2])).toBe(false); // the hole
    for (const g of [u, holed, multi]) {
      const p = labelPoint(g);
      expect(geoContains(forD3(g), p), JSON.stringify(p)).toBe(true);
    }
    // The largest part of a multi-polygon carries the name.
    expect(labelPoint(multi)[0]).toBeLessThan(5);
  });

  it('every region of the test atlas gets a label point inside its own outline', () => {
    for (const r of catalogue.regions) {
      const f = loadRegions(dataDir).features.find((x) => x.properties.id === r.id)!;
      expect(outlineHolds(f.geometry as Polygon | MultiPolygon, r.label), r.id).toBe(true);
      expect(regionsForPoint([{ id: r.id, geometry: f.geometry as Polygon | MultiPolygon }], r.label).holding, r.id).toEqual([r.id]);
    }
  });
});

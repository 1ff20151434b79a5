/**
 * The first-view counter of the many-region benchmark (bench/first-view.mjs) on a hand-made site
 * whose files and sizes are known: what a browser loads for the screen is counted (the page, its
 * screen stylesheets, its module scripts and what they import statically, the worker they name,
 * the data its script fetches at start, the opening layer's image), and what it does not load is
 * left out (the print stylesheet, a dynamic import, a `data-print-url` address, other layers).
 * Sizes are those written here; gzip sizes come from node:zlib and are checked only to be smaller
 * for repetitive text.
 */
import { mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { firstViewBytes } from '../../bench/first-view.mjs';

let dist = '';
const sizes: Record<string, number> = {};
function put(path: string, text: string): void {
  const p = join(dist, path);
  mkdirSync(dirname(p), { recursive: true });
  writeFileSync(p, text);
  sizes[path] = Buffer.byteLength(text);
}

beforeAll(() => {
  dist = mkdtempSync(join(tmpdir(), 'hh-first-view-'));
  put(
    'map/index.html',
    [
      '<link rel="stylesheet" href="/assets/a.css"><link rel="stylesheet" href="/print.css" media="print">',
      '<script type="module" src="/assets/page.js"></script>',
      '<div data-catalogue-url="/map/explorer.json" data-regions-url="/data/regions.geojson"></div>',
      '<table id="region-values" data-layer-id="L1"></table><p data-print-url="/data/big.csv"></p>',
    ].join(''),
  );
  put('assets/a.css', 'body{}'.repeat(50));
  put('print.css', '@page{}'.repeat(100));
  put('assets/page.js', 'import{x}from"./chunk.js";const w="/assets/worker.mjs";import("./lazy.js");');
  put('assets/chunk.js', 'export const x=1;'.repeat(20));
  put('assets/worker.mjs', 'self.onmessage=()=>{};'.repeat(10));
  put('assets/lazy.js', 'export default 1;'.repeat(1000));
  put(
    'map/explorer.json',
    JSON.stringify({
      layers: [
        { id: 'L1', images: [{ path: 'data/layers/l1.png' }], values: 'map/values/0.json' },
        { id: 'L2', images: [{ path: 'data/layers/l2.png' }], values: 'map/values/1.json' },
      ],
      regionIndex: {
        count: 3,
        maxDrawn: 5,
        byName: [{ path: 'map/regions/name-0.json', from: 'a' }],
        byId: [{ path: 'map/regions/id-0.json', from: 'a' }],
        areas: [
          { path: 'map/regions/area-0.json', bbox: [0, 0, 1, 1], count: 2 },
          { path: 'map/regions/area-1.json', bbox: [1, 0, 2, 1], count: 1 },
        ],
      },
    }),
  );
  put('data/regions.geojson', '{"type":"FeatureCollection","features":[]}');
  put('map/values/0.json', '[1,2,3]');
  put('map/values/1.json', '[4,5,6]');
  put('map/regions/name-0.json', '{"regions":[]}'.repeat(3));
  put('map/regions/id-0.json', '{"regions":[]}'.repeat(4));
  put('map/regions/area-0.json', 'A'.repeat(70));
  put('map/regions/area-1.json', 'B'.repeat(90));
  put('data/layers/l1.png', 'P'.repeat(300));
  put('data/layers/l2.png', 'Q'.repeat(5000));
  put('data/big.csv', 'a,b\n'.repeat(10000));
});

afterAll(() => rmSync(dist, { recursive: true, force: true }));

describe('first-view byte counter (bench/first-view.mjs)', () => {
  it('counts the page, its screen stylesheet, its scripts and static imports, the worker, the data fetched at start, the opening layer with its values and the area pieces drawn, and nothing else', () => {
    const counted = [
      'map/index.html',
      'assets/a.css',
      'assets/page.js',
      'assets/chunk.js',
      'assets/worker.mjs',
      'map/explorer.json',
      'data/regions.geojson',
      'data/layers/l1.png',
      'map/values/0.json',
      'map/regions/area-0.json',
      'map/regions/area-1.json',
    ];
    const r = firstViewBytes(dist, 'map/');
    expect(r.files).toBe(counted.length);
    expect(r.bytes).toBe(counted.reduce((s, p) => s + sizes[p], 0));
    expect(r.gzipBytes).toBeLessThan(r.bytes);
    expect(r.largest).toHaveLength(3);
  });

  it('counts no area piece when the pieces together hold more regions than the map draws at once', () => {
    const cat = JSON.parse(readFileSync(join(dist, 'map/explorer.json'), 'utf8'));
    const before = firstViewBytes(dist, 'map/');
    writeFileSync(join(dist, 'map/explorer.json'), JSON.stringify({ ...cat, regionIndex: { ...cat.regionIndex, maxDrawn: 2 } }));
    try {
      const after = firstViewBytes(dist, 'map/');
      expect(after.files).toBe(before.files - 2);
      expect(before.bytes - after.bytes).toBe(sizes['map/regions/area-0.json'] + sizes['map/regions/area-1.json']);
    } finally {
      writeFileSync(join(dist, 'map/explorer.json'), JSON.stringify(cat));
    }
  });
});

/**
 * The first-view counter of the many-region benchmark (bench/first-view.mjs) on a hand-made site
 * whose files and sizes are known: what a browser loads for the screen is counted (the page, its
 * screen stylesheets, its module scripts and what they import statically, the worker they name,
 * the data its script fetches at start, the opening layer's image), and what it does not load is
 * left out (the print stylesheet, a dynamic import, a `data-print-url` address, other layers).
 * Sizes are those written here; gzip sizes come from node:zlib and are checked only to be smaller
 * for repetitive text.
 */
import { mkdirSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
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
  put('map/index.html', [
    '<link rel="stylesheet" href="/assets/a.css"><link rel="stylesheet" href="/print.css" media="print">',
    '<script type="module" src="/assets/page.js"></script>',
    '<div data-catalogue-url="/map/explorer.json" data-regions-url="/data/regions.geojson"></div>',
    '<table id="region-values" data-layer-id="L1"></table><p data-print-url="/data/big.csv"></p>',
  ].join(''));
  put('assets/a.css', 'body{}'.repeat(50));
  put('print.css', '@page{}'.repeat(100));
  put('assets/page.js', 'import{x}from"./chunk.js";const w="/assets/worker.mjs";import("./lazy.js");');
  put('assets/chunk.js', 'export const x=1;'.repeat(20));
  put('assets/worker.mjs', 'self.onmessage=()=>{};'.repeat(10));
  put('assets/lazy.js', 'export default 1;'.repeat(1000));
  put('map/explorer.json', JSON.stringify({ layers: [{ id: 'L1', images: [{ path: 'data/layers/l1.png' }] }, { id: 'L2', images: [{ path: 'data/layers/l2.png' }] }] }));
  put('data/regions.geojson', '{"type":"FeatureCollection","features":[]}');
  put('data/layers/l1.png', 'P'.repeat(300));
  put('data/layers/l2.png', 'Q'.repeat(5000));
  put('data/big.csv', 'a,b\n'.repeat(10000));
});

afterAll(() => rmSync(dist, { recursive: true, force: true }));

describe('first-view byte counter (bench/first-view.mjs)', () => {
  it('counts the page, its screen stylesheet, its scripts and static imports, the worker, the data fetched at start and the opening layer, and nothing else', () => {
    const counted = ['map/index.html', 'assets/a.css', 'assets/page.js', 'assets/chunk.js', 'assets/worker.mjs', 'map/explorer.json', 'data/regions.geojson', 'data/layers/l1.png'];
    const r = firstViewBytes(dist, 'map/');
    expect(r.files).toBe(counted.length);
    expect(r.bytes).toBe(counted.reduce((s, p) => s + sizes[p], 0));
    expect(r.gzipBytes).toBeLessThan(r.bytes);
    expect(r.largest).toHaveLength(3);
  });
});

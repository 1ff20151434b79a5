import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createServer, type Server } from 'node:http';
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { chromium, type BrowserContext, type Page } from 'playwright-core';
import { interpolateViridis } from 'd3-scale-chromatic';
import sharp from 'sharp';
import { renderLayerPng, type LayerPng } from '../../../pipeline/publish/layers/render-layer-png.ts';
import { cssToRgb, regularGrid } from './helpers.ts';

// Outside reference: MapLibre GL JS 6.20.0 itself, in Debian's headless Chromium (STACK.md
// "Headless Chromium with WebGL"), drawing our PNG as an `image` source. MapLibre's own
// map.project([lon, lat]) says where each cell centre is on screen; the screenshot (decoded by
// sharp) must show that cell's colour there. Offline: every request not to 127.0.0.1 is aborted.

const ny = 40;
const nx = 60;
const grid = regularGrid(20.5, 1, ny, 0.5, 1, nx, (y) => y); // 20–60 °N, 0–60 °E, value = row
const dateline = regularGrid(-10.5, 1, 10, 175.5, 1, 10, (_y, x) => (x < 5 ? 0 : ny - 1)); // 175–185 °E, west half 0, east half ny − 1
const rowColours = Array.from({ length: ny }, (_, j) => cssToRgb(interpolateViridis(j / (ny - 1))));
const style = { kind: 'continuous' as const, ramp: 'viridis' as const, domain: [0, ny - 1] as [number, number], units: '1' };

function nearestRow(p: ArrayLike<number>): { row: number; dist: number } {
  let row = -1;
  let dist = Infinity;
  rowColours.forEach((c, j) => {
    const d = Math.abs(c[0] - p[0]) + Math.abs(c[1] - p[1]) + Math.abs(c[2] - p[2]);
    if (d < dist) [row, dist] = [j, d];
  });
  return { row, dist };
}

const dist = new URL('../../../node_modules/maplibre-gl/dist/', import.meta.url);
let server: Server;
let base = '';
let context: BrowserContext;
let profile = '';
const external: string[] = [];
const consoleLines: string[] = [];
const layers: Record<string, LayerPng> = {};

function page(layer: LayerPng, name: string, bounds: [[number, number], [number, number]]): string {
  const sources = Object.fromEntries(layer.parts.map((part, i) => [`l${i}`, { type: 'image', url: `/${name}.${i}.png`, coordinates: part.coordinates }]));
  const rasters = layer.parts.map((_, i) => ({
    id: `l${i}`,
    type: 'raster',
    source: `l${i}`,
    paint: { 'raster-resampling': 'nearest', 'raster-fade-duration': 0 },
  }));
  return `<!doctype html><html><head><style>html,body{margin:0}#m{width:600px;height:700px}</style></head><body><div id="m"></div>
<script type="module">
import * as maplibregl from '/ml/maplibre-gl.mjs';
maplibregl.setWorkerUrl('/ml/maplibre-gl-worker.mjs');
const map = new maplibregl.Map({ container: 'm', attributionControl: false, fadeDuration: 0,
  canvasContextAttributes: { preserveDrawingBuffer: true },
  bounds: ${JSON.stringify(bounds)}, fitBoundsOptions: { padding: 20 },
  style: { version: 8, sources: ${JSON.stringify(sources)},
    layers: [ { id: 'bg', type: 'background', paint: { 'background-color': '#ff00ff' } }, ...${JSON.stringify(rasters)} ] } });
window.project = (ll) => { const p = map.project(ll); return [p.x, p.y]; };
map.on('idle', () => { window.ready = true; });
</script></body></html>`;
}

beforeAll(async () => {
  layers.tall = renderLayerPng(grid, style);
  layers.dateline = renderLayerPng(dateline, style);
  server = createServer((req, res) => {
    const url = req.url ?? '/';
    if (url.startsWith('/ml/')) {
      res.writeHead(200, { 'content-type': url.endsWith('.css') ? 'text/css' : 'text/javascript' });
      res.end(readFileSync(new URL(url.slice(4), dist)));
    } else if (url.endsWith('.png')) {
      const [name, part] = url.slice(1, -4).split('.');
      res.writeHead(200, { 'content-type': 'image/png' });
      res.end(Buffer.from(layers[name].parts[Number(part)].png));
    } else if (url === '/tall.html') {
      res.writeHead(200, { 'content-type': 'text/html' });
      res.end(
        page(layers.tall, 'tall', [
          [0, 20],
          [60, 60],
        ]),
      );
    } else if (url === '/dateline.html') {
      res.writeHead(200, { 'content-type': 'text/html' });
      res.end(
        page(layers.dateline, 'dateline', [
          [175, -11],
          [185, 0],
        ]),
      );
    } else {
      res.writeHead(404);
      res.end();
    }
  });
  await new Promise<void>((ok) => server.listen(0, '127.0.0.1', ok));
  const addr = server.address();
  base = `http://127.0.0.1:${typeof addr === 'object' && addr ? addr.port : 0}`;
  profile = mkdtempSync(join(tmpdir(), 'layers-chromium-'));
  context = await chromium.launchPersistentContext(profile, {
    executablePath: '/usr/bin/chromium',
    headless: true,
    viewport: { width: 600, height: 700 },
    args: [
      '--no-sandbox',
      '--disable-gpu',
      '--disable-quic',
      '--no-first-run',
      '--disable-background-networking',
      '--disable-component-update',
      '--disable-sync',
      '--enable-unsafe-swiftshader',
    ],
  });
  await context.route('**/*', (route) => {
    if (route.request().url().startsWith(base)) return route.continue();
    external.push(route.request().url());
    return route.abort();
  });
}, 60_000);

afterAll(async () => {
  if (consoleLines.length) process.stdout.write(`browser console:\n${consoleLines.join('\n')}\n`);
  await context?.close();
  await new Promise((ok) => server?.close(ok));
  if (profile) rmSync(profile, { recursive: true, force: true });
});

async function shoot(name: string): Promise<{ p: Page; at: (x: number, y: number) => Uint8Array }> {
  const p = await context.newPage();
  p.on('console', (m) => consoleLines.push(`${m.type()}: ${m.text()}`));
  p.on('pageerror', (e) => consoleLines.push(`pageerror: ${e.message}`));
  await p.goto(`${base}/${name}.html`);
  await p.waitForFunction(() => (window as unknown as { ready?: boolean }).ready === true, undefined, { timeout: 15_000 });
  const shot = await p.screenshot({ type: 'png' });
  const { data, info } = await sharp(shot).raw().toBuffer({ resolveWithObject: true });
  return {
    p,
    at: (x, y) => data.subarray((Math.round(y) * info.width + Math.round(x)) * info.channels, (Math.round(y) * info.width + Math.round(x)) * info.channels + 3),
  };
}

describe('MapLibre 6.20 draws the PNG layer where its own projection puts each cell', () => {
  it('every grid row of a 20–60 °N layer shows at map.project of its centre latitude', async () => {
    const { p, at } = await shoot('tall');
    let wrong = 0;
    for (let j = 0; j < ny; j++) {
      const [x, y] = (await p.evaluate((ll) => (window as unknown as { project: (l: number[]) => number[] }).project(ll), [30.5, 20.5 + j])) as number[];
      const got = nearestRow(at(x, y));
      if (got.row !== j || got.dist > 12) wrong++;
    }
    expect(wrong).toBe(0);
    expect(external).toEqual([]);
    await p.close();
  }, 60_000);

  it('a layer across the antimeridian (175–185 °E), given as its two parts, is drawn on both sides of 180 °', async () => {
    expect(layers.dateline.parts).toHaveLength(2);
    const { p, at } = await shoot('dateline');
    const proj = async (ll: number[]) => (await p.evaluate((l) => (window as unknown as { project: (l: number[]) => number[] }).project(l), ll)) as number[];
    const [xw, yw] = await proj([177.5, -5.5]);
    const [xe, ye] = await proj([182.5, -5.5]);
    expect(nearestRow(at(xw, yw))).toMatchObject({ row: 0 });
    expect(nearestRow(at(xe, ye))).toMatchObject({ row: ny - 1 });
    expect(nearestRow(at(xe, ye)).dist).toBeLessThanOrEqual(12);
    // the cell just west and just east of 180 ° (centres 179.5 and 180.5) are both drawn
    const [x1, y1] = await proj([179.5, -5.5]);
    const [x2, y2] = await proj([180.5, -5.5]);
    expect(nearestRow(at(x1, y1)).row).toBe(0);
    expect(nearestRow(at(x2, y2)).row).toBe(ny - 1);
    await p.close();
  }, 60_000);
});

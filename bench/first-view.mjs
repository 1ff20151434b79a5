// What the first view of a built page transfers, counted from the files of the built site (no
// browser): the page's HTML, its stylesheets (media="print" left out: not loaded for the screen),
// its module scripts and every module they import statically (`from "./x.js"`, `import "./x.js"`,
// the same with an /assets/ path), the worker and other scripts they name by /assets/ path, and the
// data the page's script fetches as it starts: every `data-*-url` attribute of the page (the map
// page's catalogue, cell index and base map) and, on the map page, the PNG images and the values
// file of the layer the page opens with (`data-layer-id` of the region table, looked up in the
// catalogue), and the regions' area pieces the opening view draws: the page draws the pieces
// meeting its view when they hold at most `regionIndex.maxDrawn` regions; the opening view
// frames the whole grid, so this counts every area piece when all of them together hold at most
// that many, else none (components/map/explorer/region-loader.ts `inView`). Bytes as stored, and
// as gzip (level 6) would send them (`heathours preview` compresses each response so). Plain JS: run by
// bench/regions-1000-child.mjs under Node without tsx.
import { existsSync, readFileSync, statSync } from 'node:fs';
import { join } from 'node:path';
import { gzipSync } from 'node:zlib';

const attr = (tag, name) => new RegExp(`\\b${name}="([^"]*)"`).exec(tag)?.[1];

/** Bytes of the first view of `page` (a path below the site root, e.g. `map/`), with the files counted. */
export function firstViewBytes(dist, page) {
  const files = new Map();
  const add = (url) => {
    const path = join(dist, decodeURIComponent(url.replace(/^\//, '').replace(/[?#].*$/, '')));
    if (files.has(path) || !existsSync(path) || !statSync(path).isFile()) return false;
    files.set(path, statSync(path).size);
    return true;
  };
  const htmlPath = join(dist, page, 'index.html');
  files.set(htmlPath, statSync(htmlPath).size);
  const html = readFileSync(htmlPath, 'utf8');
  for (const tag of html.match(/<link\b[^>]*>/g) ?? []) {
    const rel = attr(tag, 'rel');
    if ((rel === 'stylesheet' && attr(tag, 'media') !== 'print') || rel === 'modulepreload') add(attr(tag, 'href') ?? '');
  }
  const scripts = (html.match(/<script\b[^>]*\bsrc="[^"]*"[^>]*>/g) ?? []).map((t) => attr(t, 'src'));
  const queue = [...scripts];
  while (queue.length > 0) {
    const url = queue.shift();
    if (!add(url)) continue;
    const js = readFileSync(join(dist, url.replace(/^\//, '')), 'utf8');
    const dir = url.slice(0, url.lastIndexOf('/') + 1);
    for (const m of js.matchAll(/(?:from|import)\s*["'](\.\.?\/[^"']+)["']/g)) queue.push(new URL(m[1], `http://x${dir}`).pathname);
    for (const m of js.matchAll(/["'`](\/assets\/[\w.-]+\.m?js)["'`]/g)) queue.push(m[1]);
  }
  for (const m of html.matchAll(/\bdata-([a-z-]+)-url="([^"]+)"/g)) if (m[1] !== 'print') add(m[2]);
  const layerId = /\bdata-layer-id="([^"]+)"/.exec(html)?.[1];
  const catUrl = /\bdata-catalogue-url="([^"]+)"/.exec(html)?.[1];
  if (layerId && catUrl) {
    const cat = JSON.parse(readFileSync(join(dist, catUrl.replace(/^\//, '')), 'utf8'));
    const layer = cat.layers.find((l) => l.id === layerId.replace(/&amp;/g, '&'));
    for (const im of layer?.images ?? []) add(`/${im.path}`);
    if (layer?.values) add(`/${layer.values}`);
    const areas = cat.regionIndex?.areas ?? [];
    if (areas.reduce((sum, a) => sum + a.count, 0) <= (cat.regionIndex?.maxDrawn ?? 0)) for (const a of areas) add(`/${a.path}`);
  }
  let bytes = 0;
  let gzipBytes = 0;
  for (const [p, b] of files) {
    bytes += b;
    gzipBytes += gzipSync(readFileSync(p)).length;
  }
  const largest = [...files]
    .sort((a, b) => b[1] - a[1])
    .slice(0, 3)
    .map(([p, b]) => `${p.slice(dist.length + 1)} ${Math.round(b / 1000)} kB`);
  return { bytes, gzipBytes, files: files.size, largest, paths: [...files.keys()].map((p) => p.slice(dist.length + 1)) };
}

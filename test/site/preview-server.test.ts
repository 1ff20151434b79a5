/**
 * The preview server: content types (IANA media types: text/javascript per RFC 9239,
 * application/geo+json per RFC 7946, text/csv per RFC 4180, image/tiff per RFC 3302,
 * application/wasm per the WebAssembly spec), index.html for folders, 404, no way out of its
 * folder, the CSP header, and catalogued errors.
 */
import { mkdir, mkdtemp, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { request } from 'node:http';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { CONTENT_TYPES, acceptsGzip, compressible, startPreviewServer, type PreviewServer } from '../../pipeline/commands/preview.ts';
import { gunzipSync } from 'node:zlib';
import { HeathoursError } from '../../pipeline/model/errors.ts';
import { CONTENT_SECURITY_POLICY_HEADER } from '../../src/lib/content-security-policy.ts';
import { buildTestSite, htmlFiles } from './browser.ts';
import { buildPipelineData } from './pipeline-data.ts';
import { readdirSync } from 'node:fs';
import { extname } from 'node:path';

let root: string;
let site: string;
let server: PreviewServer;

/** A raw GET, so the path reaches the server exactly as written (fetch would normalise `..`). */
function rawGet(port: number, path: string, method = 'GET'): Promise<{ status: number; headers: Record<string, string | string[] | undefined>; body: string }> {
  return new Promise((ok, fail) => {
    const req = request({ host: '127.0.0.1', port, path, method }, (res) => {
      let body = '';
      res.setEncoding('utf8');
      res.on('data', (c: string) => (body += c));
      res.on('end', () => ok({ status: res.statusCode ?? 0, headers: res.headers, body }));
    });
    req.on('error', fail);
    req.end();
  });
}

const FILES: Record<string, [string, string]> = {
  'index.html': ['<!doctype html><title>home</title>', 'text/html; charset=utf-8'],
  'inventory/index.html': ['<!doctype html><title>inventory</title>', 'text/html; charset=utf-8'],
  'assets/app.js': ['export {};', 'text/javascript; charset=utf-8'],
  'assets/worker.mjs': ['self.onmessage = () => {};', 'text/javascript; charset=utf-8'],
  'assets/site.css': ['body{}', 'text/css; charset=utf-8'],
  'data/inventory.json': ['{}', 'application/json; charset=utf-8'],
  'data/regions.geojson': ['{"type":"FeatureCollection","features":[]}', 'application/geo+json; charset=utf-8'],
  'data/regions/a.csv': ['a,b\n1,2\n', 'text/csv; charset=utf-8'],
  'layers/x.png': ['\x89PNG', 'image/png'],
  'layers/x.tif': ['II*\0', 'image/tiff'],
  'favicon.svg': ['<svg xmlns="http://www.w3.org/2000/svg"/>', 'image/svg+xml'],
  'assets/m.wasm': ['\0asm', 'application/wasm'],
  'assets/blob.bin': ['x', 'application/octet-stream'],
  'data/calculator/r.bin': ['\x01\x02', 'application/octet-stream'],
  'data/layers/a/b/mean-01.tif': ['MM\0*', 'image/tiff'],
};

/**
 * The media type each kind of file of a built site must be served with: RFC 9239 (JavaScript,
 * also .mjs for the MapLibre worker), RFC 7946 (GeoJSON), RFC 4180 with the charset (CSV),
 * RFC 3302 (TIFF), RFC 2083 / W3C (PNG), W3C SVG, RFC 8259 (JSON), RFC 2046 (unknown binary),
 * the IANA registration of Office Open XML spreadsheets (.xlsx).
 */
const IANA: Record<string, string> = {
  '.html': 'text/html; charset=utf-8',
  '.css': 'text/css; charset=utf-8',
  '.js': 'text/javascript; charset=utf-8',
  '.mjs': 'text/javascript; charset=utf-8',
  '.json': 'application/json; charset=utf-8',
  '.geojson': 'application/geo+json; charset=utf-8',
  '.csv': 'text/csv; charset=utf-8',
  '.tif': 'image/tiff',
  '.png': 'image/png',
  '.svg': 'image/svg+xml',
  '.bin': 'application/octet-stream',
  // No IANA registration exists; the type netCDF's own documentation uses (common practice).
  '.nc': 'application/x-netcdf',
  // IANA registration of the Office Open XML spreadsheet (ECMA-376), the region workbooks.
  '.xlsx': 'application/vnd.openxmlformats-officedocument.spreadsheetml.sheet',
};

beforeAll(async () => {
  root = await mkdtemp(join(tmpdir(), 'heathours-preview-'));
  site = join(root, 'dist');
  for (const [rel, [body]] of Object.entries(FILES)) {
    await mkdir(join(site, rel, '..'), { recursive: true });
    await writeFile(join(site, rel), Buffer.from(body, 'latin1'));
  }
  await writeFile(join(root, 'secret.txt'), 'outside the site');
  server = await startPreviewServer({ dir: site, port: 0 });
});

afterAll(async () => {
  await server?.close();
  await rm(root, { recursive: true, force: true });
});

describe('startPreviewServer', () => {
  it('listens on 127.0.0.1 only and reports its URL', () => {
    expect(server.url).toBe(`http://127.0.0.1:${server.port}/`);
  });

  it('serves each kind of file with its registered media type and the CSP header', async () => {
    for (const [rel, [body, type]] of Object.entries(FILES)) {
      const res = await fetch(new URL(rel, server.url));
      expect(res.status, rel).toBe(200);
      expect(res.headers.get('content-type'), rel).toBe(type);
      expect(res.headers.get('content-security-policy'), rel).toBe(CONTENT_SECURITY_POLICY_HEADER);
      expect(res.headers.get('x-content-type-options'), rel).toBe('nosniff');
      expect(Buffer.from(await res.arrayBuffer()).toString('latin1'), rel).toBe(body);
    }
  });

  it('answers a folder with its index.html, and redirects a folder without its trailing slash', async () => {
    expect(await (await fetch(server.url)).text()).toBe(FILES['index.html'][0]);
    expect(await (await fetch(new URL('inventory/', server.url))).text()).toBe(FILES['inventory/index.html'][0]);
    const res = await rawGet(server.port, '/inventory');
    expect(res.status).toBe(301);
    expect(res.headers.location).toBe('/inventory/');
    expect((await rawGet(server.port, '/inventory/?x=1')).status).toBe(200);
  });

  it('answers 404 for a missing file and for a folder without index.html', async () => {
    expect((await fetch(new URL('nothing-here.html', server.url))).status).toBe(404);
    expect((await fetch(new URL('data/', server.url))).status).toBe(404);
    const res = await fetch(new URL('nothing-here.html', server.url));
    expect(res.headers.get('content-security-policy')).toBe(CONTENT_SECURITY_POLICY_HEADER);
  });

  it('never serves a file outside its folder, whatever the spelling of ..', async () => {
    for (const path of [
      '/../secret.txt',
      '/assets/../../secret.txt',
      '/%2e%2e/secret.txt',
      '/%2E%2E%2Fsecret.txt',
      '/assets/%2e%2e/%2e%2e/secret.txt',
      '/..%5csecret.txt',
      '/%00/index.html',
    ]) {
      const res = await rawGet(server.port, path);
      expect(res.status, path).toBeGreaterThanOrEqual(400);
      expect(res.body, path).not.toContain('outside the site');
    }
  });

  it('answers HEAD without a body and refuses other methods', async () => {
    const head = await rawGet(server.port, '/data/inventory.json', 'HEAD');
    expect(head.status).toBe(200);
    expect(head.headers['content-length']).toBe('2');
    expect(head.body).toBe('');
    expect((await rawGet(server.port, '/index.html', 'POST')).status).toBe(405);
  });

  it('registers a media type for every extension the site publishes (none falls back to the default)', () => {
    for (const [ext, type] of Object.entries(IANA)) expect(CONTENT_TYPES[ext], ext).toBe(type);
  });

  it('sends text files of 1,024 bytes or more gzip-compressed to a client accepting gzip (RFC 9110 §8.4), the same bytes once inflated by node:zlib; as stored to one that does not, and images always as stored', async () => {
    const js = 'export const rows = [' + Array.from({ length: 4000 }, (_, i) => `{"id":"r${i}","name":"Region ${i}"}`).join(',') + '];\n';
    const png = Buffer.alloc(5000, 7);
    await writeFile(join(site, 'assets/big.js'), js);
    await writeFile(join(site, 'layers/big.png'), png);
    const get = (path: string, encoding?: string) =>
      new Promise<{ headers: Record<string, string | string[] | undefined>; body: Buffer }>((ok, fail) => {
        const req = request({ host: '127.0.0.1', port: server.port, path, headers: encoding ? { 'Accept-Encoding': encoding } : {} }, (res) => {
          const parts: Buffer[] = [];
          res.on('data', (c: Buffer) => parts.push(c));
          res.on('end', () => ok({ headers: res.headers, body: Buffer.concat(parts) }));
        });
        req.on('error', fail);
        req.end();
      });
    const zipped = await get('/assets/big.js', 'gzip, deflate, br');
    expect(zipped.headers['content-encoding']).toBe('gzip');
    expect(zipped.headers.vary).toBe('Accept-Encoding');
    expect(zipped.body.length).toBeLessThan(Buffer.byteLength(js) / 4);
    expect(gunzipSync(zipped.body).toString('utf8')).toBe(js);
    const plain = await get('/assets/big.js');
    expect(plain.headers['content-encoding']).toBeUndefined();
    expect(plain.headers['content-length']).toBe(String(Buffer.byteLength(js)));
    expect(plain.body.toString('utf8')).toBe(js);
    expect((await get('/assets/big.js', 'gzip;q=0, identity')).headers['content-encoding']).toBeUndefined();
    const image = await get('/layers/big.png', 'gzip');
    expect(image.headers['content-encoding']).toBeUndefined();
    expect(image.body.equals(png)).toBe(true);
    // Small files go as stored: gzip would not shrink them.
    expect((await get('/assets/app.js', 'gzip')).headers['content-encoding']).toBeUndefined();
  });

  it('reads Accept-Encoding as RFC 9110 §12.5.3 writes it: gzip or * admit gzip unless q=0', () => {
    expect(acceptsGzip('gzip')).toBe(true);
    expect(acceptsGzip('deflate, GZIP;q=0.5')).toBe(true);
    expect(acceptsGzip('*')).toBe(true);
    expect(acceptsGzip('gzip;q=0')).toBe(false);
    expect(acceptsGzip('br, deflate')).toBe(false);
    expect(acceptsGzip(undefined)).toBe(false);
    expect(compressible('application/geo+json; charset=utf-8')).toBe(true);
    expect(compressible('image/png')).toBe(false);
  });

  it('fails with PreviewDirMissing when the folder holds no built site', async () => {
    const err = await startPreviewServer({ dir: join(root, 'no-such-dist'), port: 0 }).catch((e: unknown) => e);
    expect(err).toBeInstanceOf(HeathoursError);
    expect((err as HeathoursError).code).toBe('PreviewDirMissing');
    expect((err as HeathoursError).hint).toMatch(/heathours build/);
  });

  it('fails with PreviewPortBusy when the port is taken', async () => {
    const err = await startPreviewServer({ dir: site, port: server.port }).catch((e: unknown) => e);
    expect(err).toBeInstanceOf(HeathoursError);
    expect((err as HeathoursError).code).toBe('PreviewPortBusy');
    expect((err as HeathoursError).message).toContain('EADDRINUSE');
  });
});

describe('the preview server on a built site', () => {
  let distDir: string;
  beforeAll(async () => {
    distDir = (await buildTestSite((await buildPipelineData()).dataDir)).distDir;
  });

  it('serves one file of every extension in the built site with its registered media type', async () => {
    const byExt = new Map<string, string>();
    const walk = (dir: string, rel: string): void => {
      for (const e of readdirSync(dir, { withFileTypes: true })) {
        if (e.isDirectory()) walk(join(dir, e.name), `${rel}${e.name}/`);
        else if (!byExt.has(extname(e.name).toLowerCase())) byExt.set(extname(e.name).toLowerCase(), `${rel}${e.name}`);
      }
    };
    walk(distDir, '');
    expect(htmlFiles(distDir).length).toBeGreaterThanOrEqual(4);
    for (const ext of ['.html', '.css', '.js', '.mjs', '.json', '.geojson', '.csv', '.tif', '.png', '.svg', '.bin'])
      expect(byExt.has(ext), `the built site has a ${ext} file`).toBe(true);
    const built = await startPreviewServer({ dir: distDir, port: 0 });
    try {
      for (const [ext, rel] of byExt) {
        expect(IANA[ext], `${ext} (${rel}) has an expected media type in this test`).toBeDefined();
        const res = await fetch(new URL(rel, built.url), { method: 'HEAD' });
        expect(res.status, rel).toBe(200);
        expect(res.headers.get('content-type'), rel).toBe(IANA[ext]);
      }
    } finally {
      await built.close();
    }
  });
});

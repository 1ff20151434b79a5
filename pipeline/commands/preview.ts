/**
 * `heathours preview [--dir dist] [--port 4321]`: serves the built site on 127.0.0.1 with the
 * right content types, `index.html` for folders, 404 for missing files, no way out of the folder
 * (`..`), and the site's Content-Security-Policy as a header. Text files (HTML, CSS, JavaScript,
 * JSON, GeoJSON, CSV, SVG, XML) of {@link GZIP_MIN_BYTES} or more go out gzip-compressed (level 6,
 * node:zlib, as a static host would) to a client that accepts gzip (RFC 9110 §8.4, §12.5.3), with
 * `Vary: Accept-Encoding`; images, GeoTIFFs, NetCDF, workbooks and binaries go as stored.
 * {@link startPreviewServer} is what the browser tests use.
 */
import { createServer, type IncomingMessage, type ServerResponse } from 'node:http';
import { createReadStream, existsSync } from 'node:fs';
import { createGzip } from 'node:zlib';
import { stat } from 'node:fs/promises';
import { extname, join, resolve, sep } from 'node:path';
import type { AddressInfo } from 'node:net';
import type { Command } from 'commander';
import { CONTENT_SECURITY_POLICY_HEADER } from '../../src/lib/content-security-policy.ts';
import { PreviewDirMissing, PreviewPortBusy } from '../../src/data/errors.ts';
import { UsageError } from '../model/errors.ts';

/**
 * Content types by file extension (IANA media types), for every kind of file the site publishes;
 * anything else is served as application/octet-stream.
 */
export const CONTENT_TYPES: Record<string, string> = {
  '.html': 'text/html; charset=utf-8',
  '.css': 'text/css; charset=utf-8',
  '.js': 'text/javascript; charset=utf-8',
  '.mjs': 'text/javascript; charset=utf-8',
  '.json': 'application/json; charset=utf-8',
  '.geojson': 'application/geo+json; charset=utf-8',
  '.csv': 'text/csv; charset=utf-8',
  '.txt': 'text/plain; charset=utf-8',
  '.xml': 'application/xml; charset=utf-8',
  '.png': 'image/png',
  '.jpg': 'image/jpeg',
  '.jpeg': 'image/jpeg',
  '.webp': 'image/webp',
  '.svg': 'image/svg+xml',
  '.ico': 'image/x-icon',
  '.tif': 'image/tiff',
  '.tiff': 'image/tiff',
  // Not an IANA registration: the type the netCDF documentation gives for NetCDF files (common practice).
  '.nc': 'application/x-netcdf',
  '.wasm': 'application/wasm',
  '.bin': 'application/octet-stream',
  '.xlsx': 'application/vnd.openxmlformats-officedocument.spreadsheetml.sheet',
  '.woff2': 'font/woff2',
  '.pbf': 'application/x-protobuf',
  '.map': 'application/json; charset=utf-8',
};

/** Smallest file sent compressed [bytes]: below it gzip's header and trailer outweigh the gain. */
export const GZIP_MIN_BYTES = 1024;

/** Whether a content type is text that gzip shrinks (the site's images and binary formats are compressed already or not worth it). */
export function compressible(type: string): boolean {
  return /^text\/|^application\/(json|geo\+json|xml)|^image\/svg\+xml/.test(type);
}

/** Whether the request's Accept-Encoding admits gzip (a `q=0` refuses it). */
export function acceptsGzip(header: string | string[] | undefined): boolean {
  const text = Array.isArray(header) ? header.join(',') : (header ?? '');
  return text.split(',').some((part) => {
    const [coding, ...params] = part.trim().toLowerCase().split(';');
    if (coding.trim() !== 'gzip' && coding.trim() !== '*') return false;
    const q = params.map((p) => p.trim()).find((p) => p.startsWith('q='));
    return q === undefined || Number(q.slice(2)) > 0;
  });
}

export interface PreviewServer {
  /** e.g. `http://127.0.0.1:4321/` */
  url: string;
  port: number;
  close(): Promise<void>;
}

function send(res: ServerResponse, status: number, body: string, headers: Record<string, string> = {}): void {
  res.writeHead(status, { 'Content-Type': 'text/plain; charset=utf-8', ...headers });
  res.end(body);
}

/** The file a request path names inside `root`, or undefined when it would leave `root`. */
export function resolveInside(root: string, urlPath: string): string | undefined {
  let decoded: string;
  try {
    decoded = decodeURIComponent(urlPath);
  } catch {
    return undefined;
  }
  if (decoded.includes('\0') || decoded.includes('\\')) return undefined;
  const target = resolve(root, `.${decoded.startsWith('/') ? '' : '/'}${decoded}`);
  return target === root || target.startsWith(root + sep) ? target : undefined;
}

async function handle(root: string, req: IncomingMessage, res: ServerResponse): Promise<void> {
  const common = { 'Content-Security-Policy': CONTENT_SECURITY_POLICY_HEADER, 'X-Content-Type-Options': 'nosniff' };
  if (req.method !== 'GET' && req.method !== 'HEAD') return send(res, 405, 'method not allowed\n', { ...common, Allow: 'GET, HEAD' });
  const rawPath = (req.url ?? '/').split('?')[0].split('#')[0];
  // Refuse any `..` segment outright, encoded or not, before resolving.
  if (/(^|\/)(\.|%2e){2}(\/|%2f|$)/i.test(rawPath)) return send(res, 403, 'forbidden\n', common);
  let file = resolveInside(root, rawPath);
  if (!file) return send(res, 403, 'forbidden\n', common);
  let info = await stat(file).catch(() => undefined);
  if (info?.isDirectory()) {
    if (!rawPath.endsWith('/')) return send(res, 301, 'moved\n', { ...common, Location: `${rawPath}/` });
    file = join(file, 'index.html');
    info = await stat(file).catch(() => undefined);
  }
  if (!info?.isFile()) return send(res, 404, 'not found\n', common);
  const type = CONTENT_TYPES[extname(file).toLowerCase()] ?? 'application/octet-stream';
  const textual = compressible(type);
  const gzip = textual && info.size >= GZIP_MIN_BYTES && acceptsGzip(req.headers['accept-encoding']);
  res.writeHead(200, {
    ...common,
    'Content-Type': type,
    ...(gzip ? { 'Content-Encoding': 'gzip' } : { 'Content-Length': String(info.size) }),
    ...(textual ? { Vary: 'Accept-Encoding' } : {}),
    'Cache-Control': 'no-cache',
  });
  if (req.method === 'HEAD') return void res.end();
  if (gzip)
    createReadStream(file)
      .pipe(createGzip({ level: 6 }))
      .pipe(res);
  else createReadStream(file).pipe(res);
}

/** Serves `dir` on 127.0.0.1:`port` (0 = any free port). A catalogued error when `dir` holds no site. */
export async function startPreviewServer(opts: { dir: string; port: number }): Promise<PreviewServer> {
  const root = resolve(opts.dir);
  if (!existsSync(join(root, 'index.html'))) throw PreviewDirMissing({ dir: root }, { file: root });
  const server = createServer((req, res) => {
    handle(root, req, res).catch(() => {
      if (!res.headersSent) send(res, 500, 'internal error\n');
      else res.destroy();
    });
  });
  await new Promise<void>((ok, fail) => {
    server.once('error', (e: NodeJS.ErrnoException) => fail(PreviewPortBusy({ port: opts.port, detail: e.code ?? e.message })));
    server.listen(opts.port, '127.0.0.1', () => ok());
  });
  const port = (server.address() as AddressInfo).port;
  return {
    url: `http://127.0.0.1:${port}/`,
    port,
    close: () =>
      new Promise<void>((ok) => {
        server.closeAllConnections();
        server.close(() => ok());
      }),
  };
}

export function register(program: Command): void {
  program
    .command('preview')
    .description('serve the built site on 127.0.0.1 (Ctrl-C stops it)')
    .option('--dir <dir>', 'folder of the built site', 'dist')
    .option('--port <port>', 'port to listen on (0 picks a free one)', '4321')
    .action(async (opts: { dir: string; port: string }) => {
      const port = Number(opts.port);
      if (!Number.isInteger(port) || port < 0 || port > 65535) {
        throw UsageError({ message: `--port ${opts.port} is not a port number`, hint: 'pass an integer from 0 to 65535, e.g. --port 4321' }, { key: '--port' });
      }
      const server = await startPreviewServer({ dir: opts.dir, port });
      process.stdout.write(`serving ${resolve(opts.dir)} at ${server.url}\n(press Ctrl-C to stop)\n`);
      await new Promise<void>((done) => {
        const stop = () => {
          void server.close().then(done);
        };
        process.once('SIGINT', stop);
        process.once('SIGTERM', stop);
      });
    });
}

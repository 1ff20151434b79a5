/**
 * pipeline/schedule runs in the browser and in Node: no file imports node: modules, zod, or uses
 * process, fs, Buffer or require; it imports the stages before it file by file (never a barrel,
 * so the page's script carries no configuration schema), and every error it defines is in the
 * catalogue.
 */
import { readdirSync, readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { errorCatalogue } from '../../pipeline/model/errors.ts';
import '../../pipeline/commands/catalogue.ts';

const dir = new URL('../../pipeline/schedule/', import.meta.url);
const files = readdirSync(dir).filter((f) => f.endsWith('.ts'));

describe('pipeline/schedule is pure and isomorphic', () => {
  it('imports only its own files, single files of work, climate and publish (the tile decoders, csv.ts; workbook.ts for a type), and the error machinery', () => {
    expect(files.length).toBeGreaterThan(15);
    for (const f of files) {
      const code = readFileSync(new URL(f, dir), 'utf8')
        .replace(/\/\*[\s\S]*?\*\//g, '')
        .replace(/\/\/.*$/gm, '');
      expect(code, f).not.toMatch(/from\s+['"]node:|\bprocess\.|\bBuffer\b|\brequire\(/);
      for (const m of code.matchAll(/^(import\s+(type\s+)?[^;]*?from\s+['"]([^'"]+)['"])/gm)) {
        const spec = m[3];
        const typeOnly = m[2] !== undefined;
        const ok =
          spec.startsWith('./') ||
          /^\.\.\/(work|climate)\/[a-z0-9-]+\.ts$/.test(spec) ||
          ['../formats/csv.ts', '../publish/histogram-tiles.ts', '../publish/point-tile-codec.ts', '../model/errors.ts'].includes(spec) ||
          (typeOnly && spec === '../publish/workbook.ts');
        expect(ok, `${f} imports ${spec}`).toBe(true);
        expect(spec, `${f}: no barrel`).not.toMatch(/index\.ts$/);
        expect(spec).not.toBe('zod');
      }
    }
  });

  it('the work and climate files it imports are zod-free too (no barrel pulls a schema in)', () => {
    const seen = new Set<string>();
    const visit = (url: URL) => {
      if (seen.has(url.href)) return;
      seen.add(url.href);
      const code = readFileSync(url, 'utf8');
      expect(code, url.pathname).not.toMatch(/from\s+['"]zod['"]/);
      for (const m of code.matchAll(/^import\s+(?!type\s)[^;]*?from\s+['"](\.[^'"]+)['"]/gm)) visit(new URL(m[1], url));
    };
    for (const f of files) visit(new URL(f, dir));
    expect(seen.size).toBeGreaterThan(files.length);
  });

  it('every error the schedule stage defines is in the catalogue', () => {
    const codes = errorCatalogue().map((e) => e.code);
    for (const m of readFileSync(new URL('errors.ts', dir), 'utf8').matchAll(/code: '([A-Za-z]+)'/g)) expect(codes).toContain(m[1]);
  });
});

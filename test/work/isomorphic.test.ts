import { describe, expect, it } from 'vitest';
import { readdirSync, readFileSync } from 'node:fs';
import { errorCatalogue } from '../../pipeline/model/errors.ts';
import '../../pipeline/commands/catalogue.ts';

const dir = new URL('../../pipeline/work/', import.meta.url);
const files = readdirSync(dir).filter((f) => f.endsWith('.ts'));

describe('pipeline/work is pure and isomorphic', () => {
  it('no file under pipeline/work imports node: modules or uses process, fs, Buffer or require', () => {
    expect(files.length).toBeGreaterThan(10);
    for (const f of files) {
      const code = readFileSync(new URL(f, dir), 'utf8')
        .replace(/\/\*[\s\S]*?\*\//g, '')
        .replace(/\/\/.*$/gm, '');
      expect(code, f).not.toMatch(/from\s+['"]node:|from\s+['"](fs|path|os|url|worker_threads)['"]|\bprocess\.|\bBuffer\b|\brequire\(/);
      for (const m of code.matchAll(/from\s+['"]([^'"]+)['"]/g)) {
        const spec = m[1];
        // ../model/sources.ts is the pure bibliography and method-descriptor shape (methods.ts).
        expect(spec === 'zod' || spec.startsWith('./') || spec === '../model/errors.ts' || spec === '../model/sources.ts', `${f} imports ${spec}`).toBe(true);
      }
    }
  });

  it('every error the work stage defines is in the catalogue', () => {
    const codes = errorCatalogue().map((e) => e.code);
    for (const f of files) {
      for (const m of readFileSync(new URL(f, dir), 'utf8').matchAll(/code: '([A-Za-z]+)'/g)) expect(codes).toContain(m[1]);
    }
  });
});

/**
 * The check material kept in test/fixtures is what its provenance says: the real NetCDF files
 * are byte for byte the files of the Debian packages named in realdata/PROVENANCE.md (their
 * SHA-256 digests, taken from the packages, are in realdata/SHA256SUMS), each with its licence
 * beside it, and the reference WBGT table has the 150 rows and the columns its README describes.
 */
import { describe, expect, it } from 'vitest';
import { createHash } from 'node:crypto';
import { readdirSync, readFileSync } from 'node:fs';
import { fixturePath } from '../helpers/fixtures.ts';

const sha256 = (p: string) => createHash('sha256').update(readFileSync(p)).digest('hex');

describe('test/fixtures/realdata', () => {
  const sums = readFileSync(fixturePath('realdata', 'SHA256SUMS'), 'utf8')
    .trim()
    .split('\n')
    .map((l) => l.match(/^([0-9a-f]{64}) {2}(\S+)$/))
    .map((m) => {
      if (!m) throw new Error('SHA256SUMS: a line is not "<sha256>  <file>"');
      return { digest: m[1], file: m[2] };
    });
  const provenance = readFileSync(fixturePath('realdata', 'PROVENANCE.md'), 'utf8');

  it('every data file is listed in SHA256SUMS and matches its digest (sha256sum -c), five files', () => {
    const data = readdirSync(fixturePath('realdata'))
      .filter((f) => /\.(nc|cdf)$/.test(f))
      .sort();
    expect(sums.map((s) => s.file).sort()).toEqual(data);
    expect(data).toHaveLength(5);
    for (const s of sums) expect(sha256(fixturePath('realdata', s.file)), s.file).toBe(s.digest);
  });

  it('PROVENANCE.md names each file with its Debian package and licence, and the licence texts are beside them', () => {
    const rows = new Map(
      [...provenance.matchAll(/^\| `([^`]+)` \| (\S+) [^|]*\|[^|]*\| ([^|]+) \|$/gm)].map((m) => [m[1], { pkg: m[2], licence: m[3].trim() }]),
    );
    for (const s of sums) {
      const row = rows.get(s.file);
      expect(row, s.file).toBeDefined();
      expect(row!.licence.length, s.file).toBeGreaterThan(2);
      expect(readdirSync(fixturePath('realdata', 'licences')), s.file).toContain(`${row!.pkg}.copyright`);
    }
    expect(readdirSync(fixturePath('realdata', 'licences'))).toContain('Apache-2.0.txt');
  });
});

describe('test/fixtures/reference', () => {
  it('the Liljegren reference table holds 150 cases with the columns its README describes', () => {
    const lines = readFileSync(fixturePath('reference', 'liljegren-wbgt-public.csv'), 'utf8').trim().split('\n');
    expect(lines).toHaveLength(151);
    const head = lines[0].split(',');
    const readme = readFileSync(fixturePath('reference', 'README.md'), 'utf8');
    for (const col of head) expect(readme, col).toContain(col.replace(/^iter_.*/, 'iter_*'));
    for (const l of lines.slice(1)) expect(l.split(',')).toHaveLength(head.length);
  });
});

/**
 * A JSON file written in pieces (pipeline/formats/json-file.ts) holds exactly the bytes of
 * `JSON.stringify(value, null, indent)` (the ECMAScript JSON.stringify of Node's V8 is the
 * reference): for a manifest-like value with thousands of entries, for the edge cases of the
 * standard's serialisation (members left out, `null` in arrays, empty containers, nested long
 * arrays, escapes, toJSON, non-finite numbers), and for any indent; and no piece holds more than
 * one element of a long array.
 */
import { mkdtempSync, readdirSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { jsonPieces, writeJsonFile } from '../../pipeline/formats/json-file.ts';

const dir = mkdtempSync(join(tmpdir(), 'heathours-json-file-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

const manifestLike = {
  manifestVersion: 1,
  atlas: { id: 'a', title: 'Line\nbreak "quoted" \u00e9\u2028', invented: true, attribution: undefined },
  years: [2021, 2023],
  work: { classes: [{ id: 'low', rate: 180 }], cautions: [] as string[], empty: {} },
  artefacts: Array.from({ length: 3000 }, (_, i) => ({
    path: `data/regions/r${i}.csv`,
    bytes: i * 17,
    sha256: 'ab'.repeat(32),
    units: i % 3 ? undefined : 'h',
  })),
  layers: Array.from({ length: 300 }, (_, i) => ({ id: `l${i}`, range: [i, -0, NaN, Infinity], nested: { deep: [[i], { x: null }] } })),
  scenarios: [{ id: 's', layers: Array.from({ length: 400 }, (_, i) => ({ id: `s${i}`, f: () => 1 })) }],
  when: new Date(Date.UTC(2026, 11, 5)),
  fn: () => 0,
  sym: Symbol('x'),
  sparse: [1, undefined, () => 2, Symbol('y'), null],
};

describe('a JSON file written in pieces', () => {
  it('holds the bytes of JSON.stringify of the same value, for indents 0, 1 and 2', async () => {
    for (const indent of [0, 1, 2]) {
      const path = join(dir, `m${indent}.json`);
      await writeJsonFile(path, manifestLike, indent);
      expect(readFileSync(path, 'utf8')).toBe(JSON.stringify(manifestLike, null, indent));
    }
  });

  it('gives the same text for small values and containers of every shape', () => {
    const values: unknown[] = [
      [],
      {},
      [[]],
      [{}],
      { a: [] },
      { a: {} },
      'x',
      1,
      null,
      true,
      [1, [2, [3, [4]]]],
      Array.from({ length: 600 }, (_, i) => [i, { i }]),
    ];
    for (const indent of [0, 1, 3]) for (const v of values) expect([...jsonPieces(v, indent)].join('')).toBe(JSON.stringify(v, null, indent));
  });

  it('never holds more than one element of a long array in one piece', () => {
    const big = { artefacts: Array.from({ length: 5000 }, (_, i) => ({ path: `f${i}`, sha256: 'cd'.repeat(32) })) };
    for (const indent of [0, 1]) {
      const pieces = [...jsonPieces(big, indent)];
      expect(pieces.length).toBeGreaterThan(5000);
      expect(Math.max(...pieces.map((p) => p.length))).toBeLessThan(200);
    }
  });

  it('refuses a value that has no JSON text or cannot be written, leaving no file behind', async () => {
    await expect(writeJsonFile(join(dir, 'u.json'), undefined)).rejects.toThrow(/no JSON text/);
    const cyclic: Record<string, unknown> = { a: Array.from({ length: 300 }, (_, i) => ({ i })) };
    (cyclic.a as Array<Record<string, unknown>>)[299].back = cyclic;
    await expect(writeJsonFile(join(dir, 'c.json'), cyclic)).rejects.toThrow(/circular/);
    await expect(writeJsonFile(join(dir, 'b.json'), { n: 1n })).rejects.toThrow(/BigInt/);
    expect(readdirSync(dir).filter((f) => /^[ucb]\.json/.test(f))).toEqual([]);
  });
});

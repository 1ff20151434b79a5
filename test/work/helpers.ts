/** Test helpers of the work stage: catalogued-error assertion and fixture reading. */
import { expect } from 'vitest';
import { readFileSync } from 'node:fs';
import { HeathoursError } from '../../pipeline/model/errors.ts';

/** Runs `fn` and checks it throws the catalogued error `code` (optionally matching `match`). */
export function expectWorkError(fn: () => unknown, code: string, match?: RegExp): HeathoursError {
  try {
    fn();
  } catch (e) {
    expect(e).toBeInstanceOf(HeathoursError);
    const err = e as HeathoursError;
    expect(err.code).toBe(code);
    expect(err.hint.length).toBeGreaterThan(10);
    if (match) expect(err.format()).toMatch(match);
    return err;
  }
  throw new Error(`expected ${code}, nothing was thrown`);
}

/** Rows of a fixture CSV in test/work/fixtures (lines starting with # are provenance). */
export function readFixture(name: string): Record<string, string>[] {
  const text = readFileSync(new URL(`./fixtures/${name}`, import.meta.url), 'utf8');
  const lines = text.split('\n').filter((l) => l.length > 0 && !l.startsWith('#'));
  const head = lines[0].split(',');
  return lines.slice(1).map((l) => {
    const cells = l.split(',');
    return Object.fromEntries(head.map((h, i) => [h, cells[i]]));
  });
}

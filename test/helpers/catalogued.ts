/**
 * The one assertion every bad-input test uses: `fn` throws (or the promise rejects with) the
 * catalogued HeathoursError `code`, with a hint, and its printed form matches `match`.
 */
import { expect } from 'vitest';
import { HeathoursError } from '../../pipeline/model/errors.ts';

function check(e: unknown, code: string, match?: RegExp): HeathoursError {
  expect(e).toBeInstanceOf(HeathoursError);
  const err = e as HeathoursError;
  expect(err.code).toBe(code);
  expect(err.hint.length).toBeGreaterThan(10);
  if (match) expect(err.format()).toMatch(match);
  return err;
}

/** Runs `fn` and expects the catalogued error `code`; returns it. */
export function expectCatalogued(fn: () => unknown, code: string, match?: RegExp): HeathoursError {
  try {
    fn();
  } catch (e) {
    return check(e, code, match);
  }
  throw new Error(`expected ${code}, nothing was thrown`);
}

/** Awaits `p` (or calls it) and expects the catalogued error `code`; returns it. */
export async function expectCataloguedAsync(p: Promise<unknown> | (() => unknown), code: string, match?: RegExp): Promise<HeathoursError> {
  try {
    await (typeof p === 'function' ? p() : p);
  } catch (e) {
    return check(e, code, match);
  }
  throw new Error(`expected ${code}, nothing was thrown`);
}

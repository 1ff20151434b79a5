import { expect } from 'vitest';
import { HeathoursError } from '../../pipeline/model/errors.ts';

/** Runs `fn`, expects a catalogued HeathoursError with `code`, returns it. */
export function expectCatalogued(fn: () => unknown, code: string, match?: RegExp): HeathoursError {
  try {
    fn();
  } catch (e) {
    expect(e).toBeInstanceOf(HeathoursError);
    const err = e as HeathoursError;
    expect(err.code).toBe(code);
    if (match) expect(err.format()).toMatch(match);
    return err;
  }
  throw new Error(`expected ${code}, nothing was thrown`);
}

/** Shared test helpers for the read stage: expect a catalogued error from a promise. */
import { expect } from 'vitest';
import { HeathoursError } from '../../pipeline/model/errors.ts';

export async function expectCatalogued(p: Promise<unknown> | (() => unknown), code: string, match?: RegExp): Promise<HeathoursError> {
  try {
    await (typeof p === 'function' ? p() : p);
  } catch (e) {
    expect(e).toBeInstanceOf(HeathoursError);
    const err = e as HeathoursError;
    expect(err.code).toBe(code);
    if (match) expect(err.format()).toMatch(match);
    return err;
  }
  throw new Error(`expected ${code}, nothing was thrown`);
}

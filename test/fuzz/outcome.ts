/**
 * How a fuzzed run ended. `read`: no error. `catalogued`: a HeathoursError from the catalogue
 * whose printed form names the damaged file. Everything else is a defect: `internal` (any other
 * error: what the CLI reports as "internal error (a bug in heathours…)"), `unnamed` (catalogued
 * but not naming the file), `noisy` (text printed to the terminal, e.g. HDF5 diagnostics),
 * `hang` (over the time limit), `crash` (the worker thread died).
 */
import { basename } from 'node:path';
import { HeathoursError, errorCatalogue } from '../../pipeline/model/errors.ts';
import '../../pipeline/commands/catalogue.ts';

export type Outcome = 'read' | 'catalogued' | 'internal' | 'unnamed' | 'noisy' | 'hang' | 'crash';
export const OUTCOMES: readonly Outcome[] = ['read', 'catalogued', 'internal', 'unnamed', 'noisy', 'hang', 'crash'];
export const GOOD: ReadonlySet<Outcome> = new Set(['read', 'catalogued']);

export interface StepResult {
  step: string;
  outcome: Outcome;
  code?: string;
  /** The error's first line(s) or stack, for the report. */
  message?: string;
  ms: number;
}

let known: Set<string> | undefined;

/** Classifies what a step threw (`undefined`: it returned). */
export function classify(e: unknown, path: string): Pick<StepResult, 'outcome' | 'code' | 'message'> {
  if (e === undefined) return { outcome: 'read' };
  known ??= new Set(errorCatalogue().map((s) => s.code));
  if (e instanceof HeathoursError && known.has(e.code) && e.hint.length > 0) {
    const text = e.format();
    const named = text.includes(path) || text.includes(basename(path));
    return { outcome: named ? 'catalogued' : 'unnamed', code: e.code, message: text };
  }
  const err = e as Error;
  return { outcome: 'internal', code: err?.name ?? typeof e, message: (err?.stack ?? String(e)).split('\n').slice(0, 6).join('\n') };
}

/** The worst of several outcomes (defects first). */
export function worst(outcomes: Outcome[]): Outcome {
  const rank: Outcome[] = ['crash', 'hang', 'internal', 'unnamed', 'noisy', 'catalogued', 'read'];
  for (const o of rank) if (outcomes.includes(o)) return o;
  return 'read';
}

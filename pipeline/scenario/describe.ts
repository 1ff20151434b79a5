/**
 * A scenario in words, for everything that shows one (the manifest, the region workbooks, the
 * site): what it is (a uniform warming, or change factors and their source), how it was made
 * (the delta change method keeps the record's day-to-day variability and changes monthly means
 * only), and that it is a what-if, not a forecast. Pure.
 */
import type { ScenarioSpec } from './settings.ts';

/** Smallest, largest and mean change over the land cells and months [unit of the change]. */
export interface ChangeRange {
  min: number;
  max: number;
  mean: number;
}

/** What the plan found in a scenario's changes: the range of each change it holds, and the file's variables. */
export interface ScenarioCheck {
  temperature: ChangeRange;
  humidity: ChangeRange | null;
  solar: ChangeRange | null;
  /** Variables read from the change file (none for a uniform warming). */
  variables: string[];
}

/** The words shown with a scenario. */
export interface ScenarioWords {
  /** `uniform warming` or `change factors`. */
  kind: string;
  /** What the scenario changes, in one sentence. */
  what: string;
  /** Where the changes come from. */
  source: string;
  /** How it is made and what it is not: the same for every scenario. */
  caveat: string;
}

/** The caveat every page, table and file showing a scenario carries. */
export const SCENARIO_CAVEAT =
  'A what-if, not a forecast: the hours of the record with their monthly means shifted by the scenario\u2019s changes (the delta change method). The record\u2019s day-to-day and hour-to-hour weather is kept and only monthly means change, so it says nothing of how often, how long or how hot future heat waves will be, nor of any particular future year.';

const signed = (x: number, d = 1) => `${x >= 0 ? '+' : '\u2212'}${Math.abs(x).toFixed(d)}`;

function span(r: { min: number; max: number; mean: number }, unit: string, scale = 1, d = 1): string {
  const lo = signed(r.min * scale, d);
  const hi = signed(r.max * scale, d);
  return lo === hi ? `${lo} ${unit}` : `${lo} to ${hi} ${unit} (mean ${signed(r.mean * scale, d)} ${unit})`;
}

/**
 * The words of a scenario; `check` (the plan's ranges over the land cells and months) adds the
 * size of a change file's changes.
 */
export function describeScenario(s: ScenarioSpec, check?: ScenarioCheck): ScenarioWords {
  if (s.kind === 'warming') {
    return {
      kind: 'uniform warming',
      what: `A uniform warming of the air temperature by ${signed(s.warming, 2)} K in every hour, relative humidity kept (the dew point recomputed); pressure, wind and solar radiation unchanged.`,
      source: 'A warming set in the atlas configuration: a sensitivity test, not derived from a climate model.',
      caveat: SCENARIO_CAVEAT,
    };
  }
  const parts = [`air temperature ${check ? span(check.temperature, 'K') : 'changed'}`];
  if (s.humidity === 'relative') parts.push(check?.humidity ? `relative humidity ${span(check.humidity, 'points')}` : 'relative humidity kept');
  else parts.push(check?.humidity ? `specific humidity ${span(check.humidity, '%', 100)}` : 'specific humidity kept');
  parts.push(check?.solar ? `solar radiation ${span(check.solar, '%', 100)}` : 'solar radiation unchanged');
  return {
    kind: 'change factors',
    what: `Monthly change factors applied to every hour of each month: ${parts.join('; ')} over the atlas\u2019s land cells and months; pressure and wind unchanged.`,
    source: `The change file ${s.file} (SHA-256 ${s.sha256.slice(0, 16)}…), interpolated bilinearly onto the atlas grid.${s.description ? ` ${s.description}` : ''}`,
    caveat: SCENARIO_CAVEAT,
  };
}

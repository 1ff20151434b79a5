/**
 * Scenarios in the atlas configuration (`scenarios:`, a list) and what a build makes of them.
 * A scenario is a what-if climate, built from the record by the delta change method: the record's
 * hours with their monthly means shifted, so its day-to-day and hour-to-hour weather are kept. It
 * is not a forecast.
 *
 * - `{ id, name, warming: K }`: a uniform warming of the air temperature by K kelvin in every
 *   hour, relative humidity kept (the dew point recomputed), pressure, wind and radiation unchanged;
 * - `{ id, name, changeFile: PATH, humidity: relative | specific }`: monthly change factors from a
 *   CF NetCDF file (pipeline/read/change-file.ts), interpolated onto the atlas grid (regrid.ts).
 */
import { z } from 'zod';
import type { HumidityChangeKind } from '../read/change-file.ts';
import { ScenarioIdDuplicate, ScenarioIdInvalid } from './errors.ts';

/** A scenario id: lower-case letters, digits and dashes (it names the folder `data/scenarios/<id>/`). */
export const SCENARIO_ID_PATTERN = /^[a-z0-9][a-z0-9-]*$/;
/** Ids a scenario may not take: the record itself is shown as the baseline. */
export const RESERVED_SCENARIO_IDS = ['baseline'] as const;
/** Largest uniform warming (or cooling) accepted [K]: a sensitivity test, not a climate. */
export const MAX_UNIFORM_WARMING = 10;

export const scenarioSchema = z
  .object({
    /** Lower-case slug; checked by {@link checkScenarioIds} (catalogued ScenarioIdInvalid). */
    id: z.string(),
    /** What the site and tables call it, e.g. "+2 °C global warming level". */
    name: z.string().min(1),
    /** Optional sentence on where the changes come from. */
    description: z.string().optional(),
    /** Uniform warming of the air temperature in every hour [K]. */
    warming: z.number().min(-MAX_UNIFORM_WARMING).max(MAX_UNIFORM_WARMING).optional(),
    /** Monthly change factors: a CF NetCDF file, relative to the configuration file. */
    changeFile: z.string().min(1).optional(),
    /** What the change file's humidity change is: `relative` (RH, percentage points) or `specific` (relative change of q). */
    humidity: z.enum(['relative', 'specific']).optional(),
  })
  .strict()
  .superRefine((s, ctx) => {
    if ((s.warming === undefined) === (s.changeFile === undefined)) {
      ctx.addIssue({
        code: z.ZodIssueCode.custom,
        path: ['warming'],
        message: 'give either `warming` (K) or `changeFile` (a NetCDF of monthly changes), one of the two',
      });
    }
    if (s.changeFile !== undefined && s.humidity === undefined) {
      ctx.addIssue({
        code: z.ZodIssueCode.custom,
        path: ['humidity'],
        message:
          "say what the change file's humidity change is: `relative` (relative humidity, kept where the file has none) or `specific` (specific humidity, kept where the file has none)",
      });
    }
    if (s.warming !== undefined && s.humidity !== undefined) {
      ctx.addIssue({
        code: z.ZodIssueCode.custom,
        path: ['humidity'],
        message: '`humidity` goes with `changeFile`; a uniform warming keeps relative humidity',
      });
    }
  });

export type ScenarioConfig = z.infer<typeof scenarioSchema>;

/** The configuration key of the list. */
export const scenariosSchema = z.array(scenarioSchema).default([]);

/**
 * A scenario as a build uses it: the configuration resolved, with the change file's absolute path
 * and SHA-256 (part of every scenario shard's cache key).
 */
export type ScenarioSpec =
  | { id: string; name: string; description?: string; kind: 'warming'; warming: number }
  | { id: string; name: string; description?: string; kind: 'change-file'; path: string; file: string; sha256: string; humidity: HumidityChangeKind };

/**
 * Checks the ids of the configured scenarios: slugs, not reserved, each once. Catalogued errors
 * name the key (`scenarios[1].id`) in `file`.
 */
export function checkScenarioIds(list: readonly Pick<ScenarioConfig, 'id'>[], file: string): void {
  const seen = new Set<string>();
  list.forEach((s, i) => {
    const where = { file, key: `scenarios[${i}].id` };
    if (!SCENARIO_ID_PATTERN.test(s.id)) {
      const why =
        s.id === ''
          ? 'is empty'
          : /[A-Z]/.test(s.id)
            ? 'has upper-case letters'
            : /^-/.test(s.id)
              ? 'starts with a dash'
              : `has characters other than a-z, 0-9 and - (${JSON.stringify(s.id.replace(/[a-z0-9-]/g, ''))})`;
      throw ScenarioIdInvalid({ id: s.id, why }, where);
    }
    if ((RESERVED_SCENARIO_IDS as readonly string[]).includes(s.id))
      throw ScenarioIdInvalid({ id: s.id, why: 'is reserved: the record itself is the baseline' }, where);
    if (seen.has(s.id)) throw ScenarioIdDuplicate({ id: s.id }, where);
    seen.add(s.id);
  });
}

/**
 * Workload classes: named metabolic rates [W] with a plain description, read from
 * content/workload-classes.yaml (already parsed from YAML by the caller, so this file stays pure
 * and runs in the browser). The defaults are the ISO 7243 class values 180 / 300 / 415 / 520 W with
 * rest at 115 W (docs/methods.md §8.1; typical values as used by ACGIH/NIOSH and ISO 7243).
 *
 * Metabolic rates are whole-body rates [W] for a 1.8 m² adult; a rate in W m⁻² times 1.8 gives W
 * (docs/methods.md §8.1 column "M (W, 1.8 m² body)").
 */
import { z } from 'zod';
import { MetabolicRateOutOfRange, RestRateNotBelowWork, WorkloadClassDuplicate, WorkloadClassUnknown, WorkloadClassesInvalid } from './errors.ts';
import type { ErrorWhere } from '../model/errors.ts';
import { MAX_METABOLIC_RATE_W } from './limit-curves.ts';

// Largest metabolic rate accepted [W] (limit-curves.ts, zod-free so the browser bundle needs no schema).
export { MAX_METABOLIC_RATE_W } from './limit-curves.ts';

/** One workload class. */
export interface WorkloadClass {
  /** Slug used in file and column names, e.g. `moderate`. */
  id: string;
  /** Display name, e.g. "Moderate work". */
  name: string;
  /** Time-weighted metabolic rate while working [W]. */
  metabolicRate: number;
  /** Plain description with examples of trade tasks. */
  description: string;
}

/** The rest state: where the worker recovers between work periods. */
export interface RestState {
  name: string;
  /** Metabolic rate at rest [W]. */
  metabolicRate: number;
  description: string;
}

/** The whole file: a rest state and the work classes. */
export interface WorkloadClasses {
  rest: RestState;
  classes: WorkloadClass[];
}

const slug = z.string().regex(/^[a-z0-9][a-z0-9-]*$/, 'use lower-case letters, digits and dashes');

const classSchema = z
  .object({
    id: slug,
    name: z.string().min(1),
    /** [W] */
    metabolicRate: z.number(),
    description: z.string().min(1),
  })
  .strict();

/** zod schema of content/workload-classes.yaml (shape only; ranges are checked by {@link parseWorkloadClasses}). */
export const workloadClassesSchema = z
  .object({
    rest: z.object({ name: z.string().min(1), metabolicRate: z.number(), description: z.string().min(1) }).strict(),
    classes: z.array(classSchema).min(1),
  })
  .strict();

/**
 * Validates the already-parsed YAML object of a workload-classes file and returns the classes.
 * Catalogued errors: WorkloadClassesInvalid (shape), WorkloadClassDuplicate, MetabolicRateOutOfRange
 * (≤ 0, > 1000 W or not finite), RestRateNotBelowWork. `file` is used in messages only.
 */
export function parseWorkloadClasses(raw: unknown, file = 'content/workload-classes.yaml'): WorkloadClasses {
  const result = workloadClassesSchema.safeParse(raw);
  if (!result.success) {
    const problems = result.error.issues.map((i) => {
      const key = i.path.join('.') || '(top level)';
      if (i.code === 'unrecognized_keys') return `${key}: unknown key(s) ${i.keys.map((k) => `"${k}"`).join(', ')}`;
      return `${key}: ${i.message}`;
    });
    throw WorkloadClassesInvalid({ problems }, { file, key: result.error.issues[0]?.path.join('.') || undefined });
  }
  const data = result.data;
  checkRate('rest', data.rest.metabolicRate, { file, key: 'rest.metabolicRate' });
  const seen = new Set<string>();
  data.classes.forEach((c, i) => {
    const where: ErrorWhere = { file, key: `classes.${i}` };
    if (seen.has(c.id)) throw WorkloadClassDuplicate({ id: c.id }, where);
    seen.add(c.id);
    checkRate(c.id, c.metabolicRate, { file, key: `classes.${i}.metabolicRate` });
    if (data.rest.metabolicRate >= c.metabolicRate) {
      throw RestRateNotBelowWork({ id: c.id, rest: data.rest.metabolicRate, work: c.metabolicRate }, where);
    }
  });
  return data;
}

function checkRate(id: string, value: number, where: ErrorWhere): void {
  if (!Number.isFinite(value) || value <= 0 || value > MAX_METABOLIC_RATE_W) throw MetabolicRateOutOfRange({ id, value }, where);
}

/**
 * Picks classes by id, in the order given. Catalogued error WorkloadClassUnknown for an id that is
 * not defined; `key` names the config key that referenced it.
 */
export function selectWorkloadClasses(all: WorkloadClasses, ids: readonly string[], key = 'work.classes'): WorkloadClass[] {
  const byId = new Map(all.classes.map((c) => [c.id, c]));
  return ids.map((id, i) => {
    const c = byId.get(id);
    if (!c) throw WorkloadClassUnknown({ id, known: [...byId.keys()] }, { key: `${key}.${i}` });
    return c;
  });
}

/**
 * The default classes (ISO 7243 class values; docs/methods.md §8.1), the same as the shipped
 * content/workload-classes.yaml, for callers that have no file (the browser calculator, tests).
 */
export const DEFAULT_WORKLOAD_CLASSES: WorkloadClasses = {
  rest: {
    name: 'Rest',
    metabolicRate: 115,
    description: 'Sitting or standing quietly during a break, no work done.',
  },
  classes: [
    {
      id: 'low',
      name: 'Low work rate',
      metabolicRate: 180,
      description:
        'Light hand and arm work at an easy pace: driving a vehicle or crane, checking and measuring, light assembly, walking on level ground at up to about 5 km/h.',
    },
    {
      id: 'moderate',
      name: 'Moderate work rate',
      metabolicRate: 300,
      description:
        'Steady hand and arm work with some body movement: nailing, plastering, operating plant, weeding or picking crops, moving moderately heavy items now and then, walking briskly.',
    },
    {
      id: 'high',
      name: 'High work rate',
      metabolicRate: 415,
      description:
        'Hard arm and trunk work: carrying heavy loads, shovelling, digging, laying concrete blocks, sawing hardwood by hand, pushing loaded wheelbarrows.',
    },
    {
      id: 'very-high',
      name: 'Very high work rate',
      metabolicRate: 520,
      description:
        'Very hard work at a fast to maximum pace: heavy digging or shovelling without pause, axe work, climbing stairs or ladders with loads, running.',
    },
  ],
};

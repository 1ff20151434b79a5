/**
 * The `work:` section of content/atlas.yaml: which workload classes, limit model,
 * acclimatization states, exposures, rest place, clothing and shift to evaluate. Every key has a
 * default, so an atlas.yaml without `work:` works (`workSettingsSchema.parse(undefined)` gives the
 * defaults). The schema checks shape; {@link resolveWorkSettings} checks meaning (class ids against
 * the workload-classes file, shift hours and days, clothing) with catalogued errors, and prepares
 * one work kernel per class × acclimatization × exposure for the reduction.
 */
import { z } from 'zod';
import type { ErrorWhere } from '../model/errors.ts';
import { WorkSettingsInvalid } from './errors.ts';
import { clothingAdjustment, type ClothingChoice } from './clothing.ts';
import { ACCLIMATIZATION_STATES, LIMIT_MODELS, type Acclimatization, type LimitModelId } from './limit-curves.ts';
import { DEFAULT_SHIFT, validateShift, type WorkShift } from './shifts.ts';
import { prepareWorkKernel, workFractionInto, type WorkKernel } from './work-fraction.ts';
import { selectWorkloadClasses, type RestState, type WorkloadClass, type WorkloadClasses } from './workload-classes.ts';

/**
 * Where the work is done: in the sun (WBGT with solar load), in the shade (the open sky with the
 * sun removed) or under a shelter (a roof or canopy, a black shelter at the air temperature,
 * docs/methods.md §6). The shelter is opt-in (`work.exposures`).
 */
export type Exposure = 'sun' | 'shade' | 'shelter';
export const EXPOSURES: readonly Exposure[] = ['sun', 'shade', 'shelter'];

/**
 * The exposures whose WBGT a build counts (sums, maxima, capacity loss) in this order, the index
 * `x` of the per-exposure arrays: sun and shade always (the shade is the rest place of
 * `restLocation: shade` and the sun and shade are the histograms' exposures), the shelter when an
 * evaluation works under it.
 */
export function countedExposures(evaluations: readonly { exposure: Exposure }[]): Exposure[] {
  return evaluations.some((e) => e.exposure === 'shelter') ? ['sun', 'shade', 'shelter'] : ['sun', 'shade'];
}
/** Where breaks are taken: where the work is, or in the shade. */
export type RestLocation = 'same-place' | 'shade';

const slug = z.string().regex(/^[a-z0-9][a-z0-9-]*$/, 'use lower-case letters, digits and dashes');
const uniqueList = <T extends z.ZodTypeAny>(item: T) =>
  z
    .array(item)
    .min(1)
    .refine((xs) => new Set(xs).size === xs.length, { message: 'list an entry only once' });

/** zod schema of the `work:` section (shape and defaults). */
export const workSettingsSchema = z
  .object({
    /** Workload-classes file, relative to the atlas config file. */
    classesFile: z.string().min(1).default('workload-classes.yaml'),
    /** Class ids to evaluate, from the classes file. */
    classes: uniqueList(slug).default(['low', 'moderate', 'high', 'very-high']),
    /** Limit model: continuous curves (NIOSH 2016 / ISO 7243:2017 form) or the ISO 7243:1989 table. */
    limitModel: z.enum(LIMIT_MODELS as [LimitModelId, ...LimitModelId[]]).default('curve-2017'),
    /** Table model only: perceptible air movement (classes 3–4 column). */
    airMovement: z.boolean().default(false),
    /** Acclimatization states to compute. */
    acclimatization: uniqueList(z.enum(ACCLIMATIZATION_STATES as [Acclimatization, ...Acclimatization[]])).default(['acclimatized', 'unacclimatized']),
    /** Exposures to compute; `shelter` (under a roof or canopy) is opt-in. */
    exposures: uniqueList(z.enum(EXPOSURES as [Exposure, ...Exposure[]])).default(['sun', 'shade']),
    /** Where breaks are taken. `shade` means: in the shade WBGT of the same cell and hour. */
    restLocation: z.enum(['same-place', 'shade']).default('same-place'),
    /** Clothing: an ensemble of pipeline/work/clothing.ts (+ hood), or a value `cav` [°C-WBGT]. */
    clothing: z
      .object({ ensemble: z.string().min(1).optional(), hood: z.boolean().optional(), cav: z.number().optional() })
      .strict()
      .refine((c) => !(c.cav !== undefined && (c.ensemble !== undefined || c.hood !== undefined)), {
        message: 'give either ensemble (and hood) or cav, not both',
      })
      .default({ ensemble: 'work-clothes' }),
    /** Shift in local time (whole hours 0–24; end below start = night shift) and days (mon … sun). */
    shift: z
      .object({
        start: z.number().default(DEFAULT_SHIFT.start),
        end: z.number().default(DEFAULT_SHIFT.end),
        days: z.array(z.string()).default([...DEFAULT_SHIFT.days]),
      })
      .strict()
      .default({}),
  })
  .strict()
  .default({});

export type WorkSettings = z.infer<typeof workSettingsSchema>;

/** One thing the reduction evaluates per cell-hour. */
export interface WorkEvaluation {
  /** Stable key for columns and files, e.g. `moderate.acclimatized.sun`. */
  key: string;
  workloadClass: WorkloadClass;
  acclimatization: Acclimatization;
  exposure: Exposure;
  /** Which WBGT to pass as the rest WBGT: `shade` = the shade array, `null` = rest in the same place. */
  restWbgt: 'shade' | null;
  kernel: WorkKernel;
}

/** The work section checked against the classes file, ready for the reduction. */
export interface ResolvedWork {
  settings: WorkSettings;
  rest: RestState;
  classes: WorkloadClass[];
  /** Clothing adjustment value [°C-WBGT]. */
  clothingAdjustment: number;
  shift: WorkShift;
  /** classes × acclimatization × exposures, in that nesting order. */
  evaluations: WorkEvaluation[];
}

/**
 * Parses a raw `work:` value (undefined → defaults). Catalogued WorkSettingsInvalid on a shape
 * error; `file` is used in messages only.
 */
export function parseWorkSettings(raw: unknown, file?: string): WorkSettings {
  const r = workSettingsSchema.safeParse(raw);
  if (!r.success) {
    const problems = r.error.issues.map((i) => {
      const key = ['work', ...i.path].join('.');
      if (i.code === 'unrecognized_keys') return `${key}: unknown key(s) ${i.keys.map((k) => `"${k}"`).join(', ')}`;
      return `${key}: ${i.message}`;
    });
    throw WorkSettingsInvalid({ problems }, { file, key: ['work', ...(r.error.issues[0]?.path ?? [])].join('.') });
  }
  return r.data;
}

/**
 * Checks the settings against the workload classes and prepares the kernels. Catalogued errors:
 * WorkloadClassUnknown, WorkShiftInvalid, WorkWeekdayUnknown, ClothingEnsembleUnknown,
 * ClothingAdjustmentOutOfRange (and those of prepareWorkKernel).
 */
export function resolveWorkSettings(settings: WorkSettings, all: WorkloadClasses, where: ErrorWhere = {}): ResolvedWork {
  const classes = selectWorkloadClasses(all, settings.classes, 'work.classes');
  const shift = validateShift(settings.shift, { ...where, key: 'work.shift' });
  const c = settings.clothing;
  const choice: ClothingChoice = c.cav !== undefined ? { cav: c.cav } : { ensemble: c.ensemble ?? 'work-clothes', hood: c.hood ?? false };
  const cav = clothingAdjustment(choice, { ...where, key: 'work.clothing' });
  const evaluations: WorkEvaluation[] = [];
  for (const wc of classes) {
    for (const acclimatization of settings.acclimatization) {
      const kernel = prepareWorkKernel({
        workRate: wc.metabolicRate,
        restRate: all.rest.metabolicRate,
        limit: { model: settings.limitModel, acclimatization, airMovement: settings.airMovement },
        clothingAdjustment: cav,
      });
      for (const exposure of settings.exposures as Exposure[]) {
        evaluations.push({
          key: `${wc.id}.${acclimatization}.${exposure}`,
          workloadClass: wc,
          acclimatization,
          exposure,
          restWbgt: settings.restLocation === 'shade' && exposure === 'sun' ? 'shade' : null,
          kernel,
        });
      }
    }
  }
  return { settings, rest: all.rest, classes, clothingAdjustment: cav, shift, evaluations };
}

/**
 * Work fraction [0–1] of one evaluation for a block of cell-hours: picks the work WBGT by exposure
 * (`wbgtSun`, `wbgtShade` or `wbgtShelter` [°C]) and the rest WBGT by the rest place, then runs
 * {@link workFractionInto}. Above the limit ⇔ out[i] < 1. No allocation. A RangeError when a
 * shelter evaluation is given no shelter WBGT.
 */
export function evaluationFractionInto(
  out: Float32Array,
  wbgtSun: Float32Array,
  wbgtShade: Float32Array,
  e: WorkEvaluation,
  wbgtShelter?: Float32Array,
): Float32Array {
  const work = exposureWbgt(e.exposure, wbgtSun, wbgtShade, wbgtShelter);
  return workFractionInto(out, work, e.restWbgt === 'shade' ? wbgtShade : null, e.kernel);
}

/** The WBGT array of an exposure [°C]; a RangeError for the shelter without its array. */
export function exposureWbgt(x: Exposure, wbgtSun: Float32Array, wbgtShade: Float32Array, wbgtShelter: Float32Array | undefined): Float32Array {
  if (x === 'sun') return wbgtSun;
  if (x === 'shade') return wbgtShade;
  if (wbgtShelter === undefined) throw new RangeError('a shelter evaluation needs the shelter WBGT (wbgtShelter)');
  return wbgtShelter;
}

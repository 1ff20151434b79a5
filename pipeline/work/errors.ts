/**
 * Catalogued errors of the work stage: workload classes, work settings, shifts, clothing,
 * limit models and the histogram helper. Each says what went wrong, where, and what to do.
 * Pure (no node: imports), so the browser calculator can import it too.
 */
import { defineError } from '../model/errors.ts';

export const WorkloadClassesInvalid = defineError<{ problems: string[] }>({
  code: 'WorkloadClassesInvalid',
  title: 'The workload classes file has invalid or unknown keys',
  message: (p) => p.problems.join('; '),
  hint: () => 'each class needs id (lower-case slug), name, metabolicRate [W] and description; see pipeline/work/README.md and content/workload-classes.yaml',
});

export const WorkloadClassDuplicate = defineError<{ id: string }>({
  code: 'WorkloadClassDuplicate',
  title: 'Two workload classes have the same id',
  message: (p) => `workload class id "${p.id}" is used more than once`,
  hint: () => 'give every class its own id; ids are used in file names and column names',
});

export const MetabolicRateOutOfRange = defineError<{ id: string; value: number }>({
  code: 'MetabolicRateOutOfRange',
  title: 'A metabolic rate is zero, negative or implausibly large',
  message: (p) => `metabolic rate of "${p.id}" is ${p.value} W; it must be a number above 0 W and at most 1000 W`,
  hint: () =>
    'metabolic rates are whole-body rates in watts for a 1.8 m² adult (rest 115 W, low 180 W, moderate 300 W, high 415 W, very high 520 W); W m⁻² values must be multiplied by 1.8',
});

export const RestRateNotBelowWork = defineError<{ id: string; rest: number; work: number }>({
  code: 'RestRateNotBelowWork',
  title: 'The rest metabolic rate is not below a work rate',
  message: (p) => `rest metabolic rate ${p.rest} W is not below the rate of class "${p.id}" (${p.work} W)`,
  hint: () => 'a work/rest split needs work above rest: lower the rest rate (115 W is usual) or raise the class rate',
});

export const WorkloadClassUnknown = defineError<{ id: string; known: string[] }>({
  code: 'WorkloadClassUnknown',
  title: 'A workload class is referenced that is not defined',
  message: (p) => `no workload class "${p.id}"; defined classes: ${p.known.join(', ')}`,
  hint: () => 'use an id from content/workload-classes.yaml, or add the class there',
});

export const WorkSettingsInvalid = defineError<{ problems: string[] }>({
  code: 'WorkSettingsInvalid',
  title: 'The work section of the configuration is invalid',
  message: (p) => p.problems.join('; '),
  hint: () => 'correct the keys named above; pipeline/work/README.md lists every key of the work section with its default',
});

export const ClothingEnsembleUnknown = defineError<{ id: string; known: string[] }>({
  code: 'ClothingEnsembleUnknown',
  title: 'The clothing ensemble is not in the table',
  message: (p) => `no clothing ensemble "${p.id}"; known: ${p.known.join(', ')}`,
  hint: () => 'pick an ensemble from the table in pipeline/work/clothing.ts, or give a clothing adjustment value directly as clothing: { cav: 2 }',
});

export const ClothingAdjustmentOutOfRange = defineError<{ value: number }>({
  code: 'ClothingAdjustmentOutOfRange',
  title: 'The clothing adjustment value is outside 0 to 20 °C-WBGT',
  message: (p) => `clothing adjustment value ${p.value} °C-WBGT is outside 0 to 20`,
  hint: () => 'published clothing adjustment values lie between 0 (work clothes) and about 12 (vapour-barrier coveralls with hood)',
});

export const WorkParameterInvalid = defineError<{ name: string; value: string; expected: string }>({
  code: 'WorkParameterInvalid',
  title: 'A work-model parameter is invalid',
  message: (p) => `${p.name} is ${p.value}; expected ${p.expected}`,
  hint: () => 'check the arguments passed to the work functions (pipeline/work/README.md lists each with its unit)',
});

export const WbgtHistogramInvalid = defineError<{ problem: string }>({
  code: 'WbgtHistogramInvalid',
  title: 'The WBGT histogram has an invalid layout',
  message: (p) => p.problem,
  hint: () =>
    'edges must be finite and strictly increasing, and counts must have edges.length + 1 entries (below the first edge, each bin, at or above the last edge); see pipeline/work/wbgt-bins.ts',
});

export const LimitOutsideHistogram = defineError<{ threshold: number; lower: number; upper: number }>({
  code: 'LimitOutsideHistogram',
  title: 'The limit falls outside the range of the WBGT histogram',
  message: (p) =>
    `the measured-WBGT threshold ${p.threshold.toFixed(2)} °C (limit minus clothing adjustment) lies outside the histogram edges ${p.lower} to ${p.upper} °C, so the open end bins cannot be split`,
  hint: () => 'use a histogram with a wider range (pipeline/work/wbgt-bins.ts) or a smaller clothing adjustment value',
});

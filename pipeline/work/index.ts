/**
 * The work model: workload classes, WBGT limits, clothing, allowable work fraction, shifts in
 * local time, capacity-loss functions, histogram evaluation and cautions. Pure and isomorphic
 * (no node: imports): the pipeline and the browser calculator import this same barrel.
 */
export * from './errors.ts';
export * from './shift-errors.ts';
export * from './workload-classes.ts';
export * from './limit-curves.ts';
export * from './clothing.ts';
export * from './work-fraction.ts';
export * from './erf.ts';
export * from './capacity-loss.ts';
export * from './time-zone.ts';
export * from './shifts.ts';
export * from './wbgt-bins.ts';
export * from './histogram-estimate.ts';
export * from './work-settings.ts';
export * from './evaluation-groups.ts';
export * from './cautions.ts';

/**
 * The schedule stage: a job replayed day by day on the published WBGT histograms of a place —
 * schedule, cost of heat, start-month and shift comparisons, crew for a deadline — and the
 * estimate's inputs shared by the /estimate/ page and `heathours estimate`. Pure and isomorphic
 * (no node: imports, no zod): the browser bundle imports these files directly.
 */
export * from './errors.ts';
export * from './calendar.ts';
export * from './shift-pattern.ts';
export * from './job.ts';
export * from './slot-figures.ts';
export * from './rest-pairing.ts';
export * from './weather-years.ts';
export * from './replay.ts';
export * from './statistics.ts';
export * from './bid.ts';
export * from './context.ts';
export * from './inputs.ts';
export * from './project-period.ts';
export * from './tiles.ts';
export * from './cell-tiles.ts';
export * from './place.ts';
export * from './cell-place.ts';
export * from './scenario-runs.ts';

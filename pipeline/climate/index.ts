/** The climate stage: normals across years and mean annual temperature against the human climate niche. */
export { quantile, quantileSorted, sortFinite, checkProbability, type QuantileResult } from './quantile.ts';
export {
  MONTHLY_COMPLETENESS,
  checkRule,
  completenessMask,
  minYearsForNormal,
  yearCounts,
  type CompletenessRule,
} from './completeness.ts';
export { checkStack, periodRows, type YearPeriod, type YearStack } from './year-stack.ts';
export { computeNormals, type Normals, type NormalsOptions } from './normals.ts';
export {
  NICHE_BOUNDS,
  NICHE_CAVEAT,
  NICHE_CLASSES,
  NICHE_LABELS,
  NICHE_MAIN_MODE_C,
  NICHE_NO_CLASS,
  NICHE_UNCERTAINTY_C,
  classifyNiche,
  distanceToMainMode,
  nearNicheBoundary,
  nicheClassCode,
  type NicheClass,
} from './niche.ts';
export { assessNiche, type NicheAssessment, type NicheInput } from './niche-assessment.ts';
export { annualMeanFromMonthlySums, type MonthlySums } from './annual-mean.ts';
export { computeTrends, annualCellTrends, theilSenSlope, mannKendall, MIN_TREND_YEARS, YEARS_PER_DECADE, type Trends } from './trend.ts';
export * as climateErrors from './errors.ts';

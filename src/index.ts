// The library API: what a TypeScript user imports. Pure functions on
// Float64Array; the command line is built on the same functions.

export { adjustBenjaminiHochberg, benjaminiHochbergSorted } from './procedures/benjamini-hochberg.js';
export { adjustBenjaminiYekutieli, benjaminiYekutieliSorted, harmonicSum } from './procedures/benjamini-yekutieli.js';
export { adjustBonferroni, bonferroniSorted } from './procedures/bonferroni.js';
export { adjustHochberg, hochbergSorted } from './procedures/hochberg.js';
export { adjustHolm, holmSorted } from './procedures/holm.js';
export { adjustHolmSidak, holmSidakSorted } from './procedures/holm-sidak.js';
export { adjustHommel, hommelSorted } from './procedures/hommel.js';
export { adjustSidak, sidakSorted } from './procedures/sidak.js';
export { adjustStorey, storeyQValuesSorted } from './procedures/storey.js';
export { adjustBky, bkySorted } from './procedures/bky.js';
export {
  estimatePi0,
  PI0_ESTIMATORS,
  DEFAULT_PI0_SETTINGS,
  PI0_MIN_TESTS,
  type Pi0Estimate,
  type Pi0EstimatorName,
  type Pi0Settings,
} from './estimators/pi0.js';
export { pi0AtLambda } from './estimators/pi0-lambda.js';
export { pi0Spline, pi0SplineCurve, SPLINE_LAMBDAS } from './estimators/pi0-spline.js';
export { pi0Bootstrap, BOOTSTRAP_LAMBDAS, BOOTSTRAP_RESAMPLES } from './estimators/pi0-bootstrap.js';
export { smoothingSplineFit, smoothingForDegreesOfFreedom, splineDegreesOfFreedom } from './estimators/smoothing-spline.js';
export { seededUniform } from './random.js';
export { ascendingOrder, adjustInInputOrder, type SortedKernel } from './procedures/sorting.js';
export {
  METHODS,
  METHOD_TOKENS,
  WEIGHTED_TOKENS,
  adjustWeighted,
  DEFAULT_SETTINGS,
  findMethod,
  columnNames,
  type Method,
  type MethodSettings,
  type FamilyAdjustment,
  type FamilyInput,
  type ErrorRate,
  type StepKind,
} from './methods.js';
export { normalisedWeights } from './procedures/weights.js';
export {
  adjustWithinFamilies,
  singleFamily,
  TooFewTestsError,
  ZeroWeightsError,
  type FamilyGrouping,
  type FamilyOutcome,
  type WithinFamilies,
  type WithinFamiliesOptions,
} from './families.js';
export { summarize, pi0Warnings, type Summary, type SummaryRow } from './summary.js';
export { readPValue, MISSING_MARKS } from './io/p-value-text.js';
export { pFromStatistic, STATISTIC_KINDS, type StatisticKind, type Tail } from './distributions/p-from-statistic.js';
export { inspectFamily, type FamilyInspection } from './diagnostics/inspect-family.js';
export { genomicInflation, type Inflation } from './diagnostics/inflation.js';
export { upperHalfUniformity, type Uniformity } from './diagnostics/uniformity.js';
export { RULES as FINDING_RULES, findingsOf, type Finding } from './diagnostics/findings.js';

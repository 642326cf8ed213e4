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
export { ascendingOrder, adjustInInputOrder, type SortedKernel } from './procedures/sorting.js';
export {
  METHODS,
  METHOD_TOKENS,
  WEIGHTED_TOKENS,
  adjustWeighted,
  findMethod,
  columnNames,
  type Method,
  type ErrorRate,
  type StepKind,
} from './methods.js';
export { normalisedWeights } from './procedures/weights.js';
export { pi0AtLambda } from './estimators/pi0-lambda.js';
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
export { summarize, type Summary, type SummaryRow } from './summary.js';
export { readPValue, MISSING_MARKS } from './io/p-value-text.js';

// The library API: what a TypeScript user imports. Pure functions on
// Float64Array; the command line is built on the same functions.

export { adjustBenjaminiHochberg, benjaminiHochbergSorted } from './procedures/benjamini-hochberg.js';
export { adjustBenjaminiYekutieli, benjaminiYekutieliSorted, harmonicSum } from './procedures/benjamini-yekutieli.js';
export { adjustBonferroni, bonferroniSorted } from './procedures/bonferroni.js';
export { adjustHochberg, hochbergSorted } from './procedures/hochberg.js';
export { adjustHolm, holmSorted } from './procedures/holm.js';
export { ascendingOrder, adjustInInputOrder, type SortedKernel } from './procedures/sorting.js';
export { METHODS, METHOD_TOKENS, findMethod, columnNames, type Method, type ErrorRate, type StepKind } from './methods.js';
export {
  adjustWithinFamilies,
  singleFamily,
  TooFewTestsError,
  type FamilyGrouping,
  type FamilyOutcome,
  type WithinFamilies,
  type WithinFamiliesOptions,
} from './families.js';
export { summarize, type Summary, type SummaryRow } from './summary.js';
export { readPValue, MISSING_MARKS } from './io/p-value-text.js';
export { pFromStatistic, STATISTIC_KINDS, type StatisticKind, type Tail } from './distributions/p-from-statistic.js';
export { inspectFamily, type FamilyInspection } from './diagnostics/inspect-family.js';
export { genomicInflation, type Inflation } from './diagnostics/inflation.js';
export { upperHalfUniformity, type Uniformity } from './diagnostics/uniformity.js';
export { RULES as FINDING_RULES, findingsOf, type Finding } from './diagnostics/findings.js';

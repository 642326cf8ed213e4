// The one registry of adjustment procedures. Method tokens, the procedure
// modules and every list shown to users come from here, so adding a
// procedure is one new module in procedures/ plus one entry below.

import { benjaminiHochbergSorted } from './procedures/benjamini-hochberg.js';
import { benjaminiYekutieliSorted } from './procedures/benjamini-yekutieli.js';
import { bonferroniSorted } from './procedures/bonferroni.js';
import { hochbergSorted } from './procedures/hochberg.js';
import { holmSorted } from './procedures/holm.js';
import { type SortedKernel, adjustInInputOrder } from './procedures/sorting.js';

export type ErrorRate = 'FWER' | 'FDR';
export type StepKind = 'single-step' | 'step-down' | 'step-up';

interface MethodEntry {
  /** What users type in --methods; also names the output columns. */
  readonly token: string;
  readonly name: string;
  readonly controls: ErrorRate;
  /** The dependence between tests under which the error rate is controlled. */
  readonly dependence: string;
  readonly steps: StepKind;
  readonly source: string;
  /** Adjusted values of ascending p-values; m >= sorted.length counts absent tests as p = 1. */
  readonly adjustSorted: SortedKernel;
}

export interface Method extends MethodEntry {
  /** Adjusted p-values in input order; m >= p.length counts absent tests as p = 1. */
  readonly adjust: (p: Float64Array, m: number) => Float64Array;
}

const ENTRIES: readonly MethodEntry[] = [
  {
    token: 'bonferroni',
    name: 'Bonferroni',
    controls: 'FWER',
    dependence: 'any',
    steps: 'single-step',
    source: 'Dunn (1961), J. Am. Stat. Assoc. 56:52-64',
    adjustSorted: bonferroniSorted,
  },
  {
    token: 'holm',
    name: 'Holm',
    controls: 'FWER',
    dependence: 'any',
    steps: 'step-down',
    source: 'Holm (1979), Scand. J. Stat. 6:65-70',
    adjustSorted: holmSorted,
  },
  {
    token: 'hochberg',
    name: 'Hochberg',
    controls: 'FWER',
    dependence: 'independent or positively dependent',
    steps: 'step-up',
    source: 'Hochberg (1988), Biometrika 75:800-802',
    adjustSorted: hochbergSorted,
  },
  {
    token: 'bh',
    name: 'Benjamini-Hochberg',
    controls: 'FDR',
    dependence: 'independent or positively dependent',
    steps: 'step-up',
    source: 'Benjamini & Hochberg (1995), J. R. Stat. Soc. B 57:289-300',
    adjustSorted: benjaminiHochbergSorted,
  },
  {
    token: 'by',
    name: 'Benjamini-Yekutieli',
    controls: 'FDR',
    dependence: 'any',
    steps: 'step-up',
    source: 'Benjamini & Yekutieli (2001), Ann. Stat. 29:1165-1188',
    adjustSorted: benjaminiYekutieliSorted,
  },
];

export const METHODS: readonly Method[] = ENTRIES.map((entry) => ({
  ...entry,
  adjust: (p: Float64Array, m: number) => adjustInInputOrder(p, m, entry.adjustSorted),
}));

export const METHOD_TOKENS: readonly string[] = METHODS.map((method) => method.token);

export function findMethod(token: string): Method | undefined {
  return METHODS.find((method) => method.token === token);
}

/** The output column names for a method: dashes in tokens become underscores. */
export function columnNames(method: Method): { adjusted: string; rejected: string } {
  const stem = method.token.replaceAll('-', '_');
  return { adjusted: `adj_${stem}`, rejected: `rej_${stem}` };
}

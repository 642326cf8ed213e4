// The one registry of adjustment procedures. Method tokens, the procedure
// modules and every list shown to users come from here, so adding a
// procedure is one new module in procedures/ plus one entry below.

import { adjustBenjaminiHochberg } from './procedures/benjamini-hochberg.js';
import { adjustBenjaminiYekutieli } from './procedures/benjamini-yekutieli.js';
import { adjustBonferroni } from './procedures/bonferroni.js';
import { adjustHochberg } from './procedures/hochberg.js';
import { adjustHolm } from './procedures/holm.js';

export type ErrorRate = 'FWER' | 'FDR';
export type StepKind = 'single-step' | 'step-down' | 'step-up';

export interface Method {
  /** What users type in --methods; also names the output columns. */
  readonly token: string;
  readonly name: string;
  readonly controls: ErrorRate;
  /** The dependence between tests under which the error rate is controlled. */
  readonly dependence: string;
  readonly steps: StepKind;
  readonly source: string;
  /** Adjusted p-values in input order; m >= p.length counts absent tests as p = 1. */
  readonly adjust: (p: Float64Array, m: number) => Float64Array;
}

export const METHODS: readonly Method[] = [
  {
    token: 'bonferroni',
    name: 'Bonferroni',
    controls: 'FWER',
    dependence: 'any',
    steps: 'single-step',
    source: 'Dunn (1961), J. Am. Stat. Assoc. 56:52-64',
    adjust: adjustBonferroni,
  },
  {
    token: 'holm',
    name: 'Holm',
    controls: 'FWER',
    dependence: 'any',
    steps: 'step-down',
    source: 'Holm (1979), Scand. J. Stat. 6:65-70',
    adjust: adjustHolm,
  },
  {
    token: 'hochberg',
    name: 'Hochberg',
    controls: 'FWER',
    dependence: 'independent or positively dependent',
    steps: 'step-up',
    source: 'Hochberg (1988), Biometrika 75:800-802',
    adjust: adjustHochberg,
  },
  {
    token: 'bh',
    name: 'Benjamini-Hochberg',
    controls: 'FDR',
    dependence: 'independent or positively dependent',
    steps: 'step-up',
    source: 'Benjamini & Hochberg (1995), J. R. Stat. Soc. B 57:289-300',
    adjust: adjustBenjaminiHochberg,
  },
  {
    token: 'by',
    name: 'Benjamini-Yekutieli',
    controls: 'FDR',
    dependence: 'any',
    steps: 'step-up',
    source: 'Benjamini & Yekutieli (2001), Ann. Stat. 29:1165-1188',
    adjust: adjustBenjaminiYekutieli,
  },
];

export const METHOD_TOKENS: readonly string[] = METHODS.map((method) => method.token);

export function findMethod(token: string): Method | undefined {
  return METHODS.find((method) => method.token === token);
}

/** The output column names for a method: dashes in tokens become underscores. */
export function columnNames(method: Method): { adjusted: string; rejected: string } {
  const stem = method.token.replaceAll('-', '_');
  return { adjusted: `adj_${stem}`, rejected: `rej_${stem}` };
}

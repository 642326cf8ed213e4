// The one registry of adjustment procedures. Method tokens, the procedure
// modules and every list shown to users come from here, so adding a
// procedure is one new module in procedures/ plus one entry below.

import { BENJAMINI_HOCHBERG_STEPS, benjaminiHochbergSorted } from './procedures/benjamini-hochberg.js';
import { BENJAMINI_YEKUTIELI_STEPS, benjaminiYekutieliSorted } from './procedures/benjamini-yekutieli.js';
import { BONFERRONI_STEPS, bonferroniSorted } from './procedures/bonferroni.js';
import { HOCHBERG_STEPS, hochbergSorted } from './procedures/hochberg.js';
import { HOLM_SIDAK_STEPS, holmSidakSorted } from './procedures/holm-sidak.js';
import { HOLM_STEPS, holmSorted } from './procedures/holm.js';
import { hommelSorted } from './procedures/hommel.js';
import { SIDAK_STEPS, sidakSorted } from './procedures/sidak.js';
import type { StepForm } from './procedures/step-parts.js';
import { weightedBenjaminiHochberg } from './procedures/weighted-benjamini-hochberg.js';
import { weightedBonferroni } from './procedures/weighted-bonferroni.js';
import { weightedHolm } from './procedures/weighted-holm.js';
import { normalisedWeights } from './procedures/weights.js';
import { bkySorted } from './procedures/bky.js';
import { storeyQValuesSorted } from './procedures/storey.js';
import { DEFAULT_PI0_SETTINGS, type Pi0Estimate, type Pi0Settings, estimatePi0 } from './estimators/pi0.js';
import { type SortedKernel, scatter, sortAscending } from './procedures/sorting.js';
import { checkedTestCount } from './procedures/validate.js';

export type ErrorRate = 'FWER' | 'FDR';
/** How the procedure walks the sorted p-values; Hommel's is a shortcut to closed testing, none of the three. */
export type StepKind = 'single-step' | 'step-down' | 'step-up' | 'closed testing';

/** One family of hypotheses as a procedure sees it. */
export interface FamilyInput {
  /** The family's p-values, ascending, none missing. */
  readonly sorted: Float64Array;
  /** Tests counted: sorted.length, or more when the table holds only some (absent tests count as p = 1). */
  readonly m: number;
}

/** What a procedure returns for one family. */
export interface FamilyAdjustment {
  /** Adjusted p-values in the order of FamilyInput.sorted. */
  readonly adjusted: Float64Array;
  /** The estimate of the share of true nulls, for procedures that use one. */
  readonly pi0?: Pi0Estimate;
}

/** A weighted procedure: p-values and weights (mean 1) in the same order, adjusted values in that order. */
export type WeightedKernel = (p: Float64Array, weights: Float64Array, m: number) => Float64Array;

/** Settings some procedures take; one object shared by all methods. */
// Procedures with tuning (pi0 estimators, seeds) add their fields here.
export interface MethodSettings {
  /** How the storey method estimates pi0. */
  readonly pi0: Pi0Settings;
}

export const DEFAULT_SETTINGS: MethodSettings = { pi0: DEFAULT_PI0_SETTINGS };

interface MethodEntry {
  /** What users type in --methods; also names the output columns. */
  readonly token: string;
  readonly name: string;
  readonly controls: ErrorRate;
  /** The dependence between tests under which the error rate is controlled. */
  readonly dependence: string;
  readonly steps: StepKind;
  readonly source: string;
  /** Whether the method estimates pi0 with MethodSettings.pi0 (so the pi0 options apply to it). */
  readonly estimatesPi0?: boolean;
  /** Adaptive procedures scale by an estimate of the share of true nulls, so adjusted values may fall below the raw p-value. */
  readonly adaptive?: boolean;
  /** Adjusts one family. */
  readonly run: (family: FamilyInput, settings: MethodSettings) => FamilyAdjustment;
  /** The weighted form, for procedures that have one. */
  readonly adjustWeighted?: WeightedKernel;
  /**
   * The same procedure as a step form (procedures/step-parts.ts), for those
   * that are a running minimum or maximum of a term, or a term alone: a
   * family sorted in two parts is then adjusted part by part, unmerged.
   */
  readonly stepForm?: StepForm;
}

export interface Method extends MethodEntry {
  /** Adjusted p-values in input order; m >= p.length counts absent tests as p = 1. */
  readonly adjust: (p: Float64Array, m?: number, settings?: MethodSettings) => Float64Array;
}

/** A procedure that needs nothing but the sorted p-values and m. */
function plain(kernel: SortedKernel): MethodEntry['run'] {
  return (family) => ({ adjusted: kernel(family.sorted, family.m) });
}

const ENTRIES: readonly MethodEntry[] = [
  {
    token: 'bonferroni',
    name: 'Bonferroni',
    controls: 'FWER',
    dependence: 'any dependence',
    steps: 'single-step',
    source: 'Dunn (1961), J. Am. Stat. Assoc. 56:52-64',
    run: plain(bonferroniSorted),
    adjustWeighted: weightedBonferroni,
    stepForm: BONFERRONI_STEPS,
  },
  {
    token: 'holm',
    name: 'Holm',
    controls: 'FWER',
    dependence: 'any dependence',
    steps: 'step-down',
    source: 'Holm (1979), Scand. J. Stat. 6:65-70',
    run: plain(holmSorted),
    adjustWeighted: weightedHolm,
    stepForm: HOLM_STEPS,
  },
  {
    token: 'sidak',
    name: 'Šidák',
    controls: 'FWER',
    dependence: 'independence, or jointly normal two-sided tests',
    steps: 'single-step',
    source: 'Šidák (1967), J. Am. Stat. Assoc. 62:626-633',
    run: plain(sidakSorted),
    stepForm: SIDAK_STEPS,
  },
  {
    token: 'holm-sidak',
    name: 'Holm–Šidák',
    controls: 'FWER',
    dependence: 'independence, or jointly normal two-sided tests',
    steps: 'step-down',
    source: 'Holm (1979), Scand. J. Stat. 6:65-70, with Šidák (1967) levels',
    run: plain(holmSidakSorted),
    stepForm: HOLM_SIDAK_STEPS,
  },
  {
    token: 'hochberg',
    name: 'Hochberg',
    controls: 'FWER',
    dependence: 'independence or positive dependence (PRDS)',
    steps: 'step-up',
    source: 'Hochberg (1988), Biometrika 75:800-802',
    run: plain(hochbergSorted),
    stepForm: HOCHBERG_STEPS,
  },
  {
    token: 'hommel',
    name: 'Hommel',
    controls: 'FWER',
    dependence: 'independence or positive dependence (PRDS)',
    steps: 'closed testing',
    source: 'Hommel (1988), Biometrika 75:383-386',
    run: plain(hommelSorted),
  },
  {
    token: 'bh',
    name: 'Benjamini–Hochberg',
    controls: 'FDR',
    dependence: 'independence or positive dependence (PRDS)',
    steps: 'step-up',
    source: 'Benjamini & Hochberg (1995), J. R. Stat. Soc. B 57:289-300',
    run: plain(benjaminiHochbergSorted),
    adjustWeighted: weightedBenjaminiHochberg,
    stepForm: BENJAMINI_HOCHBERG_STEPS,
  },
  {
    token: 'by',
    name: 'Benjamini–Yekutieli',
    controls: 'FDR',
    dependence: 'any dependence',
    steps: 'step-up',
    source: 'Benjamini & Yekutieli (2001), Ann. Stat. 29:1165-1188',
    run: plain(benjaminiYekutieliSorted),
    stepForm: BENJAMINI_YEKUTIELI_STEPS,
  },
  {
    token: 'storey',
    name: 'Storey q-values',
    controls: 'FDR',
    dependence: 'independence (weak dependence, asymptotically)',
    steps: 'step-up',
    source: 'Storey (2002), J. R. Stat. Soc. B 64:479-498; Storey & Tibshirani (2003), PNAS 100:9440-9445',
    estimatesPi0: true,
    adaptive: true,
    run: (family, settings) => {
      // A family with no tests has nothing to estimate pi0 from, and nothing to adjust.
      if (family.m === 0) return { adjusted: new Float64Array(0) };
      const pi0 = estimatePi0(family.sorted, family.m, settings.pi0);
      return { adjusted: storeyQValuesSorted(family.sorted, family.m, pi0.value), pi0 };
    },
  },
  {
    token: 'bky',
    name: 'Benjamini–Krieger–Yekutieli two-stage',
    controls: 'FDR',
    dependence: 'independence',
    steps: 'step-up',
    source: 'Benjamini, Krieger & Yekutieli (2006), Biometrika 93:491-507',
    adaptive: true,
    run: plain(bkySorted),
  },
];

export const METHODS: readonly Method[] = ENTRIES.map((entry) => ({
  ...entry,
  adjust: (p: Float64Array, m = p.length, settings = DEFAULT_SETTINGS) => {
    const tests = checkedTestCount(p, m);
    const { order, sorted } = sortAscending(p);
    return scatter(entry.run({ sorted, m: tests }, settings).adjusted, order);
  },
}));

export const METHOD_TOKENS: readonly string[] = METHODS.map((method) => method.token);

/** The tokens of the procedures with a weighted form. */
export const WEIGHTED_TOKENS: readonly string[] = METHODS.filter((method) => method.adjustWeighted !== undefined).map((method) => method.token);

/** Weighted adjusted p-values in input order, weights on any scale (normalised to mean 1 here). */
export function adjustWeighted(method: Method, p: Float64Array, weights: Float64Array): Float64Array {
  if (method.adjustWeighted === undefined) throw new RangeError(`${method.name} has no weighted form`);
  if (weights.length !== p.length) throw new RangeError('p-values and weights differ in length');
  return method.adjustWeighted(p, normalisedWeights(weights), checkedTestCount(p, p.length));
}

export function findMethod(token: string): Method | undefined {
  return METHODS.find((method) => method.token === token);
}

/** The output column names for a method: dashes in tokens become underscores. */
export function columnNames(method: Method): { adjusted: string; rejected: string } {
  const stem = method.token.replaceAll('-', '_');
  return { adjusted: `adj_${stem}`, rejected: `rej_${stem}` };
}

/** Names people type for procedures, from papers and habit, and the token they most likely mean. */
const LIKELY_MEANT: Readonly<Record<string, string>> = {
  fdr: 'bh',
  benjaminihochberg: 'bh',
  benjaminiyekutieli: 'by',
  bonf: 'bonferroni',
  bonferoni: 'bonferroni',
  qvalue: 'storey',
  qvalues: 'storey',
  twostage: 'bky',
};

/** The token an unknown name most likely means (a column spelling such as holm_sidak, or a common name), if any. */
export function likelyMethod(name: string): string | undefined {
  const lower = name.toLowerCase();
  const dashed = lower.replaceAll('_', '-').replace(/^(adj|rej)-/, '');
  if (findMethod(dashed)) return dashed;
  return LIKELY_MEANT[lower.replace(/[^a-z]/g, '')];
}

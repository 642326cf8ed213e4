// Reading a p-value from a cell that holds something else: a test
// statistic (z, t, chi-square, F) whose p-value is computed, or a p-value
// stored as -log10(p), as genome-scan tables often do. Only used when the
// user asks for it; plain p-value cells go through p-value-text.ts
// unchanged.
//
// The arithmetic is in src/distributions/; this module only decides which
// texts are acceptable and says why one is not.

import {
  DEGREES_NEEDED,
  type StatisticKind,
  type Tail,
  pFromStatistic,
} from '../distributions/p-from-statistic.js';
import { MISSING_MARKS, readDecimal, whyNotFinite } from './p-value-text.js';

/** Degrees of freedom: the same for every row, or read from a column (name or 1-based position). */
export type DegreesSource = { readonly constant: number } | { readonly column: string };

/** What the value column holds, when it is not plain p-values. */
export type ValueReading =
  | { readonly kind: 'minus-log10' }
  | {
      readonly kind: 'statistic';
      readonly statistic: StatisticKind;
      readonly tail: Tail;
      /** t and chisq: the degrees of freedom; f: the numerator's. */
      readonly df?: DegreesSource | undefined;
      /** f: the denominator's degrees of freedom. */
      readonly df2?: DegreesSource | undefined;
    };

/** What each kind of value is called in messages. */
export const VALUE_NAMES: Readonly<Record<StatisticKind | 'minus-log10', string>> = {
  z: 'z statistic',
  t: 't statistic',
  chisq: 'chi-square statistic',
  f: 'F statistic',
  'minus-log10': '-log10 p-value',
};

/**
 * Header names (lower-cased, letters and digits only) that the value column
 * is found by when no column is named. `stat` and `statistic` fit any kind.
 */
export const VALUE_COLUMN_NAMES: Readonly<Record<StatisticKind | 'minus-log10', readonly string[]>> = {
  z: ['z', 'zscore', 'zvalue', 'zstat', 'zstatistic', 'stat', 'statistic'],
  t: ['t', 'tstat', 'tvalue', 'tstatistic', 'tratio', 'stat', 'statistic'],
  chisq: ['chisq', 'chi2', 'chisquare', 'chisquared', 'x2', 'stat', 'statistic'],
  f: ['f', 'fstat', 'fvalue', 'fstatistic', 'fratio', 'stat', 'statistic'],
  'minus-log10': ['log10p', 'mlog10p', 'neglog10p', 'minuslog10p', 'nlog10p', 'logp'],
};

export function valueKind(reading: ValueReading): StatisticKind | 'minus-log10' {
  return reading.kind === 'statistic' ? reading.statistic : reading.kind;
}

/**
 * A number in a cell: signed, decimal or scientific, a decimal comma where
 * allowed (the grammar of p-value-text.ts). A written number too large for a
 * double (1e400) reads as an infinity: its p-value is 0, as for any huge statistic.
 */
export function readNumber(text: string, decimalComma: boolean): number | 'missing' | 'invalid' {
  return readDecimal(text, decimalComma, true);
}

function expectedNumber(kind: StatisticKind | 'minus-log10', decimalComma: boolean): string {
  const marks = MISSING_MARKS.filter(Boolean).join(', ');
  const examples = kind === 'minus-log10' ? '2.31, 0.5 or 1.2e1' : '2.31, -1.5 or 4e1';
  return `expected a number like ${examples}${decimalComma ? ' (or 2,31)' : ''}, or a missing-value mark (${marks}, or empty)`;
}

/** Why a value cell was refused; undefined when it is acceptable. */
export function whyNotValue(kind: StatisticKind | 'minus-log10', value: number | 'invalid', text: string, decimalComma: boolean): string | undefined {
  if (value === 'invalid') {
    return whyNotFinite(text, decimalComma) ?? expectedNumber(kind, decimalComma);
  }
  if (kind === 'minus-log10' && value < 0) return '-log10 p cannot be negative (p would exceed 1); is this column already a p-value, or a log without the minus?';
  if ((kind === 'chisq' || kind === 'f') && value < 0) return `${VALUE_NAMES[kind]}s cannot be negative`;
  return undefined;
}

/** Why a degrees-of-freedom cell was refused; undefined when it is acceptable. */
export function whyNotDegrees(value: number | 'invalid'): string | undefined {
  return value !== 'invalid' && value > 0 ? undefined : 'expected a positive number of degrees of freedom (like 10 or 27.4), or a missing-value mark';
}

/** The p-value of an accepted value: 10^-v for -log10 p, the tail probability for a statistic. */
export function pFromValue(reading: ValueReading, value: number, df: number, df2: number): number {
  if (reading.kind === 'minus-log10') return 10 ** -value;
  return pFromStatistic(reading.statistic, reading.tail, value, df, df2);
}

/** How many degrees-of-freedom sources a reading needs. */
export function degreesNeeded(reading: ValueReading): 0 | 1 | 2 {
  return reading.kind === 'statistic' ? DEGREES_NEEDED[reading.statistic] : 0;
}

// What a family's p-values are made of: how many, how many missing, how many
// exactly 0 or 1, how many distinct values, and the share below 0.05.
// Exact zeros are underflow (a real p-value is never 0), a pile of exact
// ones points to one-sided tests or clipping, few distinct values to discrete
// tests or rounding, and the share below 0.05 against the 5% that nulls alone
// would give is the first rough sign of signal.
//
// Cost: O(n) on sorted p-values.
// Source: common practice, no source.

export interface Counts {
  /** p-values present. */
  readonly tested: number;
  readonly missing: number;
  readonly zeros: number;
  readonly ones: number;
  readonly distinct: number;
  /** p-values below 0.05. */
  readonly below05: number;
}

/** Counts of ascending p-values (none missing). */
export function pValueCounts(sorted: Float64Array, missing: number): Counts {
  let zeros = 0;
  let ones = 0;
  let distinct = 0;
  let below05 = 0;
  for (let i = 0; i < sorted.length; i++) {
    const value = sorted[i] as number;
    if (value === 0) zeros++;
    if (value === 1) ones++;
    if (value < 0.05) below05++;
    if (i === 0 || value !== sorted[i - 1]) distinct++;
  }
  return { tested: sorted.length, missing, zeros, ones, distinct, below05 };
}

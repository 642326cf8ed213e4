// Adjustment within families: each family (a combination of values of the
// --family columns) is a separate set of hypotheses with its own m, adjusted
// on its own. Rows are grouped with a counting sort on the family id (one
// pass to count, one to place); each family's p-values are then sorted once
// and every method runs on the same sorted values. Nothing but typed arrays
// is allocated per row.

import type { Pi0Estimate } from './estimators/pi0.js';
import { DEFAULT_SETTINGS, type Method, type MethodSettings, type WeightedKernel } from './methods.js';
import { normalisedWeights } from './procedures/weights.js';
import { type SortedParts, gather, mergeSorted, sharedFloat64, sortAscending } from './procedures/sorting.js';
import { checkedTestCount } from './procedures/validate.js';

/** Family membership: ids[row] is in [0, count). */
export interface FamilyGrouping {
  readonly ids: Int32Array;
  readonly count: number;
}

/** What one method did in one family. */
export interface FamilyOutcome {
  /** p-values present (not missing). */
  readonly tested: number;
  readonly missing: number;
  /** Tests the adjustment counted: `tested`, or the --tests value. */
  readonly m: number;
  /** Rows whose adjusted p-value is <= alpha. */
  readonly rejected: number;
  /** The largest raw p-value among the rejected rows; null when none. */
  readonly threshold: number | null;
  /** The estimate of the share of true nulls, for methods that use one (storey); else null. */
  readonly pi0: Pi0Estimate | null;
}

export interface WithinFamilies {
  /** One array per method, in the order given: adjusted p-values by row, NaN where p is missing. */
  readonly adjusted: Float64Array[];
  /** outcomes[family][method]. */
  readonly outcomes: FamilyOutcome[][];
}

export interface WithinFamiliesOptions {
  readonly alpha: number;
  /** The real number of tests in every family (or in each, by family id), when the table holds only some. */
  readonly tests?: number | readonly number[] | undefined;
  /** Prior weights by row (any scale, normalised to mean 1 within each family); only for methods with a weighted form. */
  readonly weights?: Float64Array | undefined;
  /** Tuning for the procedures that take any. */
  readonly settings?: MethodSettings | undefined;
  /**
   * p already sorted in two parts (as two threads sort a table they read),
   * merged in place of sorting when every row is in one family and no
   * p-value is missing; ignored otherwise. (io/parallel-adjust.ts adjusts
   * such parts unmerged, in two threads, when every method is a step
   * procedure.)
   */
  readonly sortedParts?: SortedParts | undefined;
}

/** Thrown when --tests is smaller than the p-values a family holds. */
export class TooFewTestsError extends RangeError {
  constructor(
    readonly family: number,
    readonly tested: number,
    readonly tests: number,
  ) {
    super(`family ${family} holds ${tested} p-values, more than the ${tests} tests given`);
  }
}

/** Thrown when every weight in a family is zero: nothing in it could be rejected. */
export class ZeroWeightsError extends RangeError {
  constructor(readonly family: number) {
    super(`every weight in family ${family} is zero`);
  }
}

/**
 * Each family's present p-values as one contiguous segment: family f is
 * gathered[start[f]] up to gathered[start[f + 1]], taken from the rows
 * rowOf[start[f]] ... A table that is one family with nothing missing (the
 * usual large table) is its own segment: gathered is p itself, rowOf undefined.
 */
export interface FamilySegments {
  readonly start: Int32Array;
  readonly missing: Int32Array;
  readonly gathered: Float64Array;
  readonly rowOf: Int32Array | undefined;
}

/** Groups the present p-values by family: one pass to count, one to place (a counting sort). */
export function familySegments(p: Float64Array, families: FamilyGrouping): FamilySegments {
  const { ids, count } = families;
  const start = new Int32Array(count + 1);
  const missing = new Int32Array(count);
  if (count === 1) {
    // Every id is 0: only the missing values are counted (the ids, 4 bytes a row, are not read).
    let absent = 0;
    for (let row = 0; row < p.length; row++) if (Number.isNaN(p[row])) absent++;
    missing[0] = absent;
    start[1] = p.length - absent;
  } else {
    for (let row = 0; row < p.length; row++) {
      if (Number.isNaN(p[row])) missing[ids[row]]++;
      else start[ids[row] + 1]++;
    }
  }
  for (let f = 0; f < count; f++) start[f + 1] += start[f];
  if (count === 1 && missing[0] === 0) return { start, missing, gathered: p, rowOf: undefined };
  const gathered = new Float64Array(start[count]);
  const rowOf = new Int32Array(gathered.length);
  const fill = start.slice(0, count);
  for (let row = 0; row < p.length; row++) {
    const value = p[row];
    if (Number.isNaN(value)) continue;
    const at = fill[ids[row]]++;
    gathered[at] = value;
    rowOf[at] = row;
  }
  return { start, missing, gathered, rowOf };
}

/** A family grouping with every row in one family. */
export function singleFamily(rows: number): FamilyGrouping {
  return { ids: new Int32Array(rows), count: 1 };
}

/**
 * Adjusts p within each family with each method. Missing p-values (NaN) are
 * left out of m and get NaN. Neither input is modified.
 */
export function adjustWithinFamilies(
  p: Float64Array,
  families: FamilyGrouping,
  methods: readonly Method[],
  options: WithinFamiliesOptions,
): WithinFamilies {
  const { ids, count } = families;
  const { weights } = options;
  if (ids.length !== p.length) throw new RangeError('family ids and p-values differ in length');
  if (weights !== undefined) {
    if (weights.length !== p.length) throw new RangeError('weights and p-values differ in length');
    if (options.tests !== undefined) throw new RangeError('weights cannot be normalised over tests absent from the table');
    const unweighted = methods.find((method) => method.adjustWeighted === undefined);
    if (unweighted) throw new RangeError(`${unweighted.name} has no weighted form`);
  }

  const { start, missing, gathered, rowOf } = familySegments(p, families);
  const testsOf = (f: number): number | undefined => (typeof options.tests === 'number' ? options.tests : options.tests?.[f]);
  for (let f = 0; f < count; f++) {
    const tests = testsOf(f);
    const present = start[f + 1] - start[f];
    if (tests !== undefined && tests < present) throw new TooFewTestsError(f, present, tests);
  }
  const gatheredWeights = weights === undefined || rowOf === undefined ? weights : Float64Array.from(rowOf, (row) => (weights as Float64Array)[row]);

  // Allocated when first written, after the first family's sort: the sort's spare arrays can
  // then be collected first, which lowers the peak memory of a large single family. Shared
  // memory, so that a worker thread writing part of the table (io/parallel-write.ts) reads the
  // values where they are rather than a copy.
  const made: (Float64Array | undefined)[] = methods.map(() => undefined);
  // Rows without a p-value keep NaN; when there are none, every value is written below.
  const complete = missing.every((count) => count === 0);
  const adjustedFor = (k: number): Float64Array => {
    if (made[k] === undefined) {
      const values = sharedFloat64(p.length);
      made[k] = complete ? values : values.fill(NaN);
    }
    return made[k];
  };
  const { sortedParts } = options;
  const parts = sortedParts !== undefined && count === 1 && rowOf === undefined && sortedParts.first.order.length + sortedParts.second.order.length === p.length ? sortedParts : undefined;
  const outcomes: FamilyOutcome[][] = [];
  for (let f = 0; f < count; f++) {
    const from = start[f];
    const to = start[f + 1];
    const segment = gathered.subarray(from, to);
    const m = checkedTestCount(segment, testsOf(f) ?? segment.length);
    const { order, sorted } = parts ? mergeSorted(parts.first, parts.second) : sortAscending(segment);
    const sortedWeights = gatheredWeights && familyWeights(gather(gatheredWeights.subarray(from, to), order), f);
    outcomes.push(
      methods.map((method, k) => {
        const { adjusted: values, pi0 } = sortedWeights
          ? { adjusted: (method.adjustWeighted as WeightedKernel)(sorted, sortedWeights, m), pi0: undefined }
          : method.run({ sorted, m }, options.settings ?? DEFAULT_SETTINGS);
        const target = adjustedFor(k);
        let rejected = 0;
        let threshold = -1;
        for (let i = 0; i < values.length; i++) {
          const value = values[i];
          target[rowOf === undefined ? order[i] : rowOf[from + order[i]]] = value;
          if (value <= options.alpha) {
            rejected++;
            threshold = Math.max(threshold, sorted[i]);
          }
        }
        return {
          tested: segment.length,
          missing: missing[f],
          m,
          rejected,
          threshold: rejected > 0 ? threshold : null,
          pi0: pi0 ?? null,
        };
      }),
    );
  }
  return { adjusted: methods.map((_, k) => adjustedFor(k)), outcomes };
}

function familyWeights(weights: Float64Array, family: number): Float64Array {
  if (weights.length > 0 && weights.every((w) => w === 0)) throw new ZeroWeightsError(family);
  return normalisedWeights(weights);
}

// The step procedures on a family sorted in two parts, without merging them.
//
// A large table is read and sorted in two threads, one part each
// (io/read-table.ts). Merging the two sorts into one array, then running a
// kernel on it and putting every value back in row order, was all done in
// one thread while the other waited. For the procedures whose adjusted
// value is a running minimum (step-up) or maximum (step-down) of a term of
// each p-value and its rank, or a term alone (single-step), each part can
// instead be adjusted on its own, in its own thread, with only a little from
// the other part:
//
//   - where each of its values falls in the order of the whole family (its
//     rank): its index in its part plus the number of values of the other
//     part before it, found by walking the two sorted parts side by side
//     (ties go to the first part, as a stable sort of the whole puts them);
//   - the other part's running minima from each of its values to its end
//     (step-up), or running maxima from its start (step-down).
//
// The adjusted value of the value at rank i is then the minimum of its own
// part's running minimum from it and the other part's from the first of
// its values after rank i (or the maximum of the two running maxima up to
// rank i). Minimum and maximum are exact, and the terms and the last step
// are the same expressions as in each procedure's module (a factor of 1 is
// exact too), so the results are bit for bit those of the procedure run on
// the merged family (test/step-parts.test.ts compares them).

import type { Sorted } from './sorting.js';

/** A step procedure as two parts of a sorted family can share it. */
export interface StepForm {
  /**
   * up: the adjusted value at rank i comes from the minimum of the terms at
   * ranks i..m-1; down: from the maximum of the terms at ranks 0..i (and 0);
   * single: from its own term.
   */
  readonly direction: 'up' | 'down' | 'single';
  /**
   * Writes into out[at + k] the term of sorted[k], whose rank (0 for the
   * smallest) among m tests is ranks[k]. A loop of each procedure's own, so
   * that the engine compiles each term inline rather than calling it per value.
   */
  terms(sorted: Float64Array, ranks: Uint32Array, m: number, out: Float64Array, at: number): void;
  /** The adjusted value is factor(m) times the running value (or the term), capped at 1 if cap. */
  readonly cap: boolean;
  factor(m: number): number;
}

/**
 * The rank of each of own's values in the whole family (own and other
 * merged, stably): its index plus the number of other's values before it.
 * ownFirst: own is the first part, whose values go first among ties.
 */
export function ranksInWhole(own: Float64Array, other: Float64Array, ownFirst: boolean, ranks: Uint32Array = new Uint32Array(own.length)): Uint32Array {
  let before = 0;
  const others = other.length;
  for (let a = 0; a < own.length; a++) {
    const value = own[a] as number;
    if (ownFirst) while (before < others && (other[before] as number) < value) before++;
    else while (before < others && (other[before] as number) <= value) before++;
    ranks[a] = a + before;
  }
  return ranks;
}

/** The length of partRunning's array for a part of n values. */
export function runningLength(form: StepForm, n: number): number {
  return form.direction === 'single' ? n : n + 1;
}

/**
 * A part's running values, by its own order, for the other part to use: for
 * step-up, running[k] is the minimum of the terms of values k.. to the end
 * (running[n] = Infinity); for step-down, running[k] is the maximum of the
 * terms of values 0..k-1 (running[0] = 0); for single-step, running[k] is
 * the term of value k.
 */
export function partRunning(form: StepForm, sorted: Float64Array, ranks: Uint32Array, m: number, running: Float64Array = new Float64Array(runningLength(form, sorted.length))): Float64Array {
  const n = sorted.length;
  if (form.direction === 'single') {
    form.terms(sorted, ranks, m, running, 0);
    return running;
  }
  if (form.direction === 'up') {
    form.terms(sorted, ranks, m, running, 0);
    running[n] = Infinity;
    for (let k = n - 1; k >= 0; k--) running[k] = Math.min(running[k] as number, running[k + 1] as number);
  } else {
    form.terms(sorted, ranks, m, running, 1);
    running[0] = 0;
    for (let k = 1; k <= n; k++) running[k] = Math.max(running[k - 1] as number, running[k] as number);
  }
  return running;
}

/** What a part's adjusted values reject: how many are <= alpha, and the largest p-value among them (-1: none). */
export interface PartRejections {
  readonly rejected: number;
  readonly threshold: number;
}

/**
 * The adjusted value of a part's k-th value: its running value, taken with
 * the other part's from the first of its values after rank ranks[k] (the
 * number of them before it is ranks[k] - k), scaled and capped as the form says.
 */
function adjustedAt(k: number, ranks: Uint32Array, ownRunning: Float64Array, otherRunning: Float64Array, up: boolean, down: boolean, factor: number, cap: boolean): number {
  const before = (ranks[k] as number) - k;
  let running: number;
  if (up) running = Math.min(ownRunning[k] as number, otherRunning[before] as number);
  else if (down) running = Math.max(ownRunning[k + 1] as number, otherRunning[before] as number);
  else running = ownRunning[k] as number;
  const scaled = factor * running;
  return cap ? Math.min(1, scaled) : scaled;
}

/**
 * The adjusted values of one part, written by row: target[rowOffset +
 * order[k]] for its k-th value. ownRunning and otherRunning are the two
 * parts' partRunning; ranks the part's ranksInWhole.
 */
export function adjustPart(
  form: StepForm,
  part: Sorted,
  ranks: Uint32Array,
  ownRunning: Float64Array,
  otherRunning: Float64Array,
  m: number,
  alpha: number,
  target: Float64Array,
  rowOffset: number,
): PartRejections {
  const { sorted, order } = part;
  const factor = form.factor(m);
  let rejected = 0;
  let threshold = -1;
  const n = sorted.length;
  const cap = form.cap;
  const up = form.direction === 'up';
  const down = form.direction === 'down';
  // Placing each value in its row is a write to memory at random, the costly part. The largest
  // p-values often all adjust to 1 (most of a table, for Holm or Bonferroni): when a good share do,
  // the part's rows are all set to 1 in order first, and only the values before those are placed.
  let placed = n;
  if (cap) while (placed > 0 && adjustedAt(placed - 1, ranks, ownRunning, otherRunning, up, down, factor, cap) === 1) placed--;
  if (n - placed >= n / 8 && n > 0) {
    target.fill(1, rowOffset, rowOffset + n);
    if (1 <= alpha) {
      rejected += n - placed;
      threshold = sorted[n - 1] as number;
    }
  } else placed = n;
  for (let k = 0; k < placed; k++) {
    const value = adjustedAt(k, ranks, ownRunning, otherRunning, up, down, factor, cap);
    target[rowOffset + (order[k] as number)] = value;
    if (value <= alpha) {
      rejected++;
      threshold = Math.max(threshold, sorted[k] as number);
    }
  }
  return { rejected, threshold };
}

/**
 * measure summed over the adjusted values of a part's values from..to-1 (in
 * its sorted order), without writing them (the writer measures their text
 * with it), so that any thread can measure any stretch of a part. The
 * arguments are adjustPart's for that part. measure is called once per run
 * of equal values, which lie together in this order (the adjusted values of
 * a step procedure rise with p).
 */
export function partMeasure(form: StepForm, ranks: Uint32Array, ownRunning: Float64Array, otherRunning: Float64Array, m: number, from: number, to: number, measure: (value: number) => number): number {
  const factor = form.factor(m);
  const cap = form.cap;
  const up = form.direction === 'up';
  const down = form.direction === 'down';
  let measured = 0;
  let last = NaN;
  let lastMeasure = 0;
  for (let k = from; k < to; k++) {
    const value = adjustedAt(k, ranks, ownRunning, otherRunning, up, down, factor, cap);
    if (value !== last) {
      last = value;
      lastMeasure = measure(value);
    }
    measured += lastMeasure;
  }
  return measured;
}

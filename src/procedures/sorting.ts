// Sorting, the one O(m log m) step of the classic procedures, done once.
//
// Each procedure is written as a kernel on p-values sorted ascending
// (p(1) <= ... <= p(m)); the caller sorts once, runs any number of kernels
// on the same sorted values, and puts the results back in input order. The
// order comes from a stable least-significant-digit radix sort on the bits
// of the doubles: for numbers >= 0 the IEEE 754 bit patterns, read as
// unsigned integers, sort in the same order as the numbers. The values
// travel with their positions, so the sorted values come out with the
// order and need no gathering (a pass of random reads).
//
// The sort is by the high 32 bits first (sign, exponent and 20 bits of
// mantissa: three passes of 11-bit digits, counted in one pass, whose count
// tables stay in the first-level cache; a pass whose digit is the same for
// every value is skipped). Values that share their high word are then next
// to each other, in input order, and only such runs are sorted by the low
// word: a short run by insertion, a long one by radix passes of its own.
// Most runs are single values or exact ties (already in order), so this
// does half the passes of a sort on all 64 bits. Linear in m, with no
// comparator calls; small inputs (many small families) use a comparison
// sort instead.

import { checkedTestCount } from './validate.js';

/** A procedure on ascending p-values: adjusted values in the same (sorted) order. */
export type SortedKernel = (sorted: Float64Array, m: number) => Float64Array;

const DIGIT_BITS = 11;
const RADIX = 1 << DIGIT_BITS;
const DIGIT = RADIX - 1;
/** Passes over the high word (11 + 11 + 10 bits). */
const HIGH_PASSES = 3;
/** Runs sharing a high word and longer than this are sorted by radix passes over the low word, of 8 bits. */
const INSERTION_RUN = 64;
const LOW_RADIX = 256;
/** Below this many values a comparison sort beats clearing and summing the count tables. */
const SMALL = 512;

/** Values in ascending order, and where each came from: sorted[i] = p[order[i]]. */
export interface Sorted {
  readonly order: Uint32Array;
  readonly sorted: Float64Array;
}

function smallAscendingOrder(p: Float64Array): Uint32Array {
  const order = new Uint32Array(p.length);
  for (let i = 0; i < order.length; i++) order[i] = i;
  // Ties broken by position keep the sort stable; -0 and 0 compare equal, as they should.
  return order.sort((a, b) => p[a] - p[b] || a - b);
}

/**
 * p sorted ascending, with the permutation that sorts it. Stable (ties keep
 * their input order). p must hold numbers >= 0, no NaN.
 */
export function sortAscending(p: Float64Array): Sorted {
  return sortAscendingInPlace(p.slice());
}

/** A Float64Array in shared memory, which a worker thread can read and write where it lies. */
export function sharedFloat64(length: number): Float64Array {
  return new Float64Array(new SharedArrayBuffer(8 * length));
}

/** The 32-bit words of a view of doubles: word 2i is the low half of value i, 2i + 1 its high half (little-endian). */
function wordsOf(values: Float64Array): Uint32Array {
  return new Uint32Array(values.buffer, values.byteOffset, 2 * values.length);
}

/**
 * sortAscending, using p itself as working space: p is overwritten (it may
 * become the result's sorted). With shared, the arrays it allocates are in
 * shared memory (and so the result is, if p is), for another thread to read.
 */
export function sortAscendingInPlace(p: Float64Array, shared = false): Sorted {
  const n = p.length;
  if (n < SMALL) {
    const order = smallAscendingOrder(p);
    return { order, sorted: gather(p, order) };
  }
  // -0 must sort with 0, but its bits would sort last: sorted by its order
  // among the numbers instead (rare, so done the slow way).
  if (hasNegativeZero(p)) {
    const order = sortAscending(p.map((value) => value + 0)).order;
    return { order, sorted: gather(p, order) };
  }
  let keys: Float64Array = p;
  let spareKeys: Float64Array = shared ? sharedFloat64(n) : new Float64Array(n);
  let order = shared ? new Uint32Array(new SharedArrayBuffer(4 * n)) : new Uint32Array(n);
  let spare = shared ? new Uint32Array(new SharedArrayBuffer(4 * n)) : new Uint32Array(n);
  const counts = countHighDigits(wordsOf(keys), order);
  for (let pass = 0; pass < HIGH_PASSES; pass++) {
    const table = counts.subarray(pass * RADIX, (pass + 1) * RADIX);
    if (!startsOf(table, n)) continue;
    placeByHighDigit(wordsOf(keys), keys, order, spareKeys, spare, table, DIGIT_BITS * pass);
    [keys, spareKeys] = [spareKeys, keys];
    [order, spare] = [spare, order];
  }
  sortRunsByLowWord(keys, order, spareKeys, spare);
  return { order, sorted: keys };
}

// Each loop of the sort is a function of its own: the engine optimises a
// long loop while it runs, and a function holding several would be compiled
// again for each loop it reaches that had not run yet.

function hasNegativeZero(p: Float64Array): boolean {
  for (let i = 0; i < p.length; i++) if (p[i] === 0 && 1 / (p[i] as number) < 0) return true;
  return false;
}

/** Counts of each 11-bit digit of the high words, by pass; fills order with 0, 1, 2, ... */
function countHighDigits(words: Uint32Array, order: Uint32Array): Uint32Array {
  const counts = new Uint32Array(RADIX * HIGH_PASSES);
  for (let i = 0; i < order.length; i++) {
    order[i] = i;
    const high = words[2 * i + 1] as number;
    counts[high & DIGIT]++;
    counts[RADIX + ((high >>> 11) & DIGIT)]++;
    counts[2 * RADIX + (high >>> 22)]++;
  }
  return counts;
}

/** One pass: each value (and its position) to where table says its digit goes next. */
function placeByHighDigit(words: Uint32Array, keys: Float64Array, order: Uint32Array, toKeys: Float64Array, toOrder: Uint32Array, table: Uint32Array, shift: number): void {
  for (let i = 0; i < order.length; i++) {
    const at = table[((words[2 * i + 1] as number) >>> shift) & DIGIT]++ as number;
    toKeys[at] = keys[i] as number;
    toOrder[at] = order[i] as number;
  }
}

/**
 * Turns counts by digit into the position where each digit's values start;
 * false (and nothing to do) when every one of the n values has the same digit.
 */
function startsOf(table: Uint32Array, n: number): boolean {
  let total = 0;
  let useful = true;
  for (let d = 0; d < table.length; d++) {
    const count = table[d] as number;
    if (count === n) useful = false;
    table[d] = total;
    total += count;
  }
  return useful;
}

/**
 * keys sorted by their high words, ties in input order: sorts each run of
 * equal high words by the low word, stably. spareKeys and spare are free
 * working space of the same length.
 */
function sortRunsByLowWord(keys: Float64Array, order: Uint32Array, spareKeys: Float64Array, spare: Uint32Array): void {
  const n = keys.length;
  const words = wordsOf(keys);
  const table = new Uint32Array(LOW_RADIX);
  let i = 0;
  while (i < n) {
    const high = words[2 * i + 1] as number;
    let previous = words[2 * i] as number;
    let inOrder = true;
    let end = i + 1;
    for (; end < n && words[2 * end + 1] === high; end++) {
      const low = words[2 * end] as number;
      if (low < previous) inOrder = false;
      previous = low;
    }
    if (!inOrder) {
      if (end - i <= INSERTION_RUN) insertionByLowWord(keys, order, words, i, end);
      else radixByLowWord(keys.subarray(i, end), order.subarray(i, end), spareKeys.subarray(i, end), spare.subarray(i, end), table);
    }
    i = end;
  }
}

/** Stable insertion sort of keys[from, to) (and order with them) by the low word. */
function insertionByLowWord(keys: Float64Array, order: Uint32Array, words: Uint32Array, from: number, to: number): void {
  for (let a = from + 1; a < to; a++) {
    const key = keys[a] as number;
    const position = order[a] as number;
    const low = words[2 * a] as number;
    let b = a - 1;
    for (; b >= from && (words[2 * b] as number) > low; b--) {
      keys[b + 1] = keys[b] as number;
      order[b + 1] = order[b] as number;
    }
    keys[b + 1] = key;
    order[b + 1] = position;
  }
}

/** Stable LSD radix sort of a run by the low word (four 8-bit digits, counted in table); the result is left in keys and order. */
function radixByLowWord(keys: Float64Array, order: Uint32Array, spareKeys: Float64Array, spare: Uint32Array, table: Uint32Array): void {
  const n = keys.length;
  let from = keys;
  let fromOrder = order;
  let to = spareKeys;
  let toOrder = spare;
  for (let shift = 0; shift < 32; shift += 8) {
    const words = wordsOf(from);
    table.fill(0);
    for (let i = 0; i < n; i++) table[((words[2 * i] as number) >>> shift) & 0xff]++;
    if (!startsOf(table, n)) continue;
    for (let i = 0; i < n; i++) {
      const at = table[((words[2 * i] as number) >>> shift) & 0xff]++ as number;
      to[at] = from[i] as number;
      toOrder[at] = fromOrder[i] as number;
    }
    [from, to] = [to, from];
    [fromOrder, toOrder] = [toOrder, fromOrder];
  }
  if (from !== keys) {
    keys.set(from);
    order.set(fromOrder);
  }
}

/**
 * An array sorted in two parts, as two threads sort a table they read in
 * two parts: first sorts its rows [0, split), second the rows from split on
 * (its order counted from split), split being first's length.
 */
export interface SortedParts {
  readonly first: Sorted;
  readonly second: Sorted;
}

/**
 * The sort of a whole array from the sorts of its two parts, for parts
 * sorted in two threads: first sorts p[0, split), second p[split, n) (its
 * order counted from split). Ties go to the first part, so the result is
 * what the stable sortAscending gives for the whole, -0 with 0 included.
 * Linear in n.
 */
export function mergeSorted(first: Sorted, second: Sorted): Sorted {
  const split = first.order.length;
  const n = split + second.order.length;
  const order = new Uint32Array(n);
  const sorted = new Float64Array(n);
  const a = first.sorted;
  const b = second.sorted;
  let i = 0;
  let j = 0;
  let k = 0;
  while (i < split && j < b.length) {
    if ((a[i] as number) <= (b[j] as number)) {
      sorted[k] = a[i] as number;
      order[k++] = first.order[i++] as number;
    } else {
      sorted[k] = b[j] as number;
      order[k++] = split + (second.order[j++] as number);
    }
  }
  for (; i < split; i++, k++) {
    sorted[k] = a[i] as number;
    order[k] = first.order[i] as number;
  }
  for (; j < b.length; j++, k++) {
    sorted[k] = b[j] as number;
    order[k] = split + (second.order[j] as number);
  }
  return { order, sorted };
}

/**
 * The permutation that sorts p ascending: p[order[0]] <= p[order[1]] <= ...
 * Stable (ties keep their input order). p must hold numbers >= 0, no NaN.
 */
export function ascendingOrder(p: Float64Array): Uint32Array {
  return sortAscending(p).order;
}

/** p in the given order: out[i] = p[order[i]]. */
export function gather(p: Float64Array, order: Uint32Array): Float64Array {
  const out = new Float64Array(order.length);
  for (let i = 0; i < order.length; i++) out[i] = p[order[i]];
  return out;
}

/** Values computed in sorted order, put back in input order: out[order[i]] = sortedValues[i]. */
export function scatter(sortedValues: Float64Array, order: Uint32Array): Float64Array {
  const out = new Float64Array(order.length);
  for (let i = 0; i < order.length; i++) out[order[i]] = sortedValues[i];
  return out;
}

/** Runs a sorted kernel on p-values in any order and returns its values in input order. */
export function adjustInInputOrder(p: Float64Array, m: number, kernel: SortedKernel): Float64Array {
  const tests = checkedTestCount(p, m);
  const { order, sorted } = sortAscending(p);
  return scatter(kernel(sorted, tests), order);
}

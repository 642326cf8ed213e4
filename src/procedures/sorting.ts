// Sorting, the one O(m log m) step of the classic procedures, done once.
//
// Each procedure is written as a kernel on p-values sorted ascending
// (p(1) <= ... <= p(m)); the caller sorts once, runs any number of kernels
// on the same sorted values, and puts the results back in input order. The
// order comes from a stable least-significant-digit radix sort on the bits
// of the doubles: for numbers >= 0 the IEEE 754 bit patterns, read as
// unsigned integers, sort in the same order as the numbers. The values
// travel with their positions, so the sorted values come out with the
// order and need no gathering (a pass of random reads). Digits of 11 bits
// (6 passes over 64 bits, counted in one pass first) keep the count tables
// in the first-level cache; a pass whose digit is the same for every value
// is skipped. Linear in m, with no comparator calls; small inputs (many
// small families) use a comparison sort instead.

import { checkedTestCount } from './validate.js';

/** A procedure on ascending p-values: adjusted values in the same (sorted) order. */
export type SortedKernel = (sorted: Float64Array, m: number) => Float64Array;

const DIGIT_BITS = 11;
const RADIX = 1 << DIGIT_BITS;
const DIGIT = RADIX - 1;
const PASSES = 6;
/** Below this many values a comparison sort beats clearing and summing six count tables. */
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

/** sortAscending, using p itself as working space: p is overwritten (it may become the result's sorted). */
export function sortAscendingInPlace(p: Float64Array): Sorted {
  const n = p.length;
  if (n < SMALL) {
    const order = smallAscendingOrder(p);
    return { order, sorted: gather(p, order) };
  }
  // -0 must sort with 0, but its bits would sort last: sorted by its order
  // among the numbers instead (rare, so done the slow way).
  for (let i = 0; i < n; i++) {
    if (p[i] === 0 && 1 / p[i] < 0) {
      const order = sortAscending(p.map((value) => value + 0)).order;
      return { order, sorted: gather(p, order) };
    }
  }
  let keys: Float64Array = p;
  let spareKeys: Float64Array = new Float64Array(n);
  let order = new Uint32Array(n);
  let spare = new Uint32Array(n);
  const counts = new Uint32Array(RADIX * PASSES);
  let words = new Uint32Array(keys.buffer, keys.byteOffset, 2 * n);
  // Digit k is bits 11k to 11k + 10 of the pattern; digit 2 spans both words.
  for (let i = 0; i < n; i++) {
    order[i] = i;
    const low = words[2 * i];
    const high = words[2 * i + 1];
    counts[low & DIGIT]++;
    counts[RADIX + ((low >>> 11) & DIGIT)]++;
    counts[2 * RADIX + (((low >>> 22) | (high << 10)) & DIGIT)]++;
    counts[3 * RADIX + ((high >>> 1) & DIGIT)]++;
    counts[4 * RADIX + ((high >>> 12) & DIGIT)]++;
    counts[5 * RADIX + (high >>> 23)]++;
  }
  for (let pass = 0; pass < PASSES; pass++) {
    const base = pass * RADIX;
    let total = 0;
    let skip = false;
    for (let d = 0; d < RADIX; d++) {
      const count = counts[base + d];
      if (count === n) skip = true; // every value has this digit
      counts[base + d] = total;
      total += count;
    }
    if (skip) continue;
    const table = counts.subarray(base, base + RADIX);
    if (pass === 2) {
      for (let i = 0; i < n; i++) {
        const at = table[((words[2 * i] >>> 22) | (words[2 * i + 1] << 10)) & DIGIT]++;
        spareKeys[at] = keys[i];
        spare[at] = order[i];
      }
    } else {
      const word = pass < 2 ? 0 : 1;
      const shift = pass < 2 ? 11 * pass : 11 * pass - 32;
      for (let i = 0; i < n; i++) {
        const at = table[(words[2 * i + word] >>> shift) & DIGIT]++;
        spareKeys[at] = keys[i];
        spare[at] = order[i];
      }
    }
    [keys, spareKeys] = [spareKeys, keys];
    [order, spare] = [spare, order];
    words = new Uint32Array(keys.buffer, keys.byteOffset, 2 * n);
  }
  return { order, sorted: keys };
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

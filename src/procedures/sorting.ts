// Sorting, the one O(m log m) step of the classic procedures, done once.
//
// Each procedure is written as a kernel on p-values sorted ascending
// (p(1) <= ... <= p(m)); the caller sorts once, runs any number of kernels
// on the same sorted values, and puts the results back in input order. The
// order comes from a stable least-significant-digit radix sort on the bits
// of the doubles: for numbers >= 0 the IEEE 754 bit patterns, read as
// unsigned integers, sort in the same order as the numbers. Four passes of
// 16 bits each make it linear in m, with no comparator calls; small inputs
// (many small families) use a comparison sort instead.

import { checkedTestCount } from './validate.js';

/** A procedure on ascending p-values: adjusted values in the same (sorted) order. */
export type SortedKernel = (sorted: Float64Array, m: number) => Float64Array;

const RADIX = 1 << 16;
/** Below this many values a comparison sort beats clearing a 65,536-entry count table four times. */
const SMALL = 512;

function smallAscendingOrder(p: Float64Array): Uint32Array {
  const order = new Uint32Array(p.length);
  for (let i = 0; i < order.length; i++) order[i] = i;
  // Ties broken by position keep the sort stable; -0 and 0 compare equal, as they should.
  return order.sort((a, b) => p[a] - p[b] || a - b);
}

/**
 * The permutation that sorts p ascending: p[order[0]] <= p[order[1]] <= ...
 * Stable (ties keep their input order). p must hold numbers >= 0, no NaN.
 */
export function ascendingOrder(p: Float64Array): Uint32Array {
  const n = p.length;
  if (n < SMALL) return smallAscendingOrder(p);
  // -0 must sort with 0; its bits would sort last. A copy with +0 added
  // (which turns -0 into 0) is made only when there is one.
  let values = p;
  for (let i = 0; i < n; i++) {
    if (p[i] === 0 && 1 / p[i] < 0) {
      values = p.map((value) => value + 0);
      break;
    }
  }
  const bits = new Uint32Array(values.buffer, values.byteOffset, 2 * n);
  let order = new Uint32Array(n);
  for (let i = 0; i < n; i++) order[i] = i;
  let spare = new Uint32Array(n);
  let key = new Uint32Array(n);
  let spareKey = new Uint32Array(n);
  const counts = new Uint32Array(RADIX);
  // Passes 0 and 1 sort on the low 32-bit word, 2 and 3 on the high word.
  for (let pass = 0; pass < 4; pass++) {
    const shift = (pass & 1) * 16;
    if (pass === 0 || pass === 2) {
      const word = pass === 0 ? 0 : 1;
      for (let i = 0; i < n; i++) key[i] = bits[2 * order[i] + word];
    }
    counts.fill(0);
    for (let i = 0; i < n; i++) counts[(key[i] >>> shift) & 0xffff]++;
    if (counts[(key[0] >>> shift) & 0xffff] === n) continue; // every key has this digit
    let total = 0;
    for (let d = 0; d < RADIX; d++) {
      const count = counts[d];
      counts[d] = total;
      total += count;
    }
    for (let i = 0; i < n; i++) {
      const at = counts[(key[i] >>> shift) & 0xffff]++;
      spare[at] = order[i];
      spareKey[at] = key[i];
    }
    [order, spare] = [spare, order];
    [key, spareKey] = [spareKey, key];
  }
  return order;
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
  const order = ascendingOrder(p);
  return scatter(kernel(gather(p, order), tests), order);
}

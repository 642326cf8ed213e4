// Helpers shared by the procedures that work on sorted p-values.
//
// Every classic adjustment (Holm, Hochberg, BH, BY, ...) gives tied p-values
// the same adjusted value, so the adjusted value is a function of the raw
// p-value alone. We therefore sort a copy of the values with the native
// numeric sort (no comparator, no index permutation), compute the adjusted
// values in sorted order, and map each raw p-value back to its adjusted value
// by binary search. That is O(m log m) overall and needs no per-row objects.

/** An ascending copy of `p`; the input is not touched. */
export function sortedAscending(p: Float64Array): Float64Array {
  return Float64Array.from(p).sort();
}

/** Index of the first element of ascending `sorted` that is >= value. */
function lowerBound(sorted: Float64Array, value: number): number {
  let lo = 0;
  let hi = sorted.length;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (sorted[mid] < value) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}

/**
 * For each p[i], the adjusted value computed for it in sorted order:
 * out[i] = adjustedSorted[first position of p[i] in sorted].
 */
export function inInputOrder(
  p: Float64Array,
  sorted: Float64Array,
  adjustedSorted: Float64Array,
): Float64Array {
  const out = new Float64Array(p.length);
  for (let i = 0; i < p.length; i++) {
    out[i] = adjustedSorted[lowerBound(sorted, p[i])];
  }
  return out;
}

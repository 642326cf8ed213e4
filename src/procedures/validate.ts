// The contract every procedure shares: p-values are numbers in [0, 1] with no
// missing values (missing ones are removed before adjusting, and only the
// count of tests `m` remembers them), and m is a whole number no smaller
// than the number of p-values present.

/** Throws a RangeError if `p` or `m` break the contract; returns m. */
export function checkedTestCount(p: Float64Array, m: number = p.length): number {
  if (!Number.isInteger(m) || m < p.length) {
    throw new RangeError(`the number of tests m must be a whole number >= ${p.length} (the p-values given), got ${m}`);
  }
  for (let i = 0; i < p.length; i++) {
    const v = p[i];
    if (!(v >= 0 && v <= 1)) {
      throw new RangeError(`p-value at position ${i} is ${v}; p-values must be numbers in [0, 1]`);
    }
  }
  return m;
}

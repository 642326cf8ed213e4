// Each family's p-values, sorted, and its count of missing ones: what the
// diagnostics need. One pass counts, one places, then each family is sorted.
//
// Cost: O(n log n) in all.

import type { FamilyGrouping } from '../families.js';

export interface FamilyValues {
  /** sorted[f]: family f's p-values, ascending, none missing. */
  readonly sorted: Float64Array[];
  /** missing[f]: family f's missing p-values. */
  readonly missing: Int32Array;
}

/** Splits p-values (NaN where missing) by family and sorts each family; the input is not changed. */
export function sortedByFamily(p: Float64Array, families: FamilyGrouping): FamilyValues {
  const present = new Int32Array(families.count);
  const missing = new Int32Array(families.count);
  for (let row = 0; row < p.length; row++) {
    const family = families.ids[row] as number;
    if (Number.isNaN(p[row])) missing[family]++;
    else present[family]++;
  }
  const sorted = Array.from(present, (size) => new Float64Array(size));
  const filled = new Int32Array(families.count);
  for (let row = 0; row < p.length; row++) {
    const value = p[row] as number;
    if (Number.isNaN(value)) continue;
    const family = families.ids[row] as number;
    (sorted[family] as Float64Array)[filled[family]++] = value;
  }
  for (const values of sorted) values.sort();
  return { sorted, missing };
}

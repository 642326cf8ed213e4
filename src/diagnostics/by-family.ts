// Each family's p-values, sorted, and its count of missing ones: what the
// diagnostics need: the families' segments (families.ts), each sorted.
//
// Cost: O(n log n) in all.

import { type FamilyGrouping, familySegments } from '../families.js';

export interface FamilyValues {
  /** sorted[f]: family f's p-values, ascending, none missing. */
  readonly sorted: Float64Array[];
  /** missing[f]: family f's missing p-values. */
  readonly missing: Int32Array;
}

/** Splits p-values (NaN where missing) by family and sorts each family; the input is not changed. */
export function sortedByFamily(p: Float64Array, families: FamilyGrouping): FamilyValues {
  const { start, missing, gathered } = familySegments(p, families);
  const sorted = Array.from({ length: families.count }, (_, f) => gathered.slice(start[f], start[f + 1]).sort());
  return { sorted, missing };
}

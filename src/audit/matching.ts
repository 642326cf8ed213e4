// Whether a recomputed adjusted p-value is the one someone printed.
//
// The true value lies within half a unit of the last digit printed (see
// io/printed-value.ts), so the two match when they differ by at most that.
// Values printed with every digit leave room only for the last bits in which
// two correct programs may differ, so a relative allowance of 1e-10 is kept
// as a floor.
//
// Cost: O(1).

import { BARE_INTEGER } from '../io/printed-value.js';

/** The relative difference two correct computations of the same value may show. */
export const RELATIVE_FLOOR = 1e-10;

/** Whether a recomputed value is what was printed, to the precision it was printed with. */
export function matchesPrinted(recomputed: number, value: number, halfUnit: number): boolean {
  const allowed = Math.max(halfUnit * (1 + 1e-9), RELATIVE_FLOOR * Math.abs(recomputed));
  return Math.abs(recomputed - value) <= allowed;
}

/** Significant digits a printed value carries (for the report): 0.0123 -> 3. */
export function significantDigits(value: number, halfUnit: number): number {
  if (halfUnit === 0 || value === 0) return Infinity;
  return Math.max(1, Math.floor(Math.log10(Math.abs(value))) - Math.round(Math.log10(2 * halfUnit)) + 1);
}

/**
 * Half units for bare "0" and "1" cells, read from the rest of the column: a
 * "1" stands for anything that rounds to 1 at the most significant digits
 * the column shows elsewhere (at D digits, values from 1 - 0.5 10^-D up print
 * as 1; exact when it shows full precision), and a "0"
 * for anything below the smallest half unit shown elsewhere (fixed decimals:
 * 0.0005 for 3 decimals; exact when the column prints small values in full).
 */
export function settleBareIntegers(values: Float64Array, halfUnits: Float64Array): Float64Array {
  let mostDigits = 0;
  let smallestHalfUnit = Infinity;
  for (let row = 0; row < values.length; row++) {
    const halfUnit = halfUnits[row] as number;
    if (Number.isNaN(halfUnit) || halfUnit === BARE_INTEGER) continue;
    mostDigits = Math.max(mostDigits, significantDigits(values[row] as number, halfUnit));
    smallestHalfUnit = Math.min(smallestHalfUnit, halfUnit);
  }
  const forOne = mostDigits === 0 || !Number.isFinite(mostDigits) || mostDigits >= 15 ? 0 : 0.5 * 10 ** -mostDigits;
  const forZero = Number.isFinite(smallestHalfUnit) ? smallestHalfUnit : 0;
  return halfUnits.map((halfUnit, row) => (halfUnit === BARE_INTEGER ? (values[row] === 1 ? forOne : forZero) : halfUnit));
}

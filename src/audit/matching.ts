// Whether a recomputed adjusted p-value is the one someone printed.
//
// The true value lies within half a unit of the last digit printed (see
// io/printed-value.ts), so the two match when they differ by at most that.
// Values printed with every digit leave room only for the last bits in which
// two correct programs may differ, so a relative allowance of 1e-10 is kept
// as a floor. When the raw p-values were themselves printed rounded, the
// exact adjusted value is only known to lie between the adjustments of the
// lowest and the highest p-values the printed ones stand for (every
// procedure's adjusted values rise with each raw p-value), so a claim is
// compared with that range.
//
// Cost: O(1) per value; O(n) per column to read its precision.

import { BARE_INTEGER } from '../io/printed-value.js';

/** The relative difference two correct computations of the same value may show. */
export const RELATIVE_FLOOR = 1e-10;

/** Whether a claim, printed with this half unit, could be a value in [low, high]. */
export function matchesRange(low: number, high: number, claim: number, halfUnit: number): boolean {
  const slack = halfUnit * (1 + 1e-9);
  return claim + slack >= low * (1 - RELATIVE_FLOOR) && claim - slack <= high * (1 + RELATIVE_FLOOR);
}

/** Whether a recomputed value is what was printed, to the precision it was printed with. */
export function matchesPrinted(recomputed: number, claim: number, halfUnit: number): boolean {
  return matchesRange(recomputed, recomputed, claim, halfUnit);
}

/** Whether two values differ by more than two correct computations may. */
export function clearlyDifferent(a: number, b: number): boolean {
  return Math.abs(a - b) > RELATIVE_FLOOR * Math.max(Math.abs(a), Math.abs(b));
}

/** Significant digits a printed value carries (for the report): 0.0123 -> 3. */
export function significantDigits(value: number, halfUnit: number): number {
  if (halfUnit === 0 || value === 0) return Infinity;
  return Math.max(1, Math.floor(Math.log10(Math.abs(value))) - Math.round(Math.log10(2 * halfUnit)) + 1);
}

/** Digits at or beyond which a column is taken as printed in full (R prints 15, shortest round-trip writers up to 17). */
const FULL_PRECISION = 15;

/**
 * The half unit of each value, read with the rest of its column. A column
 * that shows full precision anywhere was written by a program that prints
 * every value in full (as R's 15 digits, or the shortest text that reads
 * back to the same double), so its short values (0.01) are exact too. Else a
 * bare "1" stands for anything that rounds to 1 at the most significant
 * digits the column shows (at D digits, values from 1 - 0.5 10^-D up), and a
 * bare "0" for anything below the smallest half unit shown (fixed decimals:
 * 0.0005 for 3 decimals).
 */
export function columnHalfUnits(values: Float64Array, halfUnits: Float64Array): Float64Array {
  let mostDigits = 0;
  let smallestHalfUnit = Infinity;
  for (let row = 0; row < values.length; row++) {
    const halfUnit = halfUnits[row] as number;
    if (Number.isNaN(halfUnit) || halfUnit === BARE_INTEGER) continue;
    mostDigits = Math.max(mostDigits, significantDigits(values[row] as number, halfUnit));
    smallestHalfUnit = Math.min(smallestHalfUnit, halfUnit);
  }
  if (mostDigits >= FULL_PRECISION) return halfUnits.map((halfUnit) => (Number.isNaN(halfUnit) ? halfUnit : 0));
  const forOne = mostDigits === 0 ? 0 : 0.5 * 10 ** -mostDigits;
  const forZero = Number.isFinite(smallestHalfUnit) ? smallestHalfUnit : 0;
  return halfUnits.map((halfUnit, row) => (halfUnit === BARE_INTEGER ? (values[row] === 1 ? forOne : forZero) : halfUnit));
}

// Reading a number someone else printed (an adjusted p-value, for audit),
// with the precision it was printed to: a value printed as 0.0123 stands for
// anything that rounds to it, so it carries half a unit of its last digit
// (0.00005 here). "0" and "1" written bare are special: a capped value prints
// as 1 at any precision, and 0.99996 rounded to 4 significant digits prints
// as 1 too, so their precision can only be read from the rest of the column
// (see audit/matching.ts); they are marked with BARE_INTEGER.

/** Plain or scientific notation: mantissa digits before and after the point, and the exponent. */
const NUMBER = /^([+-]?)(\d*)(?:\.(\d*))?(?:[eE]([+-]?\d+))?$/;

export interface PrintedValue {
  readonly value: number;
  /** Half a unit of the last digit written; BARE_INTEGER for a bare 0 or 1. */
  readonly halfUnit: number;
}

/** The half unit given to a bare "0" or "1", whose precision the rest of the column tells. */
export const BARE_INTEGER = -1;

/** The value of a printed number and the half unit of its last digit; undefined if it is not a number. */
export function readPrintedValue(text: string, decimalComma = false): PrintedValue | undefined {
  const trimmed = decimalComma ? text.trim().replace(',', '.') : text.trim();
  const parts = NUMBER.exec(trimmed);
  if (!parts || (parts[2] === '' && (parts[3] ?? '') === '')) return undefined;
  const value = Number(trimmed);
  if (!Number.isFinite(value)) return undefined;
  const decimals = (parts[3] ?? '').length;
  const exponent = Number(parts[4] ?? 0);
  if (decimals === 0 && parts[4] === undefined && (value === 0 || value === 1)) return { value, halfUnit: BARE_INTEGER };
  return { value, halfUnit: 0.5 * 10 ** (exponent - decimals) };
}

/** Adjusted values printed elsewhere may exceed 1 by this much (1.0000000000000002 from summing in another order). */
const ABOVE_ONE = 1e-9;

/** Whether a printed value is admissible as an adjusted p-value. */
export function admissibleClaim(value: number): boolean {
  return value >= 0 && value <= 1 + ABOVE_ONE;
}

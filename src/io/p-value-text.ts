// Reading numbers from the text of table cells: p-values, weights, and (in
// statistic-text.ts) statistics. One list of missing-value marks and one
// number grammar, shared by every command and every column.

/** Cell texts that mean "no p-value here" (after trimming spaces). */
export const MISSING_MARKS: readonly string[] = ['', 'NA', 'na', 'N/A', 'n/a', 'NaN', 'nan', 'NULL', 'null', 'None', '#N/A'];

const missing = new Set(MISSING_MARKS);
// Plain decimal or scientific notation, no sign, no thousands separators:
// 0.05  .05  5e-3  5E-03  1  0  1.0  3.2e-300
const DECIMAL = /^(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?$/;

/** Any number written in plain decimal or scientific notation, signed or not. */
export function isNumberText(text: string): boolean {
  return SIGNED_DECIMAL.test(text);
}
const SIGNED_DECIMAL = /^[+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?$/;

export type PValueText = number | 'missing' | 'invalid';

/**
 * The p-value in a cell: a number in [0, 1], 'missing' for a missing-value
 * mark, or 'invalid'. Surrounding spaces are ignored. With decimalComma
 * (tables not separated by commas), "0,05" reads as 0.05.
 */
export function readPValue(text: string, decimalComma = false): PValueText {
  const value = readDecimal(text, decimalComma);
  return typeof value === 'number' && value > 1 ? 'invalid' : value;
}

/**
 * A decimal number in a cell, the grammar every column shares: 'missing' for
 * a missing-value mark, 'invalid' for anything else that is not a number;
 * surrounding spaces ignored, and with decimalComma "0,05" read as 0.05.
 * Signed numbers (statistics) only where `signed` says so.
 */
export function readDecimal(text: string, decimalComma: boolean, signed = false): PValueText {
  let trimmed = text.trim();
  if (missing.has(trimmed)) return 'missing';
  if (decimalComma && trimmed.includes(',')) trimmed = trimmed.replace(',', '.');
  return (signed ? SIGNED_DECIMAL : DECIMAL).test(trimmed) ? Number(trimmed) : 'invalid';
}

/** Whether a text is a plain unsigned decimal number (as options such as --df take). */
export function isUnsignedNumberText(text: string): boolean {
  return DECIMAL.test(text);
}

const INFINITY = /^[+-]?inf(inity)?$/i;
const DECIMAL_COMMA = /^[+-]?\d*,\d+$/;
const DECIMAL_COMMA_REFUSED = 'a decimal comma is read only in tables not separated by commas (tab, ";" or "|"); is --delimiter right?';

/** Why a statistic's cell is not a number, for infinity and a misplaced decimal comma; undefined for other texts. */
export function whyNotFinite(text: string, decimalCommaAllowed: boolean): string | undefined {
  const trimmed = text.trim();
  if (INFINITY.test(trimmed)) return 'an infinite value has no p-value famwise will guess; fix the tool that wrote it';
  if (!decimalCommaAllowed && DECIMAL_COMMA.test(trimmed)) return DECIMAL_COMMA_REFUSED;
  return undefined;
}

/**
 * Whether a cell that read as 0 was written as a positive number too small
 * for a double (below about 5e-324, such as 1e-400): it underflowed.
 */
export function underflowed(text: string, value: PValueText): boolean {
  return value === 0 && /[1-9]/.test(text.trim().split(/[eE]/)[0] ?? '');
}

/** A bound, as statistics programs print p-values below their precision: <2e-16, < 0.001, <=.05, >0.99. */
const BOUND = /^([<>≤≥])=?\s*[\d.,]/;
const UPPER_BOUND = /^(?:<=?|≤)\s*/;

/**
 * The value of an upper bound ("<2e-16" -> 2e-16), or undefined if the text
 * is not one. Using the bound in place of the unknown smaller p-value is
 * conservative: every procedure's adjusted values only grow with the raw ones.
 */
export function readUpperBound(text: string, decimalComma = false): number | undefined {
  const trimmed = text.trim();
  const sign = UPPER_BOUND.exec(trimmed);
  if (!sign) return undefined;
  const value = readPValue(trimmed.slice(sign[0].length), decimalComma);
  // "<0" bounds nothing: no p-value is below 0.
  return typeof value === 'number' && value > 0 ? value : undefined;
}

/** Why a cell's text is not a p-value, for the error message. */
export function whyNotPValue(text: string, decimalCommaAllowed = false, boundsAsValues = false): string {
  const trimmed = text.trim();
  const value = Number(trimmed.replace(',', '.'));
  const bound = BOUND.exec(trimmed)?.[1];
  if ((bound === '<' || bound === '≤') && boundsAsValues) return 'a bound is read as its value only when that value is a p-value above 0, like <2e-16';
  if (bound === '<' || bound === '≤') {
    return 'it is a bound ("less than"), not a value, and famwise will not guess one; to read each such bound as the value (conservative: the adjusted values in its family become upper bounds), use --bounds-as-values';
  }
  if (bound === '>' || bound === '≥') return 'it is a bound ("greater than"), not a value, and famwise will not guess one';
  if (trimmed.endsWith('%')) return 'percentages are not accepted; write 5% as 0.05';
  if (INFINITY.test(trimmed)) return 'infinity is not a p-value';
  if (Number.isFinite(value) && trimmed !== '' && (value < 0 || Object.is(value, -0))) return 'p-values cannot be negative';
  if (Number.isFinite(value) && trimmed !== '' && value > 1 && value < 1 + 1e-12) {
    return 'p-values cannot exceed 1; this one exceeds it only in the last digits, as some programs compute a p-value of 1 (round it to 1 upstream)';
  }
  if (Number.isFinite(value) && trimmed !== '' && value > 1) return 'p-values cannot exceed 1 (is this column a statistic, or -log10 p? see --statistic and --p-scale)';
  if (!decimalCommaAllowed && DECIMAL_COMMA.test(trimmed)) return DECIMAL_COMMA_REFUSED;
  return `expected a number from 0 to 1 (like 0.05 or 5e-3) or a missing-value mark (${MISSING_MARKS.filter(Boolean).join(', ')}, or empty)`;
}

/**
 * A prior weight in a cell: a finite number >= 0, 'missing' for a
 * missing-value mark, or 'invalid'. Same number grammar as p-values.
 */
export function readWeight(text: string, decimalComma = false): PValueText {
  const value = readDecimal(text, decimalComma);
  return typeof value === 'number' && !Number.isFinite(value) ? 'invalid' : value;
}

/** Why a cell's text is not a weight, for the error message. */
export function whyNotWeight(text: string): string {
  const trimmed = text.trim();
  if (/^-\s*\d|^-\.\d/.test(trimmed)) return 'weights cannot be negative (0 means the hypothesis is never rejected)';
  if (INFINITY.test(trimmed) || (DECIMAL.test(trimmed) && !Number.isFinite(Number(trimmed)))) {
    return 'weights must be finite';
  }
  return 'expected a number >= 0 (like 1, 2.5 or 0)';
}

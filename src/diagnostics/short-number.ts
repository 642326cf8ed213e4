// Numbers for reading: three significant digits, without floating-point
// noise ("0.3", not "0.30000000000000004"), and in exponent form below 1e-4
// so that a tiny value does not print as a long row of zeros. The text
// report, the findings, the terminal histogram and the SVG labels all use it;
// the JSON keeps every digit.
//
// Cost: O(1).

/** value to three significant digits: "0", "1.23", "0.0457", "3.2e-7", "Infinity". */
export function shortNumber(value: number): string {
  if (value === 0) return '0';
  return Math.abs(value) < 1e-4 ? value.toExponential(2) : String(Number(value.toPrecision(3)));
}

// Reading a plain decimal number straight from the bytes of a field, without
// making a string first: the p-value column of a table with tens of millions
// of rows is read this way.
//
// It is exactly as correct as Number(text), because it only answers when one
// rounding is enough: the digits, read as a whole number, stay below 2^53
// (so they are held exactly), and the decimal exponent e is within 22 of
// zero (so 10^|e| is held exactly too). Then digits * 10^e or digits / 10^e
// is one correctly rounded IEEE operation on exact operands, which gives the
// nearest double to the decimal value: the same double Number() returns
// (Clinger, "How to read floating point numbers accurately", PLDI 1990,
// pp. 92-101; from memory). Anything else (more digits, a larger exponent,
// spaces, signs, missing-value marks, decimal commas) gets NOT_SIMPLE, and
// the caller reads the text the general way. Cost: O(length of the field).

const ZERO = 0x30;
const NINE = 0x39;
const DOT = 0x2e;
const PLUS = 0x2b;
const MINUS = 0x2d;
const SMALL_E = 0x65;
const CAPITAL_E = 0x45;

/** The answer for bytes this reader leaves to the general path. */
export const NOT_SIMPLE = -1;

/** Whole numbers below this are exact in a double (2^53). */
const EXACT_LIMIT = 9007199254740992;

/** 10^0 .. 10^22, every one exact in a double. */
const POWERS_OF_TEN = Array.from({ length: 23 }, (_, k) => Number(`1e${k}`));

/**
 * The value of buf[start, end) written as digits, an optional point and
 * digits, and an optional exponent (0.05, .05, 5e-3, 5E-03, 1, 12.5e+2); no
 * sign, no spaces. NOT_SIMPLE when the bytes are anything else, or when one
 * rounding would not give the same double as Number().
 */
export function simpleDecimal(buf: Uint8Array, start: number, end: number): number {
  let digits = 0;
  let digitCount = 0;
  let exponent = 0;
  let pos = start;
  let byte = 0;
  for (; pos < end; pos++) {
    byte = buf[pos];
    if (byte < ZERO || byte > NINE) break;
    digits = digits * 10 + (byte - ZERO);
    digitCount++;
  }
  if (pos < end && byte === DOT) {
    for (pos++; pos < end; pos++) {
      byte = buf[pos];
      if (byte < ZERO || byte > NINE) break;
      digits = digits * 10 + (byte - ZERO);
      digitCount++;
      exponent--;
    }
  }
  // Beyond this the running total may have been rounded.
  if (digitCount === 0 || digits >= EXACT_LIMIT) return NOT_SIMPLE;
  if (pos < end) {
    if (byte !== SMALL_E && byte !== CAPITAL_E) return NOT_SIMPLE;
    pos++;
    let negative = false;
    if (pos < end && (buf[pos] === PLUS || buf[pos] === MINUS)) {
      negative = buf[pos] === MINUS;
      pos++;
    }
    if (pos === end || end - pos > 3) return NOT_SIMPLE;
    let written = 0;
    for (; pos < end; pos++) {
      byte = buf[pos];
      if (byte < ZERO || byte > NINE) return NOT_SIMPLE;
      written = written * 10 + (byte - ZERO);
    }
    exponent += negative ? -written : written;
  }
  if (digits === 0) return 0;
  if (exponent < -22 || exponent > 22) return NOT_SIMPLE;
  return exponent < 0 ? digits / POWERS_OF_TEN[-exponent] : digits * POWERS_OF_TEN[exponent];
}

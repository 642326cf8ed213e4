// Numbers written as text: the shortest decimal that reads back to the same
// double, exactly as JavaScript's String(number) writes it (ECMA-262,
// Number::toString: the fewest digits; of those, the value closest to the
// number; of two as close, the even one).
//
// Writing the new columns of a large table is mostly formatting numbers, and
// String() costs a few hundred nanoseconds a number here. writeNumber
// writes the bytes itself for the common case, a number between 1e-6 and 1
// (an adjusted p-value), in a few dozen, and hands every other number to
// String(). With v = f 2^e (f an integer of 53 bits) in [10^(n-1), 10^n),
// for d = 15, 16, 17 digits in turn:
//
//   S = v 10^q, q = d - n, is computed exactly as the sum of two doubles
//   (Dekker's product; 10^q is an exact double for q up to 22). Its
//   nearest integer N (ties to even) is the nearest d-digit decimal to v,
//   scaled. N reads back as v exactly when |S - N| is below half a unit in
//   the last place of v, scaled (2^(e-1) 10^q, exact). (It is never equal:
//   a point halfway between two doubles below 1 has at least 54 decimals,
//   N 10^-q at most 22.) S - N and that bound are multiples of 2^(e+q-1)
//   below 2 (below 9 for 17 digits, where S - N is Dekker's error term
//   itself), so both are exact doubles and the comparison is exact.
//
//   At most one 15-digit decimal reads back as v (they lie further apart
//   than v's rounding interval is wide), so when N does at d = 15, N less
//   its trailing zeros is the shortest. At d = 16 several may, and the
//   nearest is the one String() takes; at d = 17 the nearest always does.
//   A power of two (f = 2^52) has a lopsided rounding interval (half as
//   wide below), which this test does not model: it goes to String().
//
// test/number-text.test.ts compares writeNumber with String() on millions
// of numbers of every kind; scripts/check-number-text.mjs on many more.

/** 2^27 + 1: splits a double into two halves whose products are exact (Veltkamp). */
const SPLITTER = 134217729;
/** The largest double below 1e-6 is written by String() as 9.99...e-7: the fast path starts above 1e-6. */
const SMALLEST = 1e-6;
/** POWERS[k] = 10^k, exact as doubles for k up to 22; with each one's Veltkamp halves. */
const POWERS = Float64Array.from({ length: 23 }, (_, k) => 10 ** k);
const POWER_HIGH = POWERS.map((power) => {
  const c = SPLITTER * power;
  return c - (c - power);
});
const POWER_LOW = POWERS.map((power, k) => power - (POWER_HIGH[k] as number));
/** Decade bounds 10^0 ... 10^-5 as doubles; each below 1 is above the real power of ten, so v >= bound is exact. */
const DECADES = Float64Array.of(1, 1e-1, 1e-2, 1e-3, 1e-4, 1e-5);

/** HALF_UNITS[E - 1000] = 2^(E - 1076): half a unit in the last place of a double with exponent field E, for E up to 1022 (below 1). */
const HALF_UNITS = Float64Array.from({ length: 23 }, (_, k) => 2 ** (k + 1000 - 1076));

const DOT = 0x2e;
const COMMA = 0x2c;
const ZERO = 0x30;
/** Bytes a number's text can take: "-1.2345678901234567e-308" is 24. */
export const LONGEST_NUMBER = 25;

/** "00", "01", ... "99" as bytes: PAIRS[2k], PAIRS[2k + 1] are the digits of k. */
const PAIRS = Uint8Array.from({ length: 200 }, (_, i) => ZERO + (i % 2 === 0 ? Math.floor(i / 20) : (i >> 1) % 10));

const word = new Float64Array(1);
const wordBits = new Uint32Array(word.buffer);

/**
 * Writes v as String(v) writes it (with a decimal comma if asked) into
 * bytes at `at`, which must have room for LONGEST_NUMBER bytes; NaN is
 * written as nothing. Returns where the text ends.
 */
export function writeNumber(v: number, bytes: Uint8Array, at: number, decimalComma: boolean): number {
  if (v > SMALLEST && v < 1) {
    const end = writeFraction(v, bytes, at, decimalComma ? COMMA : DOT);
    if (end >= 0) return end;
  }
  if (v === 1) {
    bytes[at] = 0x31;
    return at + 1;
  }
  if (v !== v) return at;
  const text = String(v);
  for (let i = 0; i < text.length; i++) {
    const code = text.charCodeAt(i);
    bytes[at + i] = decimalComma && code === DOT ? COMMA : code;
  }
  return at + text.length;
}

/** The number of bytes writeNumber writes for v (the same with a decimal comma). */
export function numberTextLength(v: number): number {
  if (v > SMALLEST && v < 1) {
    const length = fractionLength(v);
    if (length >= 0) return length;
  }
  if (v === 1) return 1;
  if (v !== v) return 0;
  return String(v).length;
}

/** What shortestFraction found: the shortest decimal of v is 0.[foundZeros zeros][the digits of foundBase + foundK]. */
let foundBase = 0;
let foundK = 0;
let foundZeros = 0;

/**
 * For 1e-6 < v < 1: how many digits (15, 16 or 17) the shortest decimal of
 * v takes before trailing zeros are trimmed (only one of 15 digits can
 * have any), with what it is in foundBase, foundK and foundZeros; -1 when it
 * cannot decide (a power of two).
 */
function shortestFraction(v: number): number {
  word[0] = v;
  const lowBits = wordBits[0] as number;
  const highBits = wordBits[1] as number;
  // A power of two has a lopsided rounding interval: left to String().
  if (lowBits === 0 && (highBits & 0xfffff) === 0) return -1;
  // Half a unit in the last place: 2^(e-1), e = exponent - 1075 (a table: Math.pow is slow).
  const half = HALF_UNITS[((highBits >>> 20) & 0x7ff) - 1000] as number;
  // v lies in [10^(n-1), 10^n), n = 1 - below.
  let below = 1;
  while (below < 6 && v < (DECADES[below] as number)) below++;
  // Veltkamp halves of v, for Dekker's exact product.
  const c = SPLITTER * v;
  const vHigh = c - (c - v);
  const vLow = v - vHigh;
  for (let digits = 15; digits <= 17; digits++) {
    const q = digits + below - 1;
    const power = POWERS[q] as number;
    const high = POWER_HIGH[q] as number;
    const low = POWER_LOW[q] as number;
    const product = v * power;
    const error = vHigh * high - product + vHigh * low + vLow * high + vLow * low;
    // S = base + x exactly, x below 2 (or, from 2^53 on, where product is an integer, x = error).
    const base = Math.floor(product);
    const x = product - base + error;
    let k = Math.floor(x);
    const over = x - k;
    // Worked out every time, not only at an exact tie: an operation first met in the middle of a
    // large table makes the engine drop the optimised writer and compile it again.
    const odd = (k & 1) !== 0;
    if (over > 0.5 || (over === 0.5 && odd)) k++;
    if (!(Math.abs(x - k) < half * power)) continue;
    foundBase = base;
    foundK = k;
    foundZeros = below - 1;
    return digits;
  }
  return -1;
}

/** The fast path for 1e-6 < v < 1; -1 when it cannot decide. */
function writeFraction(v: number, bytes: Uint8Array, at: number, point: number): number {
  const digits = shortestFraction(v);
  if (digits < 0) return -1;
  return writeDigits(foundBase, foundK, digits, foundZeros, bytes, at, point, digits === 15);
}

/** The bytes writeFraction writes for v, without writing them; -1 when it cannot decide. */
function fractionLength(v: number): number {
  const digits = shortestFraction(v);
  if (digits < 0) return -1;
  if (splitDigits(foundBase, foundK) >= (POWERS[digits - 8] as number)) return -1;
  let length = digits;
  if (digits === 15) {
    // Below 10^15 < 2^53: exact, and its trailing zeros trimmed as writeDigits trims them.
    for (let rest = foundBase + foundK; rest % 10 === 0 && length > 0; rest /= 10) length--;
  }
  return 2 + foundZeros + length;
}

/** The lower part splitDigits found. */
let splitLower = 0;

/**
 * base + k (base an integer below 10^17, k a small integer) in two parts
 * that int32 arithmetic can take: returns upper, with base + k = upper
 * 10^8 + splitLower.
 */
function splitDigits(base: number, k: number): number {
  const upper = Math.floor(base / 1e8);
  const lower = base - upper * 1e8 + k;
  // lower is an integer from -1e8 to below 2e8 (all exact): the carry, -1, 0 or 1, taken without
  // a branch that runs only now and then (the same reason as the tie's parity above).
  const carry = Math.floor(lower / 1e8);
  splitLower = lower - carry * 1e8;
  return upper + carry;
}

/**
 * Writes "0", the point, `zeros` zeros and the `digits` digits of base + k
 * (base an integer below 10^17, k a small integer), less its trailing zeros
 * when trim; -1 if base + k has more digits (it rounded up to a power of ten).
 */
function writeDigits(base: number, k: number, digits: number, zeros: number, bytes: Uint8Array, at: number, point: number, trim: boolean): number {
  const upper = splitDigits(base, k);
  const lower = splitLower;
  if (upper >= (POWERS[digits - 8] as number)) return -1;
  bytes[at++] = ZERO;
  bytes[at++] = point;
  for (; zeros > 0; zeros--) bytes[at++] = ZERO;
  let rest = lower | 0;
  let top = upper | 0;
  const end = at + digits;
  // Two digits at a time from a table: half the divisions.
  for (let pos = end - 2; pos >= end - 8; pos -= 2) {
    const hundredth = (rest / 100) | 0;
    const pair = 2 * (rest - 100 * hundredth);
    bytes[pos] = PAIRS[pair] as number;
    bytes[pos + 1] = PAIRS[pair + 1] as number;
    rest = hundredth;
  }
  let pos = end - 9;
  for (; pos > at; pos -= 2) {
    const hundredth = (top / 100) | 0;
    const pair = 2 * (top - 100 * hundredth);
    bytes[pos - 1] = PAIRS[pair] as number;
    bytes[pos] = PAIRS[pair + 1] as number;
    top = hundredth;
  }
  if (pos === at) bytes[pos] = ZERO + top;
  let last = end;
  if (trim) while (bytes[last - 1] === ZERO) last--;
  return last;
}

// Every branch of writeNumber (and numberTextLength) run once at load, on numbers of each kind (the
// decades below 1, a power of two, 15 to 17 digits, rounding either way, 1,
// NaN, numbers String() writes): the engine then has seen each of them when
// it optimises the writer in the middle of a large table, and does not
// throw that code away the first time a rarer number comes (each time it
// did, compiling it again cost 10-30 ms of a run of 1M rows).
// Twice: the engine keeps no record of a function's first few calls.
for (let round = 0; round < 2; round++) {
  const bytes = Buffer.allocUnsafe(LONGEST_NUMBER);
  for (const v of [0.5, 0.1, 0.123, 0.62428642848007821, 0.1234567890123456, 0.047, 0.0031, 3.2e-4, 4.1e-5, 5.7e-6, 0.9999999999999999, 1, 2, NaN, 1e-7, 0]) {
    for (let scale = 1; scale > 0.5; scale -= 0.0625) {
      writeNumber(v * scale, bytes, 0, scale < 0.75);
      numberTextLength(v * scale);
    }
  }
}

// writeNumber writes numbers as JavaScript's String() does (the shortest
// decimal that reads back to the same double; ECMA-262 Number::toString),
// faster for those between 1e-6 and 1. Checked against String() itself on
// samples of every kind (src/io/number-samples.ts); scripts/check-number-text.mjs
// runs the same check on as many as wanted.
import { describe, expect, it } from 'vitest';
import { numberSamples, stepsAway } from '../src/io/number-samples.js';
import { LONGEST_NUMBER, numberTextLength, writeNumber } from '../src/io/number-text.js';
import { seededRandom } from './helpers/random.js';

const bytes = new Uint8Array(LONGEST_NUMBER + 8);
const written = (v: number, decimalComma = false): string => Buffer.from(bytes.subarray(0, writeNumber(v, bytes, 0, decimalComma))).toString('latin1');
const expected = (v: number): string => (Number.isNaN(v) ? '' : String(v));

describe('writeNumber', () => {
  it('writes what String() writes, on 800,000 numbers of every kind and the edges of decades and binades', () => {
    const wrong: string[] = [];
    let count = 0;
    numberSamples(seededRandom(20261201), 200_000, (v) => {
      count++;
      if (written(v) !== expected(v) && wrong.length < 5) wrong.push(`${expected(v)} written as ${written(v)}`);
    });
    expect(count).toBeGreaterThan(800_000);
    expect(wrong).toEqual([]);
  });

  it('tells the length of what it writes without writing it (numberTextLength), on the same numbers', () => {
    const wrong: string[] = [];
    numberSamples(seededRandom(20261202), 200_000, (v) => {
      if (numberTextLength(v) !== expected(v).length && wrong.length < 5) wrong.push(`${expected(v)}: ${numberTextLength(v)}`);
    });
    for (const v of [0.1, 0.5, 0.25, 1e-6, 1.5e-6, 0.999999999999999, 0.30000000000000004, 2 ** -20, 1, 0, -0, NaN, Infinity, 1e-300, 5e-324, 0.123456789012345]) {
      if (numberTextLength(v) !== expected(v).length) wrong.push(`${expected(v)}: ${numberTextLength(v)}`);
    }
    expect(wrong).toEqual([]);
  });

  it('writes a decimal comma where asked, and nothing for NaN', () => {
    expect(written(0.0123, true)).toBe('0,0123');
    expect(written(1e-7, true)).toBe('1e-7');
    expect(written(2.5e-10, true)).toBe('2,5e-10');
    expect(written(NaN, true)).toBe('');
    expect(written(1, true)).toBe('1');
  });

  it('chooses as String() does between decimals of the same length (examples worked by hand)', () => {
    // 0.1 + 0.2 needs 17 digits; 1/3 needs 16; 2^-20 is a power of two (lopsided interval).
    expect(written(0.1 + 0.2)).toBe('0.30000000000000004');
    expect(written(1 / 3)).toBe('0.3333333333333333');
    expect(written(2 ** -20)).toBe('9.5367431640625e-7');
    expect(written(2 ** -10)).toBe('0.0009765625');
    expect(written(stepsAway(0.1, 1))).toBe('0.10000000000000002');
    expect(written(stepsAway(0.1, -1))).toBe('0.09999999999999999');
    expect(written(stepsAway(1, -1))).toBe('0.9999999999999999');
  });
});

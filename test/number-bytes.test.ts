// The byte-level decimal reader must give exactly what Number() gives, or
// step aside: checked on two million texts (random digit strings with points
// and exponents, and doubles printed the ways statistics programs print them).
import { describe, expect, it } from 'vitest';
import { NOT_SIMPLE, simpleDecimal } from '../src/io/number-bytes.js';
import { seededRandom } from './helpers/random.js';

// The p-value grammar of io/p-value-text.ts, signless.
const DECIMAL = /^(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?$/;

function read(text: string): number {
  const bytes = Buffer.from(text, 'latin1');
  return simpleDecimal(bytes, 0, bytes.length);
}

/** Checks one text; returns whether the fast reader answered. */
function agrees(text: string): boolean {
  const value = read(text);
  if (value === NOT_SIMPLE) return false;
  if (!DECIMAL.test(text) || !Object.is(value, Number(text))) throw new Error(`${JSON.stringify(text)}: read ${value}, Number() gives ${Number(text)}`);
  return true;
}

function digits(random: () => number, count: number): string {
  let text = '';
  for (let i = 0; i < count; i++) text += String(Math.floor(random() * 10));
  return text;
}

describe('simpleDecimal', () => {
  it('reads the usual p-value texts', () => {
    expect(read('0.05')).toBe(0.05);
    expect(read('.05')).toBe(0.05);
    expect(read('5e-3')).toBe(0.005);
    expect(read('5E-03')).toBe(0.005);
    expect(read('1')).toBe(1);
    expect(read('0')).toBe(0);
    expect(read('1.')).toBe(1);
    expect(read('1.23456e-7')).toBe(1.23456e-7);
    expect(read('0.1')).toBe(0.1);
    expect(read('0.3')).toBe(0.3);
  });

  it('leaves everything else to the general reader', () => {
    for (const text of ['', ' 0.05', '0.05 ', '-0.05', '+0.05', 'NA', '0,05', '.', 'e5', '1e', '1e+', '0x10', '1.2.3', '5%', '<2e-16', '"0.1"', 'Infinity', '1e-400', '3.2e-300', '12345678901234567890', '1e0001', '1_0']) {
      expect(read(text), text).toBe(NOT_SIMPLE);
    }
  });

  it('matches Number() on a million random decimal texts', () => {
    const random = seededRandom(20261201);
    let answered = 0;
    for (let i = 0; i < 1_000_000; i++) {
      const whole = digits(random, Math.floor(random() * 6));
      const fraction = digits(random, Math.floor(random() * 19));
      let text = random() < 0.5 ? `${whole}.${fraction}` : whole + fraction;
      if (random() < 0.4) {
        const exponent = String(Math.floor(random() * 40)).padStart(random() < 0.2 ? 2 : 1, '0');
        text += `${random() < 0.5 ? 'e' : 'E'}${['', '+', '-'][Math.floor(random() * 3)]}${exponent}`;
      }
      if (agrees(text)) answered++;
    }
    expect(answered).toBeGreaterThan(500_000);
  });

  it('matches Number() on a million doubles printed as programs print them', () => {
    const random = seededRandom(42);
    let answered = 0;
    for (let i = 0; i < 1_000_000; i++) {
      const value = random() ** (1 + Math.floor(random() * 30));
      const style = i % 5;
      const text =
        style === 0 ? String(value)
        : style === 1 ? value.toPrecision(1 + Math.floor(random() * 17))
        : style === 2 ? value.toExponential(Math.floor(random() * 16))
        : style === 3 ? value.toFixed(Math.floor(random() * 20))
        : value.toPrecision(6);
      if (agrees(text)) answered++;
    }
    // Most printed p-values take the fast path; the rest are still read right, by Number().
    expect(answered).toBeGreaterThan(700_000);
  });

  it('takes the fast path for the values of a table written with 6 significant digits, down to 1e-17', () => {
    const random = seededRandom(3);
    for (let i = 0; i < 100_000; i++) {
      const value = random() < 0.9 ? random() : random() ** 8;
      const text = value.toPrecision(6);
      // Six digits need 10^(e - 5) exact: every printed exponent e from -17 up.
      expect(agrees(text)).toBe(Number(text.split('e')[1] ?? 0) >= -17);
    }
  });
});

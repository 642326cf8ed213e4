// famwise audit's core: reading printed precision, matching, and naming the
// mistake behind claimed values built (here, with famwise's own procedures,
// which are checked against R elsewhere) to carry each one.
import { describe, expect, it } from 'vitest';
import { type Grouping, type Printed, auditClaims, fitTests } from '../src/audit/audit.js';
import { columnHalfUnits, matchesPrinted, matchesRange, significantDigits } from '../src/audit/matching.js';
import { singleFamily } from '../src/families.js';
import { BARE_INTEGER, readPrintedValue } from '../src/io/printed-value.js';
import { type Method, findMethod } from '../src/methods.js';
import { seededRandom } from './helpers/random.js';

const method = (token: string): Method => findMethod(token) as Method;

describe('printed precision', () => {
  it('is half a unit of the last digit written', () => {
    expect(readPrintedValue('0.0123')?.halfUnit).toBeCloseTo(0.00005, 18);
    expect(readPrintedValue('1.23e-05')?.halfUnit).toBeCloseTo(0.005e-5, 20);
    expect(readPrintedValue('5E-3')?.halfUnit).toBeCloseTo(0.0005, 18);
    expect(readPrintedValue('0,05', true)).toEqual({ value: 0.05, halfUnit: expect.closeTo(0.005, 15) });
    expect(readPrintedValue('1.0')?.halfUnit).toBeCloseTo(0.05, 15);
    expect(readPrintedValue('1')?.halfUnit).toBe(BARE_INTEGER);
    expect(readPrintedValue('0')?.halfUnit).toBe(BARE_INTEGER);
    expect(readPrintedValue('abc')).toBeUndefined();
    expect(readPrintedValue('.')).toBeUndefined();
  });

  it('matches a value that rounds to the printed text, and nothing else', () => {
    // 0.0123 stands for [0.01225, 0.01235].
    expect(matchesPrinted(0.012349, 0.0123, 0.00005)).toBe(true);
    expect(matchesPrinted(0.01225, 0.0123, 0.00005)).toBe(true);
    expect(matchesPrinted(0.012351, 0.0123, 0.00005)).toBe(false);
    // Full precision: only the last bits may differ.
    expect(matchesPrinted(0.1 + 0.2, 0.3, 5e-17)).toBe(true);
    expect(matchesPrinted(0.3000001, 0.3, 5e-17)).toBe(false);
  });

  it('compares with the range left by rounded raw p-values', () => {
    // Exact value somewhere in [0.0121, 0.0125]: a claim of 0.012 (printed to 2 digits) fits, 0.014 does not.
    expect(matchesRange(0.0121, 0.0125, 0.012, 0.0005)).toBe(true);
    expect(matchesRange(0.0121, 0.0125, 0.014, 0.0005)).toBe(false);
  });

  it('counts significant digits', () => {
    expect(significantDigits(0.0123, 0.00005)).toBe(3);
    expect(significantDigits(0.5, 0.05)).toBe(1);
    expect(significantDigits(1.23e-5, 0.005e-5)).toBe(3);
  });

  it('reads the precision of a bare 1 or 0 from the rest of the column', () => {
    // A column printed to 2 significant digits: "1" stands for [0.995, 1]; with fixed 3 decimals, "0" for < 0.0005.
    const values = Float64Array.of(0.12, 1, 0.5);
    const settled = columnHalfUnits(values, Float64Array.of(0.005, BARE_INTEGER, 0.05));
    expect(settled[1]).toBeCloseTo(0.005, 15);
    const fixed = columnHalfUnits(Float64Array.of(0.012, 0, 0.5), Float64Array.of(0.0005, BARE_INTEGER, 0.0005));
    expect(fixed[1]).toBeCloseTo(0.0005, 15);
    // Full precision elsewhere: a bare 1 is exact, and so is a short value (0.01 from a shortest round-trip writer).
    const full = columnHalfUnits(Float64Array.of(0.10999999999999999, 1, 0.01), Float64Array.of(5e-18, BARE_INTEGER, 0.005));
    expect(Array.from(full)).toEqual([0, 0, 0]);
  });
});

describe('auditClaims', () => {
  const random = seededRandom(491);
  const n = 400;
  const p = Float64Array.from({ length: n }, (_, i) => (i < 300 ? random() : random() ** 8));
  const chrom = Int32Array.from({ length: n }, () => Math.floor(random() * 3));
  const whole: Grouping = { columns: [], families: singleFamily(n) };
  const byChrom: Grouping = { columns: ['chrom'], families: { ids: chrom, count: 3 } };
  const exact = (values: Float64Array): Printed => ({ values, halfUnits: new Float64Array(values.length) });
  const raw = exact(p);
  const rounded = (values: Float64Array, digits: number): Printed => {
    const printed = values.map((value) => Number(value.toPrecision(digits)));
    const halfUnits = printed.map((value) => 0.5 * 10 ** (Math.floor(Math.log10(value || 1)) - digits + 1));
    return { values: printed, halfUnits };
  };

  it('passes a correct adjustment, also rounded to 4 significant digits, and names the procedure', () => {
    for (const claims of [exact(method('bh').adjust(p)), rounded(method('bh').adjust(p), 4)]) {
      const result = auditClaims(raw, claims, [whole, byChrom], { alpha: 0.05 });
      expect(result.fittingMethods.map((m) => m.token)).toEqual(['bh']);
      expect(result.explanation).toBeUndefined();
    }
  });

  it('names another procedure', () => {
    const result = auditClaims(raw, exact(method('hochberg').adjust(p)), [whole, byChrom], { alpha: 0.05, method: method('bh') });
    expect(result.fittingMethods).toEqual([]);
    expect(result.explanation?.kind).toBe('method');
    expect(result.explanation?.candidate.method.token).toBe('hochberg');
  });

  it('names families the claims were adjusted within', () => {
    const withinChrom = new Float64Array(n);
    for (let c = 0; c < 3; c++) {
      const rows = Array.from(chrom.keys()).filter((row) => chrom[row] === c);
      const adjusted = method('holm').adjust(Float64Array.from(rows, (row) => p[row] as number));
      rows.forEach((row, k) => {
        withinChrom[row] = adjusted[k] as number;
      });
    }
    const result = auditClaims(raw, exact(withinChrom), [whole, byChrom], { alpha: 0.05, method: method('holm') });
    expect(result.explanation?.kind).toBe('families');
    expect(result.explanation?.candidate.grouping.columns).toEqual(['chrom']);
    // And the reverse: claimed over the whole table, stated within chrom.
    const reverse = auditClaims(raw, exact(method('holm').adjust(p)), [byChrom, whole], { alpha: 0.05, method: method('holm') });
    expect(reverse.explanation?.candidate.grouping.columns).toEqual([]);
  });

  it('names the number of tests that fits, fewer (filtered before adjusting) or more', () => {
    const filtered = auditClaims(raw, exact(method('bh').adjust(p)), [whole], { alpha: 0.05, method: method('bh'), tests: 1000 });
    expect(filtered.explanation?.kind).toBe('tests');
    expect(filtered.explanation?.candidate.testsByFamily).toEqual([400]);
    const more = auditClaims(raw, rounded(method('bonferroni').adjust(p, 12345), 6), [whole], { alpha: 0.05, method: method('bonferroni') });
    expect(more.explanation?.candidate.testsByFamily).toEqual([12345]);
    expect(fitTests(raw, exact(method('by').adjust(p, 777)), Array.from(p.keys()), method('by'))).toBe(777);
  });

  it('names rows dropped before adjusting', () => {
    const kept = Array.from(p.keys()).filter((row) => row % 4 !== 0);
    const adjusted = method('bh').adjust(Float64Array.from(kept, (row) => p[row] as number));
    const values = new Float64Array(n).fill(NaN);
    kept.forEach((row, k) => {
      values[row] = adjusted[k] as number;
    });
    const result = auditClaims(raw, exact(values), [whole], { alpha: 0.05, method: method('bh') });
    expect(result.explanation?.kind).toBe('only-claimed-rows');
  });

  it('names rounding that changes decisions at alpha', () => {
    // Bonferroni of the p-value 0.0512 / 400 is 0.0512, printed as 0.05 at one digit.
    const q = Float64Array.from(p);
    q[0] = 0.0512 / n;
    const result = auditClaims(exact(q), rounded(method('bonferroni').adjust(q), 1), [whole], { alpha: 0.05 });
    expect(result.fittingMethods.map((m) => m.token)).toContain('bonferroni');
    expect(result.explanation?.kind).toBe('rounding');
    expect(result.explanation?.comparison.flipped).toContain(0);
  });
});

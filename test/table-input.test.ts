// Reading cells and tables: the number grammar, the missing-value list,
// delimiter sniffing, and within-family adjustment on hand-worked examples.
import { describe, expect, it } from 'vitest';
import { TooFewTestsError, adjustWithinFamilies, singleFamily } from '../src/families.js';
import { sniffDelimiter, sniffLoneCr } from '../src/io/dialect.js';
import { MISSING_MARKS, readPValue, readUpperBound, underflowed, whyNotPValue } from '../src/io/p-value-text.js';
import { readTable } from '../src/io/read-table.js';
import { bufferSource } from '../src/io/source.js';
import { METHODS, findMethod, type Method } from '../src/methods.js';
import { sortAscending } from '../src/procedures/sorting.js';

describe('readPValue', () => {
  it.each([
    ['0.05', 0.05], ['.05', 0.05], ['5E-3', 0.005], ['5e-03', 0.005], [' 0.05 ', 0.05], ['0', 0], ['1', 1], ['1.0', 1],
    ['1e-300', 1e-300], ['1e-400', 0], ['+0.5', 'invalid'], ['0.5.1', 'invalid'], ['1.0000001', 'invalid'], ['-0.01', 'invalid'],
    ['Inf', 'invalid'], ['0x1', 'invalid'], ['5%', 'invalid'], ['<2e-16', 'invalid'], ['0,05', 'invalid'], ['1,000', 'invalid'],
  ])('%j -> %s', (text, expected) => {
    expect(readPValue(text)).toBe(expected);
  });

  it('reads every missing-value mark as missing', () => {
    for (const mark of MISSING_MARKS) expect(readPValue(mark)).toBe('missing');
    expect(readPValue('   ')).toBe('missing');
  });

  it('reads a decimal comma only when asked', () => {
    expect(readPValue('0,05', true)).toBe(0.05);
    expect(readPValue('0.05', true)).toBe(0.05);
    expect(readPValue('1,5', true)).toBe('invalid');
  });
});

describe('underflow, bounds and the reasons given', () => {
  it('tells a positive number that underflowed to 0 from a written zero', () => {
    for (const text of ['1e-400', ' 3.5E-999 ', '0.0001e-330']) expect(underflowed(text, readPValue(text))).toBe(true);
    for (const text of ['0', '0.0', '0e5', '.0', '1e-300', '5e-324', 'NA']) expect(underflowed(text, readPValue(text))).toBe(false);
  });

  it('reads an upper bound as its value, and nothing else', () => {
    expect(readUpperBound('<2e-16')).toBe(2e-16);
    expect(readUpperBound(' < 2.2e-16 ')).toBe(2.2e-16);
    expect(readUpperBound('<=.001')).toBe(0.001);
    expect(readUpperBound('≤0.05')).toBe(0.05);
    expect(readUpperBound('<0,001', true)).toBe(0.001);
    for (const text of ['<0,001', '>0.5', '≥0.1', '<2', '<', '<NA', '0.05', '<<0.1']) expect(readUpperBound(text)).toBeUndefined();
  });

  it('says why a cell is not a p-value, naming the option that would accept a bound', () => {
    expect(whyNotPValue('<2e-16')).toMatch(/bound \("less than"\).*--bounds-as-values/);
    expect(whyNotPValue('< .001')).toMatch(/--bounds-as-values/);
    expect(whyNotPValue('>1')).toMatch(/bound \("greater than"\)/);
    expect(whyNotPValue('5 %')).toMatch(/percentages/);
    expect(whyNotPValue('-Inf')).toMatch(/infinity/);
    expect(whyNotPValue('0,05')).toMatch(/decimal comma.*--delimiter/);
  });
});

describe('sniffDelimiter', () => {
  const sniff = (text: string, extension = '') => String.fromCharCode(sniffDelimiter(Buffer.from(text), extension));
  it('picks the delimiter of the first line, ignoring quoted text', () => {
    expect(sniff('a,b,c\n1\t2\n')).toBe(',');
    expect(sniff('a\tb\tc\n')).toBe('\t');
    expect(sniff('"x, y; z"\tb\n')).toBe('\t');
    expect(sniff('id;p\n0,5;1\n')).toBe(';');
    expect(sniff('p\n0.1\n', 'tsv')).toBe('\t');
    expect(sniff('p\n0.1\n')).toBe(',');
  });

  it('prefers a delimiter that occurs equally often on the first two lines', () => {
    expect(sniff('gene\tnote (a, b, c, d)\tp\nx\ty\t0.1\n', 'tsv')).toBe('\t');
    expect(sniff('gene\tnote (a, b, c, d)\tp\nx\ty\t0.1\n', '')).toBe('\t');
    expect(sniff('gene;fold change (A,B);p\nx;1;0,01\n', 'csv')).toBe(';');
    expect(sniff('id;"a\nb";p\nx;y;0,5\n')).toBe(';');
  });

  it('follows the file name on a tie, the counts otherwise', () => {
    expect(sniff('gene\tnote (a, b)\tp\n', 'tsv')).toBe('\t');
    expect(sniff('gene,note (a\tb),p\n', 'csv')).toBe(',');
    expect(sniff('gene\tnote (a, b, c, d)\tp\n', 'tsv')).toBe(',');
    expect(sniff('a;b;c\n', 'csv')).toBe(';');
  });

  it('looks past a byte-order mark, and reads a quote inside a field as text', () => {
    expect(sniff('\ufeff"gene, name";p\nx;0,01\n')).toBe(';');
    expect(sniff('size (5");a;b\n')).toBe(';');
    expect(sniffLoneCr(Buffer.from('\ufeff"a\rb",c\r\n1,2\r\n'))).toBe(false);
  });
});

describe('sniffLoneCr', () => {
  it('is true only when the first line ends with a lone CR outside quotes', () => {
    expect(sniffLoneCr(Buffer.from('a,b\r1,2\r'))).toBe(true);
    expect(sniffLoneCr(Buffer.from('a,b\r\n1,2\r\n'))).toBe(false);
    expect(sniffLoneCr(Buffer.from('a,b\n1,\r2\n'))).toBe(false);
    expect(sniffLoneCr(Buffer.from('"a\rb",c\n'))).toBe(false);
  });
});

describe('readTable', () => {
  it('keeps p-values and family ids in typed arrays, families in order of first appearance', async () => {
    const table = await readTable(bufferSource(Buffer.from('g,p\nb,0.1\na,NA\nb,0.3\n'), 't'), { familyColumns: ['g'] });
    expect(table.p).toBeInstanceOf(Float64Array);
    expect(Array.from(table.p)).toEqual([0.1, NaN, 0.3]);
    expect(Array.from(table.families.ids)).toEqual([0, 1, 0]);
    expect(table.familyValues).toEqual([['b'], ['a']]);
  });

  it('keeps family values apart when several columns could run together', async () => {
    const table = await readTable(bufferSource(Buffer.from('a,b,p\n"x,y",z,0.1\nx,"y,z",0.2\n'), 't'), { familyColumns: ['a', 'b'] });
    expect(table.families.count).toBe(2);
  });

  it('finds the p-value column by common names', async () => {
    for (const name of ['p', 'P', 'pvalue', 'p_value', 'P.Value', 'pval', 'Pr(>|t|)', 'p-value']) {
      const table = await readTable(bufferSource(Buffer.from(`id,${name},x\na,0.1,2\n`), 't'), {});
      expect(table.pColumn).toBe(1);
    }
  });
});

describe('adjustWithinFamilies', () => {
  const bh = findMethod('bh') as Method;
  const holm = findMethod('holm') as Method;

  it('equals adjusting each family separately, and leaves missing rows NaN', () => {
    const p = Float64Array.of(0.01, 0.2, NaN, 0.03, 0.04, 0.001);
    const ids = Int32Array.of(0, 1, 1, 0, 0, 1);
    const result = adjustWithinFamilies(p, { ids, count: 2 }, [bh, holm], { alpha: 0.05 });
    const family0 = bh.adjust(Float64Array.of(0.01, 0.03, 0.04), 3);
    const family1 = bh.adjust(Float64Array.of(0.2, 0.001), 2);
    expect(Array.from(result.adjusted[0] as Float64Array)).toEqual([family0[0], family1[0], NaN, family0[1], family0[2], family1[1]]);
    expect(result.outcomes[1]?.[0]).toEqual({ tested: 2, missing: 1, m: 2, rejected: 1, threshold: 0.001, pi0: null });
    // Holm in family 0: 3 * 0.01 = 0.03, max(2 * 0.03, 0.03) = 0.06, 0.06: one rejection at 0.05.
    expect(result.outcomes[0]?.[1]).toEqual({ tested: 3, missing: 0, m: 3, rejected: 1, threshold: 0.01, pi0: null });
  });

  it('counts missing p-values in a table that is one family, and leaves their rows NaN', () => {
    const result = adjustWithinFamilies(Float64Array.of(0.01, NaN, 0.04, NaN), singleFamily(4), [bh], { alpha: 0.05 });
    // BH with m = 2: 0.01 * 2 / 1 = 0.02, 0.04 * 2 / 2 = 0.04.
    expect(Array.from(result.adjusted[0] as Float64Array)).toEqual([0.02, NaN, 0.04, NaN]);
    expect(result.outcomes[0]?.[0]).toEqual({ tested: 2, missing: 2, m: 2, rejected: 2, threshold: 0.04, pi0: null });
  });

  it('uses --tests as m in every family', () => {
    const result = adjustWithinFamilies(Float64Array.of(0.001, 0.002), singleFamily(2), [bh], { alpha: 0.05, tests: 100 });
    expect(Array.from(result.adjusted[0] as Float64Array)).toEqual([0.1, 0.1]);
    expect(result.outcomes[0]?.[0]?.m).toBe(100);
  });

  it('takes a number of tests for each family (Bonferroni: m p with each family\'s m)', () => {
    const bonferroni = findMethod('bonferroni') as Method;
    const result = adjustWithinFamilies(Float64Array.of(0.001, 0.002, 0.003), { ids: Int32Array.of(0, 1, 0), count: 2 }, [bonferroni], { alpha: 0.05, tests: [10, 7] });
    expect(Array.from(result.adjusted[0] as Float64Array)).toEqual([0.01, 0.014, 0.03]);
    expect(() => adjustWithinFamilies(Float64Array.of(0.1, 0.2), singleFamily(2), [bonferroni], { alpha: 0.05, tests: [1] })).toThrow(TooFewTestsError);
  });

  it('takes p sorted in two parts (as two threads sort it) for one family with no missing p-value, and ignores it otherwise', () => {
    const p = Float64Array.from({ length: 3000 }, (_, i) => ((i * 7919) % 1000) / 1000);
    const split = 1234;
    const parts = { first: sortAscending(p.subarray(0, split)), second: sortAscending(p.subarray(split)) };
    // Every method, the step procedures only, and one of each: merged, and adjusted as the whole is.
    const steps = METHODS.filter((method) => method.stepForm !== undefined);
    for (const methods of [METHODS, steps, [findMethod('holm') as Method, findMethod('storey') as Method]]) {
      const plain = adjustWithinFamilies(p, singleFamily(p.length), methods, { alpha: 0.05 });
      expect(adjustWithinFamilies(p, singleFamily(p.length), methods, { alpha: 0.05, sortedParts: parts })).toEqual(plain);
      expect(adjustWithinFamilies(p, singleFamily(p.length), methods, { alpha: 0.05, tests: 5000, sortedParts: parts })).toEqual(
        adjustWithinFamilies(p, singleFamily(p.length), methods, { alpha: 0.05, tests: 5000 }),
      );
    }
    // Parts that are not p's would show in the values: so they are not used for two families, or with a missing p-value.
    const wrongPart = { order: new Uint32Array(1500), sorted: new Float64Array(1500) };
    const wrong = { first: wrongPart, second: wrongPart };
    const ids = Int32Array.from(p, (_, i) => i % 2);
    expect(adjustWithinFamilies(p, { ids, count: 2 }, steps, { alpha: 0.05, sortedParts: wrong })).toEqual(adjustWithinFamilies(p, { ids, count: 2 }, steps, { alpha: 0.05 }));
    const gap = p.slice();
    gap[5] = NaN;
    expect(adjustWithinFamilies(gap, singleFamily(p.length), steps, { alpha: 0.05, sortedParts: wrong })).toEqual(adjustWithinFamilies(gap, singleFamily(p.length), steps, { alpha: 0.05 }));
    // And wrong ones for the one family are used as given: the tests above would see them.
    expect(adjustWithinFamilies(p, singleFamily(p.length), METHODS, { alpha: 0.05, sortedParts: wrong })).not.toEqual(adjustWithinFamilies(p, singleFamily(p.length), METHODS, { alpha: 0.05 }));
  });

  it('handles a table with no rows', () => {
    const result = adjustWithinFamilies(new Float64Array(0), singleFamily(0), [bh], { alpha: 0.05 });
    expect(result.outcomes[0]?.[0]).toEqual({ tested: 0, missing: 0, m: 0, rejected: 0, threshold: null, pi0: null });
  });
});

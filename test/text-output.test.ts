// What people read at the terminal: the summary table and --format table.
import { describe, expect, it } from 'vitest';
import { familyLabel, summaryText } from '../src/summary.js';
import { alignedTable } from '../src/text-table.js';

describe('summary text', () => {
  it('tells apart family values that differ only in spaces, and marks empty ones', () => {
    expect(familyLabel({ plate: 'A' })).toBe('plate=A');
    expect(familyLabel({ plate: 'A ' })).toBe('plate="A "');
    expect(familyLabel({ plate: '' })).toBe('plate=""');
    expect(familyLabel({ a: 'x,y', b: 'z' })).toBe('a="x,y", b=z');
    expect(familyLabel(null)).toBe('(all rows)');
  });

  it('shows counts and the largest rejected p-value to four digits', () => {
    const text = summaryText({
      alpha: 0.05,
      rows: [
        { family: null, method: 'bh', tested: 10, missing: 2, m: 10, rejected: 3, threshold: 0.012345678, pi0: null },
        { family: null, method: 'holm', tested: 10, missing: 2, m: 10, rejected: 0, threshold: null, pi0: null },
      ],
    });
    expect(text).toBe(
      [
        'family      method  tested  missing   m  rejected at 0.05  largest rejected p',
        '(all rows)  bh          10        2  10                 3             0.01235',
        '(all rows)  holm        10        2  10                 0                   -',
        '',
      ].join('\n'),
    );
  });
});

describe('aligned tables', () => {
  it('aligns wide characters by the columns they take and shows line breaks as escapes', () => {
    // 日本 takes four columns, like "name" and the escaped "x\ny".
    expect(alignedTable(['name', 'p'], [['日本', '0.5'], ['ab', '0.25'], ['x\ny', 'NA']])).toBe('name     p\n日本   0.5\nab    0.25\nx\\ny    NA\n');
  });
});

// p-values from test statistics and from -log10 p, through the built CLI.
import { describe, expect, it } from 'vitest';
import { famwise } from './helpers/cli.js';

/** The p_raw column of an output without quoted fields, as numbers (NaN where empty; decimal commas read). */
function rawP(stdout: string, delimiter = ','): number[] {
  const [header, ...rows] = stdout.trim().split('\n');
  const column = (header ?? '').split(delimiter).indexOf('p_raw');
  return rows.map((row) => {
    const cell = row.split(delimiter)[column] ?? '';
    return cell === '' ? NaN : Number(cell.replace(',', '.'));
  });
}

function closeTo(actual: number[], expected: number[], relative: number): void {
  expect(actual.length).toBe(expected.length);
  actual.forEach((value, i) => {
    const want = expected[i] as number;
    if (Number.isNaN(want)) expect(value).toBeNaN();
    else expect(Math.abs(value - want) / want, `row ${i + 1}: ${value} vs ${want}`).toBeLessThan(relative);
  });
}

// Critical values from printed percentage-point tables (e.g. Lindley & Scott (1995),
// New Cambridge Statistical Tables, 2nd ed.; from memory), each the 5% point.
describe('statistics to p-values in adjust', () => {
  it('z, two-sided by default, with a column found by its name', () => {
    const run = famwise(['adjust', '--statistic', 'z', '--methods', 'bonferroni', '-q'], 'gene,z_value\na,1.959964\nb,-3.290527\nc,NA\nd,10\n');
    expect(run.status).toBe(0);
    expect(run.stdout.split('\n')[0]).toBe('gene,z_value,p_raw,adj_bonferroni,rej_bonferroni');
    // z = 10 two-sided: R's 2 * pnorm(10, lower.tail = FALSE) (fixtures/reference/upper-tails.json).
    closeTo(rawP(run.stdout), [0.05, 0.001, NaN, 1.5239706048321054e-23], 2e-6);
  });

  it('z one-sided in either direction', () => {
    const upper = famwise(['adjust', '--statistic', 'z', '--tail', 'upper', '-q'], 'z\n1.644854\n-1.644854\n');
    closeTo(rawP(upper.stdout), [0.05, 0.95], 2e-6);
    const lower = famwise(['adjust', '--statistic', 'z', '--tail', 'lower', '-q'], 'z\n1.644854\n-1.644854\n');
    closeTo(rawP(lower.stdout), [0.95, 0.05], 2e-6);
  });

  it('t with constant df, and with df from a column (decimal commas in a ; table)', () => {
    closeTo(rawP(famwise(['adjust', '--statistic', 't', '--df', '10', '-q'], 't_stat\n2.228139\n').stdout), [0.05], 2e-6);
    const run = famwise(['adjust', '--statistic', 't', '--df-column', 'df', '-q'], 'id;t;df\nx;2,228139;10\ny;2,0;NA\n');
    expect(run.status).toBe(0);
    expect(run.stdout).toMatch(/^id;t;df;p_raw;adj_bh;rej_bh\nx;2,228139;10;0,0499999/);
    closeTo(rawP(run.stdout, ';'), [0.05, NaN], 2e-6);
  });

  it('chi-square with 1 df and F with (1, 10) df, both upper-tailed', () => {
    closeTo(rawP(famwise(['adjust', '--statistic', 'chisq', '--df', '1', '-q'], 'chisq\n3.841459\n').stdout), [0.05], 2e-6);
    closeTo(rawP(famwise(['adjust', '--statistic', 'f', '--df', '1', '--df2', '10', '-q'], 'F\n4.964603\n').stdout), [0.05], 2e-6);
    closeTo(rawP(famwise(['adjust', '--statistic', 'F', '--df-column', 'a', '--df2-column', '3', '-q'], 'F,a,b\n4.964603,1,10\n').stdout), [0.05], 2e-6);
  });

  it('a headerless column of statistics, by position', () => {
    const run = famwise(['adjust', '--no-header', '--statistic', 'z', '--statistic-column', '2', '-q'], 'a,1.959964\nb,0\n');
    expect(run.status).toBe(0);
    closeTo(rawP(`x,y,p_raw\n${run.stdout}`), [0.05, 1], 2e-6);
  });

  it('-log10 p-values', () => {
    const run = famwise(['adjust', '--p-scale', 'minus-log10', '--methods', 'bonferroni', '-q'], 'snp,LOG10P\nrs1,2\nrs2,0\nrs3,301\n');
    expect(run.status).toBe(0);
    expect(run.stdout.split('\n')[0]).toBe('snp,LOG10P,p_raw,adj_bonferroni,rej_bonferroni');
    expect(rawP(run.stdout)).toEqual([0.01, 1, 1e-301]);
  });
});

describe('bad statistic cells: file, line, column, text and what is accepted (exit 1)', () => {
  const cases: [string, string[], string, RegExp][] = [
    ['text', ['--statistic', 'z'], 'z\n1.2\nabc\n', /^famwise: <stdin>:3: column "z": "abc" is not a z statistic: expected a number/],
    ['a negative chi-square', ['--statistic', 'chisq', '--df', '2'], 'chisq\n-0.5\n', /<stdin>:2: column "chisq": "-0.5" is not a chi-square statistic: chi-square statistics cannot be negative/],
    ['infinity', ['--statistic', 't', '--df', '3'], 't\nInf\n', /<stdin>:2: column "t": "Inf" is not a t statistic: an infinite value/],
    ['a bad df cell', ['--statistic', 't', '--df-column', 'df'], 't,df\n1,0\n', /<stdin>:2: column "df": "0" is not a number of degrees of freedom: expected a positive number/],
    ['a negative -log10 p', ['--p-scale', 'minus-log10'], 'log10p\n-2\n', /<stdin>:2: column "log10p": "-2" is not a -log10 p-value: -log10 p cannot be negative/],
  ];
  for (const [label, args, input, message] of cases) {
    it(label, () => {
      const run = famwise(['adjust', ...args, '-q'], input);
      expect(run.status).toBe(1);
      expect(run.stdout).toBe('');
      expect(run.stderr).toMatch(message);
    });
  }
});

describe('options that do not fit together (exit 2, naming the option)', () => {
  const cases: [string[], RegExp][] = [
    [['--statistic', 't'], /--statistic t: needs degrees of freedom: --df N for all rows, or --df-column COLUMN/],
    [['--statistic', 'f', '--df', '1'], /--statistic f: needs the denominator degrees of freedom/],
    [['--statistic', 'z', '--df', '3'], /--statistic z: takes no degrees of freedom/],
    [['--statistic', 'chisq', '--df', '1', '--tail', 'two'], /--tail two: chi-square statistics are tested in the upper tail only/],
    [['--statistic', 't', '--df', '3', '--df-column', 'df'], /--df and --df-column: give one or the other/],
    [['--df', '3'], /--df needs --statistic/],
    [['--tail', 'upper'], /--tail needs --statistic/],
    [['--statistic', 'w'], /--statistic "w": accepts z, t, chisq, f/],
    [['--statistic', 'z', '--p-column', 'z'], /--p-column and --statistic: name the column of statistics with --statistic-column/],
    [['--statistic', 'z', '--p-scale', 'minus-log10'], /--p-scale and --statistic/],
    [['--p-scale', 'log'], /--p-scale "log": accepts plain or minus-log10/],
    [['--statistic', 't', '--df', '-2'], /--df "-2": needs a positive number of degrees of freedom/],
    [['--statistic', 'z', '--statistic-column', 'zz'], /--statistic-column "zz": no such column/],
    [['--statistic', 't', '--statistic-column', 'z', '--df-column', 'dof'], /--df-column "dof": no such column/],
  ];
  for (const [args, message] of cases) {
    it(args.join(' '), () => {
      const run = famwise(['adjust', ...args, '-q'], 'z,df\n1,3\n');
      expect(run.status).toBe(2);
      expect(run.stderr).toMatch(message);
    });
  }

  it('says which names it looked for when no column is named like the statistic', () => {
    const run = famwise(['adjust', '--statistic', 't', '--df', '4'], 'gene,score\na,1\n');
    expect(run.status).toBe(2);
    expect(run.stderr).toMatch(/no column is named like a t statistic column \(t, tstat, tvalue, tstatistic, \.\.\.\); name it with --statistic-column; the columns are "gene", "score"/);
  });
});

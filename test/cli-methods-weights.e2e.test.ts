// The built command line: `famwise methods`, the new procedures' columns,
// and --weights, run as a user would.
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { METHODS } from '../src/methods.js';
import { expectRefusal, famwise } from './helpers/cli.js';

describe('famwise methods', () => {
  it('--json lists every procedure in the registry with its traits', () => {
    const run = famwise(['methods', '--json']);
    expect(run.status).toBe(0);
    const list = JSON.parse(run.stdout) as Record<string, unknown>[];
    expect(list.map((entry) => entry.token)).toEqual(METHODS.map((method) => method.token));
    for (const entry of list) {
      expect(Object.keys(entry)).toEqual(['token', 'name', 'controls', 'dependence', 'steps', 'weighted', 'source']);
      expect(['FWER', 'FDR']).toContain(entry.controls);
      expect(['single-step', 'step-down', 'step-up', 'closed testing']).toContain(entry.steps);
      expect(entry.source).toMatch(/\(\d{4}\)/);
    }
    expect(list.filter((entry) => entry.weighted).map((entry) => entry.token)).toEqual(['bonferroni', 'holm', 'bh']);
  });

  it('prints a block per procedure that fits an 80-column terminal', () => {
    const run = famwise(['methods']);
    expect(run.status).toBe(0);
    for (const method of METHODS) expect(run.stdout).toContain(`${method.token} `);
    expect(run.stdout).toMatch(/hommel +Hommel \(FWER, closed testing\)\n +valid under independence or positive dependence \(PRDS\)\n +Hommel \(1988\), Biometrika 75:383-386/);
    for (const line of run.stdout.split('\n')) expect([...line].length).toBeLessThanOrEqual(80);
  });

  it('refuses options it does not have, with the usage status', () => {
    const run = famwise(['methods', '--all']);
    expect(run.status).toBe(2);
    expect(run.stderr).toMatch(/unknown option '--all'/);
  });
});

describe('the new procedures on the command line', () => {
  it('writes adj_/rej_ columns for sidak, holm-sidak and hommel, dashes as underscores', () => {
    const run = famwise(['adjust', '--methods', 'sidak,holm-sidak,hommel', '--format', 'csv'], 'p\n0.01\n0.04\n0.03\n');
    expect(run.status).toBe(0);
    const [header, ...rows] = run.stdout.trim().split('\n');
    expect(header).toBe('p,adj_sidak,rej_sidak,adj_holm_sidak,rej_holm_sidak,adj_hommel,rej_hommel');
    // Šidák of 0.01 with m = 3: 1 - 0.99^3 = 0.029701. Hommel by closed testing, by hand: H(0.01) is
    // bounded by Simes over {all three}: min(3(0.01), 3(0.03)/2, 0.04) = 0.03; the other two by 0.04.
    expect(Number(rows[0]?.split(',')[1])).toBeCloseTo(0.029701, 12);
    expect(rows.map((row) => row.split(',')[5])).toEqual(['0.03', '0.04', '0.04']);
  });
});

describe('--weights', () => {
  const table = 'gene,p,prior\nA,0.01,2\nB,0.02,1\nC,0.03,0.5\nD,0.04,0.5\n';

  it('weights Bonferroni, Holm and BH by the column, and the summary says how', () => {
    const run = famwise(['adjust', '--weights', 'prior', '--methods', 'bonferroni,holm,bh', '--format', 'csv'], table);
    expect(run.status).toBe(0);
    const rows = run.stdout.trim().split('\n').slice(1).map((row) => row.split(','));
    // Worked by hand in test/weighted.test.ts: m p / w = 0.02, 0.08, 0.24, 0.32.
    expect(rows.map((row) => row[3])).toEqual(['0.02', '0.08', '0.24', '0.32']);
    expect(rows.map((row) => row[6])).toEqual(['true', 'true', 'false', 'false']);
    expect(run.stderr).toContain('weighted by column "prior", normalised to mean 1 within each family');
  });

  it('records the weights in the JSON summary', () => {
    const run = famwise(['adjust', '--weights', '3', '--summary', '/dev/stderr', '-q', '-o', '/dev/null'], table);
    expect(run.status).toBe(0);
    expect(JSON.parse(run.stderr).weights).toEqual({ column: 'prior', normalisation: 'mean 1 within each family' });
  });

  it.each([
    ['a method without a weighted form', ['--methods', 'bh,hommel'], table, 2, /--weights: hommel has no weighted form; the weighted procedures are bonferroni, holm, bh/],
    ['--tests', ['--tests', '10'], table, 2, /--weights cannot be combined with --tests/],
    ['a negative weight', [], 'p,prior\n0.01,1\n0.02,-0.5\n', 1, /<stdin>:3: column "prior": "-0.5" is not a weight: weights cannot be negative/],
    ['a missing weight', [], 'p,prior\n0.01,1\n0.02,NA\n', 1, /<stdin>:3: column "prior": the weight is missing on a row with a p-value/],
    ['text for a weight', [], 'p,prior\n0.01,high\n', 1, /<stdin>:2: column "prior": "high" is not a weight: expected a number >= 0/],
    ['all weights zero', [], 'p,prior\n0.01,0\n0.02,0\n', 1, /every weight in the table is zero/],
    ['no such column', ['--weights', 'priors'], table, 2, /--weights "priors": no such column/],
  ])('refuses %s', (_what, args, input, status, message) => expectRefusal(['adjust', '--weights', 'prior', ...args], input, status, message));

  it('accepts a missing weight where the p-value is missing too', () => {
    const run = famwise(['adjust', '--weights', 'prior', '--format', 'csv'], 'p,prior\n0.01,1\nNA,\n0.02,3\n');
    expect(run.status).toBe(0);
    expect(run.stdout.split('\n')[2]).toBe('NA,,,');
  });

  it('normalises within each family', () => {
    const run = famwise(['adjust', '--weights', 'w', '--family', 'f', '--methods', 'bonferroni', '--format', 'csv'], 'f,p,w\na,0.01,1\nb,0.02,9\na,0.04,3\n');
    expect(run.status).toBe(0);
    // Family a: weights 1, 3 -> 0.5, 1.5; m = 2: 2(0.01)/0.5 = 0.04. Family b alone: 0.02.
    expect(run.stdout.split('\n').slice(1, 3)).toEqual(['a,0.01,1,0.04,true', 'b,0.02,9,0.02,true']);
  });
});

describe("the README's Methods table", () => {
  it('is what famwise methods prints, row for row', () => {
    const readme = readFileSync(new URL('../README.md', import.meta.url), 'utf8');
    const start = readme.indexOf('| token | procedure | controls |');
    const rows = readme
      .slice(start)
      .split('\n')
      .slice(2)
      .filter((line, i, all) => all.slice(0, i + 1).every((row) => row.startsWith('| `')))
      .map((line) => line.split(' | ').map((cell) => cell.replace(/^\| /, '').replace(/ \|$/, '')));
    const dash = (text: string): string => text.replace(/(\d)-(\d)/g, '$1–$2');
    expect(rows.map((row) => row[0])).toEqual(METHODS.map((method) => `\`${method.token}\``));
    rows.forEach((row, i) => {
      const method = METHODS[i] as (typeof METHODS)[number];
      expect(row.slice(1, 5)).toEqual([method.name, method.controls, method.dependence, method.steps]);
      expect(row[5]?.trim()).toBe(method.adjustWeighted ? 'yes' : '');
      expect(row[6]).toBe(dash(method.source));
    });
  });
});

describe('bad weights on several rows', () => {
  it('are all counted in the one error, as bad p-values are', () => {
    expectRefusal(['adjust', '--weights', 'w'], 'p,w\n0.1,-1\n0.2,x\n0.3,1\n', 1, /<stdin>:2: column "w": "-1" is not a weight: .*; 1 more row is refused too \(line 3\)/);
  });
});

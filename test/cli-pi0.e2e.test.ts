// famwise adjust with the adaptive FDR methods (storey, bky) and the pi0
// options, end to end through the built CLI.
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { famwise } from './helpers/cli.js';
import { seededRandom } from './helpers/random.js';
import { removeTemporaryFolders, temporaryFolder } from './helpers/temporary-folder.js';

afterAll(removeTemporaryFolders);

const work = temporaryFolder('famwise-pi0-');

// Two families of 200 tests: in "deep" 40% are real effects, in "flat" none.
const random = seededRandom(31);
const rows = ['screen,id,p'];
for (const screen of ['deep', 'flat']) {
  for (let i = 0; i < 200; i++) rows.push(`${screen},${screen}${i},${screen === 'deep' && i < 80 ? random() ** 12 : random()}`);
}
const table = `${rows.join('\n')}\n`;

describe('storey and bky in a run', () => {
  it('adds adj_/rej_ columns, reports pi0 per family in the JSON summary (null for other methods)', () => {
    const summaryPath = join(work, 'summary.json');
    const run = famwise(['adjust', '--family', 'screen', '--methods', 'bh,storey,bky', '--summary', summaryPath], table);
    expect(run.status).toBe(0);
    expect(run.stdout.split('\n')[0]).toBe('screen,id,p,adj_bh,rej_bh,adj_storey,rej_storey,adj_bky,rej_bky');
    const summary = JSON.parse(readFileSync(summaryPath, 'utf8')) as { rows: { family: { screen: string }; method: string; rejected: number; pi0: unknown }[] };
    const storeyRows = summary.rows.filter((row) => row.method === 'storey');
    expect(storeyRows.map((row) => row.family.screen)).toEqual(['deep', 'flat']);
    for (const row of storeyRows) {
      expect(row.pi0).toMatchObject({ estimator: 'fixed', tuning: { lambda: 0.5 }, fallback: null });
    }
    const deep = storeyRows[0]?.pi0 as { value: number };
    expect(deep.value).toBeGreaterThan(0.5);
    expect(deep.value).toBeLessThan(0.75);
    expect(summary.rows.filter((row) => row.method !== 'storey').every((row) => row.pi0 === null)).toBe(true);
    // The text summary shows the estimate, the estimator and its tuning.
    expect(run.stderr).toMatch(/screen=deep\s+storey\s+200\s+0\s+200\s+\d+\s+\S+\s+0\.\d+ fixed lambda=0\.5\n/);
    expect(run.stderr).toMatch(/screen=deep\s+bh\s+.*\s-\n/);
    // The deep screen gains from estimating pi0: storey rejects at least as many as BH.
    const rejected = (method: string): number => summary.rows.find((row) => row.family.screen === 'deep' && row.method === method)?.rejected ?? -1;
    expect(rejected('storey')).toBeGreaterThanOrEqual(rejected('bh'));
    expect(rejected('bky')).toBeGreaterThanOrEqual(rejected('bh'));
  });

  it('shows no pi0 column when no method estimates pi0', () => {
    const run = famwise(['adjust', '--methods', 'bh'], table);
    expect(run.stderr).not.toMatch(/pi0/);
  });

  it('chooses the estimator with --pi0, and the bootstrap is the same run after run', () => {
    const spline = famwise(['adjust', '--family', 'screen', '--methods', 'storey', '--pi0', 'spline'], table);
    expect(spline.status).toBe(0);
    expect(spline.stderr).toMatch(/spline lambda=0\.95 df=3/);
    const once = famwise(['adjust', '--methods', 'storey', '--pi0', 'bootstrap-mse', '--pi0-seed', '17'], table);
    const again = famwise(['adjust', '--methods', 'storey', '--pi0', 'bootstrap-mse', '--pi0-seed', '17'], table);
    expect(once.status).toBe(0);
    expect(once.stdout).toBe(again.stdout);
    expect(once.stderr).toMatch(/bootstrap-mse lambda=0\.\d+ seed=17 resamples=100/);
    const lambda = famwise(['adjust', '--methods', 'storey', '--pi0-lambda', '0.7', '--quiet'], 'p\n0.5\n0.8\n0.9\n0.2\n0.01\n0.75\n0.95\n0.3\n0.6\n0.72\n');
    // Above 0.7: 0.8, 0.9, 0.75, 0.95, 0.72 -> 5 / (10 * 0.3) = 1.67, capped at 1: the q-values are BH's.
    expect(lambda.stdout.split('\n')[5]).toBe('0.01,0.1,false');
  });
});

describe('fallback warnings are never silent', () => {
  it('warns on standard error, even with --quiet, and records the reason in the JSON summary', () => {
    const summaryPath = join(work, 'fallback.json');
    const run = famwise(['adjust', '--values', '0.01,0.02,0.03', '--methods', 'storey', '--quiet', '-o', join(work, 'fallback.csv'), '--summary', summaryPath]);
    expect(run.status).toBe(0);
    expect(run.stderr).toBe(
      'famwise: warning: (all rows), storey: pi0 is not estimated from 3 tests (the fixed estimator needs at least 10); pi0 = 1 used instead, as Benjamini-Hochberg assumes\n',
    );
    const row = (JSON.parse(readFileSync(summaryPath, 'utf8')) as { rows: { pi0: { value: number; fallback: string } }[] }).rows[0];
    expect(row?.pi0.value).toBe(1);
    expect(row?.pi0.fallback).toMatch(/needs at least 10/);
  });

  it('names the family whose estimate fell back, and marks it in the summary', () => {
    const small = 'g,p\na,0.01\na,0.02\nb,0.5\n' + Array.from({ length: 12 }, (_, i) => `c,${(i + 1) / 100}`).join('\n') + '\n';
    const run = famwise(['adjust', '--family', 'g', '--methods', 'storey'], small);
    expect(run.stderr).toMatch(/famwise: warning: g=a, storey: pi0 is not estimated from 2 tests/);
    expect(run.stderr).toMatch(/famwise: warning: g=b, storey: pi0 is not estimated from 1 test \(/);
    expect(run.stderr).toMatch(/famwise: warning: g=c, storey: the fixed estimate of pi0 is 0 at lambda = 0\.5: too few p-values above lambda/);
    expect(run.stderr).toMatch(/g=c\s+storey\s+.*1 fixed lambda=0\.5 \(fallback\)/);
  });
});

describe('pi0 option errors name the option (exit status 2)', () => {
  it.each([
    [['--methods', 'bh', '--pi0', 'spline'], /^famwise: --pi0: sets how pi0 is estimated, which only storey does \(bky has its own first stage\); add it to --methods\n/],
    [['--methods', 'bky', '--pi0-seed', '3'], /^famwise: --pi0-seed: sets how pi0 is estimated, which only storey does/],
    [['--methods', 'storey', '--pi0', 'spline', '--pi0-lambda', '0.3'], /^famwise: --pi0-lambda: applies to --pi0 fixed only; --pi0 spline chooses its own lambda\n/],
    [['--methods', 'storey', '--pi0-seed', '3'], /^famwise: --pi0-seed: applies to --pi0 bootstrap-mse only/],
    [['--methods', 'storey', '--pi0-lambda', '1'], /^famwise: --pi0-lambda "1": needs a tuning value from 0 up to \(not including\) 1, such as 0\.5\n/],
    [['--methods', 'storey', '--pi0-lambda', 'half'], /^famwise: --pi0-lambda "half": needs a tuning value/],
    [['--methods', 'storey', '--pi0-lambda', ''], /^famwise: --pi0-lambda "": needs a tuning value/],
    [['--methods', 'storey', '--pi0', 'bootstrap-mse', '--pi0-seed', '-4'], /--pi0-seed/],
    [['--methods', 'storey', '--pi0', 'bootstrap-mse', '--pi0-seed', '4294967296'], /^famwise: --pi0-seed "4294967296": needs a whole number from 0 to 4294967295\n/],
    [['--methods', 'storey', '--pi0', 'smooth'], /--pi0 <estimator>' argument 'smooth' is invalid\. Allowed choices are fixed, spline, bootstrap-mse/],
  ])('%j', (args, message) => {
    const run = famwise(['adjust', '--values', '0.1,0.2', ...args]);
    expect(run.status).toBe(2);
    expect(run.stderr).toMatch(message);
    expect(run.stdout).toBe('');
  });

  it('lists the pi0 options in the help', () => {
    const help = famwise(['adjust', '--help']).stdout;
    expect(help).toMatch(/--pi0 <estimator>[^-]*choices:\s+"fixed",\s+"spline",\s+"bootstrap-mse"/);
    expect(help).toMatch(/--pi0-lambda <value>/);
    expect(help).toMatch(/--pi0-seed <n>/);
  });
});

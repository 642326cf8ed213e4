// famwise audit, run as a user would, on tables whose adjusted columns were
// computed by R's stats::p.adjust (fixtures/reference/make-audit-tables.R;
// provenance in fixtures/reference/audit/provenance.json).
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { expectRefusal, famwise } from './helpers/cli.js';

const fixture = (name: string): string => fileURLToPath(new URL(`../fixtures/reference/audit/${name}`, import.meta.url));
const adjusted = fixture('adjusted.csv');

describe('famwise audit on tables adjusted by R', () => {
  it.each([
    ['r_bonferroni', 'bonferroni'],
    ['r_holm', 'holm'],
    ['r_hochberg', 'hochberg'],
    ['r_hommel', 'hommel'],
    ['r_bh', 'bh'],
    ['r_by', 'by'],
    ['bh_4_digits', 'bh'],
  ])('passes column %s and names %s as the procedure', (column, token) => {
    const run = famwise(['audit', adjusted, '--adjusted-column', column, '--json']);
    expect(run.status).toBe(0);
    const report = JSON.parse(run.stdout);
    expect(report.verdict).toBe('match');
    expect(report.method).toBe(token);
    expect(report.matchingMethods).toEqual([token]);
    expect(report.matched).toBe(600);
  });

  it('passes with the right --method, in words', () => {
    const run = famwise(['audit', adjusted, '--adjusted-column', 'bh_4_digits', '--method', 'BH']);
    expect(run.status).toBe(0);
    expect(run.stdout).toContain('bh reproduces 600 of 600 claimed values, printed to 4 significant digits');
    expect(run.stdout).toMatch(/verdict: match \(bh\)\n$/);
  });

  it.each([
    ['another procedure', ['--adjusted-column', 'r_hochberg', '--method', 'bh'], 'method', /the values are hochberg, not bh/],
    ['families it was not told about', ['--adjusted-column', 'bh_by_chrom', '--method', 'bh'], 'families', /adjusted within families by chrom, not over the whole table/],
    ['more tests than the table holds', ['--adjusted-column', 'bh_m_5000', '--method', 'bh'], 'tests', /adjusted over 5000 tests, more than the 600 p-values the table holds/],
    ['rounding that changes decisions', ['--adjusted-column', 'bonferroni_1_digit', '--method', 'bonferroni'], 'rounding', /rounded to 1 significant digit, and 1 of them falls on the other side of alpha = 0.05 from the exact value \(line 601: printed 0.05, exact 0.0512\)/],
  ])('names %s and exits 3', (_what, args, kind, text) => {
    const run = famwise(['audit', adjusted, ...args]);
    expect(run.status).toBe(3);
    expect(run.stdout).toMatch(text);
    expect(run.stdout).toMatch(/verdict: mismatch\n$/);
    const json = famwise(['audit', adjusted, ...args, '--json']);
    expect(json.status).toBe(3);
    expect(JSON.parse(json.stdout).explanation.kind).toBe(kind);
  });

  it('names a table filtered before adjusting, given the real number of tests', () => {
    const run = famwise(['audit', fixture('filtered-then-adjusted.csv'), '--adjusted-column', 'bh', '--tests', '600', '--json']);
    expect(run.status).toBe(3);
    const report = JSON.parse(run.stdout);
    expect(report.explanation.kind).toBe('tests');
    expect(report.explanation.tests).toEqual([340]);
    expect(report.explanation.text).toMatch(/adjusted over 340 tests, not the 600 given by --tests: the table was filtered before adjusting/);
    expect(report.mismatches[0]).toMatchObject({ line: 2 });
  });

  it('passes a table whose raw p-values were printed to 3 significant digits', () => {
    const run = famwise(['audit', fixture('rounded-p.csv'), '--adjusted-column', 'padj', '--method', 'bh']);
    expect(run.stdout).toContain('bh reproduces 400 of 400 claimed values, printed to 3 significant digits');
    expect(run.status).toBe(0);
  });

  it('names rows filtered before adjusting, and --only-adjusted-rows audits the rest', () => {
    const args = ['audit', fixture('independent-filter.csv'), '--adjusted-column', 'padj', '--method', 'bh'];
    const named = famwise([...args, '--json']);
    expect(named.status).toBe(3);
    expect(JSON.parse(named.stdout).explanation.kind).toBe('only-claimed-rows');
    expect(JSON.parse(named.stdout).explanation.text).toMatch(/filter that is independent of the p-values under the null .* --only-adjusted-rows/);
    const only = famwise([...args, '--only-adjusted-rows']);
    expect(only.status).toBe(0);
    expect(only.stdout).toMatch(/rows without an adjusted value left out/);
  });

  it('names values that were not adjusted at all', () => {
    const rows = Array.from({ length: 40 }, (_, i) => `g${i},${((i + 1) / 41).toFixed(4)},${((i + 1) / 41).toFixed(4)}`);
    const run = famwise(['audit', '--adjusted-column', 'padj', '--method', 'bh'], `id,p,padj\n${rows.join('\n')}\n`);
    expect(run.status).toBe(3);
    expect(run.stdout).toContain('the values are the raw p-values, not adjusted at all (40 of 40');
  });

  it('says when the explanation also needs another procedure', () => {
    // Bonferroni at m = 5000 for 600 rows is neither bh nor m = 600.
    const table = famwise(['adjust', adjusted, '--p-column', 'p', '--methods', 'bonferroni', '--tests', '5000', '--format', 'csv', '-q']).stdout;
    const run = famwise(['audit', '--adjusted-column', 'adj_bonferroni', '--p-column', 'p', '--method', 'bh'], table);
    expect(run.status).toBe(3);
    expect(run.stdout).toMatch(/adjusted over 5000 tests, and with bonferroni, not bh, .* --tests 5000 --method bonferroni/);
  });

  it('tries other families even when --tests is smaller than the whole table', () => {
    const run = famwise(['audit', adjusted, '--adjusted-column', 'bh_by_chrom', '--family', 'chrom', '--method', 'holm', '--tests', '300']);
    expect(run.status).toBe(3);
    expect(run.stderr).toBe('');
  });

  it('gives the same bytes on every run (deterministic)', () => {
    const first = famwise(['audit', adjusted, '--adjusted-column', 'bh_by_chrom', '--json']);
    const second = famwise(['audit', adjusted, '--adjusted-column', 'bh_by_chrom', '--json']);
    expect(second.stdoutBytes.equals(first.stdoutBytes)).toBe(true);
  });
});

describe('famwise audit: errors', () => {
  it.each([
    ['no --adjusted-column', ['audit'], 'p,q\n0.1,0.2\n', 2, /--adjusted-column: is required/],
    ['an unknown column', ['audit', '--adjusted-column', 'padj'], 'p,q\n0.1,0.2\n', 2, /--adjusted-column "padj": no such column/],
    ['the p column as the adjusted column', ['audit', '--adjusted-column', 'p'], 'p,q\n0.1,0.2\n', 2, /is the raw p-value column/],
    ['an unknown method', ['audit', '--adjusted-column', 'q', '--method', 'fdr'], 'p,q\n0.1,0.2\n', 2, /--method "fdr": is not a method/],
    ['a claimed value that is not a number', ['audit', '--adjusted-column', 'q'], 'p,q\n0.1,0.2\n0.2,high\n', 1, /<stdin>:3: column "q": "high" is not an adjusted p-value/],
    ['a claimed value above 1', ['audit', '--adjusted-column', 'q'], 'p,q\n0.1,1.2\n', 1, /<stdin>:2: column "q": "1.2" is not an adjusted p-value/],
  ])('refuses %s', (_what, args, input, status, message) => expectRefusal(args, input, status, message));

  it('reports rows with a p-value but no claimed value as mismatches', () => {
    const run = famwise(['audit', '--adjusted-column', 'q', '--method', 'bonferroni'], 'p,q\n0.01,0.02\n0.5,\n');
    expect(run.status).toBe(3);
    expect(run.stdout).toContain('1 row has a p-value but no claimed value');
    expect(run.stdout).toContain('line 3: p 0.5, claimed (none)');
  });
});

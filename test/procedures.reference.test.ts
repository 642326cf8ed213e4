// The procedures against values from outside the project.
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { METHODS, findMethod } from '../src/methods.js';

interface ReferenceCase {
  name: string;
  n?: number | null;
  p: (number | null)[];
  adjusted: Record<string, (number | null)[]>;
}

interface Reference {
  provenance: Record<string, string>;
  cases: ReferenceCase[];
}

function readReference(file: string): Reference {
  return JSON.parse(readFileSync(new URL(`../fixtures/reference/${file}`, import.meta.url), 'utf8')) as Reference;
}

function expectClose(actual: number | undefined, expected: number | null | undefined, where: string): void {
  if (typeof actual !== 'number' || typeof expected !== 'number') expect.fail(`${where}: got ${actual}, reference gives ${expected}`);
  const scale = Math.max(Math.abs(expected), Number.MIN_VALUE);
  // Written so that NaN fails too.
  if (!(Math.abs(actual - expected) / scale <= 1e-12)) expect.fail(`${where}: got ${actual}, reference gives ${expected}`);
}

/** Every method a fixture holds, on every case, to 1e-12 relative; missing p-values stay missing. */
function agreesWith(reference: Reference): void {
  for (const referenceCase of reference.cases) {
    for (const token of Object.keys(referenceCase.adjusted)) {
      it(`${token}: ${referenceCase.name}`, () => {
        const method = findMethod(token);
        if (method === undefined) expect.fail(`the fixture has ${token}, which is not a method`);
        const present = referenceCase.p.flatMap((value, i) => (value === null ? [] : [i]));
        const p = Float64Array.from(present, (i) => referenceCase.p[i] as number);
        const adjusted = method.adjust(p, referenceCase.n ?? p.length);
        const expected = referenceCase.adjusted[token];
        expect(expected).toHaveLength(referenceCase.p.length);
        expect(adjusted).toHaveLength(present.length);
        present.forEach((row, k) => expectClose(adjusted[k], expected?.[row], `row ${row}`));
        referenceCase.p.forEach((value, row) => {
          if (value === null) expect(expected?.[row]).toBeNull();
        });
      });
    }
  }
}

describe('agreement with R stats::p.adjust to 1e-12 relative', () => {
  // Source: R's stats::p.adjust (Debian r-base-core), written by the committed
  // script fixtures/reference/make-p-adjust.R; provenance is inside the file.
  const reference = readReference('p-adjust.json');
  it('has the provenance recorded and covers every classic method', () => {
    expect(reference.provenance.library).toBe('R stats::p.adjust');
    expect(reference.provenance.version).toMatch(/^R version/);
    expect(Object.keys(reference.cases[0]?.adjusted ?? {}).sort()).toEqual(['bh', 'bonferroni', 'by', 'hochberg', 'holm', 'hommel']);
  });
  agreesWith(reference);
});

describe('agreement with statsmodels multipletests to 1e-12 relative', () => {
  // Source: statsmodels.stats.multitest.multipletests (Debian
  // python3-statsmodels), written by the committed script
  // fixtures/reference/make-sidak.py; provenance is inside the file.
  const reference = readReference('sidak.json');
  it('has the provenance recorded', () => {
    expect(reference.provenance.library).toBe('statsmodels.stats.multitest.multipletests');
    expect(Object.keys(reference.cases[0]?.adjusted ?? {}).sort()).toEqual(['holm-sidak', 'hommel', 'sidak']);
  });
  agreesWith(reference);
});

describe('Benjamini & Hochberg (1995), J. R. Stat. Soc. B 57:289-300, section 4 worked example', () => {
  // The 15 p-values of the paper's example, as we remember them (from memory,
  // and the same vector is in the R fixture above). The paper reports that at
  // level 0.05 the BH procedure rejects 4 hypotheses while the Bonferroni-type
  // procedures reject 3.
  const p = Float64Array.from([
    0.0001, 0.0004, 0.0019, 0.0095, 0.0201, 0.0278, 0.0298, 0.0344, 0.0459, 0.324, 0.4262, 0.5719, 0.6528, 0.759, 1.0,
  ]);
  const rejectedAt = (token: string, alpha: number): number =>
    Array.from(findMethod(token)?.adjust(p, p.length) ?? []).filter((value) => value <= alpha).length;

  it('BH rejects 4 at 0.05', () => expect(rejectedAt('bh', 0.05)).toBe(4));
  it('Bonferroni rejects 3 at 0.05', () => expect(rejectedAt('bonferroni', 0.05)).toBe(3));
  it('Holm rejects 3 at 0.05', () => expect(rejectedAt('holm', 0.05)).toBe(3));
  it('Hochberg rejects 3 at 0.05', () => expect(rejectedAt('hochberg', 0.05)).toBe(3));
});

// The procedures against values from outside the project.
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { METHODS, findMethod } from '../src/methods.js';

interface ReferenceCase {
  name: string;
  n: number | null;
  p: (number | null)[];
  adjusted: Record<string, (number | null)[]>;
}

// Source: R's stats::p.adjust (Debian r-base-core), written by the committed
// script fixtures/reference/make-p-adjust.R; provenance is inside the file.
const reference = JSON.parse(readFileSync(new URL('../fixtures/reference/p-adjust.json', import.meta.url), 'utf8')) as {
  provenance: Record<string, string>;
  cases: ReferenceCase[];
};

function expectClose(actual: number | undefined, expected: number | null | undefined, where: string): void {
  if (typeof actual !== 'number' || typeof expected !== 'number') expect.fail(`${where}: got ${actual}, R gives ${expected}`);
  const scale = Math.max(Math.abs(expected), Number.MIN_VALUE);
  // Written so that NaN fails too.
  if (!(Math.abs(actual - expected) / scale <= 1e-12)) expect.fail(`${where}: got ${actual}, R gives ${expected}`);
}

describe('agreement with R stats::p.adjust to 1e-12 relative', () => {
  it('has the provenance recorded', () => {
    expect(reference.provenance.library).toBe('R stats::p.adjust');
    expect(reference.provenance.version).toMatch(/^R version/);
  });
  for (const referenceCase of reference.cases) {
    // p.adjust has no adaptive procedures (storey, bky): their references are in their own specs.
    for (const method of METHODS.filter((candidate) => candidate.token in referenceCase.adjusted)) {
      it(`${method.token}: ${referenceCase.name}`, () => {
        const present = referenceCase.p.flatMap((value, i) => (value === null ? [] : [i]));
        const p = Float64Array.from(present, (i) => referenceCase.p[i] as number);
        const adjusted = method.adjust(p, referenceCase.n ?? p.length);
        const expected = referenceCase.adjusted[method.token];
        expect(expected).toHaveLength(referenceCase.p.length);
        expect(adjusted).toHaveLength(present.length);
        present.forEach((row, k) => expectClose(adjusted[k], expected?.[row], `row ${row}`));
        // R leaves missing p-values missing.
        referenceCase.p.forEach((value, row) => {
          if (value === null) expect(expected?.[row]).toBeNull();
        });
      });
    }
  }
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

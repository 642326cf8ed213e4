// What a TypeScript user imports from the package entry.
import { describe, expect, it } from 'vitest';
import * as famwise from '../src/index.js';

describe('library API', () => {
  it('exposes the procedures, the registry and within-family adjustment', () => {
    expect(famwise.METHOD_TOKENS).toEqual(['bonferroni', 'holm', 'hochberg', 'bh', 'by']);
    expect(Array.from(famwise.adjustHolm(Float64Array.of(0.01, 0.04, 0.03)))).toEqual([0.03, 0.06, 0.06]);
    const result = famwise.adjustWithinFamilies(Float64Array.of(0.01, 0.02), famwise.singleFamily(2), famwise.METHODS, { alpha: 0.05 });
    expect(result.adjusted).toHaveLength(famwise.METHODS.length);
  });

  it('exposes p-values from statistics and the diagnostics', () => {
    expect(famwise.pFromStatistic('z', 'two', 1.959964)).toBeCloseTo(0.05, 7);
    const inspection = famwise.inspectFamily(Float64Array.of(0, 0.2, 0.7), 0, 10);
    expect(inspection.findings.map((finding) => finding.id)).toEqual(['exact-zeros']);
    expect(famwise.FINDING_RULES.length).toBeGreaterThan(0);
  });
});

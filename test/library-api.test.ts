// What a TypeScript user imports from the package entry.
import { describe, expect, it } from 'vitest';
import * as famwise from '../src/index.js';

describe('library API', () => {
  it('exposes the procedures, the registry and within-family adjustment', () => {
    expect(famwise.METHOD_TOKENS).toEqual(['bonferroni', 'holm', 'sidak', 'holm-sidak', 'hochberg', 'hommel', 'bh', 'by', 'storey', 'bky']);
    expect(Array.from(famwise.adjustHolm(Float64Array.of(0.01, 0.04, 0.03)))).toEqual([0.03, 0.06, 0.06]);
    const result = famwise.adjustWithinFamilies(Float64Array.of(0.01, 0.02), famwise.singleFamily(2), famwise.METHODS, { alpha: 0.05 });
    expect(result.adjusted).toHaveLength(famwise.METHODS.length);
  });

  it('exposes storey q-values with their pi0 estimate, bky, and the pi0 estimators', () => {
    // 20 p-values: 10 of 0.001 and 10 spread above 0.5 (0.525, 0.575, ..., 0.975):
    // pi0(0.5) = 10 / (20 * 0.5) = 1.
    const p = Float64Array.from({ length: 20 }, (_, i) => (i < 10 ? 0.001 : 0.5 + (i - 9.5) / 20));
    const { qValues, pi0 } = famwise.adjustStorey(p);
    expect(pi0).toEqual({ value: 1, estimator: 'fixed', tuning: { lambda: 0.5 }, fallback: null });
    expect(Array.from(qValues)).toEqual(Array.from(famwise.adjustBenjaminiHochberg(p)));
    const spline = famwise.adjustStorey(p, 40, { ...famwise.DEFAULT_PI0_SETTINGS, estimator: 'spline' });
    expect(spline.pi0.estimator).toBe('spline');
    expect(famwise.adjustBky(p)).toHaveLength(20);
    expect(famwise.PI0_ESTIMATORS).toEqual(['fixed', 'spline', 'bootstrap-mse']);
  });

  it('exposes p-values from statistics and the diagnostics', () => {
    expect(famwise.pFromStatistic('z', 'two', 1.959964)).toBeCloseTo(0.05, 7);
    const inspection = famwise.inspectFamily(Float64Array.of(0, 0.2, 0.7), 0, 10);
    expect(inspection.findings.map((finding) => finding.id)).toEqual(['exact-zeros']);
    expect(famwise.FINDING_RULES.length).toBeGreaterThan(0);
  });
});

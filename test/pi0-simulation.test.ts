// Simulation with known truth (common practice, no source): m = 10,000 tests
// of which 80% are true nulls (p uniform) and 20% real effects with small
// p-values (p = U^20, a beta(0.05, 1): most below 0.01, about 3% above 0.5).
// Over ten seeds, each pi0 estimator's average must be within 0.05 of 0.8,
// and the false discovery proportion of storey and bky at 0.05, averaged
// over the seeds, at most 0.05 plus three standard errors of that average.
import { describe, expect, it } from 'vitest';
import { DEFAULT_PI0_SETTINGS, PI0_ESTIMATORS, estimatePi0 } from '../src/estimators/pi0.js';
import { DEFAULT_SETTINGS, findMethod } from '../src/methods.js';
import { seededRandom } from './helpers/random.js';

const M = 10_000;
const PI0 = 0.8;
const SEEDS = [101, 202, 303, 404, 505, 606, 707, 808, 909, 1010];
const ALPHA = 0.05;

function simulate(seed: number): { p: Float64Array; isNull: Uint8Array } {
  const random = seededRandom(seed);
  const p = new Float64Array(M);
  const isNull = new Uint8Array(M);
  for (let i = 0; i < M; i++) {
    isNull[i] = i < M * PI0 ? 1 : 0;
    p[i] = isNull[i] ? random() : random() ** 20;
  }
  return { p, isNull };
}

const runs = SEEDS.map(simulate);
const mean = (values: number[]): number => values.reduce((sum, value) => sum + value, 0) / values.length;
const standardError = (values: number[]): number => {
  const average = mean(values);
  return Math.sqrt(values.reduce((sum, value) => sum + (value - average) ** 2, 0) / (values.length - 1) / values.length);
};

describe(`simulation: m = ${M}, pi0 = ${PI0}, ${SEEDS.length} seeds`, () => {
  for (const estimator of PI0_ESTIMATORS) {
    it(`the ${estimator} estimate averages within 0.05 of ${PI0}`, () => {
      const estimates = runs.map(({ p }, k) => {
        const estimate = estimatePi0(Float64Array.from(p).sort(), M, { ...DEFAULT_PI0_SETTINGS, estimator, seed: SEEDS[k] as number });
        expect(estimate.fallback).toBeNull();
        return estimate.value;
      });
      expect(Math.abs(mean(estimates) - PI0)).toBeLessThan(0.05);
    });
  }

  for (const [token, estimator] of [['storey', 'fixed'], ['storey', 'spline'], ['storey', 'bootstrap-mse'], ['bky', 'fixed']] as const) {
    it(`${token}${token === 'storey' ? ` (${estimator})` : ''} keeps the average false discovery proportion at ${ALPHA} within simulation error`, () => {
      const method = findMethod(token);
      const settings = { ...DEFAULT_SETTINGS, pi0: { ...DEFAULT_PI0_SETTINGS, estimator } };
      const proportions = runs.map(({ p, isNull }) => {
        const adjusted = method?.adjust(p, M, settings) as Float64Array;
        let rejected = 0;
        let false_ = 0;
        adjusted.forEach((value, i) => {
          if (value <= ALPHA) {
            rejected++;
            false_ += isNull[i] as number;
          }
        });
        expect(rejected).toBeGreaterThan(500); // the effects are strong enough to find
        return false_ / rejected;
      });
      expect(mean(proportions)).toBeLessThanOrEqual(ALPHA + 3 * standardError(proportions));
    });
  }
});

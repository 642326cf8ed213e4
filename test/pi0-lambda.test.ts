// pi0(lambda) = #{p > lambda} / (m (1 - lambda)), Storey (2002) eq. (6), on
// vectors small enough to count by hand.
import { describe, expect, it } from 'vitest';
import { pi0AtLambda } from '../src/estimators/pi0-lambda.js';

describe('pi0AtLambda', () => {
  it('counts the p-values strictly above lambda', () => {
    // 10 values, 4 above 0.5 (0.5 itself is not above): 4 / (10 * 0.5) = 0.8.
    const sorted = Float64Array.of(0.001, 0.01, 0.02, 0.1, 0.3, 0.5, 0.6, 0.7, 0.9, 1);
    expect(pi0AtLambda(sorted, 10, 0.5)).toBeCloseTo(0.8, 15);
    // Above 0: the 10 values, 10 / 10 = 1. Above 0.8: 2 / (10 * 0.2) = 1.
    expect(pi0AtLambda(sorted, 10, 0)).toBe(1);
    expect(pi0AtLambda(sorted, 10, 0.8)).toBeCloseTo(1, 15);
  });

  it('counts absent tests as p = 1', () => {
    // 2 present, both below 0.5, m = 4: 2 absent above lambda -> 2 / (4 * 0.5) = 1.
    expect(pi0AtLambda(Float64Array.of(0.01, 0.2), 4, 0.5)).toBe(1);
  });

  it('is not capped: it can exceed 1 by chance', () => {
    // All 4 above 0.5: 4 / (4 * 0.5) = 2.
    expect(pi0AtLambda(Float64Array.of(0.6, 0.7, 0.8, 0.9), 4, 0.5)).toBe(2);
  });

  it('refuses lambda outside [0, 1) and m = 0', () => {
    expect(() => pi0AtLambda(Float64Array.of(0.5), 1, 1)).toThrow(RangeError);
    expect(() => pi0AtLambda(Float64Array.of(0.5), 1, -0.1)).toThrow(RangeError);
    expect(() => pi0AtLambda(new Float64Array(0), 0, 0.5)).toThrow(RangeError);
  });
});

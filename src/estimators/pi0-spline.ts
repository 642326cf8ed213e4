// pi0, the share of true null hypotheses, from a smoothed curve of
// pi0(lambda) over many tuning values lambda.
//
// pi0(lambda) = #{p > lambda} / (m (1 - lambda)) (see pi0-lambda.ts) has a
// bias that shrinks as lambda grows (fewer real effects lie above it) and a
// variance that grows (fewer p-values are left to count). Storey &
// Tibshirani compute it on the grid lambda = 0, 0.01, ..., 0.95, smooth the
// 96 values against lambda with a cubic smoothing spline of 3 degrees of
// freedom, and read the smooth curve at the largest lambda, 0.95: the
// smoothing borrows strength from the neighbouring lambdas, so the estimate
// keeps the small bias of a large lambda with much less of its noise.
//
// Cost: one binary search per grid value on sorted p-values, O(96 log m),
// plus an O(96) banded solve. The smoothing level for 3 degrees of freedom
// depends only on the grid, so it is found once per process.
// Source: Storey, J. D. & Tibshirani, R. (2003). Statistical significance for
// genomewide studies. PNAS 100:9440-9445, Remark B (the grid 0 to 0.95 by
// 0.01 and reading at 0.95 are as we remember them from that remark).

import { pi0AtLambda } from './pi0-lambda.js';
import { smoothingForDegreesOfFreedom, smoothingSplineFit } from './smoothing-spline.js';

/** The spline's degrees of freedom in Storey & Tibshirani (2003). */
export const SPLINE_DEGREES_OF_FREEDOM = 3;

/** lambda = 0, 0.01, ..., 0.95, each computed as k / 100 so that every value is the nearest double. */
export const SPLINE_LAMBDAS: Float64Array = Float64Array.from({ length: 96 }, (_, k) => k / 100);

/** The largest lambda of the grid, where the smoothed curve is read. */
export const SPLINE_READ_AT = SPLINE_LAMBDAS[SPLINE_LAMBDAS.length - 1] as number;

// Finding the smoothing level costs about a hundred O(n^2) traces; it is the
// same for every family, so it is computed on first use and kept.
let gridSmoothing: number | undefined;

/** pi0(lambda) on the grid, then its 3-df smoothing spline; both in grid order. */
export function pi0SplineCurve(sorted: Float64Array, m: number): { raw: Float64Array; smoothed: Float64Array } {
  const raw = SPLINE_LAMBDAS.map((lambda) => pi0AtLambda(sorted, m, lambda));
  gridSmoothing ??= smoothingForDegreesOfFreedom(SPLINE_LAMBDAS, SPLINE_DEGREES_OF_FREEDOM);
  return { raw, smoothed: smoothingSplineFit(SPLINE_LAMBDAS, raw, gridSmoothing) };
}

/** The smoothed pi0 read at lambda = 0.95, uncapped (it can exceed 1, or even fall to 0 or below for tiny m). */
export function pi0Spline(sorted: Float64Array, m: number): number {
  const { smoothed } = pi0SplineCurve(sorted, m);
  return smoothed[smoothed.length - 1] as number;
}

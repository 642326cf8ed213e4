// pi0, the share of true null hypotheses in a family, by the estimator the
// user chose; the one place that caps the estimate and decides when an
// estimator cannot be trusted.
//
// Every estimator can come out above 1 by chance (pi0 is a share, so it is
// capped at 1), and each fails on families too small or too strong for it: a
// count of zero p-values above lambda says pi0 = 0, which would make every
// q-value 0. Then the estimate falls back to pi0 = 1, which is what the
// Benjamini-Hochberg procedure assumes and which can only err on the safe
// side, and the reason is returned so that it is shown, never silent.
//
// Cost: that of the chosen estimator (see its module).

import { pi0AtLambda } from './pi0-lambda.js';
import { BOOTSTRAP_RESAMPLES, pi0Bootstrap } from './pi0-bootstrap.js';
import { SPLINE_DEGREES_OF_FREEDOM, SPLINE_READ_AT, pi0Spline } from './pi0-spline.js';

/** The estimators, as users name them. */
export const PI0_ESTIMATORS = ['fixed', 'spline', 'bootstrap-mse'] as const;
export type Pi0EstimatorName = (typeof PI0_ESTIMATORS)[number];

export interface Pi0Settings {
  readonly estimator: Pi0EstimatorName;
  /** The tuning value of the `fixed` estimator, in [0, 1). */
  readonly lambda: number;
  /** The seed of the `bootstrap-mse` resampling, a whole number from 0 to 2^32 - 1. */
  readonly seed: number;
}

// fixed at lambda = 0.5 is the default: see the README (Methods) for why.
export const DEFAULT_PI0_SETTINGS: Pi0Settings = { estimator: 'fixed', lambda: 0.5, seed: 1 };

/** Below this many tests no estimator is tried: a share estimated from a handful of p-values means nothing. */
export const PI0_MIN_TESTS = 10;

/** The value used when an estimator cannot work. */
export const PI0_FALLBACK = 1;

export interface Pi0Estimate {
  /** The estimate used, in (0, 1]. */
  readonly value: number;
  readonly estimator: Pi0EstimatorName;
  /** The tuning the estimate was made with (lambda, degrees of freedom, seed, resamples). */
  readonly tuning: Readonly<Record<string, number>>;
  /** Why the estimator could not work and pi0 = 1 was used instead; null when it worked. */
  readonly fallback: string | null;
}

/** The tuning the user chose, before any estimation (the bootstrap's lambda is not chosen yet). */
function requestedTuning(settings: Pi0Settings): Record<string, number> {
  switch (settings.estimator) {
    case 'fixed':
      return { lambda: settings.lambda };
    case 'spline':
      return { df: SPLINE_DEGREES_OF_FREEDOM };
    case 'bootstrap-mse':
      return { seed: settings.seed, resamples: BOOTSTRAP_RESAMPLES };
  }
}

function rawEstimate(sorted: Float64Array, m: number, settings: Pi0Settings): { value: number; tuning: Record<string, number> } {
  switch (settings.estimator) {
    case 'fixed':
      return { value: pi0AtLambda(sorted, m, settings.lambda), tuning: { lambda: settings.lambda } };
    case 'spline':
      return { value: pi0Spline(sorted, m), tuning: { lambda: SPLINE_READ_AT, df: SPLINE_DEGREES_OF_FREEDOM } };
    case 'bootstrap-mse': {
      const choice = pi0Bootstrap(sorted, m, settings.seed);
      return { value: choice.value, tuning: { lambda: choice.lambda, seed: settings.seed, resamples: BOOTSTRAP_RESAMPLES } };
    }
  }
}

/** pi0 of one family (ascending p-values; m may exceed sorted.length, absent tests count as p = 1), capped at 1. */
export function estimatePi0(sorted: Float64Array, m: number, settings: Pi0Settings = DEFAULT_PI0_SETTINGS): Pi0Estimate {
  const { estimator } = settings;
  const fallback = (tuning: Record<string, number>, reason: string): Pi0Estimate => ({
    value: PI0_FALLBACK,
    estimator,
    tuning,
    fallback: `${reason}; pi0 = ${PI0_FALLBACK} used instead, as Benjamini-Hochberg assumes`,
  });
  if (m < PI0_MIN_TESTS) {
    return fallback(requestedTuning(settings), `pi0 is not estimated from ${m} ${m === 1 ? 'test' : 'tests'} (the ${estimator} estimator needs at least ${PI0_MIN_TESTS})`);
  }
  const { value, tuning } = rawEstimate(sorted, m, settings);
  if (!(value > 0)) {
    const shown = Number(value.toPrecision(3));
    return fallback(tuning, `the ${estimator} estimate of pi0 is ${shown} at lambda = ${tuning.lambda}: too few p-values above lambda to estimate it`);
  }
  return { value: Math.min(1, value), estimator, tuning, fallback: null };
}

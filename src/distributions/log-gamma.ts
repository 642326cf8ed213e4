// The logarithm of the gamma function, and of the beta function built on it.
//
// Every tail probability below has a factor like x^a e^-x / Gamma(a), which
// is computed in logarithms to stay within floating point. jstat provides
// two log-gamma functions: gammaln (the 6-term Lanczos series of Numerical
// Recipes, 2nd ed.) is good to only about 1e-10, which would show in the
// tenth digit of every p-value; loggam (Zhang & Jin 1996) agrees with R's
// lgamma to about 1e-15 relative (checked in test/distributions.reference.test.ts),
// so famwise uses loggam.
//
// Cost: O(1). Source: Zhang, S. & Jin, J. (1996). Computation of Special
// Functions. Wiley (cited from memory), as implemented by jstat 1.9.6.

import { createRequire } from 'node:module';
import type { JStat } from 'jstat';

// jstat is loaded on first use: only tables of statistics need it, and
// loading it costs every other run of the command some 20 ms.
let jStat: JStat | undefined;

/** log Gamma(x), x > 0. */
export function logGamma(x: number): number {
  jStat ??= createRequire(import.meta.url)('jstat') as JStat;
  return jStat.loggam(x);
}

/** log B(a, b) = log Gamma(a) + log Gamma(b) - log Gamma(a + b). */
export function logBeta(a: number, b: number): number {
  return logGamma(a) + logGamma(b) - logGamma(a + b);
}

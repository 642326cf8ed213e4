// Upper tail of the chi-square distribution, P(X > x) for X ~ chi-square(k),
// through the upper regularized incomplete gamma function
//   Q(a, x) = Gamma(a, x) / Gamma(a),   P(X > x) = Q(k / 2, x / 2).
//
// Q is computed directly, never as 1 - P: for x < a + 1 from the power
// series of P (there Q is not small, so 1 - P loses nothing), and for
// x >= a + 1 from Legendre's continued fraction for Gamma(a, x), evaluated
// by the modified Lentz method, which gives Q itself to full relative
// precision however small it is. jstat 1.9.6 offers only P (its chi-square
// cdf), whose complement reads 0 beyond about chi-square(1) = 70.
//
// Cost: O(sqrt(a)) terms of the series or fraction (a few dozen for the
// usual degrees of freedom).
// Source: Press, W. H., Teukolsky, S. A., Vetterling, W. T. & Flannery, B. P.
// (2007). Numerical Recipes, 3rd ed., Cambridge University Press, section 6.2
// (eqs. 6.2.5 and 6.2.7; section and equation numbers cited from memory, the
// results checked against R's pchisq).

import { logGamma } from './log-gamma.js';

const EPSILON = Number.EPSILON;
const TINY = Number.MIN_VALUE / Number.EPSILON;
const MAX_TERMS = 100_000;

/** log(x^a e^-x / Gamma(a)), the factor in front of both expansions. */
function logPrefactor(a: number, x: number): number {
  return a * Math.log(x) - x - logGamma(a);
}

/** P(a, x) by its series; for x < a + 1. */
function lowerBySeries(a: number, x: number): number {
  let term = 1 / a;
  let sum = term;
  for (let n = 1; n < MAX_TERMS; n++) {
    term *= x / (a + n);
    sum += term;
    if (Math.abs(term) < Math.abs(sum) * EPSILON) break;
  }
  return sum * Math.exp(logPrefactor(a, x));
}

/** Q(a, x) by its continued fraction; for x >= a + 1. */
function upperByFraction(a: number, x: number): number {
  let b = x + 1 - a;
  let c = 1 / TINY;
  let d = 1 / b;
  let h = d;
  for (let i = 1; i < MAX_TERMS; i++) {
    const an = -i * (i - a);
    b += 2;
    d = an * d + b;
    if (Math.abs(d) < TINY) d = TINY;
    c = b + an / c;
    if (Math.abs(c) < TINY) c = TINY;
    d = 1 / d;
    const step = d * c;
    h *= step;
    if (Math.abs(step - 1) < EPSILON) break;
  }
  return Math.exp(logPrefactor(a, x)) * h;
}

/** The upper regularized incomplete gamma function Q(a, x), a > 0, x >= 0. */
export function upperRegularizedGamma(a: number, x: number): number {
  if (x <= 0) return 1;
  if (x === Infinity) return 0;
  return x < a + 1 ? 1 - lowerBySeries(a, x) : upperByFraction(a, x);
}

/** P(X > x) for X ~ chi-square with df degrees of freedom (df > 0, x >= 0). */
export function chiSquareUpperTail(x: number, df: number): number {
  return upperRegularizedGamma(df / 2, x / 2);
}

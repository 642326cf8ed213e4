// The cubic smoothing spline: the smooth curve g through noisy points
// (x_i, y_i) that minimises
//   sum (y_i - g(x_i))^2 + alpha * integral of g''(x)^2 dx.
// alpha trades closeness against wiggle: alpha = 0 interpolates the points,
// alpha -> infinity gives the least-squares straight line. The minimiser is
// a natural cubic spline with a knot at every x_i (Reinsch 1967), so it is
// found from its values g at the knots by one banded linear system:
// with Q (n x (n-2)) the second-difference matrix and R ((n-2) x (n-2)) the
// tridiagonal matrix of Green & Silverman (1994, section 2.1),
//   (R + alpha Q'Q) gamma = Q'y,   g = y - alpha Q gamma.
// How much the curve may bend is easier to state as its degrees of freedom,
// the trace of the smoother matrix S(alpha) = (I + alpha Q R^-1 Q')^-1: n at
// alpha = 0, falling to 2 (a straight line) as alpha grows. A target df is
// met by bisection on log alpha; the trace is
//   n - alpha * trace((R + alpha Q'Q)^-1 Q'Q),
// one banded solve per row of Q.
//
// Cost: a fit at a given alpha is O(n) (banded Cholesky, bandwidth 2); the
// trace is O(n^2), and finding alpha for a df takes about a hundred traces.
// alpha depends only on x and the df, not on y, so callers with a fixed x
// find it once.
// Sources: Reinsch, C. H. (1967). Smoothing by spline functions. Numerische
// Mathematik 10:177-183. Green, P. J. & Silverman, B. W. (1994).
// Nonparametric Regression and Generalized Linear Models, chapter 2
// (Chapman & Hall).

/** A symmetric positive-definite matrix with bandwidth 2, by its diagonals. */
interface Pentadiagonal {
  readonly main: Float64Array;
  /** first[i] is the entry (i + 1, i). */
  readonly first: Float64Array;
  /** second[i] is the entry (i + 2, i). */
  readonly second: Float64Array;
}

/** The lower Cholesky factor L of a pentadiagonal matrix: diagonal, and the entries one and two below it. */
interface BandedFactor {
  readonly diagonal: Float64Array;
  /** below1[i] = L(i, i - 1). */
  readonly below1: Float64Array;
  /** below2[i] = L(i, i - 2). */
  readonly below2: Float64Array;
}

function choleskyBanded(matrix: Pentadiagonal): BandedFactor {
  const size = matrix.main.length;
  const diagonal = new Float64Array(size);
  const below1 = new Float64Array(size);
  const below2 = new Float64Array(size);
  for (let i = 0; i < size; i++) {
    if (i >= 2) below2[i] = matrix.second[i - 2] / diagonal[i - 2];
    if (i >= 1) below1[i] = (matrix.first[i - 1] - (i >= 2 ? below2[i] * below1[i - 1] : 0)) / diagonal[i - 1];
    diagonal[i] = Math.sqrt(matrix.main[i] - below1[i] * below1[i] - below2[i] * below2[i]);
  }
  return { diagonal, below1, below2 };
}

/** Solves L L' x = b; b is not modified. */
function solveBanded(factor: BandedFactor, b: Float64Array): Float64Array {
  const { diagonal, below1, below2 } = factor;
  const size = diagonal.length;
  const x = new Float64Array(size);
  for (let i = 0; i < size; i++) {
    x[i] = (b[i] - (i >= 1 ? below1[i] * x[i - 1] : 0) - (i >= 2 ? below2[i] * x[i - 2] : 0)) / diagonal[i];
  }
  for (let i = size - 1; i >= 0; i--) {
    x[i] = (x[i] - (i + 1 < size ? below1[i + 1] * x[i + 1] : 0) - (i + 2 < size ? below2[i + 2] * x[i + 2] : 0)) / diagonal[i];
  }
  return x;
}

/**
 * The three non-zero entries of column c of Q (rows c, c + 1, c + 2), for
 * each interior knot c + 1, from the gaps h between knots.
 */
function secondDifferences(x: Float64Array): { upper: Float64Array; middle: Float64Array; lower: Float64Array; gaps: Float64Array } {
  const n = x.length;
  const gaps = new Float64Array(n - 1);
  for (let i = 0; i < n - 1; i++) {
    gaps[i] = x[i + 1] - x[i];
    if (!(gaps[i] > 0)) throw new RangeError('smoothing spline knots must be strictly increasing');
  }
  const upper = new Float64Array(n - 2);
  const middle = new Float64Array(n - 2);
  const lower = new Float64Array(n - 2);
  for (let c = 0; c < n - 2; c++) {
    upper[c] = 1 / gaps[c];
    middle[c] = -1 / gaps[c] - 1 / gaps[c + 1];
    lower[c] = 1 / gaps[c + 1];
  }
  return { upper, middle, lower, gaps };
}

type Differences = ReturnType<typeof secondDifferences>;

/** R + alpha Q'Q, pentadiagonal. */
function systemMatrix(d: Differences, alpha: number): Pentadiagonal {
  const size = d.middle.length;
  const main = new Float64Array(size);
  const first = new Float64Array(size);
  const second = new Float64Array(size);
  for (let c = 0; c < size; c++) {
    main[c] = (d.gaps[c] + d.gaps[c + 1]) / 3 + alpha * (d.upper[c] ** 2 + d.middle[c] ** 2 + d.lower[c] ** 2);
    if (c + 1 < size) first[c] = d.gaps[c + 1] / 6 + alpha * (d.middle[c] * d.upper[c + 1] + d.lower[c] * d.middle[c + 1]);
    if (c + 2 < size) second[c] = alpha * d.lower[c] * d.upper[c + 2];
  }
  return { main, first, second };
}

/** Row r of Q as a vector over the n - 2 columns (at most three non-zero entries). */
function rowOfQ(d: Differences, r: number): Float64Array {
  const row = new Float64Array(d.middle.length);
  if (r < row.length) row[r] = d.upper[r];
  if (r - 1 >= 0 && r - 1 < row.length) row[r - 1] = d.middle[r - 1];
  if (r - 2 >= 0 && r - 2 < row.length) row[r - 2] = d.lower[r - 2];
  return row;
}

/** The trace of the smoother matrix at alpha: the fit's degrees of freedom. */
export function splineDegreesOfFreedom(x: Float64Array, alpha: number): number {
  const n = x.length;
  if (n < 3) return n;
  const d = secondDifferences(x);
  const factor = choleskyBanded(systemMatrix(d, alpha));
  let trace = 0;
  for (let r = 0; r < n; r++) {
    const row = rowOfQ(d, r);
    const solved = solveBanded(factor, row);
    for (let c = Math.max(0, r - 2); c <= Math.min(row.length - 1, r); c++) trace += row[c] * solved[c];
  }
  return n - alpha * trace;
}

/**
 * The alpha at which the spline on knots x has `df` degrees of freedom,
 * 2 < df < n, by bisection on log alpha to the last bits.
 */
export function smoothingForDegreesOfFreedom(x: Float64Array, df: number): number {
  if (!(df > 2 && df < x.length)) throw new RangeError(`degrees of freedom must be above 2 and below ${x.length}, got ${df}`);
  // df falls as alpha grows: widen the bracket until it holds the target.
  let low = 1;
  let high = 1;
  while (splineDegreesOfFreedom(x, low) < df) low /= 16;
  while (splineDegreesOfFreedom(x, high) > df) high *= 16;
  for (let step = 0; step < 200 && high / low > 1 + 1e-14; step++) {
    const mid = Math.sqrt(low * high);
    if (splineDegreesOfFreedom(x, mid) > df) low = mid;
    else high = mid;
  }
  return Math.sqrt(low * high);
}

/** The smoothing spline's values at the knots x for data y, at smoothing alpha. */
export function smoothingSplineFit(x: Float64Array, y: Float64Array, alpha: number): Float64Array {
  const n = x.length;
  if (y.length !== n) throw new RangeError('x and y differ in length');
  if (n < 3) return Float64Array.from(y);
  const d = secondDifferences(x);
  const qTy = new Float64Array(n - 2);
  for (let c = 0; c < n - 2; c++) qTy[c] = d.upper[c] * y[c] + d.middle[c] * y[c + 1] + d.lower[c] * y[c + 2];
  const gamma = solveBanded(choleskyBanded(systemMatrix(d, alpha)), qTy);
  const fitted = Float64Array.from(y);
  for (let c = 0; c < n - 2; c++) {
    fitted[c] -= alpha * d.upper[c] * gamma[c];
    fitted[c + 1] -= alpha * d.middle[c] * gamma[c];
    fitted[c + 2] -= alpha * d.lower[c] * gamma[c];
  }
  return fitted;
}

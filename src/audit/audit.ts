// Auditing an adjustment made elsewhere: recompute it, compare value by value
// to the precision the values were printed with, and when they do not match,
// find the likeliest mistake by trying the alternatives: values not adjusted
// at all, another procedure, other families, another number of tests, only
// the rows that carry a claimed value. Pure: typed arrays in, findings out.
//
// Every procedure's adjusted values rise (weakly) with each raw p-value and
// with the number of tests m. So rounded raw p-values bound the exact
// adjusted values between the adjustments of their lowest and highest
// readings, and the m that fits a family is found by bisection on the
// balance of rows recomputed above and below their claims.
//
// Cost: O(n log n) per candidate tried (three times that when the raw
// p-values are rounded); O(n log n log M) to fit m.

import { type FamilyGrouping, adjustWithinFamilies, familySegments } from '../families.js';
import { DEFAULT_SETTINGS, METHODS, type Method } from '../methods.js';
import { sortAscending } from '../procedures/sorting.js';
import { clearlyDifferent, matchesRange } from './matching.js';

/** Numbers read from a column with the precision each was printed to. */
export interface Printed {
  /** By row; NaN where the cell is empty or missing. */
  readonly values: Float64Array;
  /** Half a unit of the last printed digit, by row (0: exact). */
  readonly halfUnits: Float64Array;
}

/** A way to group the rows into families: the columns, and the grouping they give. */
export interface Grouping {
  readonly columns: readonly string[];
  readonly families: FamilyGrouping;
}

/** One way the claimed values could have been computed. */
export interface Candidate {
  readonly method: Method;
  readonly grouping: Grouping;
  /** The number of tests in each family, or undefined for the p-values present. */
  readonly tests?: number | undefined;
  /** A number of tests for each family, fitted to the claims (overrides `tests`). */
  readonly testsByFamily?: readonly number[];
  /** Only rows that carry a claimed value were adjusted. */
  readonly onlyClaimedRows?: boolean;
}

/** A candidate's adjusted values by row, and the range the rounding of the raw p-values leaves them in. */
export interface Recomputed {
  readonly value: Float64Array;
  readonly low: Float64Array;
  readonly high: Float64Array;
}

export interface Comparison {
  /** Rows with both a p-value and a claimed value. */
  readonly compared: number;
  readonly matched: number;
  /** Rows (0-based) whose claimed value is not the recomputed one, in row order. */
  readonly mismatched: readonly number[];
  /** Rows that match to the printed precision but fall on the other side of alpha. */
  readonly flipped: readonly number[];
  /** Rows with a p-value but no claimed value, and the reverse. */
  readonly unclaimed: readonly number[];
  readonly claimWithoutP: readonly number[];
}

/** Compares claimed values with recomputed ones, row by row. */
export function compareClaims(p: Printed, claims: Printed, recomputed: Recomputed, alpha: number): Comparison {
  let compared = 0;
  let matched = 0;
  const mismatched: number[] = [];
  const flipped: number[] = [];
  const unclaimed: number[] = [];
  const claimWithoutP: number[] = [];
  for (let row = 0; row < p.values.length; row++) {
    const claim = claims.values[row] as number;
    const hasP = !Number.isNaN(p.values[row]);
    const hasClaim = !Number.isNaN(claim);
    if (hasP && !hasClaim) unclaimed.push(row);
    if (!hasP && hasClaim) claimWithoutP.push(row);
    if (!hasP || !hasClaim) continue;
    compared++;
    if (!matchesRange(recomputed.low[row] as number, recomputed.high[row] as number, claim, claims.halfUnits[row] as number)) {
      mismatched.push(row);
      continue;
    }
    matched++;
    const value = recomputed.value[row] as number;
    if (claim <= alpha !== value <= alpha && clearlyDifferent(claim, value)) flipped.push(row);
  }
  return { compared, matched, mismatched, flipped, unclaimed, claimWithoutP };
}

/** Whether the claimed values are the candidate's, for every row. */
export function isFullMatch(comparison: Comparison): boolean {
  return (
    comparison.matched === comparison.compared &&
    comparison.unclaimed.length === 0 &&
    comparison.claimWithoutP.length === 0 &&
    comparison.compared > 0
  );
}

/** Present p-values in each family. */
export function presentPerFamily(p: Float64Array, families: FamilyGrouping): Int32Array {
  const { start } = familySegments(p, families);
  return Int32Array.from({ length: families.count }, (_, f) => start[f + 1] - start[f]);
}

/** The rows of each family's present p-values. */
function rowsByFamily(p: Float64Array, families: FamilyGrouping): Int32Array[] {
  const { start, rowOf } = familySegments(p, families);
  const rows = rowOf ?? Int32Array.from(p.keys());
  return Array.from({ length: families.count }, (_, f) => rows.subarray(start[f], start[f + 1]));
}

/** The candidate's adjusted values of one reading of the p-values. */
function adjusted(values: Float64Array, candidate: Candidate): Float64Array {
  // alpha only counts rejections, which the audit does not use.
  const tests = candidate.testsByFamily ?? candidate.tests;
  return adjustWithinFamilies(values, candidate.grouping.families, [candidate.method], { alpha: 0.05, tests }).adjusted[0] as Float64Array;
}

/** The candidate's adjusted values, with the range that rounded raw p-values leave them in. */
export function recompute(p: Printed, claims: Printed, candidate: Candidate): Recomputed {
  const base = candidate.onlyClaimedRows ? p.values.map((value, row) => (Number.isNaN(claims.values[row]) ? NaN : value)) : p.values;
  const value = adjusted(base, candidate);
  if (!p.halfUnits.some((halfUnit) => halfUnit > 0)) return { value, low: value, high: value };
  const shifted = (sign: number): Float64Array =>
    base.map((v, row) => (Number.isNaN(v) ? v : Math.min(1, Math.max(0, v + sign * (p.halfUnits[row] as number)))));
  return { value, low: adjusted(shifted(-1), candidate), high: adjusted(shifted(1), candidate) };
}

/** A tried candidate and how well it did. */
export interface Trial {
  readonly candidate: Candidate;
  readonly recomputed: Recomputed;
  readonly comparison: Comparison;
}

function trial(p: Printed, claims: Printed, candidate: Candidate, alpha: number): Trial {
  const recomputed = recompute(p, claims, candidate);
  return { candidate, recomputed, comparison: compareClaims(p, claims, recomputed, alpha) };
}

const LARGEST_M = 2 ** 31 - 1;

/**
 * The number of tests m (at least the p-values present) at which the method
 * reproduces a family's claimed values, or undefined when no m does.
 */
export function fitTests(p: Printed, claims: Printed, rows: Int32Array | readonly number[], method: Method): number | undefined {
  if (rows.some((row) => Number.isNaN(claims.values[row]))) return undefined;
  // Each reading sorted once; each trial m then costs linear passes of the procedure.
  const reading = (sign: number) => {
    const values = Float64Array.from(rows, (row) => Math.min(1, Math.max(0, (p.values[row] as number) + sign * (p.halfUnits[row] as number))));
    return sortAscending(values);
  };
  const [low, high] = [reading(-1), reading(1)];
  const inRowOrder = (at: { sorted: Float64Array; order: Uint32Array }, m: number): Float64Array => {
    const values = method.run({ sorted: at.sorted, m }, DEFAULT_SETTINGS).adjusted;
    const out = new Float64Array(values.length);
    at.order.forEach((k, i) => {
      out[k] = values[i] as number;
    });
    return out;
  };
  const misses = (m: number): { above: number; below: number } => {
    const lows = inRowOrder(low, m);
    const highs = inRowOrder(high, m);
    let above = 0;
    let below = 0;
    rows.forEach((row, k) => {
      const claim = claims.values[row] as number;
      if (matchesRange(lows[k] as number, highs[k] as number, claim, claims.halfUnits[row] as number)) return;
      if ((lows[k] as number) > claim) above++;
      else below++;
    });
    return { above, below };
  };
  let lowest = rows.length;
  let highest = LARGEST_M;
  // The smallest m at which nothing is recomputed below its claim.
  while (lowest < highest) {
    const mid = Math.floor((lowest + highest) / 2);
    if (misses(mid).below > 0) lowest = mid + 1;
    else highest = mid;
  }
  const at = misses(lowest);
  return at.above === 0 && at.below === 0 ? lowest : undefined;
}

export type ExplanationKind = 'rounding' | 'unadjusted' | 'method' | 'families' | 'tests' | 'only-claimed-rows';

/** The findings of an audit: how the stated adjustment compares, and the likeliest explanation. */
export interface AuditResult {
  /** The stated (or, without a method, the best-fitting) adjustment. */
  readonly stated: Trial;
  /** Methods that reproduce every claimed value as stated (families and tests as given). */
  readonly fittingMethods: readonly Method[];
  /** When the stated adjustment does not match: the alternative that explains the claims. */
  readonly explanation?: Trial & { readonly kind: ExplanationKind };
}

export interface AuditOptions {
  readonly alpha: number;
  /** The procedure the claims say was used; undefined to find it. */
  readonly method?: Method | undefined;
  /** The number of tests per family, when the table holds only some. */
  readonly tests?: number | undefined;
}

/** An alternative is offered as the explanation only if it reproduces at least this share of the values. */
export const EXPLAINS = 0.95;

function better(a: Trial, b: Trial | undefined): boolean {
  return b === undefined || a.comparison.matched > b.comparison.matched;
}

/** Audits claimed adjusted values; `groupings[0]` is the grouping the claims state, the rest are alternatives to try. */
export function auditClaims(p: Printed, claims: Printed, groupings: readonly Grouping[], options: AuditOptions): AuditResult {
  const { alpha, tests } = options;
  const stated = groupings[0] as Grouping;
  const methods = options.method ? [options.method] : METHODS;
  const statedFirst = [...methods, ...METHODS.filter((other) => !methods.includes(other))];
  const asStated = methods.map((method) => trial(p, claims, { method, grouping: stated, tests }, alpha));
  const fitting = asStated.filter((t) => isFullMatch(t.comparison));
  const best = asStated.reduce((a, b) => (better(b, a) ? b : a));
  const chosen = fitting.find((t) => t.comparison.flipped.length === 0) ?? fitting[0] ?? best;
  const result = { stated: chosen, fittingMethods: fitting.map((t) => t.candidate.method) };
  if (fitting.length > 0) {
    // Every value is right to its printed digits, but too few digits change decisions at alpha.
    return chosen.comparison.flipped.length > 0 ? { ...result, explanation: { ...chosen, kind: 'rounding' } } : result;
  }

  // The first alternative that reproduces every value is the explanation; otherwise the one that
  // reproduces most, if that is nearly all of them.
  let explanation: (Trial & { kind: ExplanationKind }) | undefined;
  const explained = (): boolean => explanation !== undefined && isFullMatch(explanation.comparison);
  const consider = (kind: ExplanationKind, tried: Trial): void => {
    if (explained()) return;
    const { matched, compared } = tried.comparison;
    const enough = isFullMatch(tried.comparison) || (matched >= EXPLAINS * compared && better(tried, chosen));
    if (enough && (isFullMatch(tried.comparison) || better(tried, explanation))) explanation = { ...tried, kind };
  };
  const tryCandidate = (kind: ExplanationKind, candidate: Candidate): void => {
    if (!explained()) consider(kind, trial(p, claims, candidate, alpha));
  };

  // Not adjusted at all: the claims are the raw p-values.
  const identity: Recomputed = { value: p.values, low: p.values.map((v, row) => v - (p.halfUnits[row] as number)), high: p.values.map((v, row) => v + (p.halfUnits[row] as number)) };
  consider('unadjusted', { candidate: { method: chosen.candidate.method, grouping: stated, tests }, recomputed: identity, comparison: compareClaims(p, claims, identity, alpha) });
  // Another procedure, as stated otherwise.
  if (options.method) for (const method of METHODS) if (method !== options.method) tryCandidate('method', { method, grouping: stated, tests });
  // Other families: none, or another column. A column with a value for nearly every row is an
  // identifier, not a family, and families larger than --tests cannot have been adjusted with it.
  for (const grouping of groupings.slice(1)) {
    if (grouping.families.count > p.values.length / 2) continue;
    if (tests !== undefined && Math.max(0, ...presentPerFamily(p.values, grouping.families)) > tests) continue;
    for (const method of statedFirst) tryCandidate('families', { method, grouping, tests });
  }
  // Another number of tests, fitted family by family.
  const familyRows = rowsByFamily(p.values, stated.families);
  for (const method of statedFirst) {
    if (explained()) break;
    const fitted = familyRows.map((rows) => (rows.length === 0 ? 0 : fitTests(p, claims, rows, method)));
    if (fitted.every((m) => m !== undefined)) tryCandidate('tests', { method, grouping: stated, testsByFamily: fitted as number[] });
  }
  // Only the rows that carry a claimed value were adjusted (the others were dropped first).
  if (chosen.comparison.unclaimed.length > 0) {
    for (const method of statedFirst) tryCandidate('only-claimed-rows', { method, grouping: stated, onlyClaimedRows: true });
  }
  return explanation ? { ...result, explanation } : result;
}

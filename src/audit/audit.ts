// Auditing an adjustment made elsewhere: recompute it, compare value by value
// to the precision the claimed values were printed with, and when they do
// not match, find the likeliest mistake by trying the alternatives: another
// procedure, other families, another number of tests, only the rows that
// carry a claimed value. Pure: typed arrays in, a report out.
//
// Every procedure's adjusted values rise (weakly) with the number of tests
// m, so the m that fits a family is found by bisection on the balance of
// rows recomputed above and below their claims.
//
// Cost: O(n log n) per candidate tried; O(n log n log M) to fit m.

import { type FamilyGrouping, adjustWithinFamilies } from '../families.js';
import { DEFAULT_SETTINGS, METHODS, type Method } from '../methods.js';
import { ascendingOrder, gather } from '../procedures/sorting.js';
import { matchesPrinted } from './matching.js';

/** The claimed adjusted values of a table, with the precision each was printed to. */
export interface Claims {
  /** Claimed adjusted p-value by row; NaN where the cell is empty or missing. */
  readonly values: Float64Array;
  /** Half a unit of the last printed digit, by row (0: taken as exact). */
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
export function compareClaims(p: Float64Array, claims: Claims, recomputed: Float64Array, alpha: number): Comparison {
  let compared = 0;
  let matched = 0;
  const mismatched: number[] = [];
  const flipped: number[] = [];
  const unclaimed: number[] = [];
  const claimWithoutP: number[] = [];
  for (let row = 0; row < p.length; row++) {
    const claim = claims.values[row];
    const hasP = !Number.isNaN(p[row]);
    const hasClaim = !Number.isNaN(claim);
    if (hasP && !hasClaim) unclaimed.push(row);
    if (!hasP && hasClaim) claimWithoutP.push(row);
    if (!hasP || !hasClaim) continue;
    compared++;
    const value = recomputed[row];
    if (!matchesPrinted(value, claim, claims.halfUnits[row])) {
      mismatched.push(row);
      continue;
    }
    matched++;
    if (claim <= alpha !== value <= alpha) flipped.push(row);
  }
  return { compared, matched, mismatched, flipped, unclaimed, claimWithoutP };
}

/** Whether the claimed values are exactly the candidate's, for every row. */
export function isFullMatch(comparison: Comparison): boolean {
  return (
    comparison.matched === comparison.compared &&
    comparison.unclaimed.length === 0 &&
    comparison.claimWithoutP.length === 0 &&
    comparison.compared > 0
  );
}

/** The candidate's adjusted values by row (NaN where it adjusts nothing). */
export function recompute(p: Float64Array, claims: Claims, candidate: Candidate): Float64Array {
  const { testsByFamily } = candidate;
  if (testsByFamily) {
    const recomputed = new Float64Array(p.length).fill(NaN);
    rowsByFamily(p, candidate.grouping.families).forEach((rows, f) => {
      const adjusted = candidate.method.adjust(Float64Array.from(rows, (row) => p[row] as number), testsByFamily[f]);
      rows.forEach((row, k) => {
        recomputed[row] = adjusted[k] as number;
      });
    });
    return recomputed;
  }
  const values = candidate.onlyClaimedRows ? p.map((value, row) => (Number.isNaN(claims.values[row]) ? NaN : value)) : p;
  return adjustWithinFamilies(values, candidate.grouping.families, [candidate.method], { alpha: 0.05, tests: candidate.tests })
    .adjusted[0] as Float64Array;
}

/** A tried candidate and how well it did. */
export interface Trial {
  readonly candidate: Candidate;
  readonly comparison: Comparison;
}

function trial(p: Float64Array, claims: Claims, candidate: Candidate, alpha: number): Trial {
  return { candidate, comparison: compareClaims(p, claims, recompute(p, claims, candidate), alpha) };
}

/** Rows of each family, present p-values only. */
function rowsByFamily(p: Float64Array, families: FamilyGrouping): number[][] {
  const rows: number[][] = Array.from({ length: families.count }, () => []);
  for (let row = 0; row < p.length; row++) if (!Number.isNaN(p[row])) rows[families.ids[row] as number]?.push(row);
  return rows;
}

const LARGEST_M = 2 ** 31 - 1;

/**
 * The number of tests m (at least the p-values present) at which the method
 * reproduces a family's claimed values, or undefined when no m does.
 */
export function fitTests(p: Float64Array, claims: Claims, rows: readonly number[], method: Method): number | undefined {
  if (rows.some((row) => Number.isNaN(claims.values[row]))) return undefined;
  // Sorted once; each trial m then costs one linear pass of the procedure.
  const values = Float64Array.from(rows, (row) => p[row] as number);
  const order = ascendingOrder(values);
  const sorted = gather(values, order);
  const claimed = Float64Array.from(order, (k) => claims.values[rows[k] as number] as number);
  const halfUnits = Float64Array.from(order, (k) => claims.halfUnits[rows[k] as number] as number);
  const misses = (m: number): { above: number; below: number } => {
    const adjusted = method.run({ sorted, m }, DEFAULT_SETTINGS).adjusted;
    let above = 0;
    let below = 0;
    for (let i = 0; i < adjusted.length; i++) {
      const value = adjusted[i] as number;
      if (matchesPrinted(value, claimed[i] as number, halfUnits[i] as number)) continue;
      if (value > (claimed[i] as number)) above++;
      else below++;
    }
    return { above, below };
  };
  let low = rows.length;
  let high = LARGEST_M;
  // The smallest m at which nothing is recomputed below its claim.
  while (low < high) {
    const mid = Math.floor((low + high) / 2);
    if (misses(mid).below > 0) low = mid + 1;
    else high = mid;
  }
  const at = misses(low);
  return at.above === 0 && at.below === 0 ? low : undefined;
}

/** The findings of an audit: how the stated adjustment compares, and the likeliest explanation. */
export interface AuditResult {
  /** The stated (or, without a method, the best-fitting) adjustment. */
  readonly stated: Trial;
  /** Methods that reproduce every claimed value as stated (families and tests as given). */
  readonly fittingMethods: readonly Method[];
  /** When the stated adjustment does not match: the alternative that explains the claims best. */
  readonly explanation?: Trial & { readonly kind: ExplanationKind };
}

export type ExplanationKind = 'method' | 'families' | 'tests' | 'only-claimed-rows' | 'rounding';

export interface AuditOptions {
  readonly alpha: number;
  /** The procedure the claims say was used; undefined to find it. */
  readonly method?: Method | undefined;
  /** The number of tests per family, when the table holds only some. */
  readonly tests?: number | undefined;
}

function better(a: Trial, b: Trial | undefined): boolean {
  return b === undefined || a.comparison.matched > b.comparison.matched;
}

/** Audits claimed adjusted values; `groupings[0]` is the grouping the claims state, the rest are alternatives to try. */
export function auditClaims(p: Float64Array, claims: Claims, groupings: readonly Grouping[], options: AuditOptions): AuditResult {
  const { alpha, tests } = options;
  const stated = groupings[0] as Grouping;
  const methods = options.method ? [options.method] : METHODS;
  const asStated = methods.map((method) => trial(p, claims, { method, grouping: stated, tests }, alpha));
  const fitting = asStated.filter((t) => isFullMatch(t.comparison));
  const best = asStated.reduce((a, b) => (better(b, a) ? b : a));
  const chosen = fitting.find((t) => t.comparison.flipped.length === 0) ?? fitting[0] ?? best;
  const result = { stated: chosen, fittingMethods: fitting.map((t) => t.candidate.method) };
  if (fitting.length > 0) {
    // Every value is right to its printed digits, but too few digits change decisions at alpha.
    return chosen.comparison.flipped.length > 0 ? { ...result, explanation: { ...chosen, kind: 'rounding' } } : result;
  }

  // An alternative explains the claims only if it reproduces more of them than the stated adjustment.
  let explanation: (Trial & { kind: ExplanationKind }) | undefined;
  const explained = (): boolean => explanation !== undefined && isFullMatch(explanation.comparison);
  const consider = (kind: ExplanationKind, candidate: Candidate): void => {
    // The first alternative that reproduces every value is the explanation; later ones are not tried.
    if (explained()) return;
    const tried = trial(p, claims, candidate, alpha);
    if (isFullMatch(tried.comparison) || (better(tried, explanation) && better(tried, chosen))) explanation = { ...tried, kind };
  };
  // Another procedure, as stated otherwise.
  if (options.method) {
    for (const method of METHODS) if (method !== options.method) consider('method', { method, grouping: stated, tests });
  }
  // Other families, with the stated procedure first and then any.
  for (const grouping of groupings.slice(1)) {
    for (const method of [...methods, ...METHODS.filter((other) => !methods.includes(other))]) {
      consider('families', { method, grouping, tests });
    }
  }
  // Another number of tests: fitted family by family.
  const familyRows = rowsByFamily(p, stated.families);
  for (const method of [...methods, ...METHODS.filter((other) => !methods.includes(other))]) {
    if (explained()) break;
    const fitted = familyRows.map((rows) => (rows.length === 0 ? 0 : fitTests(p, claims, rows, method)));
    if (fitted.every((m) => m !== undefined)) consider('tests', { method, grouping: stated, testsByFamily: fitted as number[] });
  }
  // Only the rows that carry a claimed value were adjusted (the others were dropped first).
  if (chosen.comparison.unclaimed.length > 0) {
    for (const method of methods) consider('only-claimed-rows', { method, grouping: stated, onlyClaimedRows: true });
  }
  return explanation ? { ...result, explanation } : result;
}

// The audit report: the findings of audit.ts as data (for --json) and as
// plain sentences (for people). Only words and layout here, no arithmetic
// beyond counting.

import type { Method } from '../methods.js';
import type { AuditResult, Candidate, Grouping, Trial } from './audit.js';
import { significantDigits } from './matching.js';

/** What the report needs to know about the table besides the audit itself. */
export interface AuditContext {
  readonly source: string;
  readonly column: string;
  readonly alpha: number;
  readonly tests?: number | undefined;
  /** The method the user named, if any. */
  readonly statedMethod?: Method | undefined;
  readonly p: Float64Array;
  readonly claims: { readonly values: Float64Array; readonly halfUnits: Float64Array };
  readonly recomputed: Float64Array;
  /** Line number of each data row. */
  readonly lines: Int32Array;
  /** Rows without an adjusted value were left out (--only-adjusted-rows). */
  readonly onlyAdjustedRows: boolean;
  /** How many mismatching rows to list. */
  readonly listed: number;
}

export interface RowReport {
  line: number;
  p: number;
  claimed: number | null;
  recomputed: number | null;
}

export interface AuditReport {
  column: string;
  alpha: number;
  verdict: 'match' | 'mismatch';
  /** The procedure compared against: the one named, or the one that fits best. */
  method: string;
  /** Every procedure that reproduces the claimed values as stated. */
  matchingMethods: string[];
  families: string[];
  tests: number | null;
  compared: number;
  matched: number;
  /** Rows with a p-value but no claimed value, and with a claimed value but no p-value. */
  unclaimed: number;
  claimWithoutP: number;
  /** The most significant digits any claimed value was printed with (null: full precision). */
  digits: number | null;
  mismatches: RowReport[];
  /** Rows right to their printed digits, but on the other side of alpha. */
  flipped: RowReport[];
  explanation: {
    kind: string;
    method: string;
    families: string[];
    tests: number | number[] | null;
    onlyClaimedRows: boolean;
    matched: number;
    compared: number;
    text: string;
  } | null;
}

function describeFamilies(grouping: Grouping): string {
  return grouping.columns.length === 0 ? 'over the whole table as one family' : `within families by ${grouping.columns.join(', ')}`;
}

function describeTests(candidate: Candidate): string {
  if (candidate.testsByFamily) {
    const distinct = [...new Set(candidate.testsByFamily.filter((m) => m > 0))];
    return distinct.length === 1 ? `m = ${distinct[0]}` : `m fitted family by family (${distinct.slice(0, 5).join(', ')}${distinct.length > 5 ? ', ...' : ''})`;
  }
  return candidate.tests === undefined ? 'm = the p-values present' : `m = ${candidate.tests}`;
}

function rowReport(row: number, context: AuditContext): RowReport {
  const number = (value: number | undefined): number | null => (value === undefined || Number.isNaN(value) ? null : value);
  return {
    line: context.lines[row] as number,
    p: context.p[row] as number,
    claimed: number(context.claims.values[row]),
    recomputed: number(context.recomputed[row]),
  };
}

/** The column's precision: the most significant digits it shows (writers drop trailing zeros, so not the fewest). */
function printedDigits(claims: AuditContext['claims']): number | null {
  let most = 0;
  for (let row = 0; row < claims.values.length; row++) {
    const value = claims.values[row] as number;
    // A bare 0 or 1 takes its precision from the other values (matching.ts), so it says nothing here.
    if (!Number.isNaN(value) && value !== 0 && value !== 1) most = Math.max(most, significantDigits(value, claims.halfUnits[row] as number));
  }
  return most === 0 || most >= 15 ? null : most;
}

function presentRows(p: Float64Array): number {
  return p.reduce((count, value) => count + (Number.isNaN(value) ? 0 : 1), 0);
}

/** One sentence that says what the alternative shows. */
function explanationText(result: AuditResult, context: AuditContext, stated: Trial, digits: number | null): string {
  const explanation = result.explanation as NonNullable<AuditResult['explanation']>;
  const { candidate, comparison } = explanation;
  const token = candidate.method.token;
  const reproduces = `${token} reproduces ${comparison.matched} of ${comparison.compared} values`;
  const statedToken = stated.candidate.method.token;
  // When the explanation also needs another procedure, say so: fixing one mistake alone would not pass.
  const andMethod = context.statedMethod && candidate.method !== context.statedMethod ? `, and with ${token}, not ${statedToken}` : '';
  switch (explanation.kind) {
    case 'rounding': {
      const first = comparison.flipped[0] as number;
      const row = rowReport(first, context);
      const flips = comparison.flipped.length;
      return `the values match ${token} to the digits printed, but they were rounded to ${digitsText(digits)}, and ${flips === 1 ? '1 of them falls' : `${flips} of them fall`} on the other side of alpha = ${context.alpha} from the exact value${flips === 1 ? '' : 's'} (line ${row.line}: printed ${shown(row.claimed)}, exact ${shownBeside(row.recomputed, row.claimed)}); keep more digits, or decide on the exact values`;
    }
    case 'unadjusted':
      return `the values are the raw p-values, not adjusted at all (${comparison.matched} of ${comparison.compared} equal the p-value of their row)`;
    case 'method':
      return `the values are ${token}, not ${statedToken}: ${reproduces} (families and tests as stated)`;
    case 'families':
      return `the values were adjusted ${describeFamilies(candidate.grouping)}, not ${describeFamilies(stated.candidate.grouping)}${andMethod}: ${reproduces} that way`;
    case 'only-claimed-rows': {
      const adjusted = comparison.compared;
      return `only the ${adjusted} rows that carry a value were adjusted (m = ${adjusted}${andMethod}), though ${presentRows(context.p)} rows have p-values: if the others were removed by a filter that is independent of the p-values under the null (such as a filter on mean counts), that is accepted practice and --only-adjusted-rows audits the adjusted rows alone; if they were removed for their p-values, the adjustment understates the multiplicity (${reproduces} that way)`;
    }
    case 'tests': {
      const fitted = candidate.testsByFamily ?? [];
      const m = fitted.find((value) => value > 0) ?? 0;
      const single = new Set(fitted.filter((value) => value > 0)).size === 1;
      const present = presentRows(context.p);
      const where = describeTests(candidate);
      if (context.tests !== undefined && single && m < context.tests) {
        return `the values were adjusted over ${m} tests${andMethod}, not the ${context.tests} given by --tests: the table was filtered before adjusting, so the adjustment understates the multiplicity (${reproduces} with ${where})`;
      }
      if (context.tests === undefined && single && fitted.length === 1 && m > present) {
        return `the values were adjusted over ${m} tests${andMethod}, more than the ${present} p-values the table holds: right if the table was filtered after adjusting (audit with --tests ${m}${andMethod ? ` --method ${token}` : ''} to confirm), wrong otherwise (${reproduces} with ${where})`;
      }
      if (context.tests === undefined && m > present) {
        return `the values were adjusted over more tests than each family holds (${where}${andMethod}): right if the table was filtered after adjusting, wrong otherwise (${reproduces})`;
      }
      return `the values fit ${token} with ${where}, not ${describeTests(stated.candidate)} (${reproduces})`;
    }
    default:
      return `${reproduces}`;
  }
}

export function auditReport(result: AuditResult, context: AuditContext): AuditReport {
  const { stated, explanation } = result;
  const comparison = stated.comparison;
  const digits = printedDigits(context.claims);
  const matches = result.fittingMethods.length > 0 && explanation?.kind !== 'rounding';
  const verdict = matches && (!context.statedMethod || result.fittingMethods.includes(context.statedMethod)) ? 'match' : 'mismatch';
  return {
    column: context.column,
    alpha: context.alpha,
    verdict,
    method: stated.candidate.method.token,
    matchingMethods: result.fittingMethods.map((method) => method.token),
    families: [...stated.candidate.grouping.columns],
    tests: context.tests ?? null,
    compared: comparison.compared,
    matched: comparison.matched,
    unclaimed: comparison.unclaimed.length,
    claimWithoutP: comparison.claimWithoutP.length,
    digits,
    mismatches: [...comparison.mismatched, ...comparison.unclaimed, ...comparison.claimWithoutP]
      .sort((a, b) => a - b)
      .slice(0, context.listed)
      .map((row) => rowReport(row, context)),
    flipped: comparison.flipped.slice(0, context.listed).map((row) => rowReport(row, context)),
    explanation: explanation
      ? {
          kind: explanation.kind,
          method: explanation.candidate.method.token,
          families: [...explanation.candidate.grouping.columns],
          tests: explanation.candidate.testsByFamily ? [...explanation.candidate.testsByFamily] : (explanation.candidate.tests ?? null),
          onlyClaimedRows: explanation.candidate.onlyClaimedRows === true,
          matched: explanation.comparison.matched,
          compared: explanation.comparison.compared,
          text: explanationText(result, context, stated, digits),
        }
      : null,
  };
}

function digitsText(digits: number | null): string {
  if (digits === null) return 'full precision';
  return digits === 1 ? '1 significant digit' : `${digits} significant digits`;
}

/**
 * A recomputed value with enough digits to tell it from the claimed one: the
 * fewest (six at least) whose text differs from the claim's; the JSON report
 * keeps every digit.
 */
function shownBeside(value: number | null, claimed: number | null): string {
  if (value === null) return '(none)';
  const claimText = claimed === null ? '' : String(claimed);
  for (let digits = 6; digits < 17; digits++) {
    const text = String(Number(value.toPrecision(digits)));
    if (text !== claimText) return text;
  }
  return String(value);
}

function shown(value: number | null): string {
  return value === null ? '(none)' : String(value);
}

/** The report in plain sentences. */
export function auditText(report: AuditReport, context: AuditContext): string {
  const lines: string[] = [];
  const families = report.families.length === 0 ? 'the whole table as one family' : `families by ${report.families.join(', ')}`;
  const m = report.tests === null ? `the p-values present${report.families.length === 0 ? ` (${presentRows(context.p)})` : ' in each family'}` : String(report.tests);
  const left = context.onlyAdjustedRows ? '; rows without an adjusted value left out' : '';
  lines.push(`audit of column ${JSON.stringify(report.column)} in ${context.source}: ${families}, m = ${m}, alpha = ${report.alpha}${left}`);
  const also = report.matchingMethods.filter((token) => token !== report.method);
  const alsoText = also.length > 0 ? ` (so do ${also.join(', ')}: with these p-values they coincide)` : '';
  lines.push(`${report.method} reproduces ${report.matched} of ${report.compared} claimed values${report.digits === null ? ' (printed at full precision)' : `, printed to ${digitsText(report.digits)}`}${report.matched === report.compared ? alsoText : ''}`);
  const rows = (count: number): string => (count === 1 ? '1 row has' : `${count} rows have`);
  if (report.unclaimed > 0) lines.push(`${rows(report.unclaimed)} a p-value but no claimed value`);
  if (report.claimWithoutP > 0) lines.push(`${rows(report.claimWithoutP)} a claimed value but no p-value`);
  if (report.mismatches.length > 0) {
    const total = report.compared - report.matched + report.unclaimed + report.claimWithoutP;
    lines.push(`first mismatches (${report.mismatches.length} of ${total}):`);
    for (const row of report.mismatches) {
      lines.push(`  line ${row.line}: p ${Number.isNaN(row.p) ? '(missing)' : row.p}, claimed ${shown(row.claimed)}, recomputed ${shownBeside(row.recomputed, row.claimed)}`);
    }
  }
  if (report.explanation) lines.push(`most likely: ${report.explanation.text}`);
  else if (report.verdict === 'mismatch') lines.push('no procedure, family grouping or number of tests that famwise tried reproduces the values');
  lines.push(report.verdict === 'match' ? `verdict: match (${report.method})` : 'verdict: mismatch');
  return `${lines.join('\n')}\n`;
}

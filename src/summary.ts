// The rejection summary: one row per family and method, as data (for the
// JSON file) and as an aligned text table (for the terminal).

import type { Pi0Estimate } from './estimators/pi0.js';
import type { WithinFamilies } from './families.js';
import type { Method } from './methods.js';
import { alignedTable, printable } from './text-table.js';

export interface SummaryRow {
  /** The family's defining values by column name, or null when the table is one family. */
  family: Record<string, string> | null;
  method: string;
  tested: number;
  missing: number;
  m: number;
  rejected: number;
  /** The largest raw p-value among the rejected, or null when nothing is rejected. */
  threshold: number | null;
  /** The estimate of the share of true nulls, for methods that use one; else null. */
  pi0: Pi0Estimate | null;
}

/** How prior weights were used, when they were. */
export interface WeightsUsed {
  /** The weights column. */
  column: string;
  normalisation: 'mean 1 within each family';
}

export interface Summary {
  alpha: number;
  /** Present only when the adjustment was weighted. */
  weights?: WeightsUsed;
  rows: SummaryRow[];
}

export function summarize(
  result: WithinFamilies,
  methods: readonly Method[],
  familyColumnNames: readonly string[],
  familyValues: readonly (readonly string[])[],
  alpha: number,
  weightsColumnName?: string,
): Summary {
  const rows: SummaryRow[] = [];
  result.outcomes.forEach((byMethod, f) => {
    const family = familyColumnNames.length === 0 ? null : familyRecord(familyColumnNames, familyValues[f] ?? []);
    byMethod.forEach((outcome, k) => {
      rows.push({ family, method: (methods[k] as Method).token, ...outcome });
    });
  });
  if (weightsColumnName === undefined) return { alpha, rows };
  return { alpha, weights: { column: weightsColumnName, normalisation: 'mean 1 within each family' }, rows };
}

/** A family's defining values keyed by column name. */
export function familyRecord(names: readonly string[], values: readonly string[]): Record<string, string> {
  return Object.fromEntries(names.map((name, k) => [name, values[k] ?? '']));
}

/** Text that tells families apart: values with spaces at their ends, or empty, are quoted. */
function shownValue(value: string): string {
  return printable(value === '' || value.trim() !== value || /[",=]/.test(value) ? JSON.stringify(value) : value);
}

export function familyLabel(family: Record<string, string> | null): string {
  if (family === null) return '(all rows)';
  return Object.entries(family)
    .map(([name, value]) => `${printable(name)}=${shownValue(value)}`)
    .join(', ');
}

/** Four significant digits is plenty for reading; the JSON keeps every digit. */
function shortNumber(value: number | null): string {
  if (value === null) return '-';
  return value === 0 ? '0' : String(Number(value.toPrecision(4)));
}

/** The pi0 estimate, its estimator and tuning, in one cell: `0.8123 fixed lambda=0.5`; a fallback is marked. */
function pi0Text(pi0: Pi0Estimate | null): string {
  if (pi0 === null) return '-';
  const tuning = Object.entries(pi0.tuning).map(([name, value]) => `${name}=${value}`);
  return [shortNumber(pi0.value), pi0.estimator, ...tuning, ...(pi0.fallback === null ? [] : ['(fallback)'])].join(' ');
}

export function summaryText(summary: Summary): string {
  const header = ['family', 'method', 'tested', 'missing', 'm', `rejected at ${summary.alpha}`, 'largest rejected p'];
  // The pi0 column appears only when a method in the run estimates pi0.
  const withPi0 = summary.rows.some((row) => row.pi0 !== null);
  const rows = summary.rows.map((row) => [
    familyLabel(row.family),
    row.method,
    String(row.tested),
    String(row.missing),
    String(row.m),
    String(row.rejected),
    shortNumber(row.threshold),
    ...(withPi0 ? [pi0Text(row.pi0)] : []),
  ]);
  const table = alignedTable(withPi0 ? [...header, 'pi0'] : header, rows);
  if (summary.weights === undefined) return table;
  return `${table}weighted by column ${JSON.stringify(summary.weights.column)}, normalised to mean 1 within each family\n`;
}

/** One line for each family and method whose pi0 estimator fell back, naming both. */
export function pi0Warnings(summary: Summary): string[] {
  return summary.rows.flatMap((row) =>
    row.pi0?.fallback ? [`${familyLabel(row.family)}, ${row.method}: ${row.pi0.fallback}`] : [],
  );
}

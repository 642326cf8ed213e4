// The rejection summary: one row per family and method, as data (for the
// JSON file) and as an aligned text table (for the terminal).

import type { WithinFamilies } from './families.js';
import type { Method } from './methods.js';
import { alignedTable } from './text-table.js';

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
  return value === '' || value.trim() !== value || /[",=]/.test(value) ? JSON.stringify(value) : value;
}

export function familyLabel(family: Record<string, string> | null): string {
  if (family === null) return '(all rows)';
  return Object.entries(family)
    .map(([name, value]) => `${name}=${shownValue(value)}`)
    .join(', ');
}

/** Four significant digits is plenty for reading; the JSON keeps every digit. */
function shortNumber(value: number | null): string {
  if (value === null) return '-';
  return value === 0 ? '0' : String(Number(value.toPrecision(4)));
}

export function summaryText(summary: Summary): string {
  const header = ['family', 'method', 'tested', 'missing', 'm', `rejected at ${summary.alpha}`, 'largest rejected p'];
  const rows = summary.rows.map((row) => [
    familyLabel(row.family),
    row.method,
    String(row.tested),
    String(row.missing),
    String(row.m),
    String(row.rejected),
    shortNumber(row.threshold),
  ]);
  const table = alignedTable(header, rows);
  if (summary.weights === undefined) return table;
  return `${table}weighted by column ${JSON.stringify(summary.weights.column)}, normalised to mean 1 within each family\n`;
}

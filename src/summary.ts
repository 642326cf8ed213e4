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

export interface Summary {
  alpha: number;
  rows: SummaryRow[];
}

export function summarize(
  result: WithinFamilies,
  methods: readonly Method[],
  familyColumnNames: readonly string[],
  familyValues: readonly (readonly string[])[],
  alpha: number,
): Summary {
  const rows: SummaryRow[] = [];
  result.outcomes.forEach((byMethod, f) => {
    const family =
      familyColumnNames.length === 0
        ? null
        : Object.fromEntries(familyColumnNames.map((name, k) => [name, familyValues[f]?.[k] ?? '']));
    byMethod.forEach((outcome, k) => {
      rows.push({ family, method: (methods[k] as Method).token, ...outcome });
    });
  });
  return { alpha, rows };
}

function familyLabel(family: Record<string, string> | null): string {
  if (family === null) return '(all rows)';
  return Object.entries(family)
    .map(([name, value]) => `${name}=${value === '' ? '(empty)' : value}`)
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
  return alignedTable(header, rows);
}

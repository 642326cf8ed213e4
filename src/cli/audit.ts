// famwise audit: check adjusted p-values that another program computed.

const USAGE = `Reads a table that already holds adjusted p-values (CSV or TSV, from FILE or
standard input), recomputes the adjustment from the raw p-values, and
compares the two row by row, to the precision each claimed value was printed
with: 0.0123 matches any value that rounds to it. When they differ, it tries
the usual mistakes (another procedure, other families, another number of
tests, rows dropped before adjusting, values rounded too far) and says which
one explains the claimed values.

The report goes to standard output (--json for scripts). The exit status is
0 when the claimed values match, 3 when they do not.

Examples (without --method, audit finds the procedure that fits):
  famwise audit results.csv --adjusted-column padj --method bh
  famwise audit results.csv --adjusted-column padj
  famwise audit scan.tsv --adjusted-column q --family chrom --json`;

import type { Command } from 'commander';
import * as z from 'zod';
import type { Grouping, Printed } from '../audit/audit.js';
import { UsageError, quoteText } from '../errors.js';
import { AUDIT_EXIT_HELP, EXIT } from '../exit-codes.js';
import { singleFamily } from '../families.js';
import { type Table, columnName, readTable } from '../io/read-table.js';
import { familyLabel, familyRecord } from '../summary.js';
import { METHOD_TOKENS, findMethod, likelyMethod } from '../methods.js';
import { alphaSchema, inputOptionsSchema, openInput, tableCommand, tableReadOptions, testsSchema } from './options.js';

const auditOptionsSchema = inputOptionsSchema.extend({
  adjustedColumn: z.string({ message: 'is required: name the column of adjusted p-values to check' }).min(1, 'needs a column name or a 1-based position'),
  method: z
    .string()
    .transform((token) => token.toLowerCase())
    .superRefine((token, context) => {
      if (findMethod(token)) return;
      const likely = likelyMethod(token);
      context.addIssue({ code: 'custom', message: `is not a method; ${likely ? `did you mean ${likely}? ` : ''}the methods are ${METHOD_TOKENS.join(', ')}` });
    })
    .transform((token) => findMethod(token))
    .optional(),
  onlyAdjustedRows: z.boolean().default(false),
  quiet: z.boolean().default(false),
  alpha: alphaSchema,
  tests: testsSchema,
  mismatches: z
    .string()
    .regex(/^\d+$/, 'needs a whole number of rows to list')
    .default('10')
    .transform(Number),
  json: z.boolean().default(false),
});

type AuditOptions = z.output<typeof auditOptionsSchema>;

export function auditCommand(): Command {
  return tableCommand('audit', 'check adjusted p-values computed elsewhere, and explain any mismatch', USAGE, auditOptionsSchema, runAudit, AUDIT_EXIT_HELP)
    .option('--adjusted-column <name|index>', 'the column of adjusted p-values to check (required)')
    .option('--method <token>', `the procedure the values claim to come from: ${METHOD_TOKENS.join(', ')} (default: find the one that fits)`)
    .option('--alpha <level>', 'the level at which decisions are compared (default: 0.05)')
    .option('--tests <n>', 'the real number of tests in each family, when the table holds only some of them')
    .option('--only-adjusted-rows', 'leave rows without an adjusted value out of the check (and out of m), as for a table filtered independently of the p-values before adjusting')
    .option('--mismatches <n>', 'list at most this many mismatching rows (default: 10)')
    .option('--json', 'print the report as JSON, for scripts')
    .option('-q, --quiet', 'print no notes on standard error (the report still goes to standard output)');
}

async function runAudit(file: string | undefined, options: AuditOptions): Promise<void> {
  // The audit's machinery loads only when audit runs, so that other commands start faster.
  const [{ auditClaims, presentPerFamily }, { columnHalfUnits }, { auditReport, auditText }] = await Promise.all([
    import('../audit/audit.js'),
    import('../audit/matching.js'),
    import('../audit/report.js'),
  ]);
  const source = await openInput(file);
  const table = await readTable(source, {
    ...tableReadOptions(options),
    claimedColumn: options.adjustedColumn,
    lineNumbers: true,
    keyColumns: true,
    pPrecision: true,
  });
  const note = (text: string): void => {
    if (!options.quiet) process.stderr.write(`famwise: note: ${text}\n`);
  };
  for (const notice of table.notices) note(notice.text);
  const claimed = table.claimed as NonNullable<typeof table.claimed>;
  const claims: Printed = { values: claimed.values, halfUnits: columnHalfUnits(claimed.values, claimed.halfUnits) };
  // Rows filtered out before adjusting (no adjusted value) are, with --only-adjusted-rows, not tests at all.
  const values = options.onlyAdjustedRows ? table.p.map((value, row) => (Number.isNaN(claims.values[row]) ? NaN : value)) : table.p;
  const p: Printed = { values, halfUnits: columnHalfUnits(values, table.pHalfUnits as Float64Array) };
  const nameOf = (column: number): string => columnName(table.shape, column);
  const familyColumnNames = table.familyColumns.map(nameOf);
  const stated: Grouping = { columns: familyColumnNames, families: table.families };
  // Alternatives: no families at all, and each other column with few distinct values.
  const alternatives: Grouping[] = [
    ...(table.familyColumns.length > 0 ? [{ columns: [], families: singleFamily(values.length) }] : []),
    ...(table.keys ?? [])
      .filter((key) => !(table.familyColumns.length === 1 && table.familyColumns[0] === key.column))
      .map((key) => ({ columns: [nameOf(key.column)], families: key.families })),
  ];
  if (options.tests !== undefined) checkTests(options.tests, presentPerFamily(values, stated.families), table, familyColumnNames);
  const result = auditClaims(p, claims, [stated, ...alternatives], { alpha: options.alpha, method: options.method, tests: options.tests });
  const context = {
    source: source.name,
    column: nameOf(claimed.column),
    alpha: options.alpha,
    tests: options.tests,
    statedMethod: options.method,
    onlyAdjustedRows: options.onlyAdjustedRows,
    p: values,
    claims,
    recomputed: result.stated.recomputed.value,
    lines: table.lines as Int32Array,
    listed: options.mismatches,
  };
  const report = auditReport(result, context);
  process.stdout.write(options.json ? `${JSON.stringify(report, null, 2)}\n` : auditText(report, context));
  if (report.verdict === 'mismatch') process.exitCode = EXIT.mismatch;
  if (claims.values.every((value) => Number.isNaN(value))) note(`column ${quoteText(context.column)} holds no values to check`);
}

/** --tests must cover every family; the message names the largest. */
function checkTests(tests: number, present: Int32Array, table: Table, familyColumnNames: readonly string[]): void {
  const largest = present.reduce((best, count, f) => (count > (present[best] as number) ? f : best), 0);
  const count = present[largest] ?? 0;
  if (tests >= count) return;
  const where = familyColumnNames.length === 0 ? 'the table' : `family ${familyLabel(familyRecord(familyColumnNames, table.familyValues[largest] ?? []))}`;
  throw new UsageError(`--tests ${tests}: ${where} holds ${count} p-values; --tests must be at least that`);
}

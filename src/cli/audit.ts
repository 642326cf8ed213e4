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
import { z } from 'zod';
import { type Grouping, auditClaims, recompute } from '../audit/audit.js';
import { settleBareIntegers } from '../audit/matching.js';
import { auditReport, auditText } from '../audit/report.js';
import { UsageError, quoteText } from '../errors.js';
import { AUDIT_EXIT_HELP, EXIT } from '../exit-codes.js';
import { singleFamily } from '../families.js';
import { readTable } from '../io/read-table.js';
import { METHOD_TOKENS, findMethod } from '../methods.js';
import { alphaSchema, inputOptionsSchema, openInput, tableCommand, tableReadOptions, testsSchema } from './options.js';

const auditOptionsSchema = inputOptionsSchema.extend({
  adjustedColumn: z.string({ message: 'is required: name the column of adjusted p-values to check' }).min(1, 'needs a column name or a 1-based position'),
  method: z
    .string()
    .transform((token) => token.toLowerCase())
    .refine((token) => findMethod(token) !== undefined, { message: `is not a method; the methods are ${METHOD_TOKENS.join(', ')}` })
    .transform((token) => findMethod(token))
    .optional(),
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
    .option('--mismatches <n>', 'list at most this many mismatching rows (default: 10)')
    .option('--json', 'print the report as JSON, for scripts');
}

async function runAudit(file: string | undefined, options: AuditOptions): Promise<void> {
  const source = await openInput(file);
  const table = await readTable(source, { ...tableReadOptions(options), claimedColumn: options.adjustedColumn, lineNumbers: true, keyColumns: true });
  const claimed = table.claimed as NonNullable<typeof table.claimed>;
  const claims = { ...claimed, halfUnits: settleBareIntegers(claimed.values, claimed.halfUnits) };
  const nameOf = (column: number): string => table.shape.names?.[column] ?? String(column + 1);
  const stated: Grouping = { columns: table.familyColumns.map(nameOf), families: table.families };
  // Alternatives: no families at all, and each other column with few distinct values.
  const alternatives: Grouping[] = [
    ...(table.familyColumns.length > 0 ? [{ columns: [], families: singleFamily(table.p.length) }] : []),
    ...(table.keys ?? [])
      .filter((key) => !(table.familyColumns.length === 1 && table.familyColumns[0] === key.column))
      .map((key) => ({ columns: [nameOf(key.column)], families: key.families })),
  ];
  if (options.tests !== undefined) {
    const largest = Math.max(0, ...countPresentByFamily(table.p, stated));
    if (options.tests < largest) throw new UsageError(`--tests ${options.tests}: a family holds ${largest} p-values; --tests must be at least that`);
  }
  const result = auditClaims(table.p, claims, [stated, ...alternatives], { alpha: options.alpha, method: options.method, tests: options.tests });
  const context = {
    source: source.name,
    column: nameOf(claims.column),
    alpha: options.alpha,
    tests: options.tests,
    statedMethod: options.method,
    p: table.p,
    claims,
    recomputed: recompute(table.p, claims, result.stated.candidate),
    lines: table.lines as Int32Array,
    listed: options.mismatches,
  };
  const report = auditReport(result, context);
  process.stdout.write(options.json ? `${JSON.stringify(report, null, 2)}\n` : auditText(report, context));
  if (report.verdict === 'mismatch') process.exitCode = EXIT.mismatch;
  if (claims.values.every((value) => Number.isNaN(value))) {
    process.stderr.write(`famwise: note: column ${quoteText(context.column)} holds no values to check\n`);
  }
}

function countPresentByFamily(p: Float64Array, grouping: Grouping): number[] {
  const counts = new Array<number>(grouping.families.count).fill(0);
  p.forEach((value, row) => {
    if (!Number.isNaN(value)) counts[grouping.families.ids[row] as number]++;
  });
  return counts;
}

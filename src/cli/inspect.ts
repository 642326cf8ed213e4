// famwise inspect: can these p-values be trusted? Diagnostics of a table's
// p-values, family by family, before any adjustment.

const USAGE = `Reads a table of p-values (CSV or TSV, from FILE or standard input) the way
famwise adjust does, and describes each family's p-values: how many, missing,
exactly 0 or 1, distinct; the share below 0.05; the share of true nulls (pi0);
the inflation factor lambda; whether the p-values above 0.5 are flat, as null
p-values are; a histogram; and findings, each a sentence of advice with an
identifier that scripts can match.

Every adjustment assumes that null p-values are uniform on [0, 1]. If the tests
behind the table are miscalibrated, the adjusted results are wrong however
correct the arithmetic: look here first.

Examples:
  famwise inspect results.csv
  famwise inspect scan.tsv --family chrom --bins 50 --plot histograms.svg
  famwise inspect scan.tsv --statistic z --json | jq '.families[].findings[].id'
  famwise inspect gwas.tsv --p-scale minus-log10`;

import type { Command } from 'commander';
import type { FamilyInspection } from '../diagnostics/inspect-family.js';
import * as z from 'zod';
import { UsageError } from '../errors.js';
import { openOutput, routeOutput } from '../io/atomic-file.js';
import { columnName, readTable } from '../io/read-table.js';
import { familyRecord } from '../summary.js';
import { inputOptionsSchema, openInput, tableCommand, tableReadOptions } from './options.js';
import { checkPlotTarget, familyTitles, omittedNote } from './plot-output.js';

const inspectOptionsSchema = inputOptionsSchema.extend({
  bins: z
    .string()
    .default('20')
    .refine((text) => /^\d+$/.test(text.trim()) && Number(text) >= 1 && Number(text) <= 200, 'needs a whole number of histogram bins from 1 to 200')
    .transform(Number),
  json: z.boolean().default(false),
  plot: z.string().min(1, 'needs a file name, or - for standard output').optional(),
  quiet: z.boolean().default(false),
});

type InspectOptions = z.output<typeof inspectOptionsSchema>;

export function inspectCommand(): Command {
  return tableCommand('inspect', 'describe the p-values of a table: counts, histogram, inflation, uniformity, findings', USAGE, inspectOptionsSchema, runInspect)
    .option('--bins <n>', 'histogram bins over [0, 1] (default: 20)')
    .option('--json', 'print the inspection as JSON instead of text')
    .option('--plot <file.svg>', 'also draw the histograms (one panel per family) into this SVG file')
    .option('-q, --quiet', 'print no notes on standard error');
}

async function runInspect(file: string | undefined, options: InspectOptions): Promise<void> {
  const readOptions = tableReadOptions(options);
  if (options.plot !== undefined) {
    checkPlotTarget(options.plot, [[file, 'the input table']]);
    if (routeOutput(options.plot).kind === 'stdout') throw new UsageError(`--plot ${options.plot}: standard output carries the report; give the plot a file name`);
  }
  // The diagnostics and plots load only when inspect runs, so that other commands start faster.
  const [{ sortedByFamily }, { inspectFamily }, { inspectionRecord }, { inspectionText }, { histogramSvg }] = await Promise.all([
    import('../diagnostics/by-family.js'),
    import('../diagnostics/inspect-family.js'),
    import('../diagnostics/inspection-record.js'),
    import('../diagnostics/inspection-text.js'),
    import('../plots/histogram-svg.js'),
  ]);
  const table = await readTable(await openInput(file, true), readOptions);
  if (!options.quiet) for (const notice of table.notices) process.stderr.write(`famwise: note: ${notice.text}\n`);

  const familyColumnNames = table.familyColumns.map((column) => columnName(table.shape, column));
  const families = familyColumnNames.length === 0 ? [null] : table.familyValues.map((values) => familyRecord(familyColumnNames, values));
  const titles = familyTitles(table, familyColumnNames);
  const { sorted, missing } = sortedByFamily(table.p, table.families);
  const inspections: FamilyInspection[] = sorted.map((values, f) => inspectFamily(values, missing[f] as number, options.bins, table.pComputed));

  if (options.plot !== undefined) {
    const plot = openOutput(options.plot);
    try {
      const figure = histogramSvg(inspections.map((inspection, f) => ({ title: titles[f] as string, histogram: inspection.histogram, pi0: inspection.pi0 })));
      plot.stream.write(figure.svg);
      await plot.finish();
      plot.install();
      const omitted = omittedNote(figure, inspections.length);
      if (omitted !== null && !options.quiet) process.stderr.write(`famwise: note: ${omitted}\n`);
    } catch (error) {
      plot.abort();
      throw error;
    }
  }
  const report = options.json
    ? `${JSON.stringify({ families: inspections.map((inspection, f) => inspectionRecord(families[f] ?? null, inspection)) }, null, 2)}\n`
    : inspections.map((inspection, f) => inspectionText(titles[f] as string, inspection)).join('\n');
  process.stdout.write(report);
}

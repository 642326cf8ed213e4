// famwise adjust: adjust the p-values of a table within families and write
// the table back with the adjusted values and the decisions.

const USAGE = `Reads a table of raw p-values (CSV or TSV, plain or gzip, from FILE or
standard input), adjusts them within each family with the chosen procedures,
and writes the same table back with two new columns per method: adj_<method>
(the adjusted p-value) and rej_<method> (true where it is at most alpha). A
summary of the rejections goes to standard error; at a terminal, a long run
also shows its progress there.

Missing p-values (${MISSING_MARKS.map((mark) => mark || 'empty').join(', ')}) are
left out of the number of tests and get empty cells.

The storey method (q-values) estimates pi0, the share of true null
hypotheses, in each family: --pi0 chooses how. When the estimate cannot be
made (too few tests, or no p-value above lambda) pi0 = 1 is used, with a
warning that is printed even with --quiet.

Examples:
  famwise adjust results.csv --methods holm,bh -o adjusted.csv
  famwise adjust screen.tsv --methods storey,bky --pi0 spline
  famwise adjust scan.tsv.gz --family chrom --methods bh -o adjusted.tsv.gz
  famwise adjust --values 0.01,0.04,0.03,0.20 --methods bonferroni,bh
  famwise adjust screen.csv --family plate --tests 384 --summary summary.json`;

import { type Command, Option } from 'commander';
import * as z from 'zod';
import { DataError, IncompleteOutputError, UsageError, quoteText } from '../errors.js';
import { TooFewTestsError, type WithinFamilies, ZeroWeightsError, adjustWithinFamilies } from '../families.js';
import { ByteSink } from '../io/byte-sink.js';
import { COMMA, TAB } from '../io/dialect.js';
import { compressedIfNamed, gzipNamed } from '../io/gzip.js';
import { type OutputFile, openOutput, routeOutput } from '../io/atomic-file.js';
import { MISSING_MARKS, isNumberText, readPValue, readUpperBound } from '../io/p-value-text.js';
import { columnName, readTable, type Table } from '../io/read-table.js';
import { bufferSource, type InputSource } from '../io/source.js';
import { jsonLinesKeys, writeJsonLines } from '../io/write-jsonl.js';
import { type OutputColumn, type OutputFormat, writeTable } from '../io/write-table.js';
import { type ColumnPlan, type ColumnsPlan, plannedColumns } from '../io/column-plan.js';
import { type OutputInPlace, firstPartCellBytes, writeTableInParts } from '../io/parallel-write.js';
import { type FirstPartMeasures, adjustInTwoThreads } from '../io/parallel-adjust.js';
import { inParts, stopWorker } from '../io/parts.js';
import { DEFAULT_PI0_SETTINGS, PI0_ESTIMATORS, type Pi0Settings } from '../estimators/pi0.js';
import { METHODS, METHOD_TOKENS, type Method, type MethodSettings, WEIGHTED_TOKENS, columnNames, findMethod, likelyMethod } from '../methods.js';
import { type Summary, familyLabel, familyRecord, pi0Warnings, summarize, summaryText } from '../summary.js';
import { checkPlotTarget, discoveriesPlot } from './plot-output.js';
import { progressLine, showsProgress } from './progress.js';
import { alphaSchema, checkWritable, collectList, inputOptionsSchema, openInput, samePath, tableCommand, tableReadOptions, testsSchema } from './options.js';

const adjustOptionsSchema = inputOptionsSchema.extend({
  methods: z
    .array(z.string().transform((token) => token.toLowerCase()))
    .default(['bh'])
    .superRefine((tokens, context) => {
      const unknown = tokens.find((token) => !findMethod(token));
      if (unknown !== undefined) {
        const likely = likelyMethod(unknown);
        const suggestion = likely ? `did you mean ${likely}? ` : '';
        context.addIssue({ code: 'custom', message: `unknown method ${quoteText(unknown)}; ${suggestion}the methods are ${METHOD_TOKENS.join(', ')}` });
      }
      const repeated = tokens.find((token, i) => tokens.indexOf(token) !== i);
      if (repeated) context.addIssue({ code: 'custom', message: `${quoteText(repeated)} is given twice` });
    })
    .transform((tokens) => tokens.map((token) => findMethod(token) as Method)),
  alpha: alphaSchema,
  tests: testsSchema,
  values: z
    .array(z.string())
    .superRefine((items, context) => {
      if (items.every((item) => item.trim() === '')) context.addIssue({ code: 'custom', message: 'needs at least one p-value' });
    })
    .optional(),
  output: z.string().min(1, 'needs a file name, or - for standard output').optional(),
  summary: z.string().min(1, 'needs a file name, or - for standard output').optional(),
  format: z.enum(['csv', 'tsv', 'jsonl', 'table'], { message: 'accepts csv, tsv, jsonl or table' }).optional(),
  weights: z.string().min(1, 'needs the name or 1-based position of the column of weights').optional(),
  plot: z.string().min(1, 'needs a file name, or - for standard output').optional(),
  replace: z.boolean().default(false),
  quiet: z.boolean().default(false),
  pi0: z.enum(PI0_ESTIMATORS, { message: `accepts ${PI0_ESTIMATORS.join(', ')}` }).optional(),
  pi0Lambda: z
    .string()
    .refine((text) => isNumberText(text.trim()) && Number(text) >= 0 && Number(text) < 1, 'needs a tuning value from 0 up to (not including) 1, such as 0.5')
    .transform(Number)
    .optional(),
  pi0Seed: z
    .string()
    .regex(/^\d+$/, 'needs a whole number from 0 to 4294967295')
    .transform(Number)
    .refine((seed) => seed <= 0xffffffff, 'needs a whole number from 0 to 4294967295')
    .optional(),
});

type AdjustOptions = z.output<typeof adjustOptionsSchema>;

export function adjustCommand(): Command {
  return tableCommand('adjust', 'adjust the p-values of a table within families, and report the rejections', USAGE, adjustOptionsSchema, runAdjust)
    .option('--methods <list>', `procedures to apply, comma-separated: ${METHOD_TOKENS.join(', ')} (default: bh)`, collectList)
    .option('--alpha <level>', 'the error rate to control, between 0 and 1 (default: 0.05)')
    .option('--tests <n>', 'the real number of tests in each family, when the table holds only some of them (the absent ones count as p = 1)')
    .option('--weights <column>', `weight each hypothesis by this column's prior weights (>= 0, any scale, normalised to mean 1 within each family); for ${WEIGHTED_TOKENS.join(', ')}`)
    .option('--values <list>', 'adjust these p-values (comma-separated) instead of reading a table', collectList)
    .option('-o, --output <file>', 'write the table to this file (all or nothing; gzip-compressed if the name ends in .gz) instead of standard output (-: standard output)')
    .option('--summary <file>', 'also write the rejection summary to this file as JSON (-: standard output, when -o names a file)')
    .addOption(new Option('--format <kind>', 'output as csv, tsv, jsonl (one JSON object per row) or an aligned table (default: the input\'s delimiter; table at a terminal)').choices(['csv', 'tsv', 'jsonl', 'table']))
    .option('--plot <file.svg>', 'also draw, per family, each method\'s discoveries against the level from 0 to 0.25 into this SVG file')
    .option('--replace', 'overwrite adj_/rej_/p_raw columns the table already has, instead of failing')
    .addOption(new Option('--pi0 <estimator>', `how the storey method estimates pi0, the share of true null hypotheses (default: ${DEFAULT_PI0_SETTINGS.estimator})`).choices(PI0_ESTIMATORS))
    .option('--pi0-lambda <value>', `the tuning value of --pi0 fixed: pi0 = #{p > value} / (m (1 - value)) (default: ${DEFAULT_PI0_SETTINGS.lambda})`)
    .option('--pi0-seed <n>', `the seed of the resampling in --pi0 bootstrap-mse, a whole number (default: ${DEFAULT_PI0_SETTINGS.seed})`)
    .option('-q, --quiet', 'print no summary or notes on standard error (pi0 warnings are still printed)');
}

function valuesSource(options: AdjustOptions, file: string | undefined): InputSource | undefined {
  if (options.values === undefined) return undefined;
  if (file !== undefined) {
    throw new UsageError(`--values takes one comma-separated list (0.01,0.04,...); ${quoteText(file)} was read as a table to adjust, so give one or the other`);
  }
  if (options.family.length > 0 || options.pColumn !== undefined || options.statistic !== undefined || options.pScale !== 'plain') {
    throw new UsageError('--values: --family, --p-column, --p-scale and --statistic need a table; --values gives a single column of p-values');
  }
  const readable = (item: string): boolean => readPValue(item) !== 'invalid' || (options.boundsAsValues && readUpperBound(item) !== undefined);
  const bad = options.values.findIndex((item) => !readable(item));
  if (bad >= 0) {
    const item = options.values[bad] as string;
    const hint = readUpperBound(item) === undefined ? '' : '; to read an upper bound as its value, add --bounds-as-values';
    throw new UsageError(`--values: item ${bad + 1}, ${quoteText(item)}, is not a p-value (a number from 0 to 1, or NA)${hint}`);
  }
  // Empty items are missing values; a blank line would not be a row at all.
  const lines = options.values.map((item) => (item.trim() === '' ? 'NA' : item));
  return bufferSource(Buffer.from(`p\n${lines.join('\n')}\n`), '--values');
}

/** Weights go with the procedures that have a weighted form, and with a table that holds every test. */
function checkWeightsUsage(options: AdjustOptions): void {
  if (options.weights === undefined) return;
  const unweighted = options.methods.filter((method) => method.adjustWeighted === undefined);
  if (unweighted.length > 0) {
    const names = unweighted.map((method) => method.token).join(', ');
    throw new UsageError(`--weights: ${names} ${unweighted.length === 1 ? 'has' : 'have'} no weighted form; the weighted procedures are ${WEIGHTED_TOKENS.join(', ')}`);
  }
  if (options.tests !== undefined) {
    throw new UsageError('--weights cannot be combined with --tests: the weights of the tests absent from the table are unknown, so they cannot be normalised');
  }
  if (options.values !== undefined) throw new UsageError('--weights needs a table with a column of weights; --values gives p-values only');
}

/** The column that shows p-values computed from statistics or -log10 p. */
const COMPUTED_P_COLUMN = 'p_raw';

function outputColumns(table: Table, methods: readonly Method[], adjusted: Float64Array[], options: AdjustOptions, decimalComma: boolean): ColumnsPlan {
  const names = table.shape.names ?? [];
  const existing = (name: string): number | undefined => {
    const index = names.indexOf(name);
    if (index < 0) return undefined;
    if (!options.replace) {
      throw new UsageError(`the table already has a column ${quoteText(name)}; use --replace to overwrite it`);
    }
    // Overwriting one of two would leave the other's stale values beside the new ones.
    const twin = names.indexOf(name, index + 1);
    if (twin >= 0) {
      throw new UsageError(`--replace: the table has two columns named ${quoteText(name)} (columns ${index + 1} and ${twin + 1}); remove or rename one`);
    }
    return index;
  };
  // p-values computed from statistics or -log10 p are shown, so that each decision can be traced.
  const computed: ColumnPlan[] = table.pComputed ? [{ name: COMPUTED_P_COLUMN, replaces: existing(COMPUTED_P_COLUMN), kind: 'number', values: table.p }] : [];
  const perMethod = methods.flatMap((method, k): ColumnPlan[] => {
    const values = adjusted[k];
    const { adjusted: adjustedName, rejected: rejectedName } = columnNames(method);
    return [
      { name: adjustedName, replaces: existing(adjustedName), kind: 'number', values },
      { name: rejectedName, replaces: existing(rejectedName), kind: 'decision', values },
    ];
  });
  return { columns: [...computed, ...perMethod], alpha: options.alpha, decimalComma };
}

/** The table writers' formats, and JSON lines. */
type TableFormat = OutputFormat | 'jsonl';

function chooseFormat(options: AdjustOptions, table: Table, toTerminal: boolean): TableFormat {
  const format = options.format ?? (toTerminal ? 'table' : undefined);
  if (format === 'jsonl') return 'jsonl';
  if (format === 'table') {
    // Without a header, columns are known by position; the p-values by name.
    const { names, columnCount } = table.shape;
    return { headings: names ?? Array.from({ length: columnCount }, (_, k) => (k === table.pColumn ? 'p' : String(k + 1))) };
  }
  if (format === 'tsv') return { delimiter: TAB };
  if (format === 'csv') return { delimiter: COMMA };
  return { delimiter: table.shape.delimiter };
}

/** Each JSON object needs distinct keys: the header's names and the new columns' names. */
function checkJsonKeys(table: Table, columns: readonly OutputColumn[]): void {
  const keys = jsonLinesKeys(table.shape, columns);
  const repeated = keys.find((key, i) => keys.indexOf(key) !== i);
  if (repeated !== undefined) {
    throw new UsageError(`--format jsonl: the table has more than one column named ${quoteText(repeated)}, and JSON objects need distinct keys; rename them, or use csv or tsv`);
  }
}

/** Where the table, the summary and the plot go; '-' (or a path that is standard output) means standard output. */
function outputTargets(options: AdjustOptions, file: string | undefined): { table?: string; summary?: string; plot?: string } {
  const { output: table, summary, plot } = options;
  const tableToStdout = table === undefined || routeOutput(table).kind === 'stdout';
  if (file !== undefined && file !== '-' && tableToStdout && routeOutput(file).kind === 'stdout') {
    // famwise adjust t.csv > t.csv: the shell emptied the file before famwise started (with >>, famwise would read what it appends).
    throw new UsageError(`${file}: standard output goes into this same file, so famwise would be reading what it writes (with ">" the shell has already emptied it); write to another file, or replace it safely with -o ${file}`);
  }
  if (table !== undefined) checkWritable(table, '--output');
  if (plot !== undefined) {
    checkPlotTarget(plot, [[file, 'the input table'], [table, 'the --output file'], [summary, 'the --summary file']]);
    const plotToStdout = routeOutput(plot).kind === 'stdout';
    if (plotToStdout && (tableToStdout || (summary !== undefined && routeOutput(summary).kind === 'stdout'))) {
      throw new UsageError(`--plot ${plot}: standard output already carries the ${tableToStdout ? 'table' : 'summary'}; give the plot a file name`);
    }
  }
  if (summary === undefined) return { table, summary, plot };
  checkWritable(summary, '--summary');
  if (tableToStdout && routeOutput(summary).kind === 'stdout') {
    throw new UsageError(`--summary ${summary}: standard output carries the table; give the summary a file name, or send the table to a file with -o`);
  }
  if (table !== undefined && samePath(table, summary)) {
    throw new UsageError(`--summary ${summary}: is also the --output file; give them different names`);
  }
  if (file !== undefined && file !== '-' && samePath(file, summary)) {
    throw new UsageError(`--summary ${summary}: is the input table; writing the summary there would replace it`);
  }
  return { table, summary, plot };
}

/** The pi0 settings from --pi0, --pi0-lambda and --pi0-seed; options that would have no effect are refused. */
function methodSettings(options: AdjustOptions): MethodSettings {
  const estimator = options.pi0 ?? DEFAULT_PI0_SETTINGS.estimator;
  const given = [options.pi0 !== undefined && '--pi0', options.pi0Lambda !== undefined && '--pi0-lambda', options.pi0Seed !== undefined && '--pi0-seed'].filter(Boolean);
  if (given.length > 0 && !options.methods.some((method) => method.estimatesPi0)) {
    const users = METHODS.filter((method) => method.estimatesPi0).map((method) => method.token);
    throw new UsageError(`${given[0]}: sets how pi0 is estimated, which only ${users.join(', ')} does (bky has its own first stage); add it to --methods`);
  }
  if (options.pi0Lambda !== undefined && estimator !== 'fixed') {
    throw new UsageError(`--pi0-lambda: applies to --pi0 fixed only; --pi0 ${estimator} chooses its own lambda`);
  }
  if (options.pi0Seed !== undefined && estimator !== 'bootstrap-mse') {
    throw new UsageError(`--pi0-seed: applies to --pi0 bootstrap-mse only, the one estimator that draws random resamples`);
  }
  const pi0: Pi0Settings = {
    estimator,
    lambda: options.pi0Lambda ?? DEFAULT_PI0_SETTINGS.lambda,
    seed: options.pi0Seed ?? DEFAULT_PI0_SETTINGS.seed,
  };
  return { pi0 };
}

/**
 * Adjusts within families; a --tests too small for a family becomes a usage
 * error naming it. measureFirst: see adjustInTwoThreads.
 */
async function adjustOrExplain(
  table: Table,
  options: AdjustOptions,
  settings: MethodSettings,
  familyColumnNames: readonly string[],
  measureFirst = false,
): Promise<WithinFamilies & { readonly firstPart?: FirstPartMeasures }> {
  const { sortedParts } = table;
  // Not kept once used: 12 bytes a row.
  table.sortedParts = undefined;
  try {
    // A table read and sorted in two parts (one family then, with no weights) is adjusted in two threads when it can be.
    const tests = typeof options.tests === 'number' ? options.tests : options.tests?.[0];
    const inTwo = sortedParts && table.families.count === 1 && table.weights === undefined ? await adjustInTwoThreads(table.p, sortedParts, options.methods, options.alpha, tests, measureFirst) : undefined;
    return inTwo ?? adjustWithinFamilies(table.p, table.families, options.methods, { alpha: options.alpha, tests: options.tests, weights: table.weights, settings, sortedParts });
  } catch (error) {
    if (!(error instanceof TooFewTestsError || error instanceof ZeroWeightsError)) throw error;
    const values = table.familyValues[error.family] ?? [];
    const where = familyColumnNames.length === 0 ? 'the table' : `family ${familyLabel(familyRecord(familyColumnNames, values))}`;
    if (error instanceof ZeroWeightsError) {
      throw new DataError(`--weights ${quoteText(options.weights ?? '')}: every weight in ${where} is zero, so nothing in it could be rejected; give at least one row a positive weight`);
    }
    throw new UsageError(`--tests ${error.tests}: ${where} holds ${error.tested} p-values; --tests must be at least that`);
  }
}

/** Writes the table and the JSON summary: every file complete, or none changed. */
async function writeOutputs(
  source: InputSource,
  table: Table,
  plan: ColumnsPlan,
  format: TableFormat,
  summary: Summary,
  targets: { table?: string; summary?: string; plot?: string },
  plot: () => Promise<string>,
  measured: Omit<OutputInPlace, 'fd'> | undefined,
): Promise<void> {
  const files: OutputFile[] = [];
  const abandon = (error: unknown): never => {
    for (const unfinished of files) unfinished.abort();
    throw error;
  };
  const tableFile = compressedIfNamed(targets.table, openOutput(targets.table ?? '-'));
  files.push(tableFile);
  const sink = new ByteSink(tableFile.stream);
  try {
    if (format === 'jsonl') await writeJsonLines(source, table.shape, plannedColumns(plan), sink, table.p.length);
    else if ('delimiter' in format && table.split && inParts(source)) {
      const inPlace = tableFile.fd !== undefined && measured !== undefined ? { fd: tableFile.fd, ...measured } : undefined;
      await writeTableInParts(source, table.shape, plan, format, sink, table.p.length, table.split, inPlace);
    }
    else await writeTable(source, table.shape, plannedColumns(plan), format, sink, table.p.length);
  } catch (error) {
    // A reader that stops early (famwise adjust big.csv | head) is not a failure: the rest still gets done.
    if ((error as NodeJS.ErrnoException).code !== 'EPIPE' || !tableFile.direct) {
      const where = targets.table === undefined || targets.table === '-' ? 'standard output' : targets.table;
      abandon(tableFile.direct && sink.written > 0 ? new IncompleteOutputError(error, where) : error);
    }
    files.pop();
    tableFile.abort();
  }
  // Nothing is left for the worker: its engine is torn down while the files are installed.
  stopWorker();
  try {
    if (targets.summary !== undefined) {
      const summaryFile = openOutput(targets.summary);
      files.push(summaryFile);
      summaryFile.stream.write(`${JSON.stringify(summary, null, 2)}\n`);
    }
    if (targets.plot !== undefined) {
      const plotFile = openOutput(targets.plot);
      files.push(plotFile);
      plotFile.stream.write(await plot());
    }
    for (const done of files) await done.finish();
    for (const done of files) done.install();
  } catch (error) {
    abandon(error);
  }
}

async function runAdjust(file: string | undefined, options: AdjustOptions): Promise<void> {
  checkWeightsUsage(options);
  const settings = methodSettings(options);
  const targets = outputTargets(options, file);
  const fromValues = valuesSource(options, file);
  const readOptions = fromValues ? { delimiter: COMMA, header: true, pColumn: 'p', boundsAsValues: options.boundsAsValues } : tableReadOptions(options);
  const opened = fromValues ?? (await openInput(file, true));
  const progressWanted = showsProgress({
    stderrIsTerminal: process.stderr.isTTY === true,
    tableToTerminal: (targets.table === undefined || routeOutput(targets.table).kind === 'stdout') && process.stdout.isTTY === true,
    quiet: options.quiet,
    env: process.env,
  });
  const source = progressWanted ? progressLine((text) => process.stderr.write(text)).watch(opened) : opened;
  const table = await readTable(source, { ...readOptions, weightsColumn: options.weights, sortP: true });
  const note = (text: string): void => {
    if (!options.quiet) process.stderr.write(`famwise: note: ${text}\n`);
  };
  const typedAtTerminal = !fromValues && (file === undefined || file === '-') && process.stdin.isTTY === true;
  for (const notice of table.notices) {
    // Pasting bare p-values at the terminal is what the prompt asked for.
    if (!(notice.id === 'header-guessed' && typedAtTerminal)) note(notice.text);
  }

  const familyColumnNames = table.familyColumns.map((column) => columnName(table.shape, column));
  const format = chooseFormat(options, table, targets.table === undefined && process.stdout.isTTY === true);
  // A table adjusted in two threads and written to a new file in two is written by the worker
  // straight into the file, where the first part's output ends: measuring the first part's
  // adjusted values as they are made tells where (parallel-write.ts, OutputInPlace).
  // Only the plain way of writing can be told ahead: records copied whole (the same delimiter, no
  // --replace), new cells of adjusted values only (no p_raw).
  const inPlace =
    format !== 'jsonl' &&
    'delimiter' in format &&
    format.delimiter === table.shape.delimiter &&
    !options.replace &&
    !table.pComputed &&
    targets.table !== undefined &&
    !gzipNamed(targets.table) &&
    routeOutput(targets.table).kind === 'replace';
  const result = await adjustOrExplain(table, options, settings, familyColumnNames, inPlace);
  const weightsName = table.weightsColumn === undefined ? undefined : columnName(table.shape, table.weightsColumn);
  const summary = summarize(result, options.methods, familyColumnNames, table.familyValues, options.alpha, weightsName);
  if (summary.rows.every((row) => row.tested === 0)) note('the table holds no p-values to adjust');

  // Decimal commas in, decimal commas out; but never in comma-separated output or JSON.
  const decimalComma = table.decimalComma && format !== 'jsonl' && !('delimiter' in format && format.delimiter === COMMA);
  const plan = outputColumns(table, options.methods, result.adjusted, options, decimalComma);
  if (format === 'jsonl') checkJsonKeys(table, plannedColumns(plan));
  const plot = (): Promise<string> => discoveriesPlot(table, result, options.methods, options.alpha, familyColumnNames, note);
  const firstCellBytes = firstPartCellBytes(plan, result.adjusted, result.firstPart);
  const measured = result.firstPart && firstCellBytes !== undefined ? { firstRows: result.firstPart.rows, firstCellBytes } : undefined;
  await writeOutputs(source, table, plan, format, summary, targets, plot, measured);
  if (!options.quiet) process.stderr.write(summaryText(summary));
  // A fallback changes what the q-values mean, so it is shown even with --quiet.
  for (const warning of pi0Warnings(summary)) process.stderr.write(`famwise: warning: ${warning}\n`);
}

// Option handling shared by the subcommands: the input options every command
// reads tables with, and the translation of zod's findings into one-line
// usage errors that name the option.

import { accessSync, constants, createReadStream, existsSync, realpathSync, statSync } from 'node:fs';
import { basename, dirname, resolve } from 'node:path';
import { Command } from 'commander';
import * as z from 'zod';
import { en } from 'zod/locales';
import { UsageError } from '../errors.js';
import { EXIT_HELP } from '../exit-codes.js';
import { CAUTION } from './cautions.js';
import { DELIMITERS } from '../io/dialect.js';
import { isUnsignedNumberText } from '../io/p-value-text.js';
import { routeOutput } from '../io/atomic-file.js';
import { decompressedIfGzip, isGzip } from '../io/gzip.js';
import { startWorker } from '../io/parts.js';
import { smallestInParts } from '../io/worker-thread.js';
import { type InputSource, fileSource, stdinFileSource } from '../io/source.js';
import { spilledSource } from '../io/spill.js';
import { type StatisticKind, type Tail, STATISTIC_KINDS, TAILS_ALLOWED, DEGREES_NEEDED, defaultTail } from '../distributions/p-from-statistic.js';
import type { DegreesSource, ValueReading } from '../io/statistic-text.js';
import type { ReadOptions } from '../io/read-table.js';

// zod's messages in English, for the checks that give none of their own. Importing zod as a
// namespace lets the bundler leave out its other languages (some 350 KB, a sixth of a small
// table's run to compile), and with them the call that chose English.
z.config(en());

/** Collects a repeatable, comma-separated option into one list. */
export function collectList(value: string, previous: string[] | undefined): string[] {
  return [...(previous ?? []), ...value.split(',').map((item) => item.trim())];
}

/**
 * A subcommand that reads one table (FILE or standard input) with the shared
 * input options, ends its help with the exit statuses and the caution, and
 * runs `run` with the options validated by `schema`.
 */
export function tableCommand<T extends z.ZodType>(
  name: string,
  summary: string,
  usage: string,
  schema: T,
  run: (file: string | undefined, options: z.output<T>) => Promise<void>,
  exitHelp: string = EXIT_HELP,
): Command {
  const command = new Command(name)
    .summary(summary)
    .description(usage)
    .argument('[file]', 'the table to read; - or nothing for standard input')
    .addHelpText('after', `\nExit status:\n${exitHelp}\n\n${CAUTION}\n`)
    .action(async (file: string | undefined, raw: Record<string, unknown>) => {
      await run(file, parseOptions(schema, raw));
    });
  return addInputOptions(command);
}

/** The input options: the same flags, with the same meaning, on every command that reads a table. */
export function addInputOptions(command: Command): Command {
  return command
    .option('--p-column <name|index>', 'the column of raw p-values (default: the one column named like p, pvalue, p_value, pval)')
    .option('--family <columns>', 'each combination of these columns\' values is a family of its own, adjusted or inspected separately (comma-separated, repeatable)', collectList)
    .option('--delimiter <char>', 'the field delimiter: comma, tab, semicolon or pipe (default: sniffed from the first two lines)')
    .option('--header', 'the first line names the columns (default: yes, unless it holds only numbers)')
    .option('--no-header', 'the first line is data; columns are named by position, 1, 2, ...')
    .option('--p-scale <scale>', 'how the p-value column is written: plain (0.003) or minus-log10 (2.52 for p = 0.003) (default: plain)')
    .option('--statistic <kind>', 'read test statistics instead of p-values, and compute each p-value: z, t, chisq or f')
    .option('--statistic-column <name|index>', 'the column of statistics (default: the one column named like the kind: z, z_value, t, t_stat, chisq, F, stat, ...)')
    .option('--df <n>', 'degrees of freedom of every t or chi-square statistic; for F, the numerator\'s')
    .option('--df-column <name|index>', 'a column holding each row\'s degrees of freedom, instead of --df')
    .option('--df2 <n>', 'for F statistics: the denominator\'s degrees of freedom')
    .option('--df2-column <name|index>', 'a column holding each row\'s denominator degrees of freedom, instead of --df2')
    .option('--tail <tail>', 'for z and t: two (default: p = P(|T| >= |t|)), upper (p = P(T >= t): large positive values are evidence) or lower (p = P(T <= t)); chisq and f are always upper')
    .option('--bounds-as-values', 'read a p-value written as an upper bound (<2e-16, as R prints them) as the bound itself: conservative, the adjusted values in its family become upper bounds');
}

const positiveNumber = z
  .string()
  .transform((text) => (isUnsignedNumberText(text.trim()) ? Number(text) : NaN))
  .refine((value) => value > 0 && Number.isFinite(value), 'needs a positive number of degrees of freedom, like 10 or 27.4');

export const inputOptionsSchema = z.object({
  pColumn: z.string().min(1, 'needs a column name or a 1-based position').optional(),
  family: z.array(z.string().min(1, 'column names cannot be empty')).default([]),
  delimiter: z
    .string()
    .refine((value) => value in DELIMITERS, 'accepts comma, tab, semicolon or pipe (or the character itself)')
    .transform((value) => DELIMITERS[value] as number)
    .optional(),
  header: z.boolean().optional(),
  pScale: z.enum(['plain', 'minus-log10'], { message: 'accepts plain or minus-log10' }).default('plain'),
  statistic: z
    .string()
    .transform((kind) => kind.toLowerCase())
    .refine((kind) => (STATISTIC_KINDS as readonly string[]).includes(kind), `accepts ${STATISTIC_KINDS.join(', ')}`)
    .transform((kind) => kind as StatisticKind)
    .optional(),
  statisticColumn: z.string().min(1, 'needs a column name or a 1-based position').optional(),
  df: positiveNumber.optional(),
  dfColumn: z.string().min(1, 'needs a column name or a 1-based position').optional(),
  df2: positiveNumber.optional(),
  df2Column: z.string().min(1, 'needs a column name or a 1-based position').optional(),
  tail: z
    .string()
    .transform((tail) => tail.toLowerCase())
    .pipe(z.enum(['two', 'upper', 'lower'], { message: 'accepts two, upper or lower' }))
    .optional(),
  boundsAsValues: z.boolean().default(false),
});

/** --alpha, shared by the commands that decide at a level. */
export const alphaSchema = z
  .string()
  .default('0.05')
  .transform(Number)
  .refine((alpha) => alpha > 0 && alpha < 1, 'needs a level between 0 and 1, such as 0.05 (for 5%)');

/** --tests, shared by the commands that adjust. */
export const testsSchema = z
  .string()
  .regex(/^\d+$/, 'needs a whole number of tests, at least the number of p-values in each family')
  .transform(Number)
  .refine((tests) => tests >= 1 && Number.isSafeInteger(tests), 'needs a whole number from 1 to 9007199254740991')
  .optional();

type InputOptions = z.output<typeof inputOptionsSchema>;

function degreesSource(constant: number | undefined, column: string | undefined, flag: string): DegreesSource | undefined {
  if (constant !== undefined && column !== undefined) throw new UsageError(`${flag} and ${flag}-column: give one or the other`);
  if (constant !== undefined) return { constant };
  return column === undefined ? undefined : { column };
}

/**
 * What the value column holds, from --p-scale, --statistic and their
 * companions; undefined for plain p-values. Options that do not fit
 * together are usage errors.
 */
export function valueReading(options: InputOptions): ValueReading | undefined {
  const { statistic } = options;
  if (statistic === undefined) {
    const stray = (['statisticColumn', 'df', 'dfColumn', 'df2', 'df2Column', 'tail'] as const).find((key) => options[key] !== undefined);
    if (stray) throw new UsageError(`${flagOf(stray)} needs --statistic (z, t, chisq or f)`);
    if (options.pScale === 'minus-log10' && options.boundsAsValues) {
      throw new UsageError('--bounds-as-values and --p-scale minus-log10: bounds are a way of writing p-values; a column of -log10 p has none');
    }
    return options.pScale === 'minus-log10' ? { kind: 'minus-log10' } : undefined;
  }
  if (options.pScale !== 'plain') throw new UsageError('--p-scale and --statistic: the column holds p-values or statistics, not both');
  if (options.boundsAsValues) throw new UsageError('--bounds-as-values and --statistic: bounds are a way of writing p-values; a column of statistics has none');
  if (options.pColumn !== undefined) throw new UsageError('--p-column and --statistic: name the column of statistics with --statistic-column');
  const df = degreesSource(options.df, options.dfColumn, '--df');
  const df2 = degreesSource(options.df2, options.df2Column, '--df2');
  const needed = DEGREES_NEEDED[statistic];
  if (needed >= 1 && df === undefined) {
    throw new UsageError(`--statistic ${statistic}: needs degrees of freedom: --df N for all rows, or --df-column COLUMN${needed === 2 ? ' (the numerator\'s), and --df2 or --df2-column (the denominator\'s)' : ''}`);
  }
  if (needed === 2 && df2 === undefined) throw new UsageError('--statistic f: needs the denominator degrees of freedom: --df2 N or --df2-column COLUMN');
  if (needed < 1 && df !== undefined) throw new UsageError(`--statistic ${statistic}: takes no degrees of freedom; drop --df/--df-column`);
  if (needed < 2 && df2 !== undefined) throw new UsageError(`--statistic ${statistic}: has one number of degrees of freedom; --df2 is for F statistics`);
  const tail: Tail = options.tail ?? defaultTail(statistic);
  if (!TAILS_ALLOWED[statistic].includes(tail)) {
    throw new UsageError(`--tail ${tail}: ${statistic === 'f' ? 'F' : 'chi-square'} statistics are tested in the upper tail only (large values are the evidence)`);
  }
  return { kind: 'statistic', statistic, tail, df, df2 };
}

/** The long flag of an option, from its key as commander names it: pColumn -> --p-column. */
function flagOf(key: string): string {
  return `--${key.replace(/[A-Z]/g, (letter) => `-${letter.toLowerCase()}`)}`;
}

/** How to read the table, from the input options (usage errors surface here, before any reading). */
export function tableReadOptions(options: InputOptions): ReadOptions {
  const reading = valueReading(options);
  return {
    delimiter: options.delimiter,
    header: options.header,
    pColumn: reading?.kind === 'statistic' ? options.statisticColumn : options.pColumn,
    familyColumns: options.family,
    reading,
    boundsAsValues: options.boundsAsValues,
  };
}

/** Validates raw commander options with a schema; the first problem becomes a UsageError naming its option. */
export function parseOptions<T extends z.ZodType>(schema: T, raw: unknown): z.output<T> {
  const parsed = schema.safeParse(raw);
  if (parsed.success) return parsed.data;
  const issue = parsed.error.issues[0] as z.core.$ZodIssue;
  const key = String(issue.path[0] ?? '');
  const flag = key === '' ? '' : flagOf(key);
  const given = (raw as Record<string, unknown>)[key];
  const shown = typeof given === 'string' ? ` ${JSON.stringify(given)}` : '';
  throw new UsageError(`${flag}${shown}: ${issue.message}`);
}

/** The table's source: a file, or standard input for '-' or no file. */
export async function openInput(file: string | undefined, readInParts = false): Promise<InputSource> {
  // A large table piped in goes to a file, which a command that reads in two parts (readInParts)
  // then reads so: its worker is started while the rest comes in (unless it is gzip, read in one).
  const onFile = (head: Buffer, size: number): void => {
    if (readInParts && !isGzip(head) && size >= smallestInParts()) startWorker();
  };
  if (file === undefined || file === '-') {
    if (process.stdin.isTTY) {
      process.stderr.write('famwise: reading from the terminal: paste p-values one per line (or a table), then press Ctrl-D\n');
    }
    return decompressedIfGzip(stdinFileSource() ?? (await spilledSource(process.stdin, '<stdin>', undefined, onFile)));
  }
  if (!existsSync(file)) throw new UsageError(`${file}: no such file`);
  const stat = statSync(file);
  if (stat.isDirectory()) throw new UsageError(`${file}: is a folder, not a table`);
  try {
    accessSync(file, constants.R_OK);
  } catch {
    throw new UsageError(`${file}: is not readable (permission denied)`);
  }
  // A pipe (<(zcat ...), /dev/stdin, a named pipe) can be read only once: keep it (spill.ts).
  return decompressedIfGzip(stat.isFile() ? fileSource(file) : await spilledSource(createReadStream(file), file, undefined, onFile));
}

/** Whether two paths name the same file (following links), whether or not it exists yet. */
export function samePath(a: string, b: string): boolean {
  const real = (path: string): string => (existsSync(path) ? realpathSync(path) : resolve(path));
  return real(a) === real(b);
}

/** Fails early, before any reading, when an output could not be written. */
export function checkWritable(path: string, flag: string): void {
  if (path.endsWith('/')) throw new UsageError(`${flag} ${path}: names a folder; give a file name`);
  if (Buffer.byteLength(basename(path)) > 255) throw new UsageError(`${flag}: the file name is longer than 255 bytes`);
  const route = routeOutput(path);
  if (route.kind === 'stdout' || route.kind === 'stderr') return;
  if (route.kind === 'direct') {
    try {
      accessSync(route.path, constants.W_OK);
    } catch {
      throw new UsageError(`${flag} ${path}: is not writable`);
    }
    return;
  }
  // The temporary file goes beside the file that will be replaced.
  const folder = dirname(route.path);
  if (!existsSync(folder) || !statSync(folder).isDirectory()) throw new UsageError(`${flag} ${path}: the folder ${dirname(path)} does not exist`);
  if (route.existing?.isDirectory()) throw new UsageError(`${flag} ${path}: is a folder`);
  try {
    accessSync(folder, constants.W_OK);
  } catch {
    throw new UsageError(`${flag} ${path}: the folder ${folder} is not writable`);
  }
}

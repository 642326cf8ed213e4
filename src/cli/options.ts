// Option handling shared by the subcommands: the input options every command
// reads tables with, and the translation of zod's findings into one-line
// usage errors that name the option.

import { accessSync, constants, createReadStream, existsSync, realpathSync, statSync } from 'node:fs';
import { basename, dirname, resolve } from 'node:path';
import type { Command } from 'commander';
import { z } from 'zod';
import { UsageError } from '../errors.js';
import { DELIMITERS } from '../io/dialect.js';
import { routeOutput } from '../io/atomic-file.js';
import { decompressedIfGzip } from '../io/gzip.js';
import { type InputSource, fileSource } from '../io/source.js';
import { spilledSource } from '../io/spill.js';

/** Collects a repeatable, comma-separated option into one list. */
export function collectList(value: string, previous: string[] | undefined): string[] {
  return [...(previous ?? []), ...value.split(',').map((item) => item.trim())];
}

/** The input options: the same flags, with the same meaning, on every command that reads a table. */
export function addInputOptions(command: Command): Command {
  return command
    .option('--p-column <name|index>', 'the column of raw p-values (default: the one column named like p, pvalue, p_value, pval)')
    .option('--family <columns>', 'adjust separately within each combination of these columns\' values (comma-separated, repeatable)', collectList)
    .option('--delimiter <char>', 'the field delimiter: comma, tab, semicolon or pipe (default: sniffed from the first line)')
    .option('--header', 'the first line names the columns (default: yes, unless it holds only numbers)')
    .option('--no-header', 'the first line is data; columns are named by position, 1, 2, ...');
}

export const inputOptionsSchema = z.object({
  pColumn: z.string().min(1, 'needs a column name or a 1-based position').optional(),
  family: z.array(z.string().min(1, 'column names cannot be empty')).default([]),
  delimiter: z
    .string()
    .refine((value) => value in DELIMITERS, 'accepts comma, tab, semicolon or pipe (or the character itself)')
    .transform((value) => DELIMITERS[value] as number)
    .optional(),
  header: z.boolean().optional(),
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

const FLAGS: Record<string, string> = {
  pColumn: '--p-column',
  family: '--family',
  delimiter: '--delimiter',
  header: '--header',
  methods: '--methods',
  alpha: '--alpha',
  tests: '--tests',
  values: '--values',
  output: '--output',
  summary: '--summary',
  format: '--format',
  weights: '--weights',
  json: '--json',
  adjustedColumn: '--adjusted-column',
  method: '--method',
  mismatches: '--mismatches',
  pi0: '--pi0',
  pi0Lambda: '--pi0-lambda',
  pi0Seed: '--pi0-seed',
};

/** Validates raw commander options with a schema; the first problem becomes a UsageError naming its option. */
export function parseOptions<T extends z.ZodType>(schema: T, raw: unknown): z.output<T> {
  const parsed = schema.safeParse(raw);
  if (parsed.success) return parsed.data;
  const issue = parsed.error.issues[0] as z.core.$ZodIssue;
  const key = String(issue.path[0] ?? '');
  const flag = FLAGS[key] ?? key;
  const given = (raw as Record<string, unknown>)[key];
  const shown = typeof given === 'string' ? ` ${JSON.stringify(given)}` : '';
  throw new UsageError(`${flag}${shown}: ${issue.message}`);
}

/** The table's source: a file, or standard input for '-' or no file. */
export async function openInput(file: string | undefined): Promise<InputSource> {
  if (file === undefined || file === '-') {
    if (process.stdin.isTTY) {
      process.stderr.write('famwise: reading from the terminal: paste p-values one per line (or a table), then press Ctrl-D\n');
    }
    return decompressedIfGzip(await spilledSource(process.stdin, '<stdin>'));
  }
  if (!existsSync(file)) throw new UsageError(`${file}: no such file`);
  const stat = statSync(file);
  if (stat.isDirectory()) throw new UsageError(`${file}: is a folder, not a table`);
  // A pipe (<(zcat ...), /dev/stdin, a named pipe) can be read only once: keep it (spill.ts).
  return decompressedIfGzip(stat.isFile() ? fileSource(file) : await spilledSource(createReadStream(file), file));
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

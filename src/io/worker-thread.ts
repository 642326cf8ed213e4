// Starting the worker thread that does half of a large table (parts.ts,
// part-worker.ts), and starting it early.
//
// A worker takes about 0.1 s to start (its own engine, Node's modules, its
// bundle), and the first half of the table is being read by then. The
// command's first module (cli/famwise.ts) therefore starts it before the
// rest of the command is even loaded, when the arguments name a file large
// enough to be read in two parts (or standard input is one), so that it is
// ready when the reading starts. A guess: parts.ts takes the worker if the
// table turns out to be read in parts, and otherwise it stays idle and ends
// with the process.

import { fstatSync, existsSync, statSync, type Stats } from 'node:fs';
import { availableParallelism } from 'node:os';
import { fileURLToPath } from 'node:url';
import { setFlagsFromString } from 'node:v8';
import { Worker } from 'node:worker_threads';

/** Below this many bytes of input one thread does it all: a worker takes about 0.1 s to start, and some 80 ms of the other core's time. */
const SMALLEST = 8 << 20;

/**
 * The worker's young generation, in MB: what a main thread's can grow to on
 * a 64-bit system (three 16 MB semi-spaces' worth; V8's defaults, from memory).
 * A worker's is small by default: reading half of a large table in it then
 * took about 1.6 times as long as in the main thread (frequent scavenges).
 */
const YOUNG_GENERATION_MB = 48;

/** The commands whose tables may be read in two parts (read-table.ts). */
const COMMANDS_IN_PARTS = new Set(['adjust', 'inspect']);
/**
 * The options of those commands that take a value, given as the next
 * argument, which is then not a table to read (an output file, a column
 * name); test/worker-thread.test.ts checks the list against the commands'
 * own definitions.
 */
export const VALUE_OPTIONS = new Set([
  '--methods', '--alpha', '--tests', '--weights', '--values', '-o', '--output', '--summary', '--format', '--plot', '--pi0', '--pi0-lambda', '--pi0-seed',
  '--bins', '--p-column', '--family', '--delimiter', '--p-scale', '--statistic', '--statistic-column', '--df', '--df-column', '--df2', '--df2-column', '--tail',
]);

/** Where the started worker waits to be taken: the command's first module and the rest are bundled apart. */
const EARLY = Symbol.for('famwise.early-worker');
interface Early {
  readonly worker: Worker;
  stopped: boolean;
  readonly stop: () => void;
}

/**
 * The worker's bundle (scripts/bundle.mjs), beside the command's bundle or,
 * from the compiled modules, in dist/cli; undefined when running from the
 * sources, which then do everything in one thread.
 */
export function workerFile(): string | undefined {
  return ['./part-worker.mjs', '../cli/part-worker.mjs'].map((relative) => fileURLToPath(new URL(relative, import.meta.url))).find((path) => existsSync(path));
}

/** A size in bytes set by an environment variable (tests use 0; a huge number turns the thing off), or else the default. */
export function sizeSetting(env: NodeJS.ProcessEnv, name: string, otherwise: number): number {
  const text = env[name]?.trim() ?? '';
  const set = Number(text);
  return text !== '' && set >= 0 ? set : otherwise;
}

/** Smallest input (bytes) done in two parts; FAMWISE_PARALLEL_MIN_BYTES sets it. */
export function smallestInParts(env: NodeJS.ProcessEnv = process.env): number {
  return sizeSetting(env, 'FAMWISE_PARALLEL_MIN_BYTES', SMALLEST);
}

/** A new worker; the caller listens for its errors. */
export function newWorker(file: string): Worker {
  // With two cores, both busy with the table, compiling in a background thread (V8's default)
  // only competes with them while the worker runs slower code meanwhile; its engine, created
  // after this, compiles in its own thread. (The main thread's engine exists already and keeps
  // the default.) At 1M rows, about 7% less CPU time in all.
  if (availableParallelism() <= 2) setFlagsFromString('--no-concurrent-recompilation');
  return new Worker(file, { resourceLimits: { maxYoungGenerationSizeMb: YOUNG_GENERATION_MB } });
}

/**
 * The largest table the command line names, or standard input if it is a
 * regular file (path undefined) and no argument names a file instead (or
 * one is "-"): its size; 0 for none, or for a command that never reads a
 * table in two parts (a guess, from the arguments alone).
 */
export function largestInput(args: readonly string[], stdinStat: () => Stats | undefined): { readonly size: number; readonly path?: string | undefined } {
  const at = args.findIndex((arg) => !arg.startsWith('-'));
  if (at < 0 || !COMMANDS_IN_PARTS.has(args[at] as string)) return { size: 0 };
  const rest = args.slice(at + 1);
  const paths = rest.filter((arg, i) => (arg === '-' || !arg.startsWith('-')) && !VALUE_OPTIONS.has(rest[i - 1] ?? ''));
  let largest: { size: number; path?: string } = { size: 0 };
  let fileNamed = false;
  for (const path of paths) {
    if (path === '-') continue;
    const found = regularFile(() => statSync(path));
    if (found === undefined) continue;
    fileNamed = true;
    if (found.size > largest.size) largest = { size: found.size, path };
  }
  // A table named on the command line is read instead of standard input.
  const stdin = fileNamed && !paths.includes('-') ? undefined : regularFile(stdinStat);
  return stdin !== undefined && stdin.size > largest.size ? { size: stdin.size } : largest;
}

function regularFile(stat: () => Stats | undefined): Stats | undefined {
  try {
    const found = stat();
    return found?.isFile() ? found : undefined;
  } catch {
    return undefined;
  }
}

/** Whether the command line looks like one that will read a table in two parts (a guess, from the arguments alone). */
export function looksParted(args: readonly string[], stdinStat: () => Stats | undefined): boolean {
  const { size } = largestInput(args, stdinStat);
  return size > 0 && size >= smallestInParts();
}

/** Standard input's status; undefined if it has none (closed). */
export function stdinStat(): Stats | undefined {
  try {
    return fstatSync(0);
  } catch {
    return undefined;
  }
}

/** Starts the worker now if the arguments suggest a table read in two parts; see the top of the file. */
export function startEarly(args: readonly string[]): void {
  const file = workerFile();
  if (file === undefined || !looksParted(args, stdinStat)) return;
  let worker: Worker;
  try {
    worker = newWorker(file);
  } catch {
    return;
  }
  // Noted here, since no one else listens yet; parts.ts then does not take a worker that has stopped.
  const stop = (): void => {
    early.stopped = true;
  };
  const early: Early = { worker, stopped: false, stop };
  worker.on('error', stop);
  worker.on('exit', stop);
  // Never what keeps the process alive.
  worker.unref();
  (globalThis as Record<symbol, unknown>)[EARLY] = early;
}

/** The worker started early, if there is one still running; it is then the caller's. */
export function takeEarlyWorker(): Worker | undefined {
  const slot = globalThis as Record<symbol, unknown>;
  const early = slot[EARLY] as Early | undefined;
  slot[EARLY] = undefined;
  if (early === undefined || early.stopped) return undefined;
  early.worker.off('error', early.stop).off('exit', early.stop);
  return early.worker;
}

// Work on one part of a large table in a second thread. Both passes over a
// table split at a record near the middle of the input: the first pass
// reads the second half in a worker (read-table.ts), the second pass writes
// it there (parallel-write.ts), while this thread does the first half. The
// worker (part-worker.ts) runs the same reader and writer as this thread, so
// the results are those of one thread; tests compare them.
//
// Only for inputs read by position (a file, or standard input spilled to a
// temporary file) that are large enough to repay starting a thread.

import { existsSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { Worker } from 'node:worker_threads';
import { DataError } from '../errors.js';
import type { ColumnsPlan } from './column-plan.js';
import type { ReadOptions, TableShape } from './read-table.js';
import type { InputSource } from './source.js';

/** Below this many bytes of input one thread does it all: starting a worker costs about 50 ms. */
const SMALLEST = 8 << 20;

/** The part of the input a worker reads: bytes [start, end) of a descriptor, from the record on line `line`. */
export interface PartInput {
  readonly name: string;
  readonly fd: number;
  readonly start: number;
  readonly end: number;
  readonly line: number;
}

export interface WritePartJob extends PartInput {
  readonly kind: 'write';
  readonly rows: number;
  readonly shape: TableShape;
  readonly delimiter: number;
  readonly plan: ColumnsPlan;
  /** The temporary file the part is written to. */
  readonly outFd: number;
}

export interface ReadPartJob extends PartInput {
  readonly kind: 'read';
  readonly options: ReadOptions & { readonly shape: TableShape };
}

export type PartJob = WritePartJob | ReadPartJob;

/** A worker's answer: what it made, or its error (dataError: the input's fault, as DataError). */
export type PartOutcome<T> = { readonly done: T } | { readonly error: string; readonly dataError: boolean };

/**
 * The worker's bundle (scripts/bundle.mjs), beside the command's bundle or,
 * from the compiled modules, in dist/cli; undefined when running from the
 * sources, which then do everything in one thread.
 */
function workerFile(): string | undefined {
  return ['./part-worker.mjs', '../cli/part-worker.mjs'].map((relative) => fileURLToPath(new URL(relative, import.meta.url))).find((path) => existsSync(path));
}

/** Smallest input (bytes) done in two parts; FAMWISE_PARALLEL_MIN_BYTES sets it (tests use 0; a huge number turns it off). */
function smallest(): number {
  const set = Number(process.env.FAMWISE_PARALLEL_MIN_BYTES);
  return process.env.FAMWISE_PARALLEL_MIN_BYTES !== undefined && set >= 0 ? set : SMALLEST;
}

/** Whether a source is worth doing in two parts, and can be. */
export function inParts(source: InputSource): boolean {
  return source.descriptor !== undefined && source.size !== undefined && source.size >= smallest() && workerFile() !== undefined;
}

export interface RunningPart<T> {
  /** What the worker made; rejects with its error (a DataError for the input's fault). */
  readonly result: Promise<T>;
  /** Stops the worker if it is still at work. */
  stop(): Promise<void>;
}

/** Starts a worker on a job; the buffers in `transfer` move to it. */
export function startPart<T>(job: PartJob, transfer: readonly ArrayBuffer[] = []): RunningPart<T> {
  let worker: Worker | undefined;
  let settled = false;
  const result = new Promise<T>((resolve, reject) => {
    worker = new Worker(workerFile() as string, { workerData: job, transferList: [...transfer] });
    worker.once('message', (outcome: PartOutcome<T>) => {
      settled = true;
      if ('done' in outcome) resolve(outcome.done);
      else reject(outcome.dataError ? new DataError(outcome.error) : new Error(outcome.error));
    });
    worker.once('error', (error) => {
      settled = true;
      reject(error);
    });
    worker.once('exit', (code) => {
      if (!settled) reject(new Error(`the worker thread stopped (exit code ${code})`));
    });
  });
  // Heeded by whoever awaits it; never an unhandled rejection when nobody does.
  result.catch(() => {});
  return {
    result,
    async stop() {
      if (!settled) await worker?.terminate();
    },
  };
}

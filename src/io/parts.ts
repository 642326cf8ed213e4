// Work on one part of a large table in a second thread. Both passes over a
// table split at a record near the middle of the input: the first pass
// reads the second half in a worker (read-table.ts), the second pass writes
// it there (parallel-write.ts), while this thread does the first half; in
// between, the step procedures adjust each sorted half in its own thread
// (parallel-adjust.ts). The worker (part-worker.ts) runs the same reader,
// procedures and writer as this thread, so the results are those of one
// thread; tests compare them.
//
// Only for inputs read by position (a file, or standard input spilled to a
// temporary file) that are large enough to repay starting a thread.

import type { Worker } from 'node:worker_threads';
import { DataError } from '../errors.js';
import type { Sorted } from '../procedures/sorting.js';
import type { ColumnsPlan } from './column-plan.js';
import type { ReadOptions, TableShape } from './read-table.js';
import type { InputSource } from './source.js';
import { newWorker, smallestInParts, takeEarlyWorker, workerFile } from './worker-thread.js';

/** The part of the input a worker reads: bytes [start, end) of a descriptor (end Infinity: to the end of the file), from the record on line `line`. */
export interface PartInput {
  readonly name: string;
  readonly fd: number;
  readonly start: number;
  readonly end: number;
  readonly line: number;
  /** Where the worker's scan keeps count of what it has done (InputSource.counts), for a progress line. */
  readonly counts?: Float64Array | undefined;
}

export interface WritePartJob extends PartInput {
  readonly kind: 'write';
  readonly rows: number;
  readonly shape: TableShape;
  readonly delimiter: number;
  readonly plan: ColumnsPlan;
  /** The file the part is written to, from byte `at` on. */
  readonly outFd: number;
  readonly at: number;
}

export interface ReadPartJob extends PartInput {
  readonly kind: 'read';
  readonly options: ReadOptions & { readonly shape: TableShape };
  /** Also sort the part's p-values (read-table.ts, ReadPart.sorted). */
  readonly sort: boolean;
}

/**
 * The second part's share of adjusting a table sorted in two parts
 * (io/parallel-adjust.ts) by one method, in two stages: 'running' writes the
 * part's running values (and first, with withRanks, its ranks); 'adjust'
 * writes its adjusted values by row and answers with its rejections. Every
 * array is in shared memory.
 */
export interface StepsJob {
  readonly kind: 'steps';
  readonly stage: 'running' | 'adjust';
  readonly withRanks: boolean;
  /** The method's token (it has a step form). */
  readonly token: string;
  readonly m: number;
  readonly alpha: number;
  readonly own: Sorted;
  readonly other: Float64Array;
  readonly ranks: Uint32Array;
  readonly ownRunning: Float64Array;
  readonly otherRunning: Float64Array;
  readonly target: Float64Array;
  /** The row of the part's first value. */
  readonly rowOffset: number;
  /**
   * Set when the first part's adjusted values are measured (the length of
   * their text, for the writer: parallel-write.ts, OutputInPlace). Both
   * threads measure, each once done with its own part: stretches of
   * MEASURE_CHUNK values of the first part's sorted order, up to `to`, each
   * claimed by adding to next[0] (shared), so that the one that finishes
   * first takes more. firstRanks: that part's ranksInWhole. (A worker that
   * fails after claiming a stretch leaves the sum short: the first part's
   * output then ends elsewhere than told, and parallel-write.ts writes the
   * whole file again, as for any place told wrong.)
   */
  readonly measureFirst?: { readonly next: Int32Array; readonly to: number; readonly firstRanks: Uint32Array } | undefined;
}

export type PartJob = WritePartJob | ReadPartJob | StepsJob;

/** A worker's answer to a job: what it made, or its error (dataError: the input's fault, as DataError). */
export type PartOutcome<T> = { readonly done: T } | { readonly error: string; readonly dataError: boolean };

/** Whether a source is worth doing in two parts, and can be. */
export function inParts(source: InputSource): boolean {
  return source.descriptor !== undefined && source.size !== undefined && source.size >= smallestInParts() && workerFile() !== undefined;
}

export interface RunningPart<T> {
  /** What the worker made; rejects with its error (a DataError for the input's fault). */
  readonly result: Promise<T>;
  /**
   * Gives up the job if it is still at work: its result is ignored, and the
   * worker stops it at its next read. (The worker is not terminated: a
   * terminate() while the main thread has nothing else pending was seen to
   * let the process exit before it resolved.) Returns whether the job was
   * still at work: its files must then stay open, since it may still use them.
   */
  stop(): boolean;
  /** Gives up the job and waits until the worker has left it (its files are then free), whatever its outcome. */
  giveUp(): Promise<void>;
}

type Settle = (outcome: PartOutcome<unknown> | { readonly failed: Error }) => void;

/**
 * The one worker, started before the command was loaded (worker-thread.ts)
 * or else as soon as the input is known (warmUp), so that it is ready by
 * the time there is a part for it, and kept for both passes.
 * It holds the process open only while a job is waited for.
 */
let shared: { readonly worker: Worker; readonly waiting: Map<number, Settle>; next: number } | undefined;

function sharedWorker(): NonNullable<typeof shared> {
  if (shared) return shared;
  const worker = takeEarlyWorker() ?? newWorker(workerFile() as string);
  const state = { worker, waiting: new Map<number, Settle>(), next: 0 };
  const failAll = (error: Error): void => {
    if (shared === state) shared = undefined;
    for (const settle of state.waiting.values()) settle({ failed: error });
    state.waiting.clear();
  };
  worker.on('message', ({ id, outcome }: { id: number; outcome: PartOutcome<unknown> }) => {
    const settle = state.waiting.get(id);
    state.waiting.delete(id);
    if (state.waiting.size === 0) worker.unref();
    settle?.(outcome);
  });
  worker.on('error', failAll);
  worker.on('exit', (code) => failAll(new Error(`the worker thread stopped (exit code ${code})`)));
  worker.unref();
  shared = state;
  return state;
}

/** Starts the worker now if the source will be done in parts, so that it is ready when wanted. */
export function warmUp(source: InputSource): void {
  if (inParts(source)) sharedWorker();
}

/** Starts the worker now, for a source not yet known that will be large (a pipe going to a file, spill.ts). */
export function startWorker(): void {
  if (workerFile() !== undefined) sharedWorker();
}

/**
 * Ends the worker now if it has no job, rather than at the process's exit,
 * which waits while the worker's engine is torn down: done as soon as the
 * last part is written, that overlaps the command's last steps (replacing the
 * output file, the summary). 25 ms less at a million rows (medians of 6
 * runs). A later job starts a new worker.
 */
export function stopWorker(): void {
  const state = shared;
  if (state === undefined || state.waiting.size > 0) return;
  shared = undefined;
  void state.worker.terminate();
}

/** Gives a job to the worker; the buffers in `transfer` move to it. */
export function startPart<T>(job: PartJob, transfer: readonly ArrayBuffer[] = []): RunningPart<T> {
  const state = sharedWorker();
  const id = state.next++;
  const result = new Promise<T>((resolve, reject) => {
    state.waiting.set(id, (outcome) => {
      if ('failed' in outcome) reject(outcome.failed);
      else if ('done' in outcome) resolve(outcome.done as T);
      else reject(outcome.dataError ? new DataError(outcome.error) : new Error(outcome.error));
    });
  });
  state.worker.ref();
  state.worker.postMessage({ id, job }, [...transfer]);
  // Heeded by whoever awaits it; never an unhandled rejection when nobody does.
  result.catch(() => {});
  return {
    result,
    stop() {
      if (!state.waiting.delete(id)) return false;
      state.worker.postMessage({ cancel: id });
      if (state.waiting.size === 0) state.worker.unref();
      return true;
    },
    async giveUp() {
      if (!state.waiting.has(id)) return;
      state.worker.postMessage({ cancel: id });
      await result.then(
        () => {},
        () => {},
      );
    },
  };
}

// The second pass in two threads. Writing is most of a large table's time
// (copying every record, formatting every new number), and it splits
// cleanly: the first pass noted a record near the middle of the input
// (read-table.ts, SplitPoint). This thread writes the part before it to the
// output; a worker thread (write-part.ts) writes the part from it on into a
// temporary file at the same time, which is then copied after the first
// part. Both parts run the one writer (write-table.ts), so the bytes are
// those of a single pass; test/parallel-write.e2e.test.ts compares them.
// Only for a delimited output of a table that can be read by position (a
// file, or standard input spilled to a temporary file) and is large enough
// to repay starting a thread.

import { existsSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { Worker } from 'node:worker_threads';
import { DataError } from '../errors.js';
import type { ByteSink } from './byte-sink.js';
import { type ColumnsPlan, planFrom, plannedColumns } from './column-plan.js';
import type { SplitPoint, TableShape } from './read-table.js';
import { type InputSource, rangeSource, readAt } from './source.js';
import { temporaryFile } from './spill.js';
import { checkRowCount, writeTable } from './write-table.js';

/** Below this many bytes of input one thread does it all: starting a worker costs about 50 ms. */
const SMALLEST = 8 << 20;
const COPY_SIZE = 4 << 20;

/** What the worker is given: everything by value, the part's numbers transferred. */
export interface PartJob {
  readonly name: string;
  readonly fd: number;
  readonly start: number;
  readonly end: number;
  readonly line: number;
  readonly rows: number;
  readonly shape: TableShape;
  readonly delimiter: number;
  readonly plan: ColumnsPlan;
  /** The temporary file the part is written to. */
  readonly outFd: number;
}

/** What the worker reports: the bytes it wrote and the rows it found, or its error. */
export type PartOutcome = { readonly written: number; readonly rows: number } | { readonly error: string; readonly dataError: boolean };

/**
 * The worker's bundle (scripts/bundle.mjs), beside the command's bundle or,
 * from the compiled modules, in dist/cli; undefined when running from the
 * sources, which then write in one thread.
 */
function workerFile(): string | undefined {
  return ['./write-part.mjs', '../cli/write-part.mjs'].map((relative) => fileURLToPath(new URL(relative, import.meta.url))).find((path) => existsSync(path));
}

/** Smallest input (bytes) written in two parts; FAMWISE_PARALLEL_MIN_BYTES sets it (tests use 0; a huge number turns it off). */
function smallest(): number {
  const set = Number(process.env.FAMWISE_PARALLEL_MIN_BYTES);
  return process.env.FAMWISE_PARALLEL_MIN_BYTES !== undefined && set >= 0 ? set : SMALLEST;
}

/** Whether a source's second pass can be written in two parts. */
export function inParts(source: InputSource): boolean {
  return source.descriptor !== undefined && source.size !== undefined && source.size >= smallest() && workerFile() !== undefined;
}

export async function writeTableInParts(
  source: InputSource,
  shape: TableShape,
  plan: ColumnsPlan,
  format: { readonly delimiter: number },
  sink: ByteSink,
  rows: number,
  split: SplitPoint,
): Promise<void> {
  const fd = (source.descriptor as () => number)();
  const size = source.size as number;
  const temporary = await temporaryFile();
  const partPlan = planFrom(plan, split.row);
  const job: PartJob = {
    name: source.name,
    fd,
    start: split.offset,
    end: size,
    line: split.line,
    rows: rows - split.row,
    shape,
    delimiter: format.delimiter,
    plan: partPlan,
    outFd: temporary.fd,
  };
  let worker: Worker | undefined;
  let settled = false;
  const second = new Promise<{ written: number; rows: number }>((resolve, reject) => {
    worker = new Worker(workerFile() as string, {
      workerData: job,
      transferList: [...new Set(partPlan.columns.map((column) => column.values.buffer as ArrayBuffer))],
    });
    worker.once('message', (outcome: PartOutcome) => {
      settled = true;
      if ('written' in outcome) resolve(outcome);
      else reject(outcome.dataError ? new DataError(outcome.error) : new Error(outcome.error));
    });
    worker.once('error', (error) => {
      settled = true;
      reject(error);
    });
    worker.once('exit', (code) => {
      if (!settled) reject(new Error(`the writing thread stopped (exit code ${code})`));
    });
  });
  // Caught here and raised below, so that an error in either part never leaves the other's promise unheeded.
  second.catch(() => {});
  try {
    const first = await writeTable(rangeSource(source.name, fd, 0, split.offset), shape, plannedColumns(plan), format, sink, split.row, {});
    let written: number;
    let later: number;
    try {
      ({ written, rows: later } = await second);
    } catch (error) {
      if (error instanceof DataError) throw error;
      // The thread could not do its part (it could not start, say): this thread writes it instead.
      later = await writeTable(rangeSource(source.name, fd, split.offset, size), shape, plannedColumns(planFrom(plan, split.row)), format, sink, rows - split.row, { firstLine: split.line });
      checkRowCount(source, first + later, rows);
      return;
    }
    // The second part is not copied after a first part that came out short.
    checkRowCount(source, first + later, rows);
    for (let position = 0; position < written; ) {
      const chunk = await readAt(temporary.fd, Math.min(COPY_SIZE, written - position), position);
      if (chunk.length === 0) throw new Error('the second part of the table ended early');
      position += chunk.length;
      sink.pushBlock(chunk);
      await sink.flush();
    }
    await sink.flush(true);
  } finally {
    if (!settled) await worker?.terminate();
    await temporary.close();
  }
}

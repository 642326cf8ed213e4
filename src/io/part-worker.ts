// The worker thread of io/parts.ts: reads or writes one part of a table, and
// posts what it made (transferring its arrays) or its error.

import { createWriteStream } from 'node:fs';
import { parentPort, workerData } from 'node:worker_threads';
import { DataError } from '../errors.js';
import { ByteSink } from './byte-sink.js';
import { plannedColumns } from './column-plan.js';
import type { PartJob, PartOutcome, ReadPartJob, WritePartJob } from './parts.js';
import { type ReadPart, readTablePart } from './read-table.js';
import { rangeSource } from './source.js';
import { writeTable } from './write-table.js';

/** Writes the part into the temporary file: the bytes written and the rows found. */
async function writePart(job: WritePartJob): Promise<{ written: number; rows: number }> {
  const stream = createWriteStream('', { fd: job.outFd, autoClose: false });
  const sink = new ByteSink(stream);
  const rows = await writeTable(rangeSource(job.name, job.fd, job.start, job.end), job.shape, plannedColumns(job.plan), { delimiter: job.delimiter }, sink, job.rows, { firstLine: job.line });
  await new Promise<void>((resolve, reject) => {
    stream.once('error', reject);
    stream.end(resolve);
  });
  return { written: sink.written, rows };
}

function readPart(job: ReadPartJob): Promise<ReadPart> {
  return readTablePart(rangeSource(job.name, job.fd, job.start, job.end), job.options, job.line);
}

/** The buffers of a read part's arrays, moved rather than copied to the main thread. */
function buffersOf(done: unknown): ArrayBuffer[] {
  if (typeof done !== 'object' || done === null || !('p' in done)) return [];
  const part = done as ReadPart;
  return [part.p, part.weights, part.familyIds].flatMap((array) => (array ? [array.buffer as ArrayBuffer] : []));
}

const job = workerData as PartJob;
const work: Promise<unknown> = job.kind === 'write' ? writePart(job) : readPart(job);
work.then(
  (done) => parentPort?.postMessage({ done } satisfies PartOutcome<unknown>, buffersOf(done)),
  (error: unknown) =>
    parentPort?.postMessage({
      error: error instanceof Error ? error.message : String(error),
      dataError: error instanceof DataError,
    } satisfies PartOutcome<unknown>),
);

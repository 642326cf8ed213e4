// The worker thread of io/parts.ts: for each job it is sent, reads, adjusts
// (io/parallel-adjust.ts) or writes one part of a table, and posts what it
// made (transferring its arrays) or its error.

import { createWriteStream } from 'node:fs';
import { finished } from 'node:stream/promises';
import { parentPort } from 'node:worker_threads';
import { DataError } from '../errors.js';
import { ByteSink } from './byte-sink.js';
import { plannedColumns } from './column-plan.js';
import type { PartJob, PartOutcome, ReadPartJob, StepsJob, WritePartJob } from './parts.js';
import { stepsStage } from './parallel-adjust.js';
import { type ReadPart, readTablePart } from './read-table.js';
import { releaseMemory } from './release-memory.js';
import { type InputSource, countedInto, rangeSource } from './source.js';
import { writeTable } from './write-table.js';

/** Jobs given up by the main thread: stopped at their next read. */
const cancelled = new Set<number>();

/** The part's bytes, unless the job is given up. */
function partSource(job: WritePartJob | ReadPartJob, id: number): InputSource {
  const source = rangeSource(job.name, job.fd, job.start, job.end);
  return {
    ...countedInto(source, job.counts),
    async *chunks(pool) {
      for await (const chunk of source.chunks(pool)) {
        if (cancelled.has(id)) {
          pool?.give(chunk);
          throw new Error('given up');
        }
        yield chunk;
      }
    },
  };
}

/** Writes the part into its file from job.at on: the bytes written and the rows found. */
async function writePart(job: WritePartJob, id: number): Promise<{ written: number; rows: number }> {
  const stream = createWriteStream('', { fd: job.outFd, autoClose: false, start: job.at });
  const sink = new ByteSink(stream);
  let rows: number;
  try {
    rows = await writeTable(partSource(job, id), job.shape, plannedColumns(job.plan), { delimiter: job.delimiter }, sink, job.rows, { firstLine: job.line });
  } catch (error) {
    // The writes already queued finish before the failure is reported, and none follow: the main
    // thread may then write over this part.
    stream.end();
    await finished(stream).catch(() => {});
    throw error;
  }
  // Done only when every byte is in the file: a write that failed late (a full disk) fails the job.
  await new Promise<void>((resolve, reject) => {
    stream.end((error?: Error | null) => (error ? reject(error) : resolve()));
  });
  if (stream.bytesWritten !== sink.written) throw new Error(`wrote ${stream.bytesWritten} of ${sink.written} bytes to the temporary file`);
  return { written: sink.written, rows };
}

async function runSteps(job: StepsJob): Promise<unknown> {
  return stepsStage(job);
}

function readPart(job: ReadPartJob, id: number): Promise<ReadPart> {
  return readTablePart(partSource(job, id), job.options, job.line, job.sort);
}

/** The buffers of a read part's arrays, moved rather than copied to the main thread. */
function buffersOf(done: unknown): ArrayBuffer[] {
  if (typeof done !== 'object' || done === null || !('p' in done)) return [];
  const part = done as ReadPart;
  // Shared memory (the sorted part) is shared, not moved.
  return [part.p, part.weights, part.familyIds, part.sorted?.order, part.sorted?.sorted].flatMap((array) => (array && array.buffer instanceof ArrayBuffer ? [array.buffer] : []));
}

parentPort?.on('message', (message: { id: number; job: PartJob } | { cancel: number }) => {
  if ('cancel' in message) {
    cancelled.add(message.cancel);
    return;
  }
  const { id, job } = message;
  const work: Promise<unknown> = job.kind === 'write' ? writePart(job, id) : job.kind === 'read' ? readPart(job, id) : runSteps(job);
  work.then(
    (done) => {
      parentPort?.postMessage({ id, outcome: { done } satisfies PartOutcome<unknown> }, buffersOf(done));
      // A read leaves this thread idle until its write job, and it would not collect by itself
      // (after the write the process ends, and a collection would only hold up its exit).
      if (job.kind === 'read') releaseMemory();
    },
    (error: unknown) =>
      parentPort?.postMessage({
        id,
        outcome: { error: error instanceof Error ? error.message : String(error), dataError: error instanceof DataError } satisfies PartOutcome<unknown>,
      }),
  );
});

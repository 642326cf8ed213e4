// The worker thread of io/parallel-write.ts: writes one part of a table
// into the temporary file it is given, and reports how many bytes it wrote.

import { createWriteStream } from 'node:fs';
import { parentPort, workerData } from 'node:worker_threads';
import { DataError } from '../errors.js';
import { ByteSink } from './byte-sink.js';
import { plannedColumns } from './column-plan.js';
import type { PartJob, PartOutcome } from './parallel-write.js';
import { rangeSource } from './source.js';
import { writeTable } from './write-table.js';

async function writePart(job: PartJob): Promise<{ written: number; rows: number }> {
  const stream = createWriteStream('', { fd: job.outFd, autoClose: false });
  const sink = new ByteSink(stream);
  const rows = await writeTable(rangeSource(job.name, job.fd, job.start, job.end), job.shape, plannedColumns(job.plan), { delimiter: job.delimiter }, sink, job.rows, { firstLine: job.line });
  await new Promise<void>((resolve, reject) => {
    stream.once('error', reject);
    stream.end(resolve);
  });
  return { written: sink.written, rows };
}

writePart(workerData as PartJob).then(
  (outcome) => parentPort?.postMessage(outcome satisfies PartOutcome),
  (error: unknown) =>
    parentPort?.postMessage({
      error: error instanceof Error ? error.message : String(error),
      dataError: error instanceof DataError,
    } satisfies PartOutcome),
);

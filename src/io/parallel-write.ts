// The second pass in two threads (io/parts.ts). Writing is most of a large
// table's time (copying every record, formatting every new number), and it
// splits cleanly at the record near the middle that the first pass noted
// (read-table.ts, SplitPoint). This thread writes the part before it to the
// output; a worker writes the part from it on into a temporary file at the
// same time, which is then copied after the first part. Both run the one
// writer (write-table.ts), so the bytes are those of a single pass;
// test/parallel.e2e.test.ts compares them. Should the worker fail for a
// reason other than the input (it could not start, say), this thread writes
// its part instead.

import { DataError } from '../errors.js';
import type { ByteSink } from './byte-sink.js';
import { type ColumnsPlan, movableBuffers, planFrom, plannedColumns } from './column-plan.js';
import { type WritePartJob, startPart } from './parts.js';
import type { SplitPoint, TableShape } from './read-table.js';
import { type InputSource, contentEnd, rangeSource, readAt } from './source.js';
import type { FileHandle } from 'node:fs/promises';
import { releaseMemory } from './release-memory.js';
import { temporaryFile } from './spill.js';
import { checkRowCount, writeTable } from './write-table.js';

const COPY_SIZE = 4 << 20;

/** Writes the table in two parts; the source must be readable by position (parts.ts, inParts). */
export async function writeTableInParts(
  source: InputSource,
  shape: TableShape,
  plan: ColumnsPlan,
  format: { readonly delimiter: number },
  sink: ByteSink,
  rows: number,
  split: SplitPoint,
): Promise<void> {
  // The sort's working arrays and the procedures' own are garbage by now: given back before the writing.
  releaseMemory();
  const fd = (source.descriptor as () => number)();
  /** Writes the part from the split on in this thread, after the first. */
  const writeSecondHere = (): Promise<number> =>
    writeTable(rangeSource(source.name, fd, split.offset, contentEnd(source)), shape, plannedColumns(planFrom(plan, split.row)), format, sink, rows - split.row, { firstLine: split.line });
  let temporary: FileHandle;
  try {
    temporary = await temporaryFile();
  } catch {
    // No temporary file to be had (TMPDIR missing or full): one thread, which needs none.
    await writeTable(source, shape, plannedColumns(plan), format, sink, rows);
    return;
  }
  const partPlan = planFrom(plan, split.row);
  const job: WritePartJob = {
    kind: 'write',
    name: source.name,
    fd,
    start: split.offset,
    // To wherever the file ends, as one thread reads it (a file that grew is then noticed), or
    // where a bounded source ends.
    end: contentEnd(source),
    line: split.line,
    rows: rows - split.row,
    shape,
    delimiter: format.delimiter,
    plan: partPlan,
    outFd: temporary.fd,
  };
  const second = startPart<{ written: number; rows: number }>(job, movableBuffers(partPlan));
  // The temporary file is closed only once the worker is known to be done with it: closing it
  // while the worker may still write could hand its descriptor to another file. Otherwise it
  // stays open (unlinked) until the process exits.
  let workerDone = false;
  try {
    const first = await writeTable(rangeSource(source.name, fd, 0, split.offset), shape, plannedColumns(plan), format, sink, split.row, {});
    let written: number;
    let later: number;
    try {
      ({ written, rows: later } = await second.result);
      workerDone = true;
    } catch (error) {
      if (error instanceof DataError) throw error;
      // The worker could not do its part (it could not start, its temporary file was full):
      // this thread writes it instead.
      checkRowCount(source, first + (await writeSecondHere()), rows);
      return;
    }
    // The second part is not copied after a first part that came out short.
    checkRowCount(source, first + later, rows);
    for (let position = 0; position < written; ) {
      const chunk = await readAt(temporary.fd, Math.min(COPY_SIZE, written - position), position);
      if (chunk.length === 0) throw new Error(`the temporary file holding the second part of the table ended at ${position} of ${written} bytes`);
      position += chunk.length;
      sink.pushBlock(chunk);
      await sink.flush();
    }
    await sink.flush(true);
  } finally {
    second.stop();
    if (workerDone) await temporary.close();
  }
}

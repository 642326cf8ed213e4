// The second pass in two threads (io/parts.ts). Writing is most of a large
// table's time (copying every record, formatting every new number), and it
// splits cleanly at the record where the first pass split the reading
// (read-table.ts, SplitPoint). This thread writes the part before it to the
// output; a worker writes the part from it on at the same time: straight
// into the output file, where the first part's output will end, when that
// can be told ahead (OutputInPlace); otherwise into a temporary file, which
// is then copied after the first part. Both run the one writer
// (write-table.ts), so the bytes are those of a single pass;
// test/parallel.e2e.test.ts compares them. Should the worker fail for a
// reason other than the input (it could not start, say), this thread writes
// its part instead.

import { createWriteStream, ftruncateSync } from 'node:fs';
import type { FileHandle } from 'node:fs/promises';
import { finished } from 'node:stream/promises';
import { DataError } from '../errors.js';
import { ByteSink } from './byte-sink.js';
import { type ColumnsPlan, movableBuffers, planFrom, plannedColumns } from './column-plan.js';
import type { FirstPartMeasures } from './parallel-adjust.js';
import { type WritePartJob, startPart } from './parts.js';
import type { SplitPoint, TableShape } from './read-table.js';
import { type InputSource, contentEnd, countedInto, rangeSource, readAt } from './source.js';
import { releaseMemory } from './release-memory.js';
import { temporaryFile } from './spill.js';
import { checkRowCount, firstPartOutputBytes, writeTable } from './write-table.js';

const COPY_SIZE = 4 << 20;

/**
 * Copies the worker's part from its temporary file after this thread's,
 * through two buffers in turn: the next chunk is read into one while the
 * other is written. (A new buffer per chunk, written when the next was read,
 * took 2-4 times as long: 250-540 ms against 140 ms for 385 MB, the second
 * half of a table of 10M rows.)
 */
async function copyPart(fd: number, size: number, sink: ByteSink, copied?: (done: number, of: number) => void): Promise<void> {
  const buffers = [Buffer.allocUnsafe(COPY_SIZE), Buffer.allocUnsafe(COPY_SIZE)];
  const readChunk = (position: number, turn: number): Promise<Buffer> => readAt(fd, Math.min(COPY_SIZE, size - position), position, buffers[turn] as Buffer);
  let reading = readChunk(0, 0);
  let writing: Promise<void> = Promise.resolve();
  for (let position = 0, turn = 0; position < size; turn ^= 1) {
    const chunk = await reading;
    if (chunk.length === 0) throw new Error(`the temporary file holding the second part of the table ended at ${position} of ${size} bytes`);
    position += chunk.length;
    // The other buffer is free once its write is done.
    await writing;
    if (position < size) reading = readChunk(position, turn ^ 1);
    writing = sink.writeReusable(chunk);
    // Its failure is met at the next await of it; meanwhile it is not an unhandled rejection.
    writing.catch(() => {});
    copied?.(position, size);
  }
  await writing;
}

/**
 * The output file itself, for the worker to write its part into at the
 * right place rather than into a temporary file that is then copied: the
 * descriptor of a regular file this thread writes from its start
 * (atomic-file.ts, OutputFile.fd), and the bytes of the new cells of the
 * first part's rows, delimiters included (measured once they were adjusted,
 * parallel-adjust.ts).
 */
export interface OutputInPlace {
  readonly fd: number;
  /** The rows measured, and their cells' bytes. */
  readonly firstRows: number;
  readonly firstCellBytes: number;
}

/**
 * The bytes of the new cells of the rows of the table's first part (as
 * written, delimiters included), from what adjusting measured of them;
 * undefined if there are cells it did not measure (p_raw).
 */
export function firstPartCellBytes(plan: ColumnsPlan, adjusted: readonly Float64Array[], firstPart: FirstPartMeasures | undefined): number | undefined {
  if (firstPart === undefined) return undefined;
  const { rows, byMethod } = firstPart;
  let bytes = 0;
  for (const column of plan.columns) {
    const measures = byMethod[adjusted.indexOf(column.values)];
    if (measures === undefined) return undefined;
    // A decision is true (4 bytes) at or below alpha, false (5) above; no p-value is missing here.
    bytes += rows + (column.kind === 'number' ? measures.measured : 4 * measures.rejected + 5 * (rows - measures.rejected));
  }
  return bytes;
}

/** Writes the table in two parts; the source must be readable by position (parts.ts, inParts). */
export async function writeTableInParts(
  source: InputSource,
  shape: TableShape,
  plan: ColumnsPlan,
  format: { readonly delimiter: number },
  sink: ByteSink,
  rows: number,
  split: SplitPoint,
  inPlace?: OutputInPlace,
): Promise<void> {
  // A progress line counts what each thread has scanned.
  const counts = source.tally?.begin(split.offset);
  try {
    const fd = (source.descriptor as () => number)();
    const partPlan = planFrom(plan, split.row);
    /** Writes the part from the split on in this thread, after the first. */
    // Counted where the worker's part would have been (the worker is done with its pair by then).
    const writeSecondHere = (): Promise<number> =>
      writeTable(countedInto(rangeSource(source.name, fd, split.offset, contentEnd(source)), counts?.[1]), shape, plannedColumns(partPlan), format, sink, rows - split.row, { firstLine: split.line });
    const firstPart = countedInto(rangeSource(source.name, fd, 0, split.offset), counts?.[0]);
    const writeFirstHere = (): Promise<number> => writeTable(firstPart, shape, plannedColumns(plan), format, sink, split.row, {});
    const job = (outFd: number, at: number): WritePartJob => ({
      kind: 'write',
      name: source.name,
      fd,
      start: split.offset,
      // To wherever the file ends, as one thread reads it (a file that grew is then noticed), or
      // where a bounded source ends.
      end: contentEnd(source),
      line: split.line,
      counts: counts?.[1],
      rows: rows - split.row,
      shape,
      delimiter: format.delimiter,
      plan: partPlan,
      outFd,
      at,
    });

    // Where the second part's output starts, when it can be told before the first is written.
    const at = inPlace && inPlace.firstRows === split.row ? firstPartOutputBytes(shape, plannedColumns(plan), format, split.offset, inPlace.firstCellBytes) : undefined;
    // The sort's working arrays and the procedures' own are garbage by now: given back before the
    // writing, once the worker has its part (it need not wait for this thread's collection).
    if (inPlace && at !== undefined) {
      const second = startPart<{ written: number; rows: number }>(job(inPlace.fd, at), movableBuffers(partPlan));
      releaseMemory();
      let first: number;
      try {
        first = await writeFirstHere();
      } catch (error) {
        // The output is given up, its descriptor closed: not while the worker may still write to it.
        await second.giveUp();
        throw error;
      }
      let later: number | undefined;
      try {
        ({ rows: later } = await second.result);
      } catch (error) {
        if (error instanceof DataError) throw error;
      }
      if (later !== undefined && sink.written === at) {
        checkRowCount(source, first + later, rows);
        return;
      }
      await sink.settled();
      if (sink.written === at) {
        // The worker could not do its part: this thread writes it after the first, over what the worker wrote.
        ftruncateSync(inPlace.fd, at);
        checkRowCount(source, first + (await writeSecondHere()), rows);
        return;
      }
      // The first part did not end where it was to (which the tests rule out), and the two parts
      // may overlap: this thread writes the whole file again, from its start.
      ftruncateSync(inPlace.fd, 0);
      const again = createWriteStream('', { fd: inPlace.fd, start: 0, autoClose: false });
      await writeTable(source, shape, plannedColumns(plan), format, new ByteSink(again), rows);
      again.end();
      await finished(again);
      return;
    }

    let temporary: FileHandle;
    try {
      temporary = await temporaryFile();
    } catch {
      // No temporary file to be had (TMPDIR missing or full): one thread, which needs none.
      releaseMemory();
      await writeTable(source, shape, plannedColumns(plan), format, sink, rows);
      return;
    }
    const second = startPart<{ written: number; rows: number }>(job(temporary.fd, 0), movableBuffers(partPlan));
    releaseMemory();
    // The temporary file is closed only once the worker is known to be done with it: closing it
    // while the worker may still write could hand its descriptor to another file. Otherwise it
    // stays open (unlinked) until the process exits.
    let workerDone = false;
    try {
      const first = await writeFirstHere();
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
      await copyPart(temporary.fd, written, sink, (done, of) => source.tally?.copied(done, of));
    } finally {
      second.stop();
      if (workerDone) await temporary.close();
    }
  } finally {
    if (counts) source.tally?.end();
  }
}

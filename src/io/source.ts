// Where a table's bytes come from. A source can be read more than once: the
// first pass collects the p-values, the second writes the table back. Files
// are simply read again, and so is standard input redirected from a file;
// other standard input and pipes are first read to their end (spill.ts),
// gzip is decompressed on every pass (gzip.ts).

import { type Stats, closeSync, createReadStream, fstatSync, openSync, read, readFileSync, readSync, statSync } from 'node:fs';
import { childProcess } from './lazy-builtin.js';

/**
 * Bytes read at a time: a writer flushes after each (write-table.ts), so
 * that few output blocks are filled between flushes.
 */
const READ_SIZE = 1 << 20;
/** Bytes of a pool's buffers: a chunk, or the first look at a table (read-table.ts, SNIFF_BYTES). */
const POOL_BUFFER_SIZE = 4 << 20;
/** Bytes a file stream reads at a time, each time into a new buffer. */
const STREAM_READ_SIZE = 4 << 20;

export interface InputSource {
  /** For messages: the file name, or <stdin>. */
  readonly name: string;
  /** File name extension in lower case ('' for stdin), a hint for the delimiter. */
  readonly extension: string;
  /** Bytes of content, when known before reading (a plain file, a spilled stream). */
  readonly size?: number;
  /**
   * A descriptor that reads the content by position (a plain file, a spilled
   * stream), so that parts of it can be read apart, also by another thread;
   * undefined when the bytes can only be read in order (gzip, memory).
   */
  readonly descriptor?: () => number;
  /**
   * Whether the content read by position ends at `size` (standard input
   * redirected from a file: what it held when famwise started, as a copy of
   * it would), rather than wherever the file ends when it is read.
   */
  readonly bounded?: boolean;
  /**
   * Where a scan of this source (scan-input.ts) keeps count of what it has
   * done, after each block: [bytes, lines] from the source's start, for a
   * progress line (cli/progress.ts); for a part of a pass in two, in memory
   * the other thread reads (PassTally).
   */
  readonly counts?: Float64Array;
  /** Set by a progress line (cli/progress.ts): told of each pass made in two parts by position, which chunks() does not see. */
  readonly tally?: PassTally;
  /**
   * The content, chunk by chunk. A source read by position reads into
   * buffers taken from `pool` when one is given; the caller then gives each
   * chunk back once it is done with it (scan-input.ts), and must not keep it.
   */
  chunks(pool?: ChunkPool): AsyncIterable<Buffer>;
}

/** Buffers a pool keeps for use again; more given back are left to the collector. */
const SPARE_BUFFERS = 4;

/**
 * Buffers that reads by position fill and the reader gives back once done
 * with them (InputSource.chunks), so that a large table is read pass after
 * pass through the same few buffers rather than a new one for every read.
 * Memory touched for the first time costs the kernel a page fault for every
 * 4 KB: on the benchmark machine, a virtual machine where faults are dear,
 * reading 42 MB into new 4 MB buffers took 190 ms, and into the same two
 * 50 ms.
 */
export class ChunkPool {
  private readonly spare: ArrayBuffer[] = [];
  /** The buffers this pool made: only these are taken back (a chunk from elsewhere is left alone). */
  private readonly made = new WeakSet<ArrayBuffer>();
  /** Bytes of each buffer. */
  readonly size = POOL_BUFFER_SIZE;

  take(): Buffer {
    let buffer = this.spare.pop();
    if (buffer === undefined) {
      buffer = new ArrayBuffer(this.size);
      this.made.add(buffer);
    }
    return Buffer.from(buffer);
  }

  /**
   * Takes back the buffer a chunk lies in, if it is one of this pool's and
   * not already back; the caller must be done with every view of it.
   */
  give(chunk: Uint8Array): void {
    const buffer = chunk.buffer;
    if (!(buffer instanceof ArrayBuffer) || !this.made.has(buffer) || this.spare.includes(buffer)) return;
    if (this.spare.length < SPARE_BUFFERS) this.spare.push(buffer);
  }
}

/**
 * Counts for a progress line of a pass over a source read by position in
 * two parts, one per thread: the parts are read where chunks(), which tells
 * it of a pass in one thread, cannot see them.
 */
export interface PassTally {
  /**
   * A pass begins: the counts ([bytes, lines], shared memory) for the first
   * part's scan and the second's, 0 so far. The first part ends at byte
   * firstEnd: once its scan has gone past, it went on through the second
   * part itself (the worker's reading was not taken), and its count alone is
   * the table's.
   */
  begin(firstEnd: number): readonly [Float64Array, Float64Array];
  /**
   * The second part, written apart, is being copied after the first
   * (io/parallel-write.ts): `done` of its `of` bytes so far.
   */
  copied(done: number, of: number): void;
  /** The pass has ended, however it ended. */
  end(): void;
}

/** The source, with its scan counting into `counts` when there are any (InputSource.counts). */
export function countedInto<T extends InputSource>(source: T, counts: Float64Array | undefined): T {
  return counts ? { ...source, counts } : source;
}

/** Where a source read by position ends: its size when bounded, else wherever the file ends (Infinity). */
export function contentEnd(source: InputSource): number {
  return source.bounded ? (source.size as number) : Infinity;
}


/** A path's extension, lower-cased, without the dot; '' when the last path element has none. */
export function extensionOf(path: string): string {
  const dot = path.lastIndexOf('.');
  return dot > path.lastIndexOf('/') ? path.slice(dot + 1).toLowerCase() : '';
}

/** Descriptors opened for reading by position, closed when the process exits. */
const opened: number[] = [];

export function fileSource(path: string): InputSource {
  let fd: number | undefined;
  return {
    name: path,
    extension: extensionOf(path),
    size: statSync(path).size,
    descriptor() {
      if (fd === undefined) {
        fd = openSync(path, 'r');
        if (opened.length === 0) process.on('exit', () => opened.forEach((each) => closeSync(each)));
        opened.push(fd);
      }
      return fd;
    },
    chunks: () => createReadStream(path, { highWaterMark: STREAM_READ_SIZE }),
  };
}

/**
 * Standard input when it is a regular file read from its start
 * (famwise adjust < table.csv): read by position, as a file is, rather than
 * copied to a temporary file first. Its content is what it held at the
 * start (bounded): a file that grows while it is read, such as the output
 * appended to it (`< t.csv | tee -a t.csv`), is not read into itself.
 * Undefined for anything else: a pipe, a terminal, a file a shell has
 * already read part of, a file that standard output also goes to (the
 * output could overwrite what is still to be read), or a system where the
 * position cannot be told (it is read from /proc/self/fdinfo, Linux).
 */
export function stdinFileSource(): InputSource | undefined {
  const fd = 0;
  let size: number;
  try {
    const stat = fstatSync(fd);
    if (!stat.isFile()) return undefined;
    if (sameFile(stat, 1)) return undefined;
    size = stat.size;
    const position = /^pos:\s*(\d+)/m.exec(readFileSync(`/proc/self/fdinfo/${fd}`, 'latin1'));
    if (position?.[1] !== '0') return undefined;
  } catch {
    return undefined;
  }
  moveToEnd(fd);
  return {
    name: '<stdin>',
    extension: '',
    size,
    descriptor: () => fd,
    bounded: true,
    chunks: (pool) => rangeSource('<stdin>', fd, 0, size).chunks(pool),
  };
}

/** Whether a descriptor is open on the file of `stat` (false if it is not open). */
function sameFile(stat: Stats, fd: number): boolean {
  try {
    const other = fstatSync(fd);
    return other.dev === stat.dev && other.ino === stat.ino;
  } catch {
    return false;
  }
}

/**
 * Moves a descriptor's offset to the end of its file: reading by position
 * leaves it where it was, and a shell that shares it
 * ({ famwise ...; next; } < file) expects it at the end, as after any
 * command that reads its input through. Node has no lseek, so `tail -c 1`
 * is given the descriptor and waited for (a few ms): it seeks to the last
 * byte and reads it, and the offset, shared with it, is then at the end,
 * with no bytes copied, before famwise reads anything or could exit. Where
 * tail cannot be run, the rest is read and dropped in the background
 * (reading 440 MB that way cost the two working threads about 0.4 s at 10M
 * rows), and whatever is left when the process exits is read then.
 */
function moveToEnd(fd: number): void {
  try {
    if (childProcess().spawnSync('tail', ['-c', '1'], { stdio: [fd, 'ignore', 'ignore'], timeout: 10_000 }).status === 0) return;
  } catch {
    // No tail to be had: read through below.
  }
  const scratch = Buffer.allocUnsafe(READ_SIZE);
  let done = false;
  const step = (): void => {
    read(fd, scratch, 0, scratch.length, null, (error, bytesRead) => {
      if (error || bytesRead === 0) done = true;
      else step();
    });
  };
  step();
  process.on('exit', () => {
    try {
      while (!done) done = readSync(fd, scratch, 0, scratch.length, null) === 0;
    } catch {
      // An input that cannot be read to its end is left where it is.
    }
  });
}

/** Reads up to length bytes at a position of a descriptor, into `buffer` (by default a new one): the bytes read. */
export function readAt(fd: number, length: number, position: number, buffer: Buffer = Buffer.allocUnsafe(length)): Promise<Buffer> {
  return new Promise((resolve, reject) => {
    read(fd, buffer, 0, length, position, (error, bytesRead) => (error ? reject(error) : resolve(buffer.subarray(0, bytesRead))));
  });
}

/**
 * Bytes [start, end) of what a descriptor reads by position, as a source of
 * its own; with end Infinity, to wherever the file ends when it is read (as
 * a stream reads it: a file that grew or shrank since is then seen to have
 * changed, by its row count).
 */
export function rangeSource(name: string, fd: number, start: number, end: number): InputSource {
  return {
    name,
    extension: '',
    ...(Number.isFinite(end) ? { size: end - start } : {}),
    async *chunks(pool?: ChunkPool) {
      for (let position = start; position < end; ) {
        const buffer = pool?.take();
        let chunk: Buffer;
        try {
          chunk = await readAt(fd, Math.min(READ_SIZE, end - position), position, buffer);
        } catch (error) {
          if (buffer) pool?.give(buffer);
          throw error;
        }
        if (chunk.length === 0) {
          if (buffer) pool?.give(buffer);
          return;
        }
        position += chunk.length;
        yield chunk;
      }
    },
  };
}

export function bufferSource(bytes: Buffer, name: string): InputSource {
  return {
    name,
    extension: '',
    size: bytes.length,
    async *chunks() {
      yield bytes;
    },
  };
}

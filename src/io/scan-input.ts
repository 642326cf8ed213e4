// Drives the record scanner over a source's chunks. Chunks are gathered into
// blocks of at least BLOCK_SIZE before scanning, and the unfinished record at
// the end of a block is carried into the next one.

import { type PlainColumn, RecordScanner, type RecordView, type ScanOptions } from './csv-scan.js';
import type { Dialect } from './dialect.js';
import { ChunkPool, type InputSource, contentEnd, readAt } from './source.js';

const BLOCK_SIZE = 1 << 20;
/**
 * The record left unfinished at the end of a chunk is joined to the next
 * chunk's first JOIN bytes in a copy, rather than the whole chunk (a copy of
 * every byte of the input, otherwise).
 */
const JOIN = 1 << 16;
/**
 * The first block of a scan is scanned in two calls, the first over only
 * its first WARM bytes: the scanner's end-of-block path then runs once
 * before the engine optimises the scanner's loop in the middle of the block,
 * which would otherwise be compiled again when that path first came, at the
 * block's end (a few milliseconds of compiling each time, in each thread).
 * The records are the same: a scan resumes where the last one stopped.
 */
const WARM = 1 << 16;

/** This thread's read buffers, used again by every scan (source.ts, ChunkPool). */
const readBuffers = new ChunkPool();

export interface ScanHandlers {
  record(view: RecordView): void;
  /** A column of plain numbers to take without a view per record (csv-scan.ts). */
  readonly column?: PlainColumn;
  /** Called after each block; lets a writer flush with back-pressure. */
  afterBlock?(): Promise<void>;
  /** The bytes after the last record (trailing blank lines), once at the end. */
  trailing?(buf: Buffer, from: number): void;
  /**
   * Once the input up to `at` (where a chunk of the source ends) is scanned,
   * and a record ends there, resume is asked whether to go on; false ends
   * the scan there. `line` is the line the next record would start on.
   */
  readonly pause?: { readonly at: number; resume(line: number): Promise<boolean> };
}


/**
 * What look() makes of the first bytes of a source (as peek gives them),
 * read into one of this thread's read buffers when they fit, which the scan
 * that follows then reads into again.
 */
export async function lookAtHead<T>(source: InputSource, want: number, look: (head: Buffer) => T): Promise<T> {
  const buffer = source.descriptor !== undefined && want <= readBuffers.size ? readBuffers.take() : undefined;
  try {
    return look(await peek(source, want, buffer));
  } finally {
    if (buffer) readBuffers.give(buffer);
  }
}

/**
 * The first bytes of a source, at least `want` of them unless it is shorter
 * (exactly `want` from a source read by position, into `into` when given,
 * which has room for them; from a stream, whole chunks).
 */
export async function peek(source: InputSource, want: number, into?: Buffer): Promise<Buffer> {
  // Read by position: just those bytes. (A stream would read a whole 4 MB chunk, and emit an
  // error as it is given up: some 10-20 ms at start-up, twice.)
  if (source.descriptor !== undefined) {
    const fd = source.descriptor();
    const length = Math.min(want, contentEnd(source));
    const head = into ? into.subarray(0, length) : Buffer.allocUnsafe(length);
    let got = 0;
    while (got < head.length) {
      const read = (await readAt(fd, head.length - got, got, head.subarray(got))).length;
      if (read === 0) break;
      got += read;
    }
    return head.subarray(0, got);
  }
  const parts: Buffer[] = [];
  let size = 0;
  for await (const chunk of source.chunks()) {
    parts.push(chunk);
    size += chunk.length;
    if (size >= want) break;
  }
  return parts.length === 1 ? (parts[0] as Buffer) : Buffer.concat(parts);
}

export async function scanInput(source: InputSource, dialect: Dialect & ScanOptions, handlers: ScanHandlers): Promise<void> {
  const scanner = new RecordScanner(dialect.delimiter, source.name, dialect.loneCrEndsLine, dialect);
  const { counts } = source;
  const firstLine = dialect.firstLine ?? 1;
  let carry: Buffer = Buffer.alloc(0);
  let pending: Buffer[] = [];
  let pendingSize = 0;
  /** Where carry[0] lies in the input. */
  let carryOffset = 0;
  let first = true;
  /** The chunk the carry lies in, kept until the next block has taken the carry. */
  let held: Buffer | undefined;
  const scanBlock = async (atEnd: boolean): Promise<void> => {
    let block: Buffer;
    let from = 0;
    // Where block[0] lies in the input.
    let blockOffset = carryOffset;
    const scanned = pending;
    const chunk = pending.length === 1 ? (pending[0] as Buffer) : undefined;
    if (chunk && carry.length === 0) block = chunk;
    else if (chunk && chunk.length > JOIN && carry.length < JOIN) {
      // Only the records across the join are scanned in a copy; the rest of the chunk where it is.
      scanner.bufOffset = carryOffset;
      const consumed = scanner.scan(Buffer.concat([carry, chunk.subarray(0, JOIN)]), 0, false, handlers.record, handlers.column);
      if (consumed >= carry.length) {
        block = chunk;
        from = consumed - carry.length;
        blockOffset = carryOffset + carry.length;
      } else {
        block = Buffer.concat([carry, chunk]);
        from = consumed;
      }
    } else block = Buffer.concat([carry, ...pending]);
    pending = [];
    pendingSize = 0;
    scanner.bufOffset = blockOffset;
    if (first && block.length - from > 2 * WARM) from = scanner.scan(block.subarray(0, from + WARM), from, false, handlers.record, handlers.column);
    first = false;
    const consumed = scanner.scan(block, from, atEnd, handlers.record, handlers.column);
    carry = block.subarray(consumed);
    carryOffset = blockOffset + consumed;
    // Every chunk scanned goes back to the pool, but the one the carry lies in (the carry before
    // this block has been copied or scanned by now); the handlers keep no views of them.
    const before = held;
    held = carry.length > 0 && block === chunk ? chunk : undefined;
    if (before !== undefined && before !== held) readBuffers.give(before);
    for (const each of scanned) if (each !== held) readBuffers.give(each);
    if (counts) {
      counts[0] = carryOffset;
      counts[1] = scanner.line - firstLine;
    }
    if (handlers.afterBlock) await handlers.afterBlock();
  };
  let fed = 0;
  try {
    for await (const chunk of source.chunks(readBuffers)) {
      pending.push(chunk);
      pendingSize += chunk.length;
      fed += chunk.length;
      if (handlers.pause && fed === handlers.pause.at) {
        await scanBlock(false);
        if (carry.length === 0 && !(await handlers.pause.resume(scanner.line))) return;
        continue;
      }
      // A record longer than a block (or a quote never closed) is rescanned
      // only when the new input is as large as the carry, which keeps the
      // total work linear rather than quadratic.
      if (pendingSize >= Math.max(BLOCK_SIZE, carry.length)) await scanBlock(false);
    }
    await scanBlock(true);
    if (handlers.trailing && carry.length > 0) handlers.trailing(carry, 0);
  } finally {
    // Whatever the scan ended with (an error, a pause that stops it): the chunks it still holds.
    for (const each of pending) readBuffers.give(each);
    if (held !== undefined) readBuffers.give(held);
    pending = [];
    held = undefined;
  }
}

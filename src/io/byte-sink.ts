// Buffered output with back-pressure: bytes and text are copied into one
// large block, which is handed to the stream when it is full, waiting for
// 'drain' when the stream has too much queued, so that memory stays bounded
// however large the table. Copying into a block allocated up front, rather than
// keeping a list of pieces, leaves nothing per row for the garbage collector.
// A write error (such as EPIPE when the reader of a pipe has gone) is raised
// from the next flush.

import { WriteStream } from 'node:fs';
import type { Writable } from 'node:stream';
import { LONGEST_NUMBER, writeNumber } from './number-text.js';

const BLOCK_SIZE = 1 << 20;
/**
 * The first block is small, so that the path that starts a new block runs
 * early, before the engine optimises the writer's loop in the middle of it
 * (a path it has not seen run would make it compile that loop again).
 */
const FIRST_BLOCK_SIZE = 1 << 14;
/** Bytes left queued in the stream before waiting for it to drain. */
const MAX_QUEUED = 16 << 20;
/**
 * Bytes a sink that fills blocks again leaves with the stream before
 * waiting for the first of them to be written: 4 blocks, few, so that few
 * are ever made; enough to keep the stream busy while the next are filled.
 */
const MAX_IN_FLIGHT = 4 * BLOCK_SIZE;
/** Runs up to this many bytes are copied byte by byte. */
const SHORT = 128;
const QUOTE = 0x22;
const LF = 0x0a;
const CR = 0x0d;

/** PlainCells.kinds: a number (as number-text.ts writes it) or a decision (true/false against alpha). */
export const NUMBER_CELL = 0;
export const DECISION_CELL = 1;

/** New cells that are all numbers or decisions, with no quoting to weigh: written straight from their values. */
export interface PlainCells {
  readonly kinds: Uint8Array;
  /** By cell, by data row. */
  readonly values: readonly Float64Array[];
  /** By cell: the level a decision compares with (unused for numbers). */
  readonly alphas: Float64Array;
  readonly decimalComma: boolean;
  /** Bytes the cells can take at most. */
  readonly room: number;
}

/** "true" where value <= alpha, "false" above, nothing for NaN, written at `at`; returns where it ends. */
function writeDecision(value: number, alpha: number, block: Uint8Array, at: number): number {
  let size = at;
  if (value <= alpha) {
    block[size++] = 0x74; // t
    block[size++] = 0x72; // r
    block[size++] = 0x75; // u
    block[size++] = 0x65; // e
  } else if (value > alpha) {
    block[size++] = 0x66; // f
    block[size++] = 0x61; // a
    block[size++] = 0x6c; // l
    block[size++] = 0x73; // s
    block[size++] = 0x65; // e
  }
  return size;
}

export class ByteSink {
  private block: Buffer = Buffer.allocUnsafeSlow(FIRST_BLOCK_SIZE);
  private blockWords = new DataView(this.block.buffer, this.block.byteOffset, this.block.byteLength);
  /** The buffer short runs were last copied from, and a view of it for four-byte reads. */
  private source: Uint8Array = this.block;
  private sourceWords = this.blockWords;
  private size = 0;
  private failure: Error | undefined;
  /** Bytes handed to the stream so far. */
  written = 0;
  private readonly full: Buffer[] = [];
  /**
   * Blocks the stream is done with, filled again rather than new ones
   * allocated: memory touched for the first time costs a page fault per
   * 4 KB (source.ts, ChunkPool). Only for a file stream or standard output,
   * which keep no block once its write has called back; another stream (one
   * that collects what it is given, say) might.
   */
  private readonly spare: ArrayBuffer[] = [];
  private readonly reuses: boolean;
  /** Bytes given to the stream whose writes have not yet called back (when reusing). */
  private inFlight = 0;
  /** Called when one of them does. */
  private wake: (() => void) | undefined;

  constructor(private readonly stream: Writable) {
    stream.on('error', (error: Error) => {
      this.failure ??= error;
    });
    this.reuses = stream instanceof WriteStream || stream === process.stdout;
  }

  /** Appends a piece: bytes as they are, text as UTF-8. */
  push(piece: Buffer | string): void {
    if (typeof piece === 'string') this.pushText(piece);
    else this.pushBytes(piece, 0, piece.length);
  }

  /** Appends buf[start, end) without making a view of it. */
  pushBytes(buf: Uint8Array, start: number, end: number): void {
    const length = end - start;
    if (this.size + length > this.block.length) this.nextBlock(length);
    this.copy(buf, start, end);
  }

  /**
   * Appends a record copied whole, buf[start, end), then its new cells for
   * data row `row`, then its line terminator buf[end, next): the common row
   * of a large table, done with one check for room.
   */
  pushRecord(buf: Uint8Array, start: number, end: number, next: number, delimiter: number, cells: PlainCells, row: number): void {
    const room = next - start + cells.room;
    if (this.size + room > this.block.length) this.nextBlock(room);
    this.copy(buf, start, end);
    const block = this.block;
    let size = this.size;
    const { kinds, values, alphas, decimalComma } = cells;
    for (let k = 0; k < kinds.length; k++) {
      const value = (values[k] as Float64Array)[row] as number;
      block[size] = delimiter;
      if (kinds[k] === NUMBER_CELL) size = writeNumber(value, block, size + 1, decimalComma);
      else size = writeDecision(value, alphas[k] as number, block, size + 1);
    }
    for (let pos = end; pos < next; pos++) block[size++] = buf[pos] as number;
    this.size = size;
  }

  /** Copies buf[start, end) to the block, which has room for it. */
  private copy(buf: Uint8Array, start: number, end: number): void {
    const length = end - start;
    const block = this.block;
    if (length > SHORT) {
      block.set(buf.subarray(start, end), this.size);
      this.size += length;
      return;
    }
    // A short run is copied faster by hand than through a view of it, four bytes at a time.
    if (buf !== this.source) {
      this.source = buf;
      this.sourceWords = new DataView(buf.buffer, buf.byteOffset, buf.byteLength);
    }
    const from = this.sourceWords;
    const to = this.blockWords;
    let size = this.size;
    let pos = start;
    for (; pos + 4 <= end; pos += 4, size += 4) to.setUint32(size, from.getUint32(pos));
    for (; pos < end; pos++) block[size++] = buf[pos];
    this.size = size;
  }

  /** Appends a delimiter byte and then a number as String() writes it (number-text.ts). */
  pushNumberCell(delimiter: number, value: number, decimalComma: boolean): void {
    if (this.size + 1 + LONGEST_NUMBER > this.block.length) this.nextBlock(1 + LONGEST_NUMBER);
    this.block[this.size] = delimiter;
    this.size = writeNumber(value, this.block, this.size + 1, decimalComma);
  }

  /** Appends a delimiter byte and then "true" where value <= alpha, "false" above, nothing for NaN. */
  pushDecisionCell(delimiter: number, value: number, alpha: number): void {
    if (this.size + 6 > this.block.length) this.nextBlock(6);
    this.block[this.size] = delimiter;
    this.size = writeDecision(value, alpha, this.block, this.size + 1);
  }

  pushText(text: string): void {
    // A UTF-8 character takes at most 3 bytes per UTF-16 unit.
    if (this.size + 3 * text.length > this.block.length) this.nextBlock(3 * text.length);
    const block = this.block;
    let size = this.size;
    // Short ASCII text (numbers, delimiters, true/false) is copied by hand: faster than an encoder call.
    if (text.length <= SHORT) {
      for (let i = 0; i < text.length; i++) {
        const code = text.charCodeAt(i);
        if (code > 0x7f) {
          size = this.size + block.write(text, this.size);
          break;
        }
        block[size++] = code;
      }
      this.size = size;
      return;
    }
    this.size += block.write(text, size);
  }

  /**
   * Appends a delimiter byte and then a cell's text, if the text is short
   * ASCII holding no delimiter, quote or line break (a number, true, false);
   * otherwise appends nothing and returns false, for the caller to quote it.
   * One pass over the text both checks and copies it.
   */
  pushPlainCell(delimiter: number, text: string): boolean {
    if (text.length > SHORT) return false;
    if (this.size + 1 + text.length > this.block.length) this.nextBlock(1 + text.length);
    const block = this.block;
    let size = this.size;
    block[size++] = delimiter;
    for (let i = 0; i < text.length; i++) {
      const code = text.charCodeAt(i);
      if (code > 0x7f || code === delimiter || code === QUOTE || code === LF || code === CR) return false;
      block[size++] = code;
    }
    this.size = size;
    return true;
  }

  /** Puts the filled block aside to be written, and starts a new one that holds at least `room` bytes. */
  private nextBlock(room: number): void {
    if (this.size > 0) this.full.push(this.block.subarray(0, this.size));
    const spare = room <= BLOCK_SIZE ? this.spare.pop() : undefined;
    this.block = spare ? Buffer.from(spare) : Buffer.allocUnsafeSlow(Math.max(BLOCK_SIZE, room));
    this.blockWords = new DataView(this.block.buffer, this.block.byteOffset, this.block.byteLength);
    this.size = 0;
  }

  /**
   * Hands a block to the stream, its bytes counted in flight until its
   * write calls back (every block's, so that a record larger than a block is
   * waited for too); a block of the usual size is then filled again.
   */
  private writeCounted(block: Buffer): void {
    const whole = block.buffer;
    const again = whole instanceof ArrayBuffer && whole.byteLength === BLOCK_SIZE;
    this.inFlight += block.length;
    try {
      this.stream.write(block, (error?: Error | null) => {
        this.inFlight -= block.length;
        // The stream's own error first: writes queued behind a failed one call back with a vaguer one.
        if (error) this.failure ??= this.firstError() ?? error;
        else if (again) this.spare.push(whole);
        const wake = this.wake;
        this.wake = undefined;
        wake?.();
      });
    } catch (error) {
      this.inFlight -= block.length;
      throw error;
    }
  }

  /**
   * Writes what is gathered, then `block` as it is; resolves once the
   * stream is done with the block, which can then be filled again.
   */
  async writeReusable(block: Buffer): Promise<void> {
    this.throwIfFailed();
    await this.flush(true);
    this.written += block.length;
    await new Promise<void>((resolve, reject) => {
      this.stream.write(block, (error?: Error | null) => (error ? reject(this.firstError() ?? error) : resolve()));
    });
  }

  /**
   * The stream's own error, if it has failed. A stream that fails is
   * destroyed at once but tells its 'error' a moment later: a write in
   * between fails only with "write after a stream was destroyed", which
   * would hide the reason (a full disk, say).
   */
  private firstError(): Error | undefined {
    return this.failure ?? ((this.stream.errored as Error | null) || undefined);
  }

  private throwIfFailed(): void {
    const failure = this.firstError();
    if (failure) throw failure;
  }

  /** Writes what is gathered; resolves once the stream has written everything it was given. */
  settled(): Promise<void> {
    return this.writeReusable(Buffer.alloc(0));
  }

  /** Writes what is gathered once a block is full (or always, with force). */
  async flush(force = false): Promise<void> {
    this.throwIfFailed();
    if (force && this.size > 0) this.nextBlock(0);
    for (const block of this.full.splice(0)) {
      if (this.reuses) this.writeCounted(block);
      else this.stream.write(block);
      this.written += block.length;
    }
    if (this.reuses) {
      // A write that fails calls back too (and so do those queued behind it, as the stream is destroyed).
      while (this.inFlight > MAX_IN_FLIGHT) {
        await new Promise<void>((resolve) => {
          this.wake = resolve;
        });
        this.throwIfFailed();
      }
      return;
    }
    // Waiting for 'drain' at every block would stop the work at each write
    // (a file stream's own limit is 16 KB); blocks are left queued up to a
    // bound instead, so that writing overlaps with making the next ones.
    if (this.stream.writableLength <= MAX_QUEUED) return;
    await new Promise<void>((resolve, reject) => {
      const onDrain = (): void => {
        this.stream.off('error', onError);
        resolve();
      };
      const onError = (error: Error): void => {
        this.stream.off('drain', onDrain);
        reject(error);
      };
      this.stream.once('drain', onDrain);
      this.stream.once('error', onError);
    });
  }
}

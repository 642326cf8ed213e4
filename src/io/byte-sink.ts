// Buffered output with back-pressure: pieces are gathered and written in
// large blocks, waiting for 'drain' when the stream is full, so that memory
// stays bounded however large the table. A write error (such as EPIPE when
// the reader of a pipe has gone) is raised from the next flush.

import type { Writable } from 'node:stream';

const FLUSH_SIZE = 1 << 20;

export class ByteSink {
  private pieces: Buffer[] = [];
  private text = '';
  private size = 0;
  private failure: Error | undefined;
  /** Bytes handed to the stream so far. */
  written = 0;

  constructor(private readonly stream: Writable) {
    stream.on('error', (error: Error) => {
      this.failure ??= error;
    });
  }

  push(piece: Buffer | string): void {
    if (typeof piece === 'string') {
      this.text += piece;
      this.size += piece.length;
      return;
    }
    if (this.text) {
      this.pieces.push(Buffer.from(this.text));
      this.text = '';
    }
    this.pieces.push(piece);
    this.size += piece.length;
  }

  /** Writes what is gathered once it is large (or always, with force). */
  async flush(force = false): Promise<void> {
    if (this.failure) throw this.failure;
    if (this.size === 0 || (!force && this.size < FLUSH_SIZE)) return;
    if (this.text) this.pieces.push(Buffer.from(this.text));
    const block = Buffer.concat(this.pieces);
    this.pieces = [];
    this.text = '';
    this.size = 0;
    this.written += block.length;
    if (this.stream.write(block)) return;
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

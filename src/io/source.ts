// Where a table's bytes come from. A source can be read more than once: the
// first pass collects the p-values, the second writes the table back. Files
// are simply read again; standard input is read to its end and kept in memory.

import { createReadStream } from 'node:fs';
import type { Readable } from 'node:stream';

export interface InputSource {
  /** For messages: the file name, or <stdin>. */
  readonly name: string;
  /** File name extension in lower case ('' for stdin), a hint for the delimiter. */
  readonly extension: string;
  chunks(): AsyncIterable<Buffer>;
}

const READ_SIZE = 4 << 20;

export function fileSource(path: string): InputSource {
  const dot = path.lastIndexOf('.');
  return {
    name: path,
    extension: dot > path.lastIndexOf('/') ? path.slice(dot + 1).toLowerCase() : '',
    chunks: () => createReadStream(path, { highWaterMark: READ_SIZE }),
  };
}

/**
 * A stream (standard input) read to its end and kept in memory, so that it
 * can be passed over more than once.
 */
export async function streamSource(stream: Readable, name = '<stdin>'): Promise<InputSource> {
  const kept: Buffer[] = [];
  for await (const chunk of stream) kept.push(typeof chunk === 'string' ? Buffer.from(chunk) : (chunk as Buffer));
  return {
    name,
    extension: '',
    async *chunks() {
      yield* kept;
    },
  };
}

export function bufferSource(bytes: Buffer, name: string): InputSource {
  return {
    name,
    extension: '',
    async *chunks() {
      yield bytes;
    },
  };
}

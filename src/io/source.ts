// Where a table's bytes come from. A source can be read more than once: the
// first pass collects the p-values, the second writes the table back. Files
// are simply read again; standard input and pipes are first read to their end
// (spill.ts), gzip is decompressed on every pass (gzip.ts).

import { createReadStream, statSync } from 'node:fs';

export interface InputSource {
  /** For messages: the file name, or <stdin>. */
  readonly name: string;
  /** File name extension in lower case ('' for stdin), a hint for the delimiter. */
  readonly extension: string;
  /** Bytes of content, when known before reading (a plain file, a spilled stream). */
  readonly size?: number;
  chunks(): AsyncIterable<Buffer>;
}

const READ_SIZE = 4 << 20;

/** A path's extension, lower-cased, without the dot; '' when the last path element has none. */
export function extensionOf(path: string): string {
  const dot = path.lastIndexOf('.');
  return dot > path.lastIndexOf('/') ? path.slice(dot + 1).toLowerCase() : '';
}

export function fileSource(path: string): InputSource {
  return {
    name: path,
    extension: extensionOf(path),
    size: statSync(path).size,
    chunks: () => createReadStream(path, { highWaterMark: READ_SIZE }),
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

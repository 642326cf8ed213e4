// gzip in and out. Input is recognised by its first two bytes (the gzip
// magic number 1f 8b, RFC 1952 section 2.3.1), whatever the file is called,
// and decompressed on each pass: a second decompression measured about as
// fast as writing the decompressed table to disk and reading it back
// (README, Benchmarks), and needs no disk space. Concatenated gzip members (bgzip output) are read as one
// stream. Output is compressed when the output file's name ends in .gz.

import { once } from 'node:events';
import { Readable, pipeline } from 'node:stream';
import { DataError } from '../errors.js';
import type { OutputFile } from './atomic-file.js';
import { zlib } from './lazy-builtin.js';
import { peek } from './scan-input.js';
import { type InputSource, extensionOf } from './source.js';

const CHUNK_SIZE = 1 << 20;

export function isGzip(head: Uint8Array): boolean {
  return head.length >= 2 && head[0] === 0x1f && head[1] === 0x8b;
}

/** The source itself, or its decompressed content when it starts like gzip. */
export async function decompressedIfGzip(source: InputSource): Promise<InputSource> {
  return isGzip(await peek(source, 2)) ? gunzipped(source) : source;
}

/** The decompressed content of a gzip source; the delimiter hint comes from the name without .gz. */
export function gunzipped(source: InputSource): InputSource {
  return {
    name: source.name,
    extension: extensionOf(source.name.replace(/\.gz$/i, '')),
    async *chunks() {
      const gunzip = pipeline(Readable.from(source.chunks()), zlib().createGunzip({ chunkSize: CHUNK_SIZE }), () => {});
      try {
        for await (const chunk of gunzip) yield chunk as Buffer;
      } catch (error) {
        const code = (error as NodeJS.ErrnoException).code ?? '';
        if (!code.startsWith('Z_')) throw error;
        throw new DataError(`${source.name}: the gzip data is damaged or cut short (${(error as Error).message}); check the file with gzip -t`);
      }
    },
  };
}

/** The output compressed when its name ends in .gz; as it is otherwise. */
/** Whether output to this path is compressed (compressedIfNamed). */
export function gzipNamed(path: string | undefined): boolean {
  return path !== undefined && /\.gz$/i.test(path);
}

export function compressedIfNamed(path: string | undefined, file: OutputFile): OutputFile {
  return gzipNamed(path) ? gzipped(file) : file;
}

/** Output through gzip into a file; finishing it ends the compressed stream first. */
function gzipped(file: OutputFile): OutputFile {
  const { constants, createGzip } = zlib();
  const gzip = createGzip({ level: constants.Z_BEST_SPEED, chunkSize: CHUNK_SIZE });
  gzip.pipe(file.stream, { end: false });
  // A failing file (a full disk) stops the compressor too, so that the writer hears of it.
  file.stream.on('error', (error: Error) => gzip.destroy(error));
  return {
    stream: gzip,
    direct: file.direct,
    async finish() {
      const ended = once(gzip, 'end');
      gzip.end();
      await ended;
      await file.finish();
    },
    install: () => file.install(),
    abort() {
      gzip.destroy();
      file.abort();
    },
  };
}

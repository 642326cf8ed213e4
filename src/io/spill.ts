// A stream that can be read only once (standard input, a pipe) made into a
// source that can be read twice. A small input stays in memory; once it
// passes IN_MEMORY bytes, everything goes to a temporary file in the
// system's temporary folder, so that a table of tens of millions of rows
// costs disk, not memory. The file is unlinked as soon as it is opened and
// read through its descriptor, so nothing is left behind however the process
// ends (even when it is killed); where unlinking an open file is not
// allowed, it is removed on exit instead. Cost: one extra write and read of
// the input, both sequential.

import { rmSync, unlinkSync } from 'node:fs';
import { type FileHandle, open } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { Readable } from 'node:stream';
import { type InputSource, rangeSource } from './source.js';
import { temporaryNamePart } from './temporary-name.js';

/**
 * Inputs up to this size are kept in memory (typing at the terminal, short
 * pipes); larger ones go to a file, which two threads can read in parts
 * (parts.ts: from 8 MB on).
 */
const IN_MEMORY = 8 << 20;
/** Where no temporary file can be made (a TMPDIR missing or full), inputs up to this size are kept in memory all the same. */
const IN_MEMORY_WITHOUT_FILE = 32 << 20;
/** Chunks are gathered into writes of about this size. */
const WRITE_SIZE = 4 << 20;

const leftOver = new Set<string>();
/**
 * Open spill files, kept referenced until the process exits (which closes
 * them): a file handle that is garbage-collected is closed with a warning.
 */
const openHandles = new Set<FileHandle>();

function removeLeftOver(): void {
  for (const path of leftOver) rmSync(path, { force: true });
  leftOver.clear();
}

/** A temporary file, opened and then unlinked at once (or removed at exit where that fails). */
export async function temporaryFile(): Promise<FileHandle> {
  const path = join(tmpdir(), `famwise-${temporaryNamePart()}.spill`);
  const handle = await open(path, 'wx+', 0o600);
  openHandles.add(handle);
  try {
    unlinkSync(path);
  } catch {
    if (leftOver.size === 0) process.on('exit', removeLeftOver);
    leftOver.add(path);
  }
  return handle;
}

/**
 * Writes the chunks as they are, in one call (not copied into one block
 * first: new memory for every byte of the input, each page of it a page
 * fault); whatever a short write leaves goes after.
 */
async function writeAll(file: FileHandle, chunks: readonly Buffer[]): Promise<void> {
  const total = chunks.reduce((sum, chunk) => sum + chunk.length, 0);
  let { bytesWritten: done } = await file.writev(chunks as Buffer[]);
  if (done === total) return;
  let rest = Buffer.concat(chunks).subarray(done);
  while (rest.length > 0) {
    const { bytesWritten } = await file.write(rest);
    done += bytesWritten;
    rest = rest.subarray(bytesWritten);
  }
}

/**
 * Reads a stream to its end, into memory or (past `inMemory` bytes) a
 * temporary file, and returns it as a source. onFile is told when the input
 * turns out to go to a file, with its first bytes and its size so far, while
 * the rest is read.
 */
export async function spilledSource(stream: Readable, name: string, inMemory = IN_MEMORY, onFile?: (head: Buffer, size: number) => void): Promise<InputSource> {
  const kept: Buffer[] = [];
  let keptSize = 0;
  let size = 0;
  let file: FileHandle | undefined;
  let noFile: Error | undefined;
  for await (const piece of stream) {
    const chunk = typeof piece === 'string' ? Buffer.from(piece) : (piece as Buffer);
    kept.push(chunk);
    keptSize += chunk.length;
    size += chunk.length;
    if (noFile) {
      if (size <= IN_MEMORY_WITHOUT_FILE) continue;
      // A system error, shown as one (errors.ts errorText), with the code of the one met.
      throw Object.assign(new Error(`${name}: more than ${IN_MEMORY_WITHOUT_FILE >> 20} MB came in, and there is no temporary file to keep them in (${noFile.message}); set TMPDIR to a folder with room for the whole input`), {
        code: (noFile as NodeJS.ErrnoException).code ?? 'EIO',
      });
    }
    if (keptSize < (file ? WRITE_SIZE : inMemory)) continue;
    if (!file) {
      try {
        file = await temporaryFile();
      } catch (error) {
        noFile = error as Error;
        continue;
      }
      onFile?.(kept[0] as Buffer, size);
    }
    await writeAll(file, kept.splice(0));
    keptSize = 0;
  }
  if (!file) {
    return {
      name,
      extension: '',
      size,
      async *chunks() {
        yield* kept;
      },
    };
  }
  await writeAll(file, kept);
  const handle = file;
  return {
    name,
    extension: '',
    size,
    descriptor: () => handle.fd,
    // Read by position, so that passes (and a first look that stops early) never disturb each other.
    chunks: (pool) => rangeSource(name, handle.fd, 0, Infinity).chunks(pool),
  };
}

// Output files are written under a temporary name beside the target and
// renamed over it only when everything succeeded, so a failed or interrupted
// run never leaves a half-written file and never changes an existing one.
// A symbolic link is followed (the file it points to is replaced, the link
// stays), and an existing file keeps its permission bits. Targets that are
// not regular files (a named pipe, a terminal), and anything under /dev or
// /proc (/dev/stdout may stand for a file the shell opened for appending),
// cannot be replaced by a rename, so they are written directly.

import { randomBytes } from 'node:crypto';
import { chmodSync, createWriteStream, existsSync, openSync, realpathSync, renameSync, rmSync, statSync, type WriteStream } from 'node:fs';
import { dirname, join, resolve } from 'node:path';
import { UsageError } from '../errors.js';

const unfinished = new Set<string>();

export interface AtomicFile {
  readonly stream: WriteStream;
  /** Closes the stream and moves the file into place. */
  commit(): Promise<void>;
  /** Removes the temporary file. Safe to call more than once. */
  abort(): void;
}

function closed(stream: WriteStream, failure: () => Error | undefined): Promise<void> {
  return new Promise<void>((resolve, reject) => {
    const early = failure();
    if (early) return reject(early);
    stream.end((error?: Error | null) => {
      const late = error ?? failure();
      if (late) reject(late);
      else resolve();
    });
  });
}

function removeQuietly(path: string): void {
  try {
    rmSync(path, { force: true });
  } catch {
    // Nothing more can be done about a file that cannot be removed.
  }
}

/** Opens a file for writing now, so that a bad name fails at once with a clear message. */
function openForWriting(path: string, flags: string, shownAs: string): number {
  try {
    return openSync(path, flags);
  } catch (error) {
    throw new UsageError(`${shownAs}: cannot be written (${(error as Error).message})`);
  }
}

export function createAtomicFile(path: string): AtomicFile {
  let failure: Error | undefined;
  // Errors surface through commit(); keep an unhandled 'error' from crashing the process.
  const remember = (error: Error): void => {
    failure ??= error;
  };
  const special = /^\/(dev|proc)\//.test(resolve(path));
  const target = !special && existsSync(path) ? realpathSync(path) : path;
  const existing = existsSync(target) ? statSync(target) : undefined;

  if (special || (existing && !existing.isFile())) {
    const stream = createWriteStream('', { fd: openForWriting(target, 'a', path) });
    stream.on('error', remember);
    return { stream, commit: () => closed(stream, () => failure), abort: () => stream.destroy() };
  }

  const temporary = join(dirname(target), `.famwise-${process.pid}-${randomBytes(6).toString('hex')}.tmp`);
  const fd = openForWriting(temporary, 'wx', path);
  unfinished.add(temporary);
  const stream = createWriteStream('', { fd });
  stream.on('error', remember);
  return {
    stream,
    async commit() {
      await closed(stream, () => failure);
      if (existing) chmodSync(temporary, existing.mode & 0o7777);
      renameSync(temporary, target);
      unfinished.delete(temporary);
    },
    abort() {
      stream.destroy();
      removeQuietly(temporary);
      unfinished.delete(temporary);
    },
  };
}

/** Removes every temporary file not yet committed (on an interrupt). */
export function removeUnfinishedFiles(): void {
  for (const temporary of unfinished) removeQuietly(temporary);
  unfinished.clear();
}

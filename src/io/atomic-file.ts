// Output files are written under a temporary name beside the target and
// renamed over it only when everything succeeded, so a failed or interrupted
// run never leaves a half-written file and never changes an existing one.
// A symbolic link is followed (the file it points to is replaced, the link
// stays), and an existing file keeps its permission bits. Targets that are
// not regular files (/dev/stdout, a named pipe) cannot be replaced by a
// rename, so they are written directly.

import { randomBytes } from 'node:crypto';
import { chmodSync, createWriteStream, existsSync, realpathSync, renameSync, rmSync, statSync, type WriteStream } from 'node:fs';
import { basename, dirname, join } from 'node:path';

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

export function createAtomicFile(path: string): AtomicFile {
  const target = existsSync(path) ? realpathSync(path) : path;
  const existing = existsSync(target) ? statSync(target) : undefined;
  let failure: Error | undefined;
  // Errors surface through commit(); keep an unhandled 'error' from crashing the process.
  const remember = (error: Error): void => {
    failure ??= error;
  };

  if (existing && !existing.isFile()) {
    const stream = createWriteStream(target, { flags: 'a' });
    stream.on('error', remember);
    return { stream, commit: () => closed(stream, () => failure), abort: () => stream.destroy() };
  }

  const temporary = join(dirname(target), `.${basename(target)}.${process.pid}-${randomBytes(4).toString('hex')}.famwise-tmp`);
  unfinished.add(temporary);
  const stream = createWriteStream(temporary, { flags: 'wx' });
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
      rmSync(temporary, { force: true });
      unfinished.delete(temporary);
    },
  };
}

/** Removes every temporary file not yet committed (on an interrupt). */
export function removeUnfinishedFiles(): void {
  for (const temporary of unfinished) rmSync(temporary, { force: true });
  unfinished.clear();
}

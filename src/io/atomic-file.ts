// Output files are written under a temporary name beside the target and
// renamed over it only when everything succeeded, so a failed or interrupted
// run never leaves a half-written file and never touches an existing one.

import { randomBytes } from 'node:crypto';
import { createWriteStream, renameSync, rmSync, type WriteStream } from 'node:fs';
import { basename, dirname, join } from 'node:path';

const unfinished = new Set<string>();

export interface AtomicFile {
  readonly stream: WriteStream;
  /** Closes the stream and moves the file into place. */
  commit(): Promise<void>;
  /** Removes the temporary file. Safe to call more than once. */
  abort(): void;
}

export function createAtomicFile(path: string): AtomicFile {
  const temporary = join(dirname(path), `.${basename(path)}.${process.pid}-${randomBytes(4).toString('hex')}.famwise-tmp`);
  unfinished.add(temporary);
  const stream = createWriteStream(temporary, { flags: 'wx' });
  // Errors surface through commit(); keep an unhandled 'error' from crashing the process.
  let failure: Error | undefined;
  stream.on('error', (error) => {
    failure = error;
  });
  return {
    stream,
    async commit() {
      await new Promise<void>((resolve, reject) => {
        if (failure) return reject(failure);
        stream.end((error?: Error | null) => (error ? reject(error) : resolve()));
      });
      if (failure) throw failure;
      renameSync(temporary, path);
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

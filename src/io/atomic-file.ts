// Where output goes, and writing it all or nothing.
//
// A regular file is written under a temporary name beside the target and
// renamed over it only when every output is complete, so a failed or
// interrupted run never leaves a half-written file and never changes an
// existing one. A symbolic link is followed (the file it points to is
// replaced, even if it does not exist yet; the link stays), and an existing
// file keeps its permission bits. A path that is this process's standard
// output or error (/dev/stdout, /dev/fd/1, or the very file they were
// redirected to) is written through that stream; anything else that is not a
// regular file (a named pipe, a terminal, /dev/null) is written directly.

import {
  chmodSync,
  createWriteStream,
  fstatSync,
  lstatSync,
  openSync,
  readlinkSync,
  renameSync,
  rmSync,
  statSync,
  type Stats,
} from 'node:fs';
import type { Writable } from 'node:stream';
import { dirname, join, resolve } from 'node:path';
import { UsageError } from '../errors.js';
import { temporaryNamePart } from './temporary-name.js';

const unfinished = new Set<string>();

/** How an output path will be written. */
export type OutputRoute =
  | { readonly kind: 'stdout' }
  | { readonly kind: 'stderr' }
  | { readonly kind: 'direct'; readonly path: string }
  /** path: the file that will be replaced, links followed. */
  | { readonly kind: 'replace'; readonly path: string; readonly existing: Stats | undefined };

/** Follows symbolic links, also to a file that does not exist yet. */
function followLinks(path: string): string {
  let current = resolve(path);
  for (let hops = 0; hops < 40; hops++) {
    let stat;
    try {
      stat = lstatSync(current);
    } catch {
      return current;
    }
    if (!stat.isSymbolicLink()) return current;
    current = resolve(dirname(current), readlinkSync(current));
  }
  return current;
}

function statOrUndefined(path: string): Stats | undefined {
  try {
    return statSync(path);
  } catch {
    return undefined;
  }
}

/** '-' is standard output; see the comment at the top for the rest. */
export function routeOutput(path: string): OutputRoute {
  if (path === '-') return { kind: 'stdout' };
  const stat = statOrUndefined(path);
  if (stat) {
    for (const [fd, kind] of [[1, 'stdout'], [2, 'stderr']] as const) {
      const open = (() => {
        try {
          return fstatSync(fd);
        } catch {
          return undefined;
        }
      })();
      if (open && open.dev === stat.dev && open.ino === stat.ino) return { kind };
    }
    if (!stat.isFile()) return { kind: 'direct', path };
  }
  const target = followLinks(path);
  return { kind: 'replace', path: target, existing: statOrUndefined(target) };
}

export interface OutputFile {
  readonly stream: Writable;
  /** Whether the stream writes into the target itself, so that what is written cannot be taken back. */
  readonly direct: boolean;
  /**
   * The descriptor of the temporary file the stream writes from its start,
   * for writing parts of it by position too (parallel-write.ts); undefined
   * for the other routes.
   */
  readonly fd?: number;
  /** Flushes and closes the stream. */
  finish(): Promise<void>;
  /** Moves the finished file into place (after every output has finished). */
  install(): void;
  /** Removes the temporary file. Safe to call more than once. */
  abort(): void;
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

function closed(stream: Writable, failure: () => Error | undefined): Promise<void> {
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

export function openOutput(path: string): OutputFile {
  const route = routeOutput(path);
  if (route.kind === 'stdout' || route.kind === 'stderr') {
    const stream = route.kind === 'stdout' ? process.stdout : process.stderr;
    return { stream, direct: true, finish: async () => {}, install: () => {}, abort: () => {} };
  }
  let failure: Error | undefined;
  // Errors surface through finish(); keep an unhandled 'error' from crashing the process.
  const remember = (error: Error): void => {
    failure ??= error;
  };
  if (route.kind === 'direct') {
    const stream = createWriteStream('', { fd: openForWriting(route.path, 'w', path) });
    stream.on('error', remember);
    return { stream, direct: true, finish: () => closed(stream, () => failure), install: () => {}, abort: () => stream.destroy() };
  }
  const temporary = join(dirname(route.path), `.famwise-${temporaryNamePart()}.tmp`);
  const fd = openForWriting(temporary, 'wx', path);
  unfinished.add(temporary);
  // Not closed by the stream itself when a write fails (autoClose): a worker thread may be writing
  // into the file by position (parallel-write.ts), and a descriptor closed under it could be handed
  // to another file. It is closed when the output is finished or given up (destroy waits for a
  // write under way), and whoever gives it up waits for the worker first.
  const stream = createWriteStream('', { fd, autoClose: false });
  stream.on('error', remember);
  return {
    stream,
    direct: false,
    fd,
    async finish() {
      try {
        await closed(stream, () => failure);
      } finally {
        await new Promise<void>((resolve) => {
          if (stream.closed) return resolve();
          stream.once('close', () => resolve());
          stream.destroy();
        });
      }
    },
    install() {
      if (route.existing) chmodSync(temporary, route.existing.mode & 0o7777);
      renameSync(temporary, route.path);
      unfinished.delete(temporary);
    },
    abort() {
      stream.destroy();
      removeQuietly(temporary);
      unfinished.delete(temporary);
    },
  };
}

/** Removes every temporary file not yet installed (on an interrupt). */
export function removeUnfinishedFiles(): void {
  for (const temporary of unfinished) removeQuietly(temporary);
  unfinished.clear();
}

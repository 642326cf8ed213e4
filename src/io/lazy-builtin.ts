// Node's own modules that only some runs need, loaded when first used
// rather than at start-up, which every run waits for: each takes a few
// milliseconds to load (zlib 2-4 ms, child_process 3-5 ms, measured by
// importing each in a fresh process on the benchmark machine), and a plain
// table in a file needs neither.

import { createRequire } from 'node:module';

const load = createRequire(import.meta.url);

/** node:zlib, for gzip in or out. */
export function zlib(): typeof import('node:zlib') {
  return load('node:zlib') as typeof import('node:zlib');
}

/** node:child_process, for moving redirected standard input to its end. */
export function childProcess(): typeof import('node:child_process') {
  return load('node:child_process') as typeof import('node:child_process');
}

#!/usr/bin/env node
// The command's first module: on two cores, it runs a large table's command
// in a child process started with an engine flag (relaunch.ts); otherwise it
// starts the worker thread for a large table's second half
// (io/worker-thread.ts) before loading the rest of the command (main.ts,
// bundled as command.mjs), so that the two start together.

import { startEarly, stdinStat } from '../io/worker-thread.js';
import { relaunched, watchParent } from './relaunch.js';

const args = process.argv.slice(2);
watchParent();
// On two cores, a large table's command runs in a child process started with an engine flag (relaunch.ts).
if (!(await relaunched(args, new URL(import.meta.url), stdinStat))) {
  startEarly(args);
  await import(new URL('./command.mjs', import.meta.url).href);
}

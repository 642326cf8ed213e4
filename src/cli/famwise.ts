#!/usr/bin/env node
// The command's first module: it starts the worker thread for a large
// table's second half (io/worker-thread.ts) before loading the rest of the
// command (main.ts, bundled as command.mjs), so that the two start together.

import { startEarly } from '../io/worker-thread.js';

startEarly(process.argv.slice(2));
await import(new URL('./command.mjs', import.meta.url).href);

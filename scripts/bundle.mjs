// Bundles the compiled command line into the files the famwise command
// runs: dist/cli/famwise.mjs, a small first module that may start the worker
// thread at once (src/io/worker-thread.ts) and then loads dist/cli/command.mjs,
// everything else (dist/cli/main.js and all it imports, commander and zod
// included); and dist/cli/part-worker.mjs, the worker. One file starts in
// about two thirds of the time that loading some sixty modules takes, which
// is most of a small table's run. jstat stays outside: it is loaded only for
// tables of statistics (src/distributions/log-gamma.ts).
import { chmodSync } from 'node:fs';
import { build } from 'esbuild';

const outfile = new URL('../dist/cli/famwise.mjs', import.meta.url).pathname;
const cli = (name) => new URL(`../dist/cli/${name}`, import.meta.url).pathname;
const common = {
  bundle: true,
  platform: 'node',
  target: 'node20',
  format: 'esm',
  external: ['jstat'],
  // commander is CommonJS; its require() calls of Node's own modules need a require in an ES module.
  banner: { js: "import { createRequire as famwiseRequire } from 'node:module'; const require = famwiseRequire(import.meta.url);" },
  logLevel: 'warning',
};
// The command runs famwise.mjs, a small first module that may start the worker (src/io/worker-thread.ts)
// before it loads command.mjs, the rest.
await build({ ...common, entryPoints: [cli('famwise.js')], outfile });
await build({ ...common, entryPoints: [cli('main.js')], outfile: cli('command.mjs') });
// The worker thread that reads and writes the second part of a large table (src/io/parts.ts), beside the command.
await build({ ...common, entryPoints: [new URL('../dist/io/part-worker.js', import.meta.url).pathname], outfile: cli('part-worker.mjs') });
chmodSync(outfile, 0o755);

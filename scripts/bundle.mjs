// Bundles the compiled command line (dist/cli/main.js and everything it
// imports, commander and zod included) into one file, dist/cli/famwise.mjs,
// the file the famwise command runs. One file starts in about two thirds of
// the time that loading some sixty modules takes, which is most of a
// small table's run. jstat stays outside: it is loaded only for tables of
// statistics (src/distributions/log-gamma.ts).
import { chmodSync } from 'node:fs';
import { build } from 'esbuild';

const outfile = new URL('../dist/cli/famwise.mjs', import.meta.url).pathname;
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
await build({ ...common, entryPoints: [new URL('../dist/cli/main.js', import.meta.url).pathname], outfile });
// The worker thread that reads and writes the second part of a large table (src/io/parts.ts), beside the command.
await build({ ...common, entryPoints: [new URL('../dist/io/part-worker.js', import.meta.url).pathname], outfile: new URL('../dist/cli/part-worker.mjs', import.meta.url).pathname });
chmodSync(outfile, 0o755);

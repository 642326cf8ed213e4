#!/usr/bin/env node
// The famwise command line: subcommands, exit statuses and error reporting.
// Everything here parses, validates, reads and writes; the arithmetic lives
// in the procedure modules.

import { readFileSync } from 'node:fs';
import { Command, CommanderError } from 'commander';
import { FamwiseError, errorText } from '../errors.js';
import { AUDIT_EXIT_HELP, EXIT } from '../exit-codes.js';
import { removeUnfinishedFiles } from '../io/atomic-file.js';
import { adjustCommand } from './adjust.js';
import { auditCommand } from './audit.js';
import { inspectCommand } from './inspect.js';
import { CAUTION } from './cautions.js';
import { methodsCommand } from './methods.js';
import { clearLine } from './progress.js';

const { version } = JSON.parse(readFileSync(new URL('../../package.json', import.meta.url), 'utf8')) as { version: string };

function program(): Command {
  const root = new Command('famwise')
    .description('Multiple-testing adjustment of p-value tables: FWER and FDR procedures within families.')
    .version(version, '--version', 'print the version')
    .helpOption('-h, --help', 'show help')
    .addHelpText('after', `\nExit status:\n${AUDIT_EXIT_HELP}\n\n${CAUTION}\n`)
    .showHelpAfterError('(see famwise --help; to adjust a table: famwise adjust FILE)');
  // In the order of the work: look at the p-values, adjust them, check someone else's adjustment.
  for (const command of [inspectCommand(), adjustCommand(), auditCommand(), methodsCommand()]) {
    root.addCommand(command.helpOption('-h, --help', 'show help').showHelpAfterError(`(see famwise ${command.name()} --help)`));
  }
  // Commander's own usage errors (unknown option, missing value) read like ours and exit with the usage status.
  for (const command of [root, ...root.commands]) {
    command.exitOverride().configureOutput({
      outputError: (text, write) => write(`famwise: ${text.replace(/^error: /, '')}`),
    });
  }
  return root;
}

function fail(error: unknown): never {
  removeUnfinishedFiles();
  if (error instanceof CommanderError) {
    // Asked-for help and the version exit 0; help shown for a missing command, and every usage error, do not.
    process.exit(error.exitCode === 0 ? EXIT.ok : EXIT.usageError);
  }
  if (error instanceof FamwiseError) {
    process.stderr.write(`famwise: ${error.message}\n`);
    process.exit(error.exitCode);
  }
  const code = (error as NodeJS.ErrnoException | undefined)?.code;
  if (code === 'EPIPE') process.exit(EXIT.ok);
  process.stderr.write(`famwise: ${errorText(error)}\n`);
  process.exit(EXIT.dataError);
}

// A reader that stops early (famwise adjust big.csv | head) is not an error:
// the table writer notices and finishes the rest of the work quietly.
process.stdout.on('error', (error: NodeJS.ErrnoException) => {
  if (error.code !== 'EPIPE') fail(error);
});
// An interrupt, a closed terminal or a cancelled CI job leaves no temporary files behind.
for (const [signal, status] of [['SIGHUP', 129], ['SIGINT', 130], ['SIGTERM', 143]] as const) {
  process.on(signal, () => {
    removeUnfinishedFiles();
    // The message replaces a progress line on the screen.
    process.stderr.write(`${clearLine()}famwise: stopped by ${signal} before finishing; no output file was changed\n`);
    process.exit(status);
  });
}

program()
  .parseAsync(process.argv)
  .catch(fail);

// famwise methods: the procedures famwise knows, from the one registry.

const USAGE = `Lists every procedure: the token to give --methods, the error rate it
controls (FWER: the chance of any false rejection; FDR: the expected share
of false rejections among the rejections), the dependence between tests
under which that control is proven, how it walks the sorted p-values, and
its published source.

Examples:
  famwise methods
  famwise methods --json | jq -r '.[] | select(.controls == "FDR") | .token'`;

import { Command } from 'commander';
import * as z from 'zod';
import { EXIT_HELP } from '../exit-codes.js';
import { METHODS } from '../methods.js';
import { parseOptions } from './options.js';

const methodsOptionsSchema = z.object({ json: z.boolean().default(false) });

/** What scripts get from --json: one object per procedure, in the registry's order. */
export function methodList(): Record<string, string | boolean>[] {
  return METHODS.map((method) => ({
    token: method.token,
    name: method.name,
    controls: method.controls,
    dependence: method.dependence,
    steps: method.steps,
    weighted: method.adjustWeighted !== undefined,
    source: method.source,
  }));
}

/** One block per procedure, readable in an 80-column terminal. */
export function methodsText(): string {
  const width = Math.max(...METHODS.map((method) => method.token.length)) + 2;
  const indent = ' '.repeat(width);
  return METHODS.map((method) => {
    const traits = [method.controls, method.steps, ...(method.adjustWeighted ? ['weighted form'] : [])].join(', ');
    return [
      `${method.token.padEnd(width)}${method.name} (${traits})`,
      `${indent}valid under ${method.dependence}`,
      // Several sources go one to a line, so that the block fits 80 columns.
      ...method.source.split('; ').map((source) => `${indent}${source}`),
    ].join('\n');
  }).join('\n\n') + '\n';
}

export function methodsCommand(): Command {
  return new Command('methods')
    .summary('list the procedures, the error rate each controls and its assumptions')
    .description(USAGE)
    .option('--json', 'print the list as JSON, for scripts')
    .addHelpText('after', `\nExit status:\n${EXIT_HELP}\n`)
    .action((raw: Record<string, unknown>) => {
      const options = parseOptions(methodsOptionsSchema, raw);
      process.stdout.write(options.json ? `${JSON.stringify(methodList(), null, 2)}\n` : methodsText());
    });
}

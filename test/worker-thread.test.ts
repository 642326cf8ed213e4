// The guess, from the arguments alone, that a table will be read in two
// parts, on which the command's first module starts the worker thread
// before loading the rest (io/worker-thread.ts).
import { statSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { VALUE_OPTIONS, looksParted } from '../dist/io/worker-thread.js';
import { adjustCommand } from '../src/cli/adjust.js';
import { inspectCommand } from '../src/cli/inspect.js';
import { removeTemporaryFolders, temporaryFolder } from './helpers/temporary-folder.js';

const work = temporaryFolder('famwise-early-');
const big = join(work, 'big.csv');
const small = join(work, 'small.csv');
writeFileSync(big, 'p\n'.padEnd(4000, '0'));
writeFileSync(small, 'p\n0.5\n');
const saved = process.env.FAMWISE_PARALLEL_MIN_BYTES;
process.env.FAMWISE_PARALLEL_MIN_BYTES = '1000';
afterAll(() => {
  if (saved === undefined) delete process.env.FAMWISE_PARALLEL_MIN_BYTES;
  else process.env.FAMWISE_PARALLEL_MIN_BYTES = saved;
  removeTemporaryFolders();
});

const noStdin = (): undefined => undefined;

describe('looksParted', () => {
  it('is true for adjust and inspect of a file at least the size set, wherever the file comes among the options', () => {
    expect(looksParted(['adjust', big], noStdin)).toBe(true);
    expect(looksParted(['adjust', '--methods', 'bh,holm', big, '-q'], noStdin)).toBe(true);
    expect(looksParted(['inspect', big], noStdin)).toBe(true);
  });

  it('is false for a smaller file, a missing one, other commands and no command', () => {
    expect(looksParted(['adjust', small], noStdin)).toBe(false);
    expect(looksParted(['adjust', join(work, 'missing.csv')], noStdin)).toBe(false);
    expect(looksParted(['audit', big, '--adjusted-column', 'q'], noStdin)).toBe(false);
    expect(looksParted(['methods'], noStdin)).toBe(false);
    expect(looksParted(['--version'], noStdin)).toBe(false);
    expect(looksParted([], noStdin)).toBe(false);
  });

  it('does not take a large output file (-o, --output, --summary, --plot) for the input', () => {
    for (const flag of ['-o', '--output', '--summary', '--plot']) expect(looksParted(['adjust', small, flag, big], noStdin)).toBe(false);
  });

  it('is true for standard input redirected from a large file, false from a small one or none', () => {
    expect(looksParted(['adjust', '--methods', 'bh'], () => statSync(big))).toBe(true);
    expect(looksParted(['adjust'], () => statSync(small))).toBe(false);
    expect(looksParted(['adjust'], () => statSync(work))).toBe(false);
    expect(looksParted(['adjust'], noStdin)).toBe(false);
  });

  it('leaves standard input out when an argument names a file, which is read instead (unless it is -)', () => {
    const bigStdin = () => statSync(big);
    expect(looksParted(['adjust', small], bigStdin)).toBe(false);
    expect(looksParted(['adjust', '--methods', 'bh', small, '-q'], bigStdin)).toBe(false);
    expect(looksParted(['adjust', '-'], bigStdin)).toBe(true);
    // An option's value that names no file leaves standard input in.
    expect(looksParted(['adjust', '--p-column', 'p'], bigStdin)).toBe(true);
    // Nor is an output file read, nor standard output ("-" as the value of -o) a table.
    expect(looksParted(['adjust', '-o', small], bigStdin)).toBe(true);
    expect(looksParted(['adjust', small, '-o', '-'], bigStdin)).toBe(false);
    // An option's value is not a table, even when a file of that name exists.
    expect(looksParted(['adjust', '--p-column', small], bigStdin)).toBe(true);
    expect(looksParted(['inspect', '--bins', small, '-'], bigStdin)).toBe(true);
  });

  it('knows every option of adjust and inspect that takes a value (VALUE_OPTIONS), and no other', () => {
    const taking = new Set<string>();
    const flags = new Set<string>();
    for (const command of [adjustCommand(), inspectCommand()]) {
      for (const option of command.options) {
        const names = [option.short, option.long].filter((name): name is string => name !== undefined);
        for (const name of names) (option.required || option.optional ? taking : flags).add(name);
      }
    }
    expect([...VALUE_OPTIONS].sort()).toEqual([...taking].sort());
    expect([...flags].filter((flag) => VALUE_OPTIONS.has(flag))).toEqual([]);
  });
});

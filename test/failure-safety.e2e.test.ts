// Failing safely, through the built CLI on a large generated table: a failure
// after part of the table went to standard output says so and exits non-zero;
// -o FILE is never half-written and an existing one never changed; an
// interrupt leaves no temporary files. The failure mid-way is made by cutting
// the input file short while famwise writes it out (its second pass).
import { type ChildProcess, spawn, spawnSync } from 'node:child_process';
import { closeSync, existsSync, openSync, readFileSync, readdirSync, statSync, truncateSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { CLI } from './helpers/cli.js';
import { removeTemporaryFolders, temporaryFolder } from './helpers/temporary-folder.js';

afterAll(removeTemporaryFolders);

const ROWS = 400_000;

/** About 25 MB: large enough that famwise is still writing when the test acts. Made once, copied for each test. */
const LARGE = (() => {
  const lines = ['id,p,note'];
  for (let i = 0; i < ROWS; i++) lines.push(`r${i},${(i % 997) / 997},a note to make the row longer than a few bytes`);
  return Buffer.from(`${lines.join('\n')}\n`);
})();

/**
 * Where the input is cut: after the line that ends just before the middle,
 * where the two threads of a large table (io/parts.ts) split it. The cut
 * goes unseen only if the second thread has read all of its part and the
 * first all of its own, the second pass almost done, whereas a cut at 75%
 * went unseen whenever the second thread had passed it (under a loaded
 * machine, the table then came out whole and right, with status 0).
 */
const CUT = LARGE.lastIndexOf('\n', Math.floor(LARGE.length / 2) - 1) + 1;

/** A folder holding large.csv; famwise runs there, so messages name large.csv. */
function folderWithLargeTable(): { folder: string; input: string } {
  const folder = temporaryFolder('famwise-safety-');
  const input = join(folder, 'large.csv');
  writeFileSync(input, LARGE);
  return { folder, input };
}

interface Ended {
  status: number | null;
  stdout: Buffer;
  stderr: string;
}

function start(args: string[], folder: string): { child: ChildProcess; ended: Promise<Ended> } {
  const child = spawn(process.execPath, [CLI, 'adjust', ...args], { cwd: folder, stdio: ['ignore', 'pipe', 'pipe'] });
  const stdout: Buffer[] = [];
  let stderr = '';
  child.stdout?.on('data', (chunk: Buffer) => stdout.push(chunk));
  child.stderr?.on('data', (chunk: Buffer) => {
    stderr += chunk.toString();
  });
  const ended = new Promise<Ended>((resolve) => {
    child.on('close', (status) => resolve({ status, stdout: Buffer.concat(stdout), stderr }));
  });
  return { child, ended };
}

/** Waits until famwise's temporary output file exists and has content (the second pass is under way). */
async function temporaryFileWritten(folder: string): Promise<string> {
  for (;;) {
    const temporary = readdirSync(folder).find((name) => name.startsWith('.famwise-'));
    if (temporary && statSync(join(folder, temporary), { throwIfNoEntry: false })?.size) return temporary;
    await new Promise((resolve) => setTimeout(resolve, 2));
  }
}

function leftovers(folder: string): string[] {
  return readdirSync(folder).filter((name) => name.startsWith('.famwise-'));
}

describe('failure part-way through the output', () => {
  it('says the table on standard output is incomplete, and exits non-zero', async () => {
    const { folder, input } = folderWithLargeTable();
    const { child, ended } = start(['large.csv', '-q'], folder);
    // Hold the pipe at the first bytes (famwise then waits for it to drain), cut the input, let it go on.
    child.stdout?.once('data', () => {
      child.stdout?.pause();
      truncateSync(input, CUT);
      child.stdout?.resume();
    });
    const run = await ended;
    expect(run.status).toBe(1);
    expect(run.stdout.length).toBeGreaterThan(0);
    expect(run.stderr).toMatch(/^famwise: large\.csv: changed while famwise was reading it \(400000 rows at first, \d+ now\); the table written to standard output is incomplete\n$/);
  });

  it('leaves -o FILE as it was, and no temporary file', async () => {
    const { folder, input } = folderWithLargeTable();
    const output = join(folder, 'adjusted.csv');
    writeFileSync(output, 'the previous result\n');
    const { ended } = start(['large.csv', '-q', '-o', output], folder);
    await temporaryFileWritten(folder);
    truncateSync(input, CUT);
    const run = await ended;
    expect(run.status).toBe(1);
    expect(run.stderr).toMatch(/^famwise: large\.csv: changed while famwise was reading it[^\n]*\n$/);
    expect(readFileSync(output, 'utf8')).toBe('the previous result\n');
    expect(leftovers(folder)).toEqual([]);
  });
});

describe('an interrupt while writing -o FILE', () => {
  it.each([
    ['SIGINT', 130],
    ['SIGTERM', 143],
    ['SIGHUP', 129],
  ] as const)('%s leaves no temporary file and no output file', async (signal, status) => {
    const { folder } = folderWithLargeTable();
    const output = join(folder, 'adjusted.csv');
    const { child, ended } = start(['large.csv', '-q', '-o', output], folder);
    await temporaryFileWritten(folder);
    child.kill(signal);
    const run = await ended;
    expect(run.status).toBe(status);
    expect(run.stderr).toBe(`famwise: stopped by ${signal} before finishing; no output file was changed\n`);
    expect(existsSync(output)).toBe(false);
    expect(leftovers(folder)).toEqual([]);
  });
});

describe('standard output sent into the input file', () => {
  it('is refused before anything is written (famwise adjust t.csv >> t.csv, or > t.csv, which the shell has already emptied)', () => {
    const folder = temporaryFolder('famwise-self-');
    const table = join(folder, 't.csv');
    writeFileSync(table, 'id,p\na,0.01\nb,0.2\n');
    for (const extra of [[], ['-o', '-'], ['-o', '/dev/stdout']]) {
      const stdout = openSync(table, 'a');
      const run = spawnSync(process.execPath, [CLI, 'adjust', 't.csv', '-q', ...extra], { cwd: folder, stdio: ['ignore', stdout, 'pipe'] });
      closeSync(stdout);
      expect(run.status).toBe(2);
      expect(run.stderr.toString()).toBe('famwise: t.csv: standard output goes into this same file, so famwise would be reading what it writes (with ">" the shell has already emptied it); write to another file, or replace it safely with -o t.csv\n');
      expect(readFileSync(table, 'utf8')).toBe('id,p\na,0.01\nb,0.2\n');
    }
  });
});

// Runs the built command line (npm test builds it first) as a user would.
import { spawnSync } from 'node:child_process';
import { fileURLToPath } from 'node:url';
import { expect } from 'vitest';

export const CLI = fileURLToPath(new URL('../../dist/cli/famwise.mjs', import.meta.url));

export interface Run {
  status: number | null;
  stdout: string;
  stderr: string;
  stdoutBytes: Buffer;
}

export function famwise(args: string[], input?: string | Buffer, cwd?: string): Run {
  const result = spawnSync(process.execPath, [CLI, ...args], {
    input: input ?? '',
    cwd,
    env: { ...process.env, NO_COLOR: '1' },
    maxBuffer: 1 << 28,
  });
  return {
    status: result.status,
    stdout: result.stdout.toString('utf8'),
    stderr: result.stderr.toString('utf8'),
    stdoutBytes: result.stdout,
  };
}

/** Runs famwise and checks that it refused: the status, a message on stderr, and nothing on stdout. */
export function expectRefusal(args: string[], input: string, status: number, message: RegExp): void {
  const run = famwise(args, input);
  expect(run.status).toBe(status);
  expect(run.stderr).toMatch(message);
  expect(run.stdout).toBe('');
}

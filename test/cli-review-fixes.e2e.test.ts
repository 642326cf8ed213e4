// Behaviour found wanting by review, run as a user would: values that could
// steer a terminal, plots that would mix into the table, unreadable files,
// and letter case in --tail.
import { spawnSync } from 'node:child_process';
import { chmodSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { XMLParser, XMLValidator } from 'fast-xml-parser';
import { afterAll, describe, expect, it } from 'vitest';
import { CLI, expectRefusal, famwise } from './helpers/cli.js';
import { removeTemporaryFolders, temporaryFolder } from './helpers/temporary-folder.js';

afterAll(removeTemporaryFolders);

const folder = temporaryFolder('famwise-review-');

describe('table values that are control characters', () => {
  const table = 'grp,p\n"a\x1b[31mRED",0.01\n"a\x1b[31mRED",0.5\n"b\u202eX",0.2\n';

  it('are shown as escapes in the summary and the aligned table, never raw', () => {
    const run = famwise(['adjust', '--family', 'grp', '--format', 'table'], table);
    expect(run.status).toBe(0);
    expect(run.stderr).toContain('grp=a\\x1b[31mRED');
    expect(run.stderr).toContain('grp=b\\u{202e}X');
    expect(run.stdout).toContain('a\\x1b[31mRED');
    expect(`${run.stdout}${run.stderr}`).not.toMatch(/[\x1b\u202e]/);
  });

  it('leave the SVG plots well-formed', () => {
    const plot = join(folder, 'families.svg');
    expect(famwise(['adjust', '--family', 'grp', '--plot', plot, '-q', '-o', '/dev/null'], table).status).toBe(0);
    const svg = readFileSync(plot, 'utf8');
    expect(XMLValidator.validate(svg)).toBe(true);
    expect(new XMLParser().parse(svg)).toHaveProperty('svg');
  });
});

describe('--plot', () => {
  it('refuses standard output when it carries the table', () => {
    expectRefusal(['adjust', '--plot', '-'], 'p\n0.1\n', 2, /--plot -: standard output already carries the table; give the plot a file name/);
    expectRefusal(['adjust', '--plot', '/dev/stdout'], 'p\n0.1\n', 2, /--plot \/dev\/stdout: standard output already carries the table/);
  });
});

describe('an input file that cannot be read', () => {
  // Root reads any file, so this runs as nobody, where nobody can read the build (true for clones
  // under /tmp or /work; a clone under /root is not readable by nobody, and there it does not run).
  const nobody = { uid: 65534, gid: 65534 };
  const nobodyCanRun = process.getuid?.() !== 0 || spawnSync(process.execPath, ['-e', `require('fs').accessSync(${JSON.stringify(CLI)})`], nobody).status === 0;

  it.runIf(nobodyCanRun)('is a usage error that says so, not a system error', () => {
    const path = join(folder, 'unreadable.csv');
    writeFileSync(path, 'p\n0.1\n');
    chmodSync(path, 0o000);
    chmodSync(folder, 0o755);
    const run = spawnSync(process.execPath, [CLI, 'adjust', path], { encoding: 'utf8', ...(process.getuid?.() === 0 ? nobody : {}) });
    expect(run.status).toBe(2);
    expect(run.stderr).toBe(`famwise: ${path}: is not readable (permission denied)\n`);
  });
});

describe('--tail', () => {
  it('is read in any letter case', () => {
    const upper = famwise(['adjust', '--statistic', 'z', '--tail', 'Upper', '--format', 'csv', '-q'], 'z\n1.644854\n');
    expect(upper.status).toBe(0);
    expect(Number(upper.stdout.split('\n')[1]?.split(',')[1])).toBeCloseTo(0.05, 6);
  });
});

describe('inspect --plot', () => {
  it('refuses standard output, which carries the report', () => {
    expectRefusal(['inspect', '--plot', '-'], 'p\n0.1\n', 2, /--plot -: standard output carries the report; give the plot a file name/);
  });
});

// Output files: all or nothing, and nothing left behind.
import { chmodSync, lstatSync, readFileSync, readdirSync, statSync, symlinkSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { openOutput, removeUnfinishedFiles, routeOutput } from '../src/io/atomic-file.js';
import { removeTemporaryFolders, temporaryFolder } from './helpers/temporary-folder.js';

afterAll(removeTemporaryFolders);

describe('openOutput', () => {
  it('shows nothing at the target until commit, then the whole content', async () => {
    const folder = temporaryFolder('famwise-atomic-');
    const target = join(folder, 'out.csv');
    const file = openOutput(target);
    file.stream.write('a,b\n');
    expect(readdirSync(folder).some((name) => name === 'out.csv')).toBe(false);
    await file.finish();
    expect(readdirSync(folder).some((name) => name === 'out.csv')).toBe(false);
    file.install();
    expect(readFileSync(target, 'utf8')).toBe('a,b\n');
    expect(readdirSync(folder)).toEqual(['out.csv']);
  });

  it('leaves an existing file as it was on abort, and removes the temporary file', () => {
    const folder = temporaryFolder('famwise-atomic-');
    const target = join(folder, 'out.csv');
    writeFileSync(target, 'old\n');
    const file = openOutput(target);
    file.stream.write('new\n');
    file.abort();
    file.abort();
    expect(readFileSync(target, 'utf8')).toBe('old\n');
    expect(readdirSync(folder)).toEqual(['out.csv']);
  });

  it('keeps the permissions of the file it replaces', async () => {
    const folder = temporaryFolder('famwise-atomic-');
    const target = join(folder, 'out.csv');
    writeFileSync(target, 'old\n');
    chmodSync(target, 0o600);
    const file = openOutput(target);
    file.stream.write('new\n');
    await file.finish();
    file.install();
    expect(statSync(target).mode & 0o777).toBe(0o600);
  });

  it('creates the file a dangling symbolic link points to, and keeps the link', async () => {
    const folder = temporaryFolder('famwise-atomic-');
    symlinkSync('made.csv', join(folder, 'link.csv'));
    const file = openOutput(join(folder, 'link.csv'));
    file.stream.write('x\n');
    await file.finish();
    file.install();
    expect(lstatSync(join(folder, 'link.csv')).isSymbolicLink()).toBe(true);
    expect(readFileSync(join(folder, 'made.csv'), 'utf8')).toBe('x\n');
  });

  it('routes - to standard output, devices directly, and regular files anywhere through a rename', () => {
    expect(routeOutput('-').kind).toBe('stdout');
    expect(routeOutput('/dev/null').kind).toBe('direct');
    expect(routeOutput(join(tmpdir(), 'new.csv')).kind).toBe('replace');
  });

  it('removes every unfinished temporary file on an interrupt', () => {
    const folder = temporaryFolder('famwise-atomic-');
    openOutput(join(folder, 'a.csv'));
    openOutput(join(folder, 'b.json'));
    expect(readdirSync(folder)).toHaveLength(2);
    removeUnfinishedFiles();
    expect(readdirSync(folder)).toEqual([]);
  });
});

describe('temporaryNamePart', () => {
  it('gives the process and 48 random bits, different on each call', async () => {
    const { temporaryNamePart } = await import('../src/io/temporary-name.js');
    const parts = Array.from({ length: 2000 }, () => temporaryNamePart());
    for (const part of parts) expect(part).toMatch(new RegExp(`^${process.pid}-[0-9a-f]{12}$`));
    expect(new Set(parts).size).toBe(parts.length);
  });
});

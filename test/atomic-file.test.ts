// Output files: all or nothing, and nothing left behind.
import { chmodSync, mkdtempSync, readFileSync, readdirSync, statSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { createAtomicFile, removeUnfinishedFiles } from '../src/io/atomic-file.js';

describe('createAtomicFile', () => {
  it('shows nothing at the target until commit, then the whole content', async () => {
    const folder = mkdtempSync(join(tmpdir(), 'famwise-atomic-'));
    const target = join(folder, 'out.csv');
    const file = createAtomicFile(target);
    file.stream.write('a,b\n');
    expect(readdirSync(folder).some((name) => name === 'out.csv')).toBe(false);
    await file.commit();
    expect(readFileSync(target, 'utf8')).toBe('a,b\n');
    expect(readdirSync(folder)).toEqual(['out.csv']);
  });

  it('leaves an existing file as it was on abort, and removes the temporary file', () => {
    const folder = mkdtempSync(join(tmpdir(), 'famwise-atomic-'));
    const target = join(folder, 'out.csv');
    writeFileSync(target, 'old\n');
    const file = createAtomicFile(target);
    file.stream.write('new\n');
    file.abort();
    file.abort();
    expect(readFileSync(target, 'utf8')).toBe('old\n');
    expect(readdirSync(folder)).toEqual(['out.csv']);
  });

  it('keeps the permissions of the file it replaces', async () => {
    const folder = mkdtempSync(join(tmpdir(), 'famwise-atomic-'));
    const target = join(folder, 'out.csv');
    writeFileSync(target, 'old\n');
    chmodSync(target, 0o600);
    const file = createAtomicFile(target);
    file.stream.write('new\n');
    await file.commit();
    expect(statSync(target).mode & 0o777).toBe(0o600);
  });

  it('removes every unfinished temporary file on an interrupt', () => {
    const folder = mkdtempSync(join(tmpdir(), 'famwise-atomic-'));
    createAtomicFile(join(folder, 'a.csv'));
    createAtomicFile(join(folder, 'b.json'));
    expect(readdirSync(folder)).toHaveLength(2);
    removeUnfinishedFiles();
    expect(readdirSync(folder)).toEqual([]);
  });
});

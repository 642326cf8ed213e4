// The corpus of hostile, broken and odd tables: every case in
// fixtures/hostile-tables/manifest.json runs through the built CLI, and its
// exit status, its message and (when accepted) its output are checked. What
// each field of the manifest means is in its "about".
import { readFileSync, readdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { afterAll, describe, expect, it } from 'vitest';
import { famwise } from './helpers/cli.js';
import { LARGE_TABLES } from './helpers/large-tables.js';
import { removeTemporaryFolders, temporaryFolder } from './helpers/temporary-folder.js';

afterAll(removeTemporaryFolders);

interface CorpusCase {
  readonly name: string;
  readonly file: string;
  readonly generated?: boolean;
  readonly stdin?: boolean;
  readonly args: string[];
  readonly status: number;
  readonly stderr: string;
  readonly delimiter?: string;
  readonly appended?: string[][];
  readonly stdout?: string;
}

const corpus = fileURLToPath(new URL('../fixtures/hostile-tables/', import.meta.url));
const { cases } = JSON.parse(readFileSync(join(corpus, 'manifest.json'), 'utf8')) as { cases: CorpusCase[] };
const generatedFolder = temporaryFolder('famwise-corpus-');

/** The case's input, and the folder to run in (so that messages name the file as the manifest does). */
function inputOf(entry: CorpusCase): { bytes: Buffer; folder: string } {
  if (!entry.generated) return { bytes: readFileSync(join(corpus, entry.file)), folder: corpus };
  const make = LARGE_TABLES[entry.file];
  if (!make) throw new Error(`no generator for ${entry.file}`);
  const bytes = make();
  writeFileSync(join(generatedFolder, entry.file), bytes);
  return { bytes, folder: generatedFolder };
}

/**
 * The output with the added cells taken out: for each record in turn, the
 * delimiter and its cells, found just before a line ending or the end.
 */
function withoutAppended(output: Buffer, appended: readonly string[][], delimiter: string): Buffer {
  const kept: Buffer[] = [];
  let cursor = 0;
  const endsRecord = (at: number): boolean => at === output.length || output[at] === 0x0a || output[at] === 0x0d;
  for (const [record, cells] of appended.entries()) {
    const suffix = Buffer.from(delimiter + cells.join(delimiter));
    let at = output.indexOf(suffix, cursor);
    while (at >= 0 && !endsRecord(at + suffix.length)) at = output.indexOf(suffix, at + 1);
    if (at < 0) throw new Error(`record ${record + 1}: ${JSON.stringify(suffix.toString())} not found at the end of a record`);
    kept.push(output.subarray(cursor, at));
    cursor = at + suffix.length;
  }
  kept.push(output.subarray(cursor));
  return Buffer.concat(kept);
}

describe('the corpus', () => {
  it('holds at least 40 cases, and every file in its folder is used', () => {
    expect(cases.length).toBeGreaterThanOrEqual(40);
    const used = new Set(cases.filter((entry) => !entry.generated).map((entry) => entry.file));
    expect(readdirSync(corpus).filter((name) => name !== 'manifest.json' && !used.has(name))).toEqual([]);
  });
});

describe.each(cases.map((entry) => [entry.name, entry] as const))('%s', (_name, entry) => {
  it(`exits ${entry.status}${entry.stderr ? ` saying ${JSON.stringify(entry.stderr.slice(0, 60))}` : ', silently'}`, () => {
    const { bytes, folder } = inputOf(entry);
    const run = entry.stdin ? famwise(['adjust', ...entry.args], bytes, folder) : famwise(['adjust', entry.file, ...entry.args], undefined, folder);
    expect(run.status, run.stderr).toBe(entry.status);
    if (entry.stderr === '') expect(run.stderr).toBe('');
    else expect(run.stderr).toContain(entry.stderr);
    if (entry.status !== 0) {
      // Refused: one line, no stack trace, and not a byte of a table.
      expect(run.stderr).toMatch(/^famwise: [^\n]+\n$/);
      expect(run.stdoutBytes.length).toBe(0);
      return;
    }
    if (entry.stdout !== undefined) expect(run.stdout).toBe(entry.stdout);
    if (entry.appended !== undefined) {
      const original = withoutAppended(run.stdoutBytes, entry.appended, entry.delimiter ?? ',');
      expect(original.equals(bytes), 'every original byte comes back unchanged').toBe(true);
    }
  });
});

// A 200,000-row table through the built command line, from a file, from
// standard input, gzip in and gzip out, against the answer computed in memory
// by the library's own procedures (whose checks against R and statsmodels are
// in procedures.reference.test.ts). The table mixes quoted fields, CRLF and
// missing values into plain lines, so that the scanner's fast and general
// paths both carry it.
import { spawn } from 'node:child_process';
import { readFileSync, readdirSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { Readable } from 'node:stream';
import { gunzipSync, gzipSync } from 'node:zlib';
import { afterAll, describe, expect, it } from 'vitest';
import { adjustBenjaminiHochberg, adjustHolm } from '../src/index.js';
import { spilledSource } from '../src/io/spill.js';
import { CLI, famwise } from './helpers/cli.js';
import { seededRandom } from './helpers/random.js';
import { removeTemporaryFolders, temporaryFolder } from './helpers/temporary-folder.js';

const ROWS = 200_000;
const work = temporaryFolder('famwise-streaming-');
afterAll(removeTemporaryFolders);

interface Row {
  content: string;
  terminator: string;
  p: number;
  chrom: number;
}

function makeRows(): Row[] {
  const random = seededRandom(20261201);
  return Array.from({ length: ROWS }, (_, i) => {
    const chrom = 1 + (i % 22);
    const value = random() < 0.9 ? random() : random() ** 8;
    const u = random();
    const text = u < 0.01 ? 'NA' : u < 0.02 ? String(value * 1e-20) : u < 0.1 ? String(value) : value.toPrecision(6);
    const p = text === 'NA' ? NaN : Number(text);
    const id = i % 997 === 0 ? `"v${i}, quoted"` : i % 1999 === 0 ? `"v${i}\nsecond line"` : `v${i}`;
    return { content: `${id},${chrom},${((random() - 0.5) * 0.1).toFixed(5)},${text}`, terminator: i % 5 === 0 ? '\r\n' : '\n', p, chrom };
  });
}

const rows = makeRows();
const table = Buffer.from(`variant,chrom,effect,p_value\n${rows.map((row) => row.content + row.terminator).join('')}`);
const plainPath = join(work, 'scan.csv');
const gzipPath = join(work, 'scan.csv.gz');
writeFileSync(plainPath, table);
writeFileSync(gzipPath, gzipSync(table));

/** BH and Holm within the given grouping of rows, computed in memory, missing values left out. */
function expectedOutput(groupOf: (row: Row) => number): Buffer {
  const bh = new Float64Array(ROWS).fill(NaN);
  const holm = new Float64Array(ROWS).fill(NaN);
  const groups = new Map<number, number[]>();
  rows.forEach((row, i) => {
    if (Number.isNaN(row.p)) return;
    const members = groups.get(groupOf(row)) ?? [];
    members.push(i);
    groups.set(groupOf(row), members);
  });
  for (const members of groups.values()) {
    const p = Float64Array.from(members, (i) => rows[i]?.p ?? NaN);
    const byBh = adjustBenjaminiHochberg(p);
    const byHolm = adjustHolm(p);
    members.forEach((row, k) => {
      bh[row] = byBh[k] ?? NaN;
      holm[row] = byHolm[k] ?? NaN;
    });
  }
  const cells = (value: number): string => (Number.isNaN(value) ? ',' : `${value},${value <= 0.05}`);
  const lines = rows.map((row, i) => `${row.content},${cells(bh[i] ?? NaN)},${cells(holm[i] ?? NaN)}${row.terminator}`);
  return Buffer.from(`variant,chrom,effect,p_value,adj_bh,rej_bh,adj_holm,rej_holm\n${lines.join('')}`);
}

const oneFamily = expectedOutput(() => 0);
const METHODS = ['--methods', 'bh,holm', '--quiet'];

describe(`a ${ROWS.toLocaleString('en')}-row table streams through unchanged, with the in-memory answer appended`, () => {
  it('from a file', () => {
    const run = famwise(['adjust', plainPath, ...METHODS]);
    expect(run.stderr).toBe('');
    expect(run.stdoutBytes.equals(oneFamily)).toBe(true);
  });

  it('from standard input', () => {
    const run = famwise(['adjust', ...METHODS], table);
    expect(run.stderr).toBe('');
    expect(run.stdoutBytes.equals(oneFamily)).toBe(true);
  });

  it('from a gzip file, recognised by its content, and within families', () => {
    const renamed = join(work, 'scan-without-suffix');
    writeFileSync(renamed, gzipSync(table));
    expect(famwise(['adjust', renamed, ...METHODS]).stdoutBytes.equals(oneFamily)).toBe(true);
    const byChromosome = famwise(['adjust', gzipPath, '--family', 'chrom', ...METHODS]);
    expect(byChromosome.stderr).toBe('');
    expect(byChromosome.stdoutBytes.equals(expectedOutput((row) => row.chrom))).toBe(true);
  });

  it('from gzip made of several members, as bgzip writes it', () => {
    const half = table.indexOf('\n', table.length / 2) + 1;
    const members = Buffer.concat([gzipSync(table.subarray(0, half)), gzipSync(table.subarray(half))]);
    const run = famwise(['adjust', ...METHODS], members);
    expect(run.stderr).toBe('');
    expect(run.stdoutBytes.equals(oneFamily)).toBe(true);
  });

  it('from gzip on standard input', () => {
    const run = famwise(['adjust', ...METHODS], gzipSync(table));
    expect(run.stderr).toBe('');
    expect(run.stdoutBytes.equals(oneFamily)).toBe(true);
  });

  it('into a gzip file when the output name ends in .gz', () => {
    const output = join(work, 'adjusted.csv.gz');
    const run = famwise(['adjust', plainPath, ...METHODS, '-o', output]);
    expect(run.status).toBe(0);
    expect(gunzipSync(readFileSync(output)).equals(oneFamily)).toBe(true);
    expect(readdirSync(work).filter((name) => name.endsWith('.tmp'))).toEqual([]);
  });

  for (const [what, args, input] of [
    ['a plain file', [plainPath], undefined],
    ['a gzip file', [gzipPath], undefined],
    ['gzip on standard input', [], gzipSync(table)],
  ] as const) {
    it(`ends quietly with status 0 when the reader stops early, from ${what}`, async () => {
      const child = spawn(process.execPath, [CLI, 'adjust', ...args, '--methods', 'bh,holm'], { stdio: ['pipe', 'pipe', 'pipe'] });
      let stderr = '';
      child.stderr.on('data', (chunk: Buffer) => (stderr += chunk.toString()));
      if (input) Readable.from([input]).pipe(child.stdin);
      else child.stdin.end();
      // Read the first block, then hang up, as head does.
      const first = await new Promise<string>((resolve) => child.stdout.once('data', (chunk: Buffer) => resolve(chunk.toString())));
      child.stdout.destroy();
      const status = await new Promise<number | null>((resolve) => child.on('close', resolve));
      expect(first.startsWith('variant,chrom,effect,p_value,adj_bh,rej_bh,adj_holm,rej_holm\n')).toBe(true);
      expect(status).toBe(0);
      expect(stderr).toMatch(new RegExp(`\\(all rows\\)\\s+bh\\s+${rows.filter((row) => !Number.isNaN(row.p)).length}\\s`));
      expect(stderr).not.toMatch(/EPIPE|\n\s+at /);
    });
  }
});

describe('standard input past the in-memory limit', () => {
  it('is written to a temporary file that is already unlinked, and reads back the same twice', async () => {
    const before = readdirSync(tmpdir()).filter((name) => name.endsWith('.spill'));
    const pieces = Array.from({ length: 64 }, (_, k) => table.subarray((k * table.length) / 64, ((k + 1) * table.length) / 64));
    const source = await spilledSource(Readable.from(pieces), '<stdin>', 1 << 16);
    expect(source.size).toBe(table.length);
    expect(readdirSync(tmpdir()).filter((name) => name.endsWith('.spill'))).toEqual(before);
    for (let pass = 0; pass < 2; pass++) {
      const read: Buffer[] = [];
      for await (const chunk of source.chunks()) read.push(chunk);
      expect(Buffer.concat(read).equals(table)).toBe(true);
    }
  });

  it('keeps up to 32 MB in memory when no temporary file can be made, and says what to do past that', async () => {
    const before = process.env.TMPDIR;
    process.env.TMPDIR = join(tmpdir(), `famwise-no-such-folder-${process.pid}`);
    try {
      const pieces = Array.from({ length: 64 }, (_, k) => table.subarray((k * table.length) / 64, ((k + 1) * table.length) / 64));
      expect(table.length).toBeGreaterThan(1 << 16);
      const told: number[] = [];
      const source = await spilledSource(Readable.from(pieces), '<stdin>', 1 << 16, (_head, size) => told.push(size));
      expect(told).toEqual([]);
      expect(source.descriptor).toBeUndefined();
      const read: Buffer[] = [];
      for await (const chunk of source.chunks()) read.push(chunk);
      expect(Buffer.concat(read).equals(table)).toBe(true);
      const large = Array.from({ length: 33 }, () => Buffer.alloc(1 << 20, 0x61));
      await expect(spilledSource(Readable.from(large), '<stdin>', 1 << 16)).rejects.toThrow(/^<stdin>: more than 32 MB came in, and there is no temporary file to keep them in \(ENOENT.*\); set TMPDIR to a folder with room for the whole input$/);
    } finally {
      if (before === undefined) delete process.env.TMPDIR;
      else process.env.TMPDIR = before;
    }
  });

  it('tells once, with the first bytes, when the input goes to a file, so that a worker can start meanwhile; not when it stays in memory', async () => {
    const pieces = Array.from({ length: 64 }, (_, k) => table.subarray((k * table.length) / 64, ((k + 1) * table.length) / 64));
    const told: [Buffer, number][] = [];
    await spilledSource(Readable.from(pieces), '<stdin>', 1 << 16, (head, size) => told.push([head, size]));
    expect(told).toHaveLength(1);
    expect(table.subarray(0, told[0]?.[0].length).equals(told[0]?.[0] as Buffer)).toBe(true);
    expect(told[0]?.[1]).toBeGreaterThanOrEqual(1 << 16);
    expect(told[0]?.[1]).toBeLessThan(table.length);
    await spilledSource(Readable.from(pieces), '<stdin>', table.length + 1, (head, size) => told.push([head, size]));
    expect(told).toHaveLength(1);
  });
});

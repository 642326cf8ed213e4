// Both passes done in two parts by two threads (io/parts.ts: the second half
// read and written by a worker) give the very bytes and messages of one
// thread, on tables whose middle is awkward: a quoted field with line breaks
// across it, blank lines, CRLF, a byte-order-mark character opening the
// record where the parts meet, no line break at the end, families first seen
// in the second half, weights, decimal commas, statistics, replaced columns,
// other output delimiters, refused rows and remarks in the second half, and
// standard input spilled to a temporary file. Each table is run with the
// parts forced (FAMWISE_PARALLEL_MIN_BYTES=0) and with one thread, through
// the built command line.
import { spawnSync } from 'node:child_process';
import { appendFileSync, closeSync, openSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { gzipSync } from 'node:zlib';
import { afterAll, describe, expect, it, vi } from 'vitest';
import { bufferSource, fileSource, rangeSource } from '../dist/io/source.js';
import { inParts } from '../dist/io/parts.js';
import { readTable } from '../dist/io/read-table.js';
import { type Sorted, mergeSorted, sortAscending } from '../dist/procedures/sorting.js';
import { CLI } from './helpers/cli.js';
import { seededRandom } from './helpers/random.js';
import { removeTemporaryFolders, temporaryFolder } from './helpers/temporary-folder.js';

const work = temporaryFolder('famwise-parts-');
afterAll(removeTemporaryFolders);

const ONE_THREAD = String(Number.MAX_SAFE_INTEGER);

function run(args: string[], minimum: string, input?: Buffer): { status: number | null; stdout: Buffer; stderr: string } {
  const result = spawnSync(process.execPath, [CLI, ...args], {
    input: input ?? '',
    cwd: work,
    env: { ...process.env, FAMWISE_PARALLEL_MIN_BYTES: minimum },
    maxBuffer: 1 << 28,
  });
  return { status: result.status, stdout: result.stdout, stderr: result.stderr.toString() };
}

/** Runs both ways and expects the same status, bytes and messages; returns the output. */
function sameBothWays(args: string[], input?: Buffer): Buffer {
  const parts = run(args, '0', input);
  const single = run(args, ONE_THREAD, input);
  expect(parts.stderr).toBe(single.stderr);
  expect(parts.status).toBe(single.status);
  expect(parts.stdout.equals(single.stdout)).toBe(true);
  return parts.stdout;
}

/** A table of `rows` rows whose lines come from `line`; the middle row is `middle`. */
function table(header: string, rows: number, line: (i: number) => string, middle?: string): string {
  const lines = Array.from({ length: rows }, (_, i) => (middle !== undefined && i === rows >> 1 ? middle : line(i)));
  return header + lines.join('');
}

function write(name: string, text: string | Buffer): string {
  writeFileSync(join(work, name), text);
  return name;
}

const random = seededRandom(7);
const p = (): string => (random() < 0.1 ? (random() ** 6).toPrecision(3) : random().toPrecision(6));

describe('writing in two parts', () => {
  it('is taken for a file, not for bytes in memory, and only past the size set', () => {
    const path = join(work, write('plain.csv', table('id,p\n', 2000, (i) => `r${i},${p()}\n`)));
    const before = process.env.FAMWISE_PARALLEL_MIN_BYTES;
    try {
      process.env.FAMWISE_PARALLEL_MIN_BYTES = '0';
      expect(inParts(fileSource(path))).toBe(true);
      expect(inParts(bufferSource(Buffer.from('p\n0.1\n'), 'memory'))).toBe(false);
      process.env.FAMWISE_PARALLEL_MIN_BYTES = ONE_THREAD;
      expect(inParts(fileSource(path))).toBe(false);
    } finally {
      if (before === undefined) delete process.env.FAMWISE_PARALLEL_MIN_BYTES;
      else process.env.FAMWISE_PARALLEL_MIN_BYTES = before;
    }
  });

  it('gives the bytes of one pass on a plain table with families and CRLF', () => {
    const name = write('crlf.csv', table('gene,chrom,p_value\r\n', 5000, (i) => `g${i},${1 + (i % 5)},${p()}\r\n`));
    const out = sameBothWays(['adjust', name, '--family', 'chrom', '--methods', 'bh,holm,hommel', '-q']);
    expect(out.toString().split('\r\n')).toHaveLength(5002);
  });

  it('gives the values of one thread when each thread sorts its own part, with every method, ties across the parts and missing p-values', () => {
    const methods = ['--methods', 'bonferroni,holm,sidak,holm-sidak,hochberg,hommel,bh,by,storey,bky', '-q'];
    // Few distinct values: many ties, on both sides of the middle.
    const tied = write('tied.csv', table('id,p\n', 6000, (i) => `r${i},${((i * 37) % 50) / 400}\n`));
    const out = sameBothWays(['adjust', tied, ...methods]);
    expect(out.toString().split('\n')).toHaveLength(6002);
    // A missing p-value in either part: the table is then sorted once, after reading.
    for (const missingAt of [10, 4500]) {
      const name = write(`missing-${missingAt}.csv`, table('id,p\n', 6000, (i) => `r${i},${i === missingAt ? 'NA' : p()}\n`));
      sameBothWays(['adjust', name, ...methods]);
    }
  });

  it('gives the values and the summary of one thread when the two threads adjust their own parts (step procedures only), with --tests too', () => {
    const steps = ['--methods', 'bonferroni,holm,sidak,holm-sidak,hochberg,bh,by'];
    // Ties across the middle, and values small enough to be rejected in both parts.
    const tied = write('steps.csv', table('id,p\n', 6000, (i) => `r${i},${i % 7 === 0 ? ((i * 13) % 97) / 1e7 : ((i * 37) % 50) / 400}\n`));
    // The summary on standard error (rejections and thresholds by method) is compared too.
    const summary = run(['adjust', tied, ...steps, '-o', '-'], '0').stderr;
    // Rows rejected in both parts: the counts and thresholds add up from the two threads.
    expect(summary).toMatch(/ bh +6000 +0 +6000 +[1-9]\d* +0\.\d/);
    expect(sameBothWays(['adjust', tied, ...steps]).toString().split('\n')).toHaveLength(6002);
    sameBothWays(['adjust', tied, ...steps, '--tests', '9000', '-q']);
  });

  it('sorts the p-values in the two threads only for a reader that asks (adjust), and then as one sort of the whole would', async () => {
    const path = join(work, write('sorted.csv', table('id,p\n', 6000, (i) => `r${i},${((i * 37) % 50) / 400}\n`)));
    const before = process.env.FAMWISE_PARALLEL_MIN_BYTES;
    try {
      process.env.FAMWISE_PARALLEL_MIN_BYTES = '0';
      const asked = await readTable(fileSource(path), { sortP: true });
      const parts = asked.sortedParts;
      expect(parts).toBeDefined();
      // Each part is its rows' sort, split where the table is (the merge of the two, the whole's).
      const split = asked.split?.row as number;
      expect(parts?.first.order.length).toBe(split);
      const merged = mergeSorted(parts?.first as Sorted, parts?.second as Sorted);
      const whole = sortAscending(asked.p);
      expect(Array.from(merged.order)).toEqual(Array.from(whole.order));
      expect(Array.from(merged.sorted)).toEqual(Array.from(whole.sorted));
      expect((await readTable(fileSource(path), {})).sortedParts).toBeUndefined();
    } finally {
      if (before === undefined) delete process.env.FAMWISE_PARALLEL_MIN_BYTES;
      else process.env.FAMWISE_PARALLEL_MIN_BYTES = before;
    }
  });

  it('keeps a quoted field with line breaks at the middle, blank lines, and no final line break', () => {
    const text = table('id,note,p\n', 4001, (i) => `r${i},"n ${i}",${p()}\n${i % 7 === 0 ? '\n\r\n' : ''}`, `mid,"line one\n\nline three, with ""quotes""",0.001\n\n\n`);
    const name = write('quoted.csv', text.slice(0, -1));
    const out = sameBothWays(['adjust', name, '-q']);
    expect(out.toString()).toContain('mid,"line one\n\nline three, with ""quotes""",0.001,');
    expect(out.toString().endsWith('\n')).toBe(false);
  });

  it('keeps a byte-order-mark character that opens the record where the parts meet', () => {
    const rows = Array.from({ length: 3000 }, (_, i) => `r${i},${p()}\n`);
    const head = 'id,p\n';
    // Every record from the middle on starts with U+FEFF, so the one where the parts meet does.
    const text = head + rows.map((row, i) => (i >= 1400 ? `\ufeff${row}` : row)).join('');
    const out = sameBothWays(['adjust', write('bom.csv', `\ufeff${text}`), '-q']);
    expect(out.subarray(0, 3).equals(Buffer.from([0xef, 0xbb, 0xbf]))).toBe(true);
    expect(out.toString().split('\n').filter((line) => line.startsWith('\ufeffr')).length).toBe(1600);
  });

  it('gives the bytes of one pass when converting the delimiter, replacing columns, or without a header', () => {
    const name = write('replace.tsv', table('id\tp\tadj_bh\n', 3000, (i) => `r${i}\t${p().replace('.', ',')}\told\n`));
    sameBothWays(['adjust', name, '--replace', '-q']);
    sameBothWays(['adjust', name, '--replace', '--format', 'csv', '-q']);
    const bare = write('bare.csv', table('', 3000, (i) => `${i},${p()}\n`));
    sameBothWays(['adjust', bare, '--no-header', '--p-column', '2', '--methods', 'by,storey', '-q']);
  });

  it('gives the bytes of one pass from standard input spilled to a temporary file', () => {
    // Past the 8 MB kept in memory, standard input goes to a file that can be read by position.
    const input = Buffer.from(table('id,chrom,p\n', 400_000, (i) => `variant${i},${1 + (i % 22)},${p()}\n`));
    expect(input.length).toBeGreaterThan(8 << 20);
    const out = sameBothWays(['adjust', '--family', 'chrom', '-q'], input);
    expect(out.length).toBeGreaterThan(input.length);
  });

  it('reads standard input redirected from a file by position, and leaves it read to its end', () => {
    const name = write('redirected.csv', table('id,p\n', 8000, (i) => `r${i},${p()}\n`));
    const fromFile = run(['adjust', name, '-q'], '0');
    const redirected = (minimum: string): { status: number | null; stdout: Buffer; stderr: string } => {
      const fd = openSync(join(work, name), 'r');
      try {
        const result = spawnSync(process.execPath, [CLI, 'adjust', '-q'], { stdio: [fd, 'pipe', 'pipe'], cwd: work, env: { ...process.env, FAMWISE_PARALLEL_MIN_BYTES: minimum } });
        return { status: result.status, stdout: result.stdout, stderr: result.stderr.toString() };
      } finally {
        closeSync(fd);
      }
    };
    for (const minimum of ['0', ONE_THREAD]) {
      const result = redirected(minimum);
      expect(result.stderr).toBe('');
      expect(result.status).toBe(0);
      expect(result.stdout.equals(fromFile.stdout)).toBe(true);
    }
    // As after any command that reads its input through, the next command sharing it finds it at the end;
    // one sharing a file the shell has read part of gets the rest (read as it comes, from where it stood).
    const shell = (script: string): string => spawnSync('sh', ['-c', script], { cwd: work, env: { ...process.env, FAMWISE_PARALLEL_MIN_BYTES: '0' } }).stdout.toString();
    expect(shell(`{ "${process.execPath}" "${CLI}" adjust -q > /dev/null; wc -c; } < ${name}`).trim()).toBe('0');
    const rest = shell(`{ head -n 1 > /dev/null; "${process.execPath}" "${CLI}" adjust --no-header --p-column 2 -q; } < ${name}`);
    expect(rest.split('\n')[0]).toMatch(/^r0,/);
    expect(rest.split('\n')).toHaveLength(8001);
    // Also when famwise stops early with an error, before a large input could be read through in the background.
    const large = write('large.csv', `id,p\n${'r,0.5\n'.repeat(6_000_000)}`);
    expect(shell(`{ "${process.execPath}" "${CLI}" adjust -q --p-column nosuch 2> /dev/null; wc -c; } < ${large}`).trim()).toBe('0');
    // Where tail (which moves the offset without reading) cannot be run, by reading it through.
    const noTail = `PATH=${join(work, 'no-such-folder')}`;
    expect(shell(`{ ${noTail} "${process.execPath}" "${CLI}" adjust -q > /dev/null; wc -c; } < ${name}`).trim()).toBe('0');
    expect(shell(`{ ${noTail} "${process.execPath}" "${CLI}" adjust -q --p-column nosuch 2> /dev/null; wc -c; } < ${large}`).trim()).toBe('0');
  });

  it('reads standard input redirected from a file as it was at the start, when the output is appended to that file', () => {
    // Larger than a read (4 MB), so that output is written while input is still to be read.
    const original = readFileSync(join(work, write('grows.csv', table('id,p\n', 500_000, (i) => `r${i},${p()}\n`))));
    const expected = Buffer.concat([original, run(['adjust', 'grows.csv', '-q'], '0').stdout]);
    for (const minimum of ['0', ONE_THREAD]) {
      // Through the same descriptor (>>), and through another process (tee -a).
      for (const append of ['>> appended.csv', '| tee -a appended.csv > /dev/null']) {
        writeFileSync(join(work, 'appended.csv'), original);
        const result = spawnSync('sh', ['-c', `ulimit -f 100000; "${process.execPath}" "${CLI}" adjust -q < appended.csv ${append}`], { cwd: work, env: { ...process.env, FAMWISE_PARALLEL_MIN_BYTES: minimum } });
        expect(result.status).toBe(0);
        expect(readFileSync(join(work, 'appended.csv')).equals(expected)).toBe(true);
      }
    }
  });

  it('gives the summary of one thread with families first seen in the second half, and weights', () => {
    const name = write('families.csv', table('id,chrom,w,p\n', 6000, (i) => `r${i},${i < 3000 ? 1 + (i % 3) : 1 + (i % 7)},${1 + (i % 4)},${p()}\n`));
    const out = sameBothWays(['adjust', name, '--family', 'chrom', '--methods', 'bh,holm', '--weights', 'w']);
    expect(out.toString()).toContain('r5999,');
  });

  it('says what one thread says of refused rows and remarks in the second half, with their lines', () => {
    const refused = write('refused.csv', table('id,p\n', 4000, (i) => `r${i},${i === 3500 ? 'oops' : i === 3600 ? '1.5' : p()}\n`));
    const parts = run(['adjust', refused, '-q'], '0');
    expect(parts.status).toBe(1);
    expect(parts.stderr).toMatch(/refused\.csv:3502: .*"oops"/);
    sameBothWays(['adjust', refused, '-q']);
    sameBothWays(['adjust', write('remarks.csv', table('id,p\n', 4000, (i) => `r${i},${i === 3900 ? '1e-400' : p()}\n`))]);
    sameBothWays(['adjust', write('commas.tsv', table('id\tp\n', 4000, (i) => `r${i}\t${i > 3000 ? p().replace('.', ',') : p()}\n`)), '-q']);
  });

  it('reads on in one thread when a quoted field spans the middle of the input', () => {
    const long = Array.from({ length: 3000 }, (_, i) => `a line, ${i}, with "" quotes`).join('\n');
    const text = table('id,note,p\n', 2001, (i) => `r${i},plain,${p()}\n`, `long,"${long}",0.002\n`);
    const out = sameBothWays(['adjust', write('spanning.csv', text), '-q']);
    expect(out.toString().split('\n').length).toBe(text.split('\n').length);
  });

  it('splits the writing at the right byte when this thread read the whole table in many chunks', () => {
    // A value to remark on in the second half makes this thread read it too (the worker's reading is
    // set aside), so the middle record is found by offsets kept across chunks of 4 MB.
    const text = table('id,chrom,p\n', 400_000, (i) => `variant${i},${1 + (i % 22)},${i === 300_000 ? '1e-400' : p()}\n`);
    expect(text.length).toBeGreaterThan(2 * (4 << 20));
    sameBothWays(['adjust', write('chunks.csv', text), '--family', 'chrom']);
  });

  it('changes nothing when the worker started before the command loaded is not used (gzip is read in one thread; audit never in parts)', () => {
    const text = table('id,p\n', 3000, (i) => `r${i},${p()}\n`);
    const zipped = write('early.csv.gz', gzipSync(text));
    const started = Date.now();
    const out = sameBothWays(['adjust', zipped, '--methods', 'bh,holm', '-q']);
    // An idle worker does not hold the process open (the vitest timeout would catch a hang; this, a stall).
    expect(Date.now() - started).toBeLessThan(20_000);
    expect(out.toString().split('\n')).toHaveLength(3002);
    const plain = write('early.csv', text);
    sameBothWays(['adjust', plain, '--methods', 'bh', '--summary', 'early-summary.json', '-q']);
    sameBothWays(['inspect', plain, '--family', 'nonesuch']);
  });

  it('reports a full disk as a full disk, not as a write to a stream already destroyed, to a device or to standard output', () => {
    const name = write('full-disk.csv', table('id,p\n', 3000, (i) => `r${i},${p()}\n`));
    for (const args of [['adjust', name, '-q', '-o', '/dev/full'], ['adjust', name, '-q']]) {
      for (const minimum of ['0', ONE_THREAD]) {
        const stdout = args.includes('-o') ? 'pipe' : openSync('/dev/full', 'w');
        try {
          const result = spawnSync(process.execPath, [CLI, ...args], { cwd: work, env: { ...process.env, FAMWISE_PARALLEL_MIN_BYTES: minimum }, stdio: ['pipe', stdout, 'pipe'] });
          expect(result.status).toBe(1);
          expect(result.stderr.toString()).toMatch(/^famwise: ENOSPC: no space left on device/);
        } finally {
          if (typeof stdout === 'number') closeSync(stdout);
        }
      }
    }
  });

  it('writes in one thread when no temporary file can be made (TMPDIR missing)', () => {
    const name = write('no-temp.csv', table('id,p\n', 3000, (i) => `r${i},${p()}\n`));
    const args = [CLI, 'adjust', name, '-q'];
    const env = (minimum: string) => ({ ...process.env, FAMWISE_PARALLEL_MIN_BYTES: minimum, TMPDIR: join(work, 'no-such-folder') });
    const parts = spawnSync(process.execPath, args, { cwd: work, env: env('0') });
    const single = spawnSync(process.execPath, args, { cwd: work, env: env(ONE_THREAD) });
    expect(parts.stderr.toString()).toBe('');
    expect(parts.status).toBe(0);
    expect(parts.stdout.equals(single.stdout)).toBe(true);
  });

  it('reads the second part to where the file ends, not where it ended when it was opened', async () => {
    const path = join(work, write('grows.csv', 'id,p\nr1,0.5\n'));
    const fd = openSync(path, 'r');
    try {
      appendFileSync(path, 'r2,0.25\n');
      const chunks: Buffer[] = [];
      for await (const chunk of rangeSource('grows.csv', fd, 5, Infinity).chunks()) chunks.push(chunk);
      expect(Buffer.concat(chunks).toString()).toBe('r1,0.5\nr2,0.25\n');
    } finally {
      closeSync(fd);
    }
  });

  it('gives the p-values of one thread when they are computed from statistics', () => {
    const name = write('z.csv', table('id,z\n', 5000, (i) => `r${i},${((random() - 0.5) * 8).toFixed(4)}\n`));
    sameBothWays(['adjust', name, '--statistic', 'z', '--statistic-column', 'z', '-q']);
  });
});

// The worker writes its part straight into the output file (-o), where the
// first part's output will end, told ahead from the first part's adjusted
// values as they were made (io/parallel-write.ts, OutputInPlace).
describe('writing the second part in place', () => {
  /** Runs with -o both ways and expects the same status, messages and file. */
  function sameFileBothWays(args: string[], name: string): Buffer {
    const parts = run([...args, '-o', `${name}.parts.out`], '0');
    const single = run([...args, '-o', `${name}.single.out`], ONE_THREAD);
    expect(parts.stderr).toBe(single.stderr);
    expect(parts.status).toBe(single.status);
    const written = readFileSync(join(work, `${name}.parts.out`));
    expect(written.equals(readFileSync(join(work, `${name}.single.out`)))).toBe(true);
    return written;
  }

  // Numbers of every kind in the new cells: 1, 0, values String() writes (1e-300, 5e-7), 15 to 17 digits, p at alpha.
  const value = (i: number): string => (i % 97 === 0 ? '0' : i % 89 === 0 ? '1e-300' : i % 83 === 0 ? '5e-7' : i % 79 === 0 ? '0.05' : p());

  it('gives the file of one thread with a byte-order mark, CRLF, blank lines and quoted fields in the first part', () => {
    const text = '\ufeff' + table('id,"note, with comma",p\r\n', 5000, (i) => `r${i},"n ""${i}""",${value(i)}\r\n${i % 11 === 0 ? '\r\n' : ''}`);
    const out = sameFileBothWays(['adjust', write('in-place.csv', text), '--methods', 'bh,holm,bonferroni,by,sidak', '-q'], 'in-place');
    expect(out.toString().split('\r\n').filter((line) => line.startsWith('r')).length).toBe(5000);
  });

  it('gives the file of one thread without a header, with decimal commas and tabs, and with --tests', () => {
    sameFileBothWays(['adjust', write('no-header.csv', table('', 5000, (i) => `r${i},${value(i)}\n`)), '--no-header', '--p-column', '2', '-q'], 'no-header');
    sameFileBothWays(['adjust', write('commas.tsv', table('id\tp\n', 5000, (i) => `r${i}\t${value(i).replace('.', ',')}\n`)), '--methods', 'holm,hochberg', '-q'], 'commas');
    sameFileBothWays(['adjust', write('tests.csv', table('id,p\n', 5000, (i) => `r${i},${value(i)}\n`)), '--methods', 'bh', '--tests', '1000000', '-q'], 'tests');
  });

  it('tells the bytes of the first part exactly, and writes the whole file right when told wrong (the worker then written over)', async () => {
    const { adjustInTwoThreads } = await import('../dist/io/parallel-adjust.js');
    const { firstPartCellBytes, writeTableInParts } = await import('../dist/io/parallel-write.js');
    const { firstPartOutputBytes, writeTable } = await import('../dist/io/write-table.js');
    const { plannedColumns } = await import('../dist/io/column-plan.js');
    const { ByteSink } = await import('../dist/io/byte-sink.js');
    const { openOutput } = await import('../dist/io/atomic-file.js');
    const { METHODS } = await import('../dist/methods.js');
    const messy = join(work, write('told.csv', '\ufeff' + table('id,p\r\n', 4000, (i) => `r${i},${value(i)}\r\n${i % 13 === 0 ? '\n' : ''}`)));
    // Lines of 12 bytes, 4000 with the header: the middle of the input is the start of a record.
    const even = join(work, write('told-even.csv', table('names,p_val\n', 3999, (i) => `r${String(i).padStart(4, '0')},${(0.001 + (i % 997) / 1000).toFixed(3)}\n`)));
    expect(readFileSync(even).length).toBe(12 * 4000);
    const methods = METHODS.filter((method) => ['bh', 'holm', 'sidak'].includes(method.token));
    const before = process.env.FAMWISE_PARALLEL_MIN_BYTES;
    process.env.FAMWISE_PARALLEL_MIN_BYTES = '0';
    try {
      for (const path of [messy, even]) await toldRight(path);
    } finally {
      if (before === undefined) delete process.env.FAMWISE_PARALLEL_MIN_BYTES;
      else process.env.FAMWISE_PARALLEL_MIN_BYTES = before;
    }

    async function toldRight(path: string): Promise<void> {
      const written = async (output: string, into: (fd: number | undefined, sink: InstanceType<typeof ByteSink>) => Promise<void>): Promise<Buffer> => {
        const file = openOutput(join(work, output));
        const sink = new ByteSink(file.stream);
        await into(file.fd, sink);
        await file.finish();
        file.install();
        return readFileSync(join(work, output));
      };
      const table = await readTable(fileSource(path), { sortP: true, pColumn: '2' });
      const split = table.split as NonNullable<typeof table.split>;
      // Written in the parts it was read and adjusted in.
      expect(table.sortedParts?.first.order.length).toBe(split.row);
      const result = await adjustInTwoThreads(table.p, table.sortedParts as NonNullable<typeof table.sortedParts>, methods, 0.05, undefined, true);
      const plan = { alpha: 0.05, decimalComma: false, columns: methods.flatMap((method, k) => [{ name: `adj_${method.token}`, kind: 'number' as const, values: result?.adjusted[k] as Float64Array }, { name: `rej_${method.token}`, kind: 'decision' as const, values: result?.adjusted[k] as Float64Array }]) };
      const format = { delimiter: 0x2c };
      const cellBytes = firstPartCellBytes(plan, result?.adjusted ?? [], result?.firstPart) as number;
      // What one thread writes, and of that, the first part.
      expect(result?.firstPart?.rows).toBe(split.row);
      const whole = await written('told-whole.out', (_fd, sink) => writeTable(fileSource(path), table.shape, plannedColumns(plan), format, sink, table.p.length).then(() => {}));
      const first = await written('told-first.out', (_fd, sink) => writeTable(rangeSource('told.csv', openSync(path, 'r'), 0, split.offset), table.shape, plannedColumns(plan), format, sink, split.row, {}).then(() => {}));
      expect(firstPartOutputBytes(table.shape, plannedColumns(plan), format, split.offset, cellBytes)).toBe(first.length);
      for (const off of [0, 1, -1, 5000, -first.length + 10]) {
        const out = await written(`told-${off}.out`, async (fd, sink) => {
          await writeTableInParts(fileSource(path), table.shape, plan, format, sink, table.p.length, split, { fd: fd as number, firstRows: split.row, firstCellBytes: cellBytes + off });
        });
        expect({ off, length: out.length, same: out.equals(whole) }).toEqual({ off, length: whole.length, same: true });
      }
    }
  });

  it('gives the file of one thread when the middle of the input is the start of a record', () => {
    const name = write('even.csv', table('names,p_val\n', 3999, (i) => `r${String(i).padStart(4, '0')},${(0.001 + ((i * 7) % 997) / 1000).toFixed(3)}\n`));
    sameFileBothWays(['adjust', name, '--p-column', 'p_val', '--methods', 'bh,holm', '-q'], 'even');
  });
});

// A progress line (standard error a terminal) once hid the descriptor, so that every byte passed
// through the chunks it counts, and a large table at the terminal was read and written in one
// thread. Now each thread's scan counts into shared memory (InputSource.counts, PassTally).
describe('a progress line, with both passes in two parts', () => {
  it('counts the bytes and lines of both threads\' parts, which add up to the whole, in both passes', async () => {
    const { progressLine } = await import('../dist/cli/progress.js');
    const { writeTableInParts } = await import('../dist/io/parallel-write.js');
    const { writeTable } = await import('../dist/io/write-table.js');
    const { plannedColumns } = await import('../dist/io/column-plan.js');
    const { ByteSink } = await import('../dist/io/byte-sink.js');
    const { Writable } = await import('node:stream');
    const before = process.env.FAMWISE_PARALLEL_MIN_BYTES;
    process.env.FAMWISE_PARALLEL_MIN_BYTES = '0';
    try {
      await countedBoth(write('watched.csv', table('id,note,p\n', 6000, (i) => `r${i},n,${p()}\n${i % 9 === 0 ? '\n' : ''}`)), true);
      // A p-value to remark on in the second half (below the smallest double): the worker's reading
      // is not taken, and this thread reads on, and counts, the second half itself.
      await countedBoth(write('watched-remark.csv', table('id,note,p\n', 6000, (i) => `r${i},n,${i === 5000 ? '1e-400' : p()}\n`)), false);
    } finally {
      if (before === undefined) delete process.env.FAMWISE_PARALLEL_MIN_BYTES;
      else process.env.FAMWISE_PARALLEL_MIN_BYTES = before;
    }

    async function countedBoth(name: string, workerRead: boolean): Promise<void> {
      const path = join(work, name);
      const bytes = readFileSync(path);
      const lines = bytes.toString().split('\n').length - 1;
      const watched = progressLine(() => {}).watch(fileSource(path));
      const passes: (readonly [Float64Array, Float64Array])[] = [];
      const tally = watched.tally as NonNullable<typeof watched.tally>;
      const firstEnds: number[] = [];
      const source = {
        ...watched,
        tally: {
          begin: (firstEnd: number) => {
            firstEnds.push(firstEnd);
            return passes[passes.push(tally.begin(firstEnd)) - 1] as readonly [Float64Array, Float64Array];
          },
          copied: (done: number, of: number) => {
            copies.push([done, of]);
            tally.copied(done, of);
          },
          end: () => tally.end(),
        },
      };
      const copies: [number, number][] = [];
      const read = await readTable(source, { sortP: true });
      expect(read.split).toBeDefined();
      const plan = { alpha: 0.05, decimalComma: false, columns: [{ name: 'q', kind: 'number' as const, values: read.p }] };
      const collect = (): { sink: InstanceType<typeof ByteSink>; bytes: () => Buffer } => {
        const pieces: Buffer[] = [];
        const stream = new Writable({
          write(chunk, _encoding, done) {
            pieces.push(Buffer.from(chunk));
            done();
          },
        });
        return { sink: new ByteSink(stream), bytes: () => Buffer.concat(pieces) };
      };
      const inParts = collect();
      await writeTableInParts(source, read.shape, plan, { delimiter: 0x2c }, inParts.sink, read.p.length, read.split as NonNullable<typeof read.split>);
      await inParts.sink.flush(true);
      expect(passes).toHaveLength(2);
      // Both passes split the table where the first part ends.
      expect(firstEnds).toEqual([read.split?.offset, read.split?.offset]);
      for (const [pass, [first, second]] of passes.entries()) {
        expect(second[0]).toBeGreaterThan(0);
        if (pass === 0 && !workerRead) {
          // This thread read on through the second half (past where its part ends): its count alone is the table's.
          expect([first[0], first[1]]).toEqual([bytes.length, lines]);
          continue;
        }
        // Each thread counted its own part, and the two add up to the table.
        expect(first[0]).toBe(firstEnds[pass]);
        expect((first[0] as number) + (second[0] as number)).toBe(bytes.length);
        expect((first[1] as number) + (second[1] as number)).toBe(lines);
      }
      // The worker's part, written apart, was told as it was copied after this thread's, to its end.
      expect(copies.length).toBeGreaterThan(0);
      expect(copies.at(-1)?.[0]).toBe(copies.at(-1)?.[1]);
      expect(copies.every(([done, of], k) => of === copies[0]?.[1] && done > (copies[k - 1]?.[0] ?? 0))).toBe(true);
      // And the table written is one thread's.
      const oneThread = collect();
      await writeTable(fileSource(path), read.shape, plannedColumns(plan), { delimiter: 0x2c }, oneThread.sink, read.p.length);
      await oneThread.sink.flush(true);
      expect(inParts.bytes().equals(oneThread.bytes())).toBe(true);
    }
  });

  // util-linux's script(1) gives the command a terminal (Debian has it in every system: bsdutils is essential).
  it.runIf(process.platform === 'linux')('gives the file of a run without a terminal, at a terminal, with the summary on a clean line', () => {
    const name = write('at-terminal.csv', table('id,p\n', 20000, (i) => `r${i},${p()}\n`));
    const command = `'${process.execPath}' '${CLI}' adjust ${name} --methods bh,holm -o at-terminal.out`;
    const atTerminal = spawnSync('script', ['-qec', command, '/dev/null'], { cwd: work, encoding: 'utf8', env: { ...process.env, FAMWISE_PARALLEL_MIN_BYTES: '0', CI: '', TERM: 'xterm' } });
    expect(atTerminal.status).toBe(0);
    // The summary, and nothing of a progress line before it (a run shorter than a second draws none).
    expect(atTerminal.stdout).toMatch(/^family +method/);
    const single = run(['adjust', name, '--methods', 'bh,holm', '-o', 'no-terminal.out', '-q'], ONE_THREAD);
    expect(single.status).toBe(0);
    expect(readFileSync(join(work, 'at-terminal.out')).equals(readFileSync(join(work, 'no-terminal.out')))).toBe(true);
  });
});

describe('the worker, once the table is written', () => {
  it('is ended when it has no job (stopWorker), and a later job starts another', async () => {
    const { stopWorker } = await import('../dist/io/parts.js');
    const { Worker } = await import('node:worker_threads');
    const terminate = vi.spyOn(Worker.prototype, 'terminate');
    const path = join(work, write('stopped.csv', table('id,p\n', 4000, (i) => `r${i},${p()}\n`)));
    const before = process.env.FAMWISE_PARALLEL_MIN_BYTES;
    process.env.FAMWISE_PARALLEL_MIN_BYTES = '0';
    try {
      const first = await readTable(fileSource(path), {});
      expect(first.split).toBeDefined();
      stopWorker();
      expect(terminate).toHaveBeenCalledTimes(1);
      // Nothing left to end.
      stopWorker();
      expect(terminate).toHaveBeenCalledTimes(1);
      const again = await readTable(fileSource(path), {});
      expect(again.split).toEqual(first.split);
      expect(Array.from(again.p)).toEqual(Array.from(first.p));
      stopWorker();
      expect(terminate).toHaveBeenCalledTimes(2);
    } finally {
      terminate.mockRestore();
      if (before === undefined) delete process.env.FAMWISE_PARALLEL_MIN_BYTES;
      else process.env.FAMWISE_PARALLEL_MIN_BYTES = before;
    }
  });
});

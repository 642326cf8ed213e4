// scanInput, which feeds the byte scanner block by block (and its first
// block in two calls), reports exactly the records that one scan of the
// whole input reports: the same fields, lines, bytes and offsets.
import { closeSync, openSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { RecordScanner, type RecordView, fieldText } from '../src/io/csv-scan.js';
import { peek, scanInput } from '../src/io/scan-input.js';
import { ChunkPool, bufferSource, fileSource, rangeSource } from '../src/io/source.js';
import { seededRandom } from './helpers/random.js';
import { removeTemporaryFolders, temporaryFolder } from './helpers/temporary-folder.js';

afterAll(removeTemporaryFolders);

interface Seen {
  fields: string[];
  line: number;
  /** Where the record's bytes (gap included) lie in the whole input, and the bytes. */
  at: number;
  raw: string;
}

const see = (out: Seen[]) => (view: RecordView): void => {
  out.push({
    fields: Array.from({ length: view.fieldCount }, (_, k) => fieldText(view, k)),
    line: view.line,
    at: view.bufOffset + view.gapStart,
    raw: view.buf.toString('latin1', view.gapStart, view.next),
  });
};

/** A large messy table: quoted fields with delimiters, quotes and line breaks, CRLF, blank lines, unicode. */
function messyTable(random: () => number, bytes: number): Buffer {
  const pieces = ['id,text,p\n'];
  let size = pieces[0]!.length;
  const cells = ['plain', '"a, b"', '"two\nlines"', '"say ""hi"""', '', 'β-actin', '"x\r\ny"', '😀'];
  for (let row = 0; size < bytes; row++) {
    const cell = cells[Math.floor(random() * cells.length)] as string;
    const end = random() < 0.2 ? '\r\n' : '\n';
    const blank = random() < 0.05 ? '\n' : '';
    const line = `${row},${cell},${random().toFixed(6)}${end}${blank}`;
    pieces.push(line);
    size += Buffer.byteLength(line);
  }
  return Buffer.from(pieces.join(''));
}

describe('scanInput', () => {
  it('reports the records of a single scan of the whole input, for tables from 100 KB to 1.2 MB in one or many chunks', async () => {
    const random = seededRandom(29);
    for (const bytes of [100_000, 140_000, 300_000, 1_200_000]) {
      const input = messyTable(random, bytes);
      const whole: Seen[] = [];
      new RecordScanner(0x2c, 'messy.csv').scan(input, 0, true, see(whole));
      for (const chunkSize of [input.length, 65_537, 99_991]) {
        const chunked: Seen[] = [];
        const source = {
          ...bufferSource(input, 'messy.csv'),
          async *chunks() {
            for (let at = 0; at < input.length; at += chunkSize) yield input.subarray(at, at + chunkSize);
          },
        };
        await scanInput(source, { delimiter: 0x2c, loneCrEndsLine: false }, { record: see(chunked) });
        expect(chunked.length).toBe(whole.length);
        expect(chunked).toEqual(whole);
      }
    }
  });
});

describe('reading through a few buffers used again (ChunkPool)', () => {
  it('hands out a buffer given back, takes back only its own, and keeps a few', () => {
    const pool = new ChunkPool();
    const first = pool.take();
    const second = pool.take();
    expect(first.buffer).not.toBe(second.buffer);
    expect(first.length).toBe(pool.size);
    // A chunk is a view of part of a buffer: the whole buffer goes back.
    pool.give(first.subarray(10, 20));
    expect(pool.take().buffer).toBe(first.buffer);
    // Given back twice before it is taken again: handed out once.
    pool.give(second);
    pool.give(second);
    expect(pool.take().buffer).toBe(second.buffer);
    expect(pool.take().buffer).not.toBe(second.buffer);
    // Not its own (another pool's, or any buffer): left alone.
    pool.give(Buffer.alloc(pool.size));
    pool.give(new ChunkPool().take());
    const made = [pool.take(), pool.take(), pool.take(), pool.take(), pool.take(), pool.take()];
    expect(new Set(made.map((each) => each.buffer)).size).toBe(6);
    for (const each of made) pool.give(each);
    // A few are kept; the rest are left to the collector.
    const again = new Set(Array.from({ length: 6 }, () => pool.take().buffer));
    expect(made.filter((each) => again.has(each.buffer)).length).toBe(4);
  });

  it('reads a file by position into the pool\'s buffers, and the scan gives every one back', async () => {
    const work = temporaryFolder('famwise-pool-');
    const bytes = messyTable(seededRandom(31), 3_500_000);
    const path = join(work, 'table.csv');
    writeFileSync(path, bytes);
    const fd = openSync(path, 'r');
    try {
      const pool = new ChunkPool();
      const taken = new Set<ArrayBufferLike>();
      const chunks: Buffer[] = [];
      for await (const chunk of rangeSource(path, fd, 0, Infinity).chunks(pool)) {
        taken.add(chunk.buffer);
        chunks.push(Buffer.from(chunk));
        pool.give(chunk);
      }
      expect(Buffer.concat(chunks).equals(bytes)).toBe(true);
      // Each chunk went back before the next was read: one buffer did for all.
      expect(taken.size).toBe(1);
      expect(chunks.length).toBeGreaterThan(3);

      // scanInput passes its own pool: every buffer it was given is back once it ends.
      const given: Uint8Array[] = [];
      const yielded: Buffer[] = [];
      const source = {
        name: path,
        extension: 'csv',
        async *chunks(scanPool?: ChunkPool) {
          expect(scanPool).toBeInstanceOf(ChunkPool);
          const pool = scanPool as ChunkPool;
          const give = pool.give.bind(pool);
          pool.give = (chunk: Uint8Array) => {
            given.push(chunk);
            give(chunk);
          };
          try {
            for await (const chunk of rangeSource(path, fd, 0, Infinity).chunks(pool)) {
              yielded.push(chunk);
              yield chunk;
            }
          } finally {
            pool.give = give;
          }
        },
      };
      const seen: Seen[] = [];
      await scanInput(source, { delimiter: 0x2c, loneCrEndsLine: false }, { record: see(seen) });
      const whole: Seen[] = [];
      new RecordScanner(0x2c, path).scan(bytes, 0, true, see(whole));
      expect(seen).toEqual(whole);
      const back = new Set(given.map((chunk) => chunk.buffer));
      expect(yielded.length).toBeGreaterThan(3);
      expect(yielded.every((chunk) => back.has(chunk.buffer))).toBe(true);
    } finally {
      closeSync(fd);
    }
  });

  it('reports the records of a single scan of the whole input when a record spans several reads, pass after pass', async () => {
    // Reads of 1 MB into buffers used again: a record longer than several reads (a quoted field
    // of 2.5 MB with line breaks and a CRLF at a read's edge) is carried across them, so no buffer
    // may be read into again while the carry still lies in it.
    const random = seededRandom(37);
    const long = `"${'x'.repeat(700_000)}\r\n${'y'.repeat(1_048_000)}\n""${'z'.repeat(800_000)}"`;
    const pieces = [messyTable(random, 1_048_570), Buffer.from(`9,${long},0.5\r\n`), messyTable(random, 2_500_000).subarray(10), Buffer.from(`10,"${'w'.repeat(1_200_000)}",0.25\n`)];
    const bytes = Buffer.concat(pieces);
    const work = temporaryFolder('famwise-long-');
    const path = join(work, 'table.csv');
    writeFileSync(path, bytes);
    const whole: Seen[] = [];
    new RecordScanner(0x2c, path).scan(bytes, 0, true, see(whole));
    expect(whole.some((record) => record.raw.length > 2_500_000)).toBe(true);
    const fd = openSync(path, 'r');
    try {
      const source = { name: path, extension: 'csv', size: bytes.length, descriptor: () => fd, chunks: (pool?: ChunkPool) => rangeSource(path, fd, 0, Infinity).chunks(pool) };
      for (let pass = 0; pass < 3; pass++) {
        const seen: Seen[] = [];
        await scanInput(source, { delimiter: 0x2c, loneCrEndsLine: false }, { record: see(seen) });
        expect(seen.length).toBe(whole.length);
        expect(seen).toEqual(whole);
      }
    } finally {
      closeSync(fd);
    }
  });
});

describe('peek', () => {
  it('gives the first bytes of a source, read by position or streamed, and at most what a bounded source holds', async () => {
    const work = temporaryFolder('famwise-peek-');
    const bytes = messyTable(seededRandom(5), 200_000);
    const path = join(work, 'table.csv');
    writeFileSync(path, bytes);
    for (const want of [0, 2, 1 << 16, 199_999, bytes.length, bytes.length + 1, 10_000_000]) {
      const expected = bytes.subarray(0, want);
      expect((await peek(fileSource(path), want)).equals(expected)).toBe(true);
      // Streamed (no descriptor): at least `want` bytes, starting with them.
      const streamed = await peek(bufferSource(bytes, 'table.csv'), want);
      expect(streamed.subarray(0, want).equals(expected)).toBe(true);
    }
    // A file that grew after its size was taken is read as a stream would read it; a bounded one is not.
    const source = fileSource(path);
    writeFileSync(path, Buffer.concat([bytes, Buffer.from('more,rows,0.5\n')]));
    expect((await peek(source, 10_000_000)).length).toBe(bytes.length + 14);
    // Standard input redirected from a file holds what the file held at the start.
    const fd = openSync(path, 'r');
    try {
      const bounded = { name: '<stdin>', extension: '', size: 1000, bounded: true, descriptor: () => fd, chunks: () => rangeSource('<stdin>', fd, 0, 1000).chunks() };
      expect((await peek(bounded, 1 << 16)).equals(bytes.subarray(0, 1000))).toBe(true);
    } finally {
      closeSync(fd);
    }
  });
});

describe('counts for a progress line', () => {
  it('keeps the bytes and lines scanned in the source\'s counts, block by block, ending at the whole', async () => {
    const random = seededRandom(7);
    // Over 3 MB: several blocks, a record across each join, a quoted field with a line break.
    const rows = Array.from({ length: 120_000 }, (_, i) => (i === 5000 ? `"a\nb",${random()}` : `r${i},${random()}`));
    const text = `name,p\n${rows.join('\n')}\n`;
    const counts = new Float64Array(2);
    const seen: number[] = [];
    await scanInput({ ...bufferChunks(Buffer.from(text), 1 << 18), counts }, { delimiter: 0x2c, loneCrEndsLine: false }, {
      record() {},
      async afterBlock() {
        seen.push(counts[0] as number);
      },
    });
    expect(counts[0]).toBe(Buffer.byteLength(text));
    // Lines, not records: the quoted field's line break counts.
    expect(counts[1]).toBe(120_002);
    expect(seen.length).toBeGreaterThan(3);
    expect(seen.every((bytes, k) => k === 0 || bytes > (seen[k - 1] as number))).toBe(true);
  });

  it('counts from the line the scan starts on (a second part)', async () => {
    const counts = new Float64Array(2);
    await scanInput({ ...bufferSource(Buffer.from('0.1\n0.2\n0.3\n'), 't'), counts }, { delimiter: 0x2c, loneCrEndsLine: false, firstLine: 40 }, { record() {} });
    expect(Array.from(counts)).toEqual([12, 3]);
  });
});

/** A source of bytes given in chunks of `size`. */
function bufferChunks(bytes: Buffer, size: number) {
  return {
    name: 't.csv',
    extension: 'csv',
    async *chunks() {
      for (let at = 0; at < bytes.length; at += size) yield bytes.subarray(at, at + size);
    },
  };
}

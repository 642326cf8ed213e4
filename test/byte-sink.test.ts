// ByteSink fills its blocks again once a file stream or standard output has
// written them (fewer pages of new memory, each a page fault), and never
// those of another stream, which may keep what it is given.
import { createWriteStream, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { Writable } from 'node:stream';
import { afterAll, describe, expect, it } from 'vitest';
import { ByteSink } from '../src/io/byte-sink.js';
import { seededRandom } from './helpers/random.js';
import { removeTemporaryFolders, temporaryFolder } from './helpers/temporary-folder.js';

afterAll(removeTemporaryFolders);

/** About `bytes` of lines of varied length, written through the sink with a flush every 300 lines as a writer does; the bytes expected. */
async function fill(sink: ByteSink, bytes: number): Promise<Buffer> {
  const random = seededRandom(11);
  const expected: Buffer[] = [];
  let size = 0;
  for (let line = 0; size < bytes; line++) {
    const text = Buffer.from(`${line},${'x'.repeat(Math.floor(random() * 200))},${random()}\n`);
    sink.pushBytes(text, 0, text.length);
    expected.push(text);
    size += text.length;
    if (line % 300 === 0) await sink.flush();
  }
  await sink.flush(true);
  await sink.settled();
  return Buffer.concat(expected);
}

describe('ByteSink', () => {
  it('writes the same bytes to a file while filling the same few blocks again', async () => {
    const path = join(temporaryFolder('famwise-sink-'), 'out.csv');
    const stream = createWriteStream(path);
    const blocks = new Set<ArrayBufferLike>();
    let writes = 0;
    const write = stream.write.bind(stream) as (chunk: Buffer, callback?: (error?: Error | null) => void) => boolean;
    stream.write = ((chunk: Buffer, callback?: (error?: Error | null) => void) => {
      blocks.add(chunk.buffer);
      writes++;
      return write(chunk, callback);
    }) as typeof stream.write;
    const expected = await fill(new ByteSink(stream), 24 << 20);
    await new Promise<void>((resolve) => stream.end(resolve));
    expect(readFileSync(path).equals(expected)).toBe(true);
    expect(writes).toBeGreaterThan(20);
    // 24 blocks of 1 MB and more written; a handful ever made.
    expect(blocks.size).toBeLessThanOrEqual(8);
  });

  it('gives every block of another stream a new one, so that a stream that keeps them keeps the right bytes', async () => {
    const kept: Buffer[] = [];
    const collecting = new Writable({
      write(chunk: Buffer, _encoding, callback) {
        kept.push(chunk);
        callback();
      },
    });
    const expected = await fill(new ByteSink(collecting), 12 << 20);
    expect(Buffer.concat(kept).equals(expected)).toBe(true);
    expect(new Set(kept.map((chunk) => chunk.buffer)).size).toBe(kept.length);
  });

  it('waits for a slow file as much when records are larger than a block, so that what is queued stays bounded', async () => {
    const path = join(temporaryFolder('famwise-sink-'), 'out.csv');
    const stream = createWriteStream(path);
    // A slow disk: each write calls back 5 ms late.
    const slow = stream._write.bind(stream);
    stream._write = (chunk, encoding, callback) => slow(chunk, encoding, (error?: Error | null) => setTimeout(() => callback(error), 5));
    stream._writev = undefined;
    const sink = new ByteSink(stream);
    const record = Buffer.alloc(1_500_000, 0x61);
    let queued = 0;
    for (let k = 0; k < 30; k++) {
      sink.pushBytes(record, 0, record.length);
      await sink.flush();
      queued = Math.max(queued, stream.writableLength);
    }
    await sink.flush(true);
    await sink.settled();
    await new Promise<void>((resolve) => stream.end(resolve));
    expect(readFileSync(path).length).toBe(30 * record.length);
    // 45 MB written, at most a few records' worth waiting at any time.
    expect(queued).toBeLessThanOrEqual(4 * record.length);
  });

  it('fails with the stream\'s error, not a hang, when a file stream cannot write (a full disk)', async () => {
    const stream = createWriteStream('/dev/full');
    stream.on('error', () => {});
    await expect(fill(new ByteSink(stream), 12 << 20)).rejects.toThrow(/ENOSPC/);
  });
});

// The progress line: when it is drawn at all, what it says, and that it is
// erased. Time is a counter the test moves, never the clock.
import { describe, expect, it, vi } from 'vitest';
import { clearLine, progressLine, progressText, showsProgress, timeLeft } from '../src/cli/progress.js';
import type { InputSource, PassTally } from '../src/io/source.js';
import { famwise } from './helpers/cli.js';

describe('whether to draw it', () => {
  const at = (stderrIsTerminal: boolean, quiet: boolean, env: Record<string, string | undefined> = {}, tableToTerminal = false): boolean =>
    showsProgress({ stderrIsTerminal, tableToTerminal, quiet, env });

  it('only when standard error is a terminal and not --quiet', () => {
    expect(at(true, false)).toBe(true);
    expect(at(false, false)).toBe(false);
    expect(at(true, true)).toBe(false);
    expect(at(false, true)).toBe(false);
  });

  it('never when the table itself is written to the terminal', () => {
    expect(at(true, false, {}, true)).toBe(false);
  });

  it('never in CI or on a dumb terminal', () => {
    expect(at(true, false, { CI: 'true' })).toBe(false);
    expect(at(true, false, { CI: '1' })).toBe(false);
    expect(at(true, false, { TERM: 'dumb' })).toBe(false);
    expect(at(true, false, { CI: 'false' })).toBe(true);
    expect(at(true, false, { CI: '' })).toBe(true);
  });

  it('never when standard error is a pipe (an end-to-end run)', () => {
    const rows = Array.from({ length: 2000 }, (_, i) => `${(i + 1) / 2001}`).join('\n');
    const run = famwise(['adjust', '--methods', 'bh'], `p\n${rows}\n`);
    expect(run.status).toBe(0);
    expect(run.stderr).not.toMatch(/\r|reading:|writing:/);
  });
});

describe('what it says', () => {
  it('estimates the rest of this pass and all of the second while reading', () => {
    // 25% read in 1 s: 3 s for the rest of the first pass, 4 s for the second.
    expect(timeLeft({ pass: 0, lines: 10, totalLines: undefined, bytes: 250, totalBytes: 1000, elapsed: 1000 })).toBe(7000);
    expect(timeLeft({ pass: 1, lines: 10, totalLines: 40, bytes: 500, totalBytes: 1000, elapsed: 2000 })).toBe(2000);
    expect(timeLeft({ pass: 0, lines: 10, totalLines: undefined, bytes: 250, totalBytes: undefined, elapsed: 1000 })).toBeUndefined();
  });

  it('names the lines and the time left', () => {
    expect(progressText({ pass: 0, lines: 1234567, totalLines: undefined, bytes: 250, totalBytes: 1000, elapsed: 1000 })).toBe('famwise: reading: 1,234,567 lines, about 7 s left');
    expect(progressText({ pass: 1, lines: 5, totalLines: 10, bytes: 50, totalBytes: 100, elapsed: 60_000 })).toBe('famwise: writing: 5 of 10 lines, about 1 min 00 s left');
    expect(progressText({ pass: 0, lines: 3, totalLines: undefined, bytes: 3, totalBytes: undefined, elapsed: 10 })).toBe('famwise: reading: 3 lines');
    // Every line written, the second part being copied into place: the rest of the copy at its speed so far.
    expect(progressText({ pass: 1, lines: 10, totalLines: 10, bytes: 100, totalBytes: 100, elapsed: 9000, copy: { done: 25, of: 100, elapsed: 2000 } })).toBe(
      'famwise: writing: 10 of 10 lines, copying the second part into place: 25%, about 6 s left',
    );
    expect(progressText({ pass: 1, lines: 10, totalLines: 10, bytes: 100, totalBytes: 100, elapsed: 9000, copy: { done: 0, of: 100, elapsed: 0 } })).toBe('famwise: writing: 10 of 10 lines, copying the second part into place: 0%');
  });
});

/** A source of `count` chunks of three lines each; the clock moves `step` ms per chunk. */
function chunkedSource(count: number, clock: { now: number }, step: number): InputSource {
  const chunk = Buffer.from('0.1\n0.2\n0.3\n');
  return {
    name: 'test.csv',
    extension: 'csv',
    size: count * chunk.length,
    async *chunks() {
      for (let i = 0; i < count; i++) {
        clock.now += step;
        yield chunk;
      }
    },
  };
}

/** Reads the source as a scan does (io/scan-input.ts): its counts, [bytes, lines], kept up after each chunk scanned. */
async function readAll(source: InputSource, chunkLength = 12): Promise<void> {
  const counts = source.counts as Float64Array;
  for await (const chunk of source.chunks()) {
    expect(chunk.length).toBe(chunkLength);
    counts[0] = (counts[0] as number) + chunk.length;
    counts[1] = (counts[1] as number) + 3;
  }
}

describe('drawing', () => {
  it('draws nothing in a run shorter than a second', async () => {
    const clock = { now: 0 };
    const written: string[] = [];
    const source = progressLine((text) => written.push(text), () => clock.now).watch(chunkedSource(10, clock, 45));
    await readAll(source);
    await readAll(source);
    expect(written).toEqual([]);
  });

  it('counts lines on both passes, at most four times a second, and erases the line after each pass', async () => {
    const clock = { now: 0 };
    const written: string[] = [];
    const source = progressLine((text) => written.push(text), () => clock.now).watch(chunkedSource(40, clock, 100));
    await readAll(source);
    const firstPass = written.splice(0);
    // 4 s in steps of 0.1 s, drawn at 1 s and then every 0.3 s (the first step past 0.25 s) up to 4 s: 11 times, then erased.
    expect(firstPass.length).toBe(12);
    // Drawn as the tenth chunk arrives: the scan has counted the nine before it.
    expect(firstPass[0]).toBe('\r\x1b[Kfamwise: reading: 27 lines, about 7 s left');
    expect(firstPass.at(-1)).toBe('\r\x1b[K');
    await readAll(source);
    expect(written.some((text) => text.includes('writing: 60 of 120 lines, about 2 s left'))).toBe(true);
    expect(written.at(-1)).toBe('\r\x1b[K');
  });

  it('tells what clears a line still on the screen (for a signal\'s message), and nothing when none is', async () => {
    const clock = { now: 0 };
    const written: string[] = [];
    const source = progressLine((text) => written.push(text), () => clock.now).watch(chunkedSource(40, clock, 100));
    expect(clearLine()).toBe('');
    const chunks = source.chunks()[Symbol.asyncIterator]();
    for (let i = 0; i < 15; i++) await chunks.next();
    expect(written.length).toBeGreaterThan(0);
    expect(clearLine()).toBe('\r\x1b[K');
    await chunks.return?.();
    expect(clearLine()).toBe('');
  });

  it('erases the line when a pass stops with an error', async () => {
    const clock = { now: 0 };
    const written: string[] = [];
    const source = progressLine((text) => written.push(text), () => clock.now).watch(chunkedSource(40, clock, 100));
    await expect(async () => {
      for await (const _ of source.chunks()) if (clock.now >= 2000) throw new Error('bad row');
    }).rejects.toThrow('bad row');
    expect(written.length).toBeGreaterThan(1);
    expect(written.at(-1)).toBe('\r\x1b[K');
  });
});

describe('lines as the scans count them', () => {
  it('in a pass in one thread and a pass in two alike, so the two agree (a table whose lines end in CR alone)', async () => {
    vi.useFakeTimers({ toFake: ['setInterval', 'clearInterval'] });
    try {
      const clock = { now: 0 };
      const written: string[] = [];
      // No LF at all: lines end in CR alone, which the scan counts (and a count of LF bytes would not).
      const chunk = Buffer.from('0.1\r0.2\r0.3\r');
      const source = progressLine((text) => written.push(text), () => clock.now).watch({
        name: 't.csv',
        extension: 'csv',
        size: 40 * chunk.length,
        descriptor: () => 3,
        async *chunks() {
          for (let i = 0; i < 40; i++) {
            clock.now += 100;
            yield chunk;
          }
        },
      });
      // The first pass in one thread, through chunks(), scanned as scan-input.ts does.
      await readAll(source, chunk.length);
      expect(written.some((text) => text.includes('reading: 27 lines'))).toBe(true);
      // The second in two parts: "of" the lines the first pass's scan counted.
      const tally = source.tally as PassTally;
      const [first, second] = tally.begin(240);
      first.set([240, 60]);
      second.set([100, 25]);
      clock.now += 250;
      vi.advanceTimersByTime(250);
      expect(written.at(-1)).toBe('\r\x1b[Kfamwise: writing: 85 of 120 lines, about 1 s left');
      tally.end();
    } finally {
      vi.useRealTimers();
    }
  });

  it('in a pass in two parts and then one in one thread alike (JSON lines written after a read in two threads)', async () => {
    vi.useFakeTimers({ toFake: ['setInterval', 'clearInterval'] });
    const clock = { now: 0 };
    const written: string[] = [];
    const source = progressLine((text) => written.push(text), () => clock.now).watch(chunkedSource(40, clock, 100));
    try {
      const tally = source.tally as PassTally;
      const [first, second] = tally.begin(240);
      clock.now += 4000;
      // The scans leave out trailing blank lines: 118 lines, where the bytes hold 120 line feeds.
      first.set([240, 60]);
      second.set([240, 58]);
      tally.end();
    } finally {
      vi.useRealTimers();
    }
    await readAll(source);
    const drawn = written.filter((text) => text.includes('writing'));
    expect(drawn.length).toBeGreaterThan(3);
    // Never more lines written than the table has, as the first pass counted them.
    for (const text of drawn) {
      const [, done, of] = /writing: (\d+) of (\d+) lines/.exec(text) ?? [];
      expect(Number(of)).toBe(118);
      expect(Number(done)).toBeLessThanOrEqual(118);
    }
  });
});

/**
 * A progress line watching a table of 1000 bytes read by position, under fake timers: what it
 * wrote, its tally, and a clock that advances the timers with it.
 */
function watchedByPosition(): { written: string[]; tally: PassTally; tick: (ms: number) => void } {
  const clock = { now: 0 };
  const written: string[] = [];
  const source = progressLine((text) => written.push(text), () => clock.now).watch({ name: 't.csv', extension: 'csv', size: 1000, descriptor: () => 3, chunks: async function* () {} });
  const tick = (ms: number): void => {
    clock.now += ms;
    vi.advanceTimersByTime(ms);
  };
  return { written, tally: source.tally as PassTally, tick };
}

describe('with a table read by position', () => {
  it('shows the copy of a second part written apart once every line is written, rather than standing at the end', () => {
    vi.useFakeTimers({ toFake: ['setInterval', 'clearInterval'] });
    try {
      const { written, tally, tick } = watchedByPosition();
      const [readFirst, readSecond] = tally.begin(500);
      readFirst.set([500, 50]);
      readSecond.set([500, 50]);
      tally.end();
      const [first, second] = tally.begin(500);
      first.set([500, 50]);
      second.set([500, 50]);
      tick(2000);
      expect(written.at(-1)).toBe('\r\x1b[Kfamwise: writing: 100 of 100 lines, about 1 s left');
      tally.copied(1000, 4000);
      tick(1000);
      tally.copied(2000, 4000);
      tick(250);
      // 2000 of 4000 bytes in 1.25 s since the copy began: about 1 s more.
      expect(written.at(-1)).toBe('\r\x1b[Kfamwise: writing: 100 of 100 lines, copying the second part into place: 50%, about 1 s left');
      tally.end();
      expect(written.at(-1)).toBe('\r\x1b[K');
    } finally {
      vi.useRealTimers();
    }
  });

  it('keeps the descriptor, so that a large table is still read in two threads', () => {
    const source: InputSource = { name: 't.csv', extension: 'csv', size: 10, descriptor: () => 3, chunks: async function* () {} };
    const watched = progressLine(() => {}).watch(source);
    expect(watched.descriptor).toBe(source.descriptor);
    expect(watched.size).toBe(10);
    expect(watched.tally).toBeDefined();
  });

  it('draws a pass in two parts from the sums of both parts\' counts, on a timer, and erases it when the pass ends', () => {
    vi.useFakeTimers({ toFake: ['setInterval', 'clearInterval'] });
    try {
      const { written, tally, tick } = watchedByPosition();
      // The first pass: the two parts' [bytes, lines], in shared memory (another thread writes the second).
      const [first, second] = tally.begin(500);
      expect(first.buffer).toBeInstanceOf(SharedArrayBuffer);
      expect(second.buffer).toBe(first.buffer);
      first.set([100, 10]);
      second.set([150, 15]);
      tick(750);
      // Nothing before a second.
      expect(written).toEqual([]);
      tick(250);
      // 250 of 1000 bytes in 1 s: 3 s for this pass's rest and 4 s for the second pass.
      expect(written).toEqual(['\r\x1b[Kfamwise: reading: 25 lines, about 7 s left']);
      first.set([500, 50]);
      second.set([500, 51]);
      tally.end();
      // The last count is the pass's total; the line is erased, and the timer stops.
      expect(written.at(-1)).toBe('\r\x1b[K');
      tick(1000);
      expect(written.length).toBe(2);
      const [writingFirst, writingSecond] = tally.begin(500);
      writingFirst.set([200, 20]);
      writingSecond.set([300, 30]);
      tick(500);
      expect(written.at(-1)).toBe('\r\x1b[Kfamwise: writing: 50 of 101 lines, about 1 s left');
      // The first part's scan past its end (it went on through the second part itself): its count alone.
      writingFirst.set([800, 80]);
      tick(250);
      expect(written.at(-1)).toBe('\r\x1b[Kfamwise: writing: 80 of 101 lines, about 1 s left');
      tally.end();
      expect(written.at(-1)).toBe('\r\x1b[K');
    } finally {
      vi.useRealTimers();
    }
  });
});

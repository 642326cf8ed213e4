// A progress line on standard error for long runs at the terminal: the lines
// read (first pass) or written (second pass) and an estimate of the time
// left. It is shown only when standard error is a terminal and the table
// goes elsewhere, never with --quiet, in CI (CI set) or on a dumb terminal,
// so logs and pipes never receive it; it appears only after the first second, so short runs print
// nothing, and it is erased at the end of each pass, so that what follows
// (an error, the summary) starts on a clean line.
//
// The estimate assumes the rest goes at the speed so far, and that the
// second pass takes as long as the first (both read every byte once).

import type { InputSource, PassTally } from '../io/source.js';

/** Nothing is shown before this many milliseconds. */
const QUIET_START = 1000;
/** The line is redrawn at most this often (milliseconds). */
const REDRAW = 250;
const ERASE = '\r\x1b[K';
/** Whether a progress line is on the screen now (of any progressLine). */
let onScreen = false;

/** What clears a progress line still on the screen (a signal ends the run mid-pass): ERASE, or nothing when none is. */
export function clearLine(): string {
  return onScreen ? ERASE : '';
}

export interface ProgressSetting {
  readonly stderrIsTerminal: boolean;
  /** Whether the table itself is written to the terminal (the line would break into it). */
  readonly tableToTerminal: boolean;
  readonly quiet: boolean;
  readonly env: Readonly<Record<string, string | undefined>>;
}

/** Whether to draw a progress line at all. */
export function showsProgress({ stderrIsTerminal, tableToTerminal, quiet, env }: ProgressSetting): boolean {
  const inCi = env.CI !== undefined && env.CI !== '' && env.CI !== 'false' && env.CI !== '0';
  return stderrIsTerminal && !tableToTerminal && !quiet && !inCi && env.TERM !== 'dumb';
}

/** What has been done so far, for the text of the line. */
export interface ProgressState {
  /** 0 while the table is read, 1 while it is written back. */
  readonly pass: number;
  readonly lines: number;
  /** Lines of the whole table, once the first pass has counted them. */
  readonly totalLines: number | undefined;
  readonly bytes: number;
  /** Bytes of the whole table, when known in advance (a plain file) or counted by the first pass. */
  readonly totalBytes: number | undefined;
  /** Milliseconds spent in this pass. */
  readonly elapsed: number;
  /** Once every line is written: the second part, written apart, being copied after the first (bytes, and milliseconds since the copy began). */
  readonly copy?: { readonly done: number; readonly of: number; readonly elapsed: number } | undefined;
}

function seconds(milliseconds: number): string {
  const total = Math.max(1, Math.round(milliseconds / 1000));
  return total < 60 ? `${total} s` : `${Math.floor(total / 60)} min ${String(total % 60).padStart(2, '0')} s`;
}

/** Milliseconds left: the rest of this pass at its speed so far, and all of the second pass while in the first. */
export function timeLeft(state: ProgressState): number | undefined {
  const { totalBytes, bytes, elapsed, pass, copy } = state;
  // The rest of a copy at its speed so far.
  if (copy) return copy.done > 0 && copy.elapsed > 0 ? (copy.elapsed * Math.max(0, copy.of - copy.done)) / copy.done : undefined;
  if (totalBytes === undefined || bytes === 0 || elapsed <= 0) return undefined;
  const thisPass = (elapsed * Math.max(0, totalBytes - bytes)) / bytes;
  return pass === 0 ? thisPass + (elapsed * totalBytes) / bytes : thisPass;
}

export function progressText(state: ProgressState): string {
  const count = state.lines.toLocaleString('en');
  const { copy } = state;
  const copying = copy ? `, copying the second part into place: ${Math.floor((100 * copy.done) / Math.max(1, copy.of))}%` : '';
  const done = state.pass === 0 ? `reading: ${count} lines` : `writing: ${count}${state.totalLines === undefined ? '' : ` of ${state.totalLines.toLocaleString('en')}`} lines${copying}`;
  const left = timeLeft(state);
  return `famwise: ${done}${left === undefined ? '' : `, about ${seconds(left)} left`}`;
}

export interface Progress {
  /** The source, counting what passes through it; the line is erased whenever a pass ends, however it ends. */
  watch(source: InputSource): InputSource;
}

/** A progress line written with `write`, timed by `now` (milliseconds). */
export function progressLine(write: (text: string) => void, now: () => number = () => performance.now()): Progress {
  let pass = 0;
  let lines = 0;
  let bytes = 0;
  let totalLines: number | undefined;
  let totalBytes: number | undefined;
  const started = now();
  let passStarted = started;
  let drawn = false;
  let lastDrawn = -Infinity;

  const draw = (): void => {
    const time = now();
    if (time - started < QUIET_START || time - lastDrawn < REDRAW) return;
    lastDrawn = time;
    drawn = true;
    onScreen = true;
    const copying = copy && { done: copy.done, of: copy.of, elapsed: time - copy.started };
    write(`${ERASE}${progressText({ pass, lines, totalLines, bytes, totalBytes, elapsed: time - passStarted, copy: copying })}`);
  };

  /**
   * Lines are those the scans count (io/scan-input.ts: a lone CR that ends
   * lines counts, trailing blank lines do not), in one thread or two, so that
   * both passes count alike. A table read in one thread, through chunks(),
   * is counted here; each of a pass's two parts in a pair of its own (tally).
   */
  const inOrderCounts = new Float64Array(2);
  /** The copy of a second part written apart (PassTally.copied), while one is under way. */
  let copy: { done: number; of: number; started: number } | undefined;
  const startPass = (): void => {
    // The first pass's scan has ended by now (it ends after the last chunk it read): its count is the table's.
    if (pass > 0 && totalLines === undefined) totalLines = inOrderCounts[1];
    inOrderCounts.fill(0);
    lines = 0;
    bytes = 0;
    passStarted = now();
  };
  const endPass = (): void => {
    if (pass === 0) totalBytes = bytes;
    pass++;
  };
  // Messages (an error, the summary) start on a clean line.
  const erase = (): void => {
    if (drawn) write(ERASE);
    drawn = false;
    onScreen = false;
  };

  /**
   * A pass read by position in two parts (io/read-table.ts, io/parallel-write.ts), which chunks()
   * does not see: each thread's scan counts into its own pair of shared numbers, and the line is
   * drawn from their sums on a timer.
   */
  let timer: ReturnType<typeof setInterval> | undefined;
  let parts: readonly [Float64Array, Float64Array] | undefined;
  let firstPartEnd = Infinity;
  let inOrder = false;
  const countParts = (): void => {
    if (parts === undefined || inOrder) return;
    const [first, second] = parts;
    const firstOnly = (first[0] as number) > firstPartEnd;
    bytes = (first[0] as number) + (firstOnly ? 0 : (second[0] as number));
    lines = (first[1] as number) + (firstOnly ? 0 : (second[1] as number));
  };
  const tally: PassTally = {
    begin(firstEnd) {
      firstPartEnd = firstEnd;
      const shared = new Float64Array(new SharedArrayBuffer(4 * Float64Array.BYTES_PER_ELEMENT));
      parts = [shared.subarray(0, 2), shared.subarray(2, 4)];
      startPass();
      timer = setInterval(() => {
        countParts();
        if (!inOrder) draw();
      }, REDRAW);
      // The timer never keeps the process alive.
      timer.unref();
      return parts;
    },
    copied(done, of) {
      copy ??= { done: 0, of, started: now() };
      copy.done = done;
    },
    end() {
      clearInterval(timer);
      countParts();
      parts = undefined;
      copy = undefined;
      if (pass === 0) totalLines = lines;
      endPass();
      erase();
    },
  };

  return {
    watch(source) {
      totalBytes = source.size;
      return {
        ...source,
        tally,
        counts: inOrderCounts,
        async *chunks(pool) {
          // A first look at the start of the table (which stops early) counts as no pass.
          startPass();
          inOrder = true;
          try {
            for await (const chunk of source.chunks(pool)) {
              bytes += chunk.length;
              // As far as the scan has got (it scans what came before this chunk).
              lines = inOrderCounts[1] as number;
              draw();
              yield chunk;
            }
            endPass();
          } finally {
            inOrder = false;
            erase();
          }
        },
      };
    },
  };
}

// The p-value histogram drawn in a terminal: one line per bin, a bar of
// Unicode block characters (eighths of a cell, so short bars still differ),
// the count, and two marks where the bar does not cover them: `|` at the
// level every bin would reach if all p-values were null, and `:` at the
// level of the nulls alone (pi0 times that).
//
// Cost: O(bins * width).

import type { Histogram } from '../diagnostics/histogram.js';
import { shortNumber } from '../diagnostics/short-number.js';

const EIGHTHS = ['', '▏', '▎', '▍', '▌', '▋', '▊', '▉'];
const FULL = '█';
export const UNIFORM_MARK = '|';
export const PI0_MARK = ':';

/** Digits for the bin edges: 2 when they are all exact hundredths (20 bins), else 3. */
export function edgeDigits(bins: number): number {
  return 100 % bins === 0 ? 2 : 3;
}

/** The label of bin k, such as "0.05-0.10". */
export function binLabel(k: number, bins: number): string {
  const digits = edgeDigits(bins);
  return `${(k / bins).toFixed(digits)}-${((k + 1) / bins).toFixed(digits)}`;
}

/** One bar of `value` on a scale where `full` fills `width` cells, with the marks drawn past its end. */
function bar(value: number, full: number, width: number, marks: readonly [number, string][]): string {
  const eighths = full > 0 ? Math.round((value / full) * width * 8) : 0;
  const cells: string[] = Array.from({ length: width }, (_, cell) => {
    const filled = eighths - cell * 8;
    return filled >= 8 ? FULL : filled > 0 ? (EIGHTHS[filled] as string) : ' ';
  });
  for (const [level, mark] of marks) {
    const cell = Math.min(width - 1, Math.floor((level / full) * width));
    if (cells[cell] === ' ') cells[cell] = mark;
  }
  return cells.join('');
}

/** The histogram as lines of text (no trailing newline on each), with a legend. */
export function terminalHistogram(histogram: Histogram, pi0: number | null, width = 40): string[] {
  const bins = histogram.counts.length;
  const full = Math.max(histogram.uniformLevel, ...histogram.counts);
  // The pi0 mark is left out when it would sit on the uniform one.
  const showPi0 = pi0 !== null && pi0 < 1;
  const marks: [number, string][] = showPi0 ? [[histogram.uniformLevel, UNIFORM_MARK], [histogram.pi0Level, PI0_MARK]] : [[histogram.uniformLevel, UNIFORM_MARK]];
  const countWidth = String(Math.max(...histogram.counts)).length;
  const lines = Array.from(histogram.counts, (count, k) => `${binLabel(k, bins)}  ${bar(count, full, width, marks)}  ${String(count).padStart(countWidth)}`);
  lines.push(`${UNIFORM_MARK} ${shortNumber(histogram.uniformLevel)} per bin if every p-value were null`);
  if (showPi0) lines.push(`${PI0_MARK} ${shortNumber(histogram.pi0Level)} per bin from the nulls alone (pi0 = ${shortNumber(pi0)})`);
  return lines;
}

// Aligned plain-text tables for reading at a terminal: columns padded with
// spaces, numbers right-aligned. Used by the summary and by --format table.

import { MISSING_MARKS } from './io/p-value-text.js';

const missing = new Set(MISSING_MARKS);

const NUMERIC = /^[+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?$/;

/** Display width: code points, not UTF-16 units (wide East Asian characters count as one). */
function width(text: string): number {
  let count = 0;
  for (const _ of text) count++;
  return count;
}

export function alignedTable(header: readonly string[], rows: readonly (readonly string[])[]): string {
  const columns = header.length;
  const widths = header.map(width);
  const numeric = header.map(() => true);
  for (const row of rows) {
    for (let k = 0; k < columns; k++) {
      const cell = row[k] ?? '';
      widths[k] = Math.max(widths[k] as number, width(cell));
      if (!missing.has(cell) && !NUMERIC.test(cell)) numeric[k] = false;
    }
  }
  const line = (cells: readonly string[]): string =>
    cells
      .map((cell, k) => {
        const pad = ' '.repeat((widths[k] as number) - width(cell));
        return numeric[k] ? pad + cell : cell + pad;
      })
      .join('  ')
      .trimEnd();
  return [line(header), ...rows.map(line)].join('\n') + '\n';
}

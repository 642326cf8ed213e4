// Aligned plain-text tables for reading at a terminal: columns padded with
// spaces, numbers right-aligned. Used by the summary and by --format table.

import { MISSING_MARKS, isNumberText } from './io/p-value-text.js';

/** Cells that neither make a column text nor number: missing marks, and '-' for "none". */
const neutral = new Set([...MISSING_MARKS, '-']);

// Characters that take two columns in a terminal: East Asian wide and
// full-width forms, and most emoji (Unicode Standard Annex #11, roughly).
const WIDE = /[\u1100-\u115f\u2e80-\u303e\u3041-\u33ff\u3400-\u4dbf\u4e00-\u9fff\ua000-\ua4cf\uac00-\ud7a3\uf900-\ufaff\ufe30-\ufe4f\uff00-\uff60\uffe0-\uffe6\u{1f300}-\u{1f64f}\u{1f900}-\u{1f9ff}\u{20000}-\u{3fffd}]/u;
// Zero-width: combining marks, joiners, the byte-order mark.
const ZERO_WIDTH = /[\u0300-\u036f\u200b-\u200f\ufeff]/u;

/** Columns a text takes in a terminal. */
function width(text: string): number {
  let columns = 0;
  for (const character of text) columns += ZERO_WIDTH.test(character) ? 0 : WIDE.test(character) ? 2 : 1;
  return columns;
}

// Characters that would act on the terminal or reorder the text around them
// rather than show: C0 and C1 controls, DEL, and the bidirectional controls.
const CONTROL = /[\u0000-\u001f\u007f-\u009f\u061c\u200e\u200f\u202a-\u202e\u2066-\u2069]/g;
const NAMED: Readonly<Record<string, string>> = { '\r': '\\r', '\n': '\\n', '\t': '\\t' };

/**
 * Text made safe to print: line breaks and tabs as \n, \r, \t, other control
 * and bidirectional characters as \xHH or \u{HHHH}, so that no table value
 * can colour, move or reorder what a terminal (or an SVG) shows.
 */
export function printable(text: string): string {
  return text.replace(CONTROL, (character) => {
    const code = character.codePointAt(0) as number;
    return NAMED[character] ?? (code <= 0xff ? `\\x${code.toString(16).padStart(2, '0')}` : `\\u{${code.toString(16)}}`);
  });
}

/** A cell on one line: line breaks, tabs and other controls are shown as escapes rather than breaking the layout. */
function oneLine(cell: string): string {
  return printable(cell);
}

export function alignedTable(rawHeader: readonly string[], rawRows: readonly (readonly string[])[]): string {
  const header = rawHeader.map(oneLine);
  const rows = rawRows.map((row) => row.map(oneLine));
  const columns = header.length;
  const widths = header.map(width);
  const numeric = header.map(() => true);
  for (const row of rows) {
    for (let k = 0; k < columns; k++) {
      const cell = row[k] ?? '';
      widths[k] = Math.max(widths[k] as number, width(cell));
      if (!neutral.has(cell) && !isNumberText(cell)) numeric[k] = false;
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

// The second pass for --format jsonl: one JSON object per data row, for
// scripts. The table's own fields are strings, exactly as written (decoded
// as UTF-8; quoting undone); the new cells are numbers and booleans, or
// null where the p-value is missing. Keys are the header's column names,
// or the 1-based positions for a table without a header. Blank lines and
// the header line produce nothing.

import type { ByteSink } from './byte-sink.js';
import { fieldText } from './csv-scan.js';
import type { TableShape } from './read-table.js';
import { scanInput } from './scan-input.js';
import type { InputSource } from './source.js';
import { type OutputColumn, checkRowCount, splitColumns } from './write-table.js';

/** The keys of the objects: the header's names (or positions) and the new columns' names (the caller refuses repeated ones). */
export function jsonLinesKeys(shape: TableShape, columns: readonly OutputColumn[]): string[] {
  const own = shape.names ?? Array.from({ length: shape.columnCount }, (_, k) => String(k + 1));
  return [...own, ...columns.filter((column) => column.replaces === undefined).map((column) => column.name)];
}

export async function writeJsonLines(
  source: InputSource,
  shape: TableShape,
  columns: readonly OutputColumn[],
  sink: ByteSink,
  expectedRows: number,
): Promise<void> {
  const keys = jsonLinesKeys(shape, columns).map((key) => JSON.stringify(key));
  const { replacing, appended } = splitColumns(columns);
  // New cells are number or boolean text already; an empty one is a missing value.
  const literal = (text: string): string => (text === '' ? 'null' : text);
  let row = shape.names ? -1 : 0;
  await scanInput(source, shape, {
    record(view) {
      if (row >= 0) {
        const parts: string[] = [];
        for (let k = 0; k < view.fieldCount; k++) {
          const replacement = replacing.get(k);
          parts.push(`${keys[k]}:${replacement ? literal(replacement.cell(row)) : JSON.stringify(fieldText(view, k))}`);
        }
        appended.forEach((column, j) => parts.push(`${keys[view.fieldCount + j]}:${literal(column.cell(row))}`));
        sink.push(`{${parts.join(',')}}\n`);
      }
      row++;
    },
    afterBlock: () => sink.flush(),
  });
  checkRowCount(source, row, expectedRows);
  await sink.flush(true);
}

// The second pass: read the source again and write every record back with
// the new columns. With the input's own delimiter each original field is
// copied byte for byte (quoting, number text, unicode, line endings, blank
// lines, a byte-order mark); only the new cells are written fresh.

import { DataError } from '../errors.js';
import { alignedTable } from '../text-table.js';
import { type ByteSink, DECISION_CELL, NUMBER_CELL, type PlainCells } from './byte-sink.js';
import { LONGEST_NUMBER } from './number-text.js';
import { COMMA } from './dialect.js';
import { type RecordView, fieldBytes, fieldText } from './csv-scan.js';
import type { TableShape } from './read-table.js';
import { scanInput } from './scan-input.js';
import type { InputSource } from './source.js';

/** An aligned text table for reading, or delimited text with this delimiter byte. */
export type OutputFormat = AlignedFormat | { readonly delimiter: number };

/** A column the writer adds, or writes over an existing one with the same name. */
export interface OutputColumn {
  readonly name: string;
  /** The cell for data row `row` (0-based, header excluded). */
  cell(row: number): string;
  /** Index of the existing column it replaces; undefined to append it. */
  readonly replaces?: number | undefined;
  /**
   * Set for a column of numbers, whose cell(row) is values[row] as String()
   * writes it (empty for NaN), with a decimal comma if decimalComma: the
   * writer then writes the bytes itself (io/number-text.ts), which is faster.
   */
  readonly numbers?: { readonly values: Float64Array; readonly decimalComma: boolean } | undefined;
  /**
   * Set for a column of decisions, whose cell(row) is "true" where
   * values[row] <= alpha, "false" above and empty for NaN: written as bytes.
   */
  readonly decisions?: { readonly values: Float64Array; readonly alpha: number } | undefined;
}

function needsQuotes(text: string, delimiter: string): boolean {
  const code = delimiter.charCodeAt(0);
  for (let i = 0; i < text.length; i++) {
    const c = text.charCodeAt(i);
    if (c === code || c === 0x22 || c === 0x0a || c === 0x0d) return true;
  }
  return false;
}

/** A cell's text, quoted if the delimiter, a quote or a line break is in it. */
function quoted(text: string, delimiter: string): string {
  return needsQuotes(text, delimiter) ? `"${text.replaceAll('"', '""')}"` : text;
}

/** The same for a field's bytes, so that bytes that are not valid UTF-8 pass unchanged. */
function quotedBytes(bytes: Buffer, delimiter: string): Buffer | string {
  const latin1 = bytes.toString('latin1');
  return needsQuotes(latin1, delimiter) ? Buffer.from(`"${latin1.replaceAll('"', '""')}"`, 'latin1') : bytes;
}

/** One part of a table, written apart from the rest. */
export interface TablePart {
  /** The line on which the part's first record starts, for a part after the first: it has no header. */
  readonly firstLine?: number | undefined;
}

/** An aligned text table for reading, with these headings for the table's own columns. */
export interface AlignedFormat {
  readonly headings: readonly string[];
}

/** The new columns that write over existing ones, by the index they replace, and those appended, in order. */
export function splitColumns(columns: readonly OutputColumn[]): { replacing: Map<number, OutputColumn>; appended: OutputColumn[] } {
  const replacing = new Map<number, OutputColumn>();
  for (const column of columns) if (column.replaces !== undefined) replacing.set(column.replaces, column);
  return { replacing, appended: columns.filter((column) => column.replaces === undefined) };
}

export async function writeTable(
  source: InputSource,
  shape: TableShape,
  columns: readonly OutputColumn[],
  format: OutputFormat,
  sink: ByteSink,
  expectedRows: number,
  /**
   * Set when the source is one part of the table (io/parallel-write.ts): the
   * rows are then counted, not checked against expectedRows.
   */
  part?: TablePart,
): Promise<number> {
  const { replacing, appended } = splitColumns(columns);
  const firstLine = part?.firstLine;
  let row = shape.names && firstLine === undefined ? -1 : 0;

  const cellsOf = (view: RecordView, record: number): string[] => {
    const cells: string[] = [];
    for (let k = 0; k < view.fieldCount; k++) {
      const replacement = replacing.get(k);
      cells.push(record < 0 || !replacement ? fieldText(view, k) : replacement.cell(record));
    }
    for (const column of appended) cells.push(record < 0 ? column.name : column.cell(record));
    return cells;
  };

  if ('headings' in format) {
    const rows: string[][] = [];
    await scanInput(source, shape, {
      record(view) {
        if (row >= 0) rows.push(cellsOf(view, row));
        row++;
      },
    });
    checkRowCount(source, row, expectedRows);
    const header = [...format.headings, ...appended.map((column) => column.name)];
    sink.push(alignedTable(header, rows));
    await sink.flush(true);
    return row;
  }

  const outDelimiter = format.delimiter;
  const delimiter = String.fromCharCode(outDelimiter);
  const copyFields = format.delimiter === shape.delimiter;
  // Records copied whole need only their bounds, not their fields.
  const wholeRecords = copyFields && replacing.size === 0;
  // The common table: records copied whole, and new cells that are all numbers and decisions.
  const cells = wholeRecords ? plainCells(appended, outDelimiter) : undefined;
  await scanInput(source, { ...shape, splitFields: !wholeRecords, firstLine }, {
    record(view) {
      const { buf } = view;
      if (cells && row >= 0) {
        sink.pushRecord(buf, view.gapStart, view.contentEnd, view.next, outDelimiter, cells, row);
        row++;
        return;
      }
      if (wholeRecords) {
        sink.pushBytes(buf, view.gapStart, view.contentEnd);
      } else {
        sink.pushBytes(buf, view.gapStart, view.contentStart);
        for (let k = 0; k < view.fieldCount; k++) {
          if (k > 0) sink.pushText(delimiter);
          const replacement = row >= 0 ? replacing.get(k) : undefined;
          if (replacement) sink.pushText(quoted(replacement.cell(row), delimiter));
          else if (copyFields) sink.pushBytes(buf, view.starts[k], view.ends[k]);
          else sink.push(quotedBytes(fieldBytes(view, k), delimiter));
        }
      }
      for (let k = 0; k < appended.length; k++) {
        const column = appended[k] as OutputColumn;
        if (row >= 0) {
          const { numbers, decisions } = column;
          if (numbers && unquoted(numbers, outDelimiter)) {
            sink.pushNumberCell(outDelimiter, numbers.values[row] as number, numbers.decimalComma);
            continue;
          }
          if (decisions) {
            sink.pushDecisionCell(outDelimiter, decisions.values[row] as number, decisions.alpha);
            continue;
          }
        }
        const text = row < 0 ? column.name : column.cell(row);
        if (sink.pushPlainCell(outDelimiter, text)) continue;
        sink.pushText(delimiter);
        sink.pushText(quoted(text, delimiter));
      }
      sink.pushBytes(buf, view.contentEnd, view.next);
      row++;
    },
    afterBlock: () => sink.flush(),
    trailing(buf, from) {
      sink.push(buf.subarray(from));
    },
  });
  if (!part) checkRowCount(source, row, expectedRows);
  await sink.flush(true);
  return row;
}

/** Whether numbers are written without quotes: their text holds no quote or line break, and the delimiter only as a decimal comma. */
function unquoted(numbers: { readonly decimalComma: boolean }, delimiter: number): boolean {
  return !(numbers.decimalComma && delimiter === COMMA);
}

/** The new cells as PlainCells, if every one is a number or a decision written without quotes; undefined otherwise. */
function plainCells(appended: readonly OutputColumn[], delimiter: number): PlainCells | undefined {
  const kinds: number[] = [];
  const values: Float64Array[] = [];
  const alphas: number[] = [];
  let decimalComma = false;
  for (const { numbers, decisions } of appended) {
    if (numbers && unquoted(numbers, delimiter)) {
      kinds.push(NUMBER_CELL);
      values.push(numbers.values);
      alphas.push(0);
      decimalComma ||= numbers.decimalComma;
    } else if (decisions) {
      kinds.push(DECISION_CELL);
      values.push(decisions.values);
      alphas.push(decisions.alpha);
    } else return undefined;
  }
  // One setting for every number: columns that differ in it take the general way.
  if (appended.some(({ numbers }) => numbers && numbers.decimalComma !== decimalComma)) return undefined;
  return { kinds: Uint8Array.from(kinds), values, alphas: Float64Array.from(alphas), decimalComma, room: appended.length * (1 + LONGEST_NUMBER) };
}

/**
 * The bytes writeTable writes for the table's first part, the input's
 * first inputBytes bytes (its header and first rows), given the bytes of
 * those rows' new cells, delimiters included; undefined unless the table is
 * written the plain way, the one this can tell ahead: records copied whole,
 * every new cell a number or a decision with no quotes. Each record is then
 * its own bytes and its cells, and the header its own and the cells' names.
 */
export function firstPartOutputBytes(shape: TableShape, columns: readonly OutputColumn[], format: OutputFormat, inputBytes: number, cellBytes: number): number | undefined {
  if ('headings' in format) return undefined;
  const { replacing, appended } = splitColumns(columns);
  if (format.delimiter !== shape.delimiter || replacing.size > 0 || plainCells(appended, format.delimiter) === undefined) return undefined;
  const delimiter = String.fromCharCode(format.delimiter);
  // As record() writes a name: plain (pushPlainCell), or quoted where it must be (which leaves other text as it is).
  const names = shape.names ? appended.reduce((sum, column) => sum + 1 + Buffer.byteLength(quoted(column.name, delimiter)), 0) : 0;
  return inputBytes + names + cellBytes;
}

export function checkRowCount(source: InputSource, rows: number, expected: number): void {
  if (rows !== expected) {
    throw new DataError(`${source.name}: changed while famwise was reading it (${expected} rows at first, ${rows} now)`);
  }
}

// Reading the value column of a table that holds test statistics or -log10 p
// (the input options --statistic and --p-scale): finding the column, and
// turning each cell (and its degrees of freedom) into a p-value, with errors
// that name the file, line, column and text. read-table.ts asks for one only
// when the user chose such a reading; plain p-values never pass through here.

import { UsageError, quoteText } from '../errors.js';
import { type RecordView, fieldText } from './csv-scan.js';
import { type TableShape, columnLabel, listColumns, normalizedName, resolveColumn } from './read-table.js';
import {
  type DegreesSource,
  type ValueReading,
  VALUE_COLUMN_NAMES,
  VALUE_NAMES,
  degreesNeeded,
  pFromValue,
  readNumber,
  valueKind,
  whyNotDegrees,
  whyNotValue,
} from './statistic-text.js';

/** A cell the converter cannot read; the reader reports it with its file and line, and goes on to count the rest. */
export class CellRefusal extends Error {
  constructor(readonly reason: string) {
    super(reason);
  }
}

export interface ValueConverter {
  /** The value column's index. */
  readonly column: number;
  /** The p-value of a row, from the text of its value cell; 'missing' when it, or a degrees-of-freedom cell it needs, is missing. */
  readonly pValue: (text: string, view: RecordView) => number | 'missing';
}

/** The option that names the value column, for messages. */
function valueOption(reading: ValueReading): string {
  return reading.kind === 'statistic' ? '--statistic-column' : '--p-column';
}

/** The one column named like the values a reading expects (z, t_value, log10p, ...). */
function findValueColumn(shape: TableShape, reading: ValueReading): number {
  const option = valueOption(reading);
  const what = VALUE_NAMES[valueKind(reading)];
  const names = shape.names;
  if (!names) {
    if (shape.columnCount === 1) return 0;
    throw new UsageError(`the table has no header and ${shape.columnCount} columns: say which holds the ${what}s with ${option} N`);
  }
  const accepted = VALUE_COLUMN_NAMES[valueKind(reading)];
  const candidates = names.flatMap((name, i) => (accepted.includes(normalizedName(name)) ? [i] : []));
  if (candidates.length === 1) return candidates[0] as number;
  if (candidates.length === 0) {
    throw new UsageError(`no column is named like a ${what} column (${accepted.slice(0, 4).join(', ')}, ...); name it with ${option}; the columns are ${listColumns(names)}`);
  }
  const listed = candidates.map((i) => `${quoteText(names[i] ?? '')} (column ${i + 1})`).join(', ');
  throw new UsageError(`several columns could hold the ${what}s: ${listed}; choose one with ${option}`);
}

/** Degrees of freedom for each row: a constant, or a column resolved against the header. */
type RowDegrees = { readonly constant: number } | { readonly column: number };

function resolveDegrees(shape: TableShape, source: DegreesSource | undefined, option: string): RowDegrees {
  if (source === undefined) return { constant: NaN };
  return 'constant' in source ? source : { column: resolveColumn(shape, source.column, option) };
}

/**
 * The converter for a table: the value column is `wanted` (a name or 1-based
 * position) or the one named like the reading's values; degrees-of-freedom
 * columns are resolved now, so that a wrong name fails before any row is read.
 */
export function valueConverter(reading: ValueReading, shape: TableShape, wanted: string | undefined, decimalComma: boolean): ValueConverter {
  const column = wanted === undefined ? findValueColumn(shape, reading) : resolveColumn(shape, wanted, valueOption(reading));
  const degrees =
    reading.kind === 'statistic'
      ? [resolveDegrees(shape, reading.df, '--df-column'), resolveDegrees(shape, reading.df2, '--df2-column')].slice(0, degreesNeeded(reading))
      : [];
  const kind = valueKind(reading);
  const same = degrees.find((which) => 'column' in which && which.column === column);
  if (same) throw new UsageError(`${valueOption(reading)} and the degrees of freedom name the same column, ${columnLabel(shape, column)}; the statistic and its degrees of freedom need columns of their own`);

  const rowDegrees = (view: RecordView, which: RowDegrees): number => {
    if ('constant' in which) return which.constant;
    const text = fieldText(view, which.column);
    const value = readNumber(text, decimalComma);
    if (value === 'missing') return NaN;
    const why = whyNotDegrees(value);
    if (why) throw new CellRefusal(`${columnLabel(shape, which.column)}: ${quoteText(text)} is not a number of degrees of freedom: ${why}`);
    return value as number;
  };

  return {
    column,
    pValue(text, view) {
      const value = readNumber(text, decimalComma);
      if (value === 'missing') return 'missing';
      const why = whyNotValue(kind, value, text, decimalComma);
      if (why) throw new CellRefusal(`${columnLabel(shape, column)}: ${quoteText(text)} is not a ${VALUE_NAMES[kind]}: ${why}`);
      const needed = degrees.map((which) => rowDegrees(view, which));
      if (needed.some(Number.isNaN)) return 'missing';
      return pFromValue(reading, value as number, needed[0] ?? NaN, needed[1] ?? NaN);
    },
  };
}

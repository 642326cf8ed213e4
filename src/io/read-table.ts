// The first pass over a table: find the header and the columns asked for,
// then read every row's p-value and family into typed arrays. Nothing else
// of the row is kept; writers read the source again to copy it out.

import { DataError, UsageError, quoteText } from '../errors.js';
import type { FamilyGrouping } from '../families.js';
import { type RecordView, fieldText } from './csv-scan.js';
import { type Dialect, sniffDelimiter, sniffLoneCr } from './dialect.js';
import { GrowableFloat64, GrowableInt32 } from './growable.js';
import { readPValue, whyNotPValue } from './p-value-text.js';
import { peek, scanInput } from './scan-input.js';
import type { InputSource } from './source.js';

export interface ReadOptions {
  /** The delimiter byte; undefined to sniff it from the first line. */
  readonly delimiter?: number | undefined;
  /** Whether the first line names the columns; undefined to decide from its content. */
  readonly header?: boolean | undefined;
  /** Column name or 1-based index; undefined to find the one p-value column by its name. */
  readonly pColumn?: string | undefined;
  /** Column names or 1-based indices whose value combinations define the families. */
  readonly familyColumns?: readonly string[] | undefined;
}

/** The layout of a table, as the writers need it. */
export interface TableShape extends Dialect {
  /** Column names from the header, or null when there is none. */
  readonly names: readonly string[] | null;
  readonly columnCount: number;
}

export interface Table {
  readonly shape: TableShape;
  readonly pColumn: number;
  readonly familyColumns: readonly number[];
  /** p-value by data row; NaN where missing. */
  readonly p: Float64Array;
  readonly families: FamilyGrouping;
  /** familyValues[f] = the family columns' values that define family f. */
  readonly familyValues: readonly (readonly string[])[];
  /** Things the user should know (how the header was decided, ...). */
  readonly notices: readonly string[];
}

/** Header names, lower-cased with everything but letters and digits removed, that mean "raw p-value". */
const P_COLUMN_NAMES = new Set([
  'p', 'pval', 'pvals', 'pvalue', 'pvalues', 'rawp', 'praw', 'rawpvalue', 'pvalueraw',
  'nominalp', 'pnominal', 'nominalpvalue', 'prt', 'prz', 'prf', 'prchisq',
]);

const NUMBER = /^[+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?$/;

function normalizedName(name: string): string {
  return name.toLowerCase().replace(/[^a-z0-9]/g, '');
}

/** How a column is called in messages. */
export function columnLabel(shape: TableShape, column: number): string {
  return shape.names ? `column ${quoteText(shape.names[column])}` : `column ${column + 1}`;
}

function listColumns(names: readonly string[]): string {
  return names.map((name) => quoteText(name, 40)).join(', ');
}

/** The index of a column given by name or 1-based position; `option` names the option in messages. */
export function resolveColumn(shape: TableShape, wanted: string, option: string): number {
  if (shape.names) {
    const matches = shape.names.flatMap((name, i) => (name === wanted ? [i] : []));
    if (matches.length === 1) return matches[0];
    if (matches.length > 1) {
      throw new UsageError(`${option} ${quoteText(wanted)}: the header has ${matches.length} columns of that name (columns ${matches.map((i) => i + 1).join(', ')}); give the position instead`);
    }
  }
  if (/^\d+$/.test(wanted)) {
    const index = Number(wanted) - 1;
    if (index >= 0 && index < shape.columnCount) return index;
    throw new UsageError(`${option} ${wanted}: the table has columns 1 to ${shape.columnCount}`);
  }
  if (!shape.names) {
    throw new UsageError(`${option} ${quoteText(wanted)}: the table has no header, so give the column's position (1 to ${shape.columnCount})`);
  }
  throw new UsageError(`${option} ${quoteText(wanted)}: no such column; the columns are ${listColumns(shape.names)}`);
}

function findPColumn(shape: TableShape): number {
  if (!shape.names) {
    if (shape.columnCount === 1) return 0;
    throw new UsageError(`the table has no header and ${shape.columnCount} columns: say which holds the p-values with --p-column N`);
  }
  const candidates = shape.names.flatMap((name, i) => (P_COLUMN_NAMES.has(normalizedName(name)) ? [i] : []));
  if (candidates.length === 1) return candidates[0];
  if (candidates.length === 0) {
    throw new UsageError(`no column is named like a p-value column (p, pvalue, p_value, pval, ...); name it with --p-column; the columns are ${listColumns(shape.names)}`);
  }
  const names = candidates.map((i) => shape.names?.[i] as string);
  throw new UsageError(`several columns could hold the raw p-values: ${listColumns(names)}; choose one with --p-column`);
}

function allNumbers(view: RecordView): boolean {
  for (let k = 0; k < view.fieldCount; k++) if (!NUMBER.test(fieldText(view, k).trim())) return false;
  return true;
}

/** Reads the p-values and families of a table (the first pass). */
export async function readTable(source: InputSource, options: ReadOptions): Promise<Table> {
  const head = await peek(source, 1 << 16);
  const delimiter = options.delimiter ?? sniffDelimiter(head, source.extension);
  const loneCrEndsLine = sniffLoneCr(head);
  const decimalComma = delimiter === 0x3b;
  const notices: string[] = [];
  const p = new GrowableFloat64();
  const familyIds = new GrowableInt32();
  const familyIndex = new Map<string, number>();
  const familyValues: string[][] = [];
  let shape: TableShape | undefined;
  let pColumn = -1;
  let familyColumns: number[] = [];

  const start = (view: RecordView): boolean => {
    const header = options.header ?? !allNumbers(view);
    if (options.header === undefined && !header) {
      notices.push('the first line holds only numbers, so it is read as data, not as a header (say --header if it is one)');
    }
    const names = header ? Array.from({ length: view.fieldCount }, (_, k) => fieldText(view, k)) : null;
    shape = { delimiter, loneCrEndsLine, names, columnCount: view.fieldCount };
    pColumn = options.pColumn === undefined ? findPColumn(shape) : resolveColumn(shape, options.pColumn, '--p-column');
    familyColumns = (options.familyColumns ?? []).map((wanted) => resolveColumn(shape as TableShape, wanted, '--family'));
    return header;
  };

  const readRow = (view: RecordView, table: TableShape): void => {
    if (view.fieldCount !== table.columnCount) {
      const what = table.names ? 'the header has' : 'the first line has';
      throw new DataError(`${source.name}:${view.line}: ${view.fieldCount} fields where ${what} ${table.columnCount} (a stray delimiter or quote?)`);
    }
    const text = fieldText(view, pColumn);
    const value = readPValue(text, decimalComma);
    if (value === 'invalid') {
      throw new DataError(`${source.name}:${view.line}: ${columnLabel(table, pColumn)}: ${quoteText(text)} is not a p-value: ${whyNotPValue(text)}`);
    }
    p.push(value === 'missing' ? NaN : value);
    if (familyColumns.length === 0) {
      familyIds.push(0);
      return;
    }
    const values = familyColumns.map((column) => fieldText(view, column));
    const key = values.length === 1 ? (values[0]) : JSON.stringify(values);
    let id = familyIndex.get(key);
    if (id === undefined) {
      id = familyValues.length;
      familyIndex.set(key, id);
      familyValues.push(values);
    }
    familyIds.push(id);
  };

  await scanInput(source, { delimiter, loneCrEndsLine }, {
    record(view) {
      if (shape === undefined) {
        if (start(view)) return;
      }
      readRow(view, shape as TableShape);
    },
  });

  if (shape === undefined) {
    throw new DataError(`${source.name}: the input is empty: expected a table with a header line and one row per test`);
  }
  if (familyColumns.length === 0) familyValues.push([]);
  return {
    shape,
    pColumn,
    familyColumns,
    p: p.toArray(),
    families: { ids: familyIds.toArray(), count: familyValues.length },
    familyValues,
    notices,
  };
}

// The first pass over a table: find the header and the columns asked for,
// then read every row's p-value and family into typed arrays. Nothing else
// of the row is kept; writers read the source again to copy it out.

import { DataError, UsageError, quoteText } from '../errors.js';
import { type FamilyGrouping, singleFamily } from '../families.js';
import { type RecordView, fieldText } from './csv-scan.js';
import { COMMA, type Dialect, sniffDelimiter, sniffLoneCr } from './dialect.js';
import { Growable } from './growable.js';
import { MISSING_MARKS, isNumberText, readPValue, readWeight, whyNotPValue, whyNotWeight } from './p-value-text.js';
import { NOT_SIMPLE, simpleDecimal } from './number-bytes.js';
import { readPrintedValue } from './printed-value.js';
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
  /** Column name or 1-based index of prior weights; undefined for none. */
  readonly weightsColumn?: string | undefined;
  /** Column name or 1-based index of adjusted p-values computed elsewhere (audit); undefined for none. */
  readonly claimedColumn?: string | undefined;
  /** Keep each data row's line number (for messages about rows after reading). */
  readonly lineNumbers?: boolean | undefined;
  /** Group rows by every other column with few distinct values (audit tries them as families). */
  readonly keyColumns?: boolean | undefined;
}

/** Adjusted p-values a table claims, with the precision each was printed to. */
export interface ClaimedColumn {
  readonly column: number;
  /** By data row; NaN where missing. */
  readonly values: Float64Array;
  /** Half a unit of each value's last printed digit (0: exact). */
  readonly halfUnits: Float64Array;
}

/** A column whose values group the rows, as a family column would. */
export interface KeyColumn {
  readonly column: number;
  readonly families: FamilyGrouping;
}

/** Columns with more distinct values than this are not tried as families. */
const KEY_LIMIT = 1000;
/** Only this many columns are followed as possible families. */
const KEY_COLUMNS = 64;

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
  /** The weights column and its values by data row (NaN where the p-value is missing), when asked for. */
  readonly weightsColumn?: number;
  readonly weights?: Float64Array;
  readonly claimed?: ClaimedColumn;
  /** Line number of each data row, when asked for. */
  readonly lines?: Int32Array;
  /** Columns with 2 to 1000 distinct values (other than the p-value and claimed columns), when asked for. */
  readonly keys?: readonly KeyColumn[];
  readonly families: FamilyGrouping;
  /** familyValues[f] = the family columns' values that define family f. */
  readonly familyValues: readonly (readonly string[])[];
  /** Whether the p-values were written with decimal commas (then new numbers should be too). */
  readonly decimalComma: boolean;
  /** Things the user should know (how the header was decided, ...). */
  readonly notices: readonly Notice[];
}

/** Something the user should know about how the table was read; the id lets callers choose. */
export interface Notice {
  readonly id: 'header-guessed';
  readonly text: string;
}

/** Header names, lower-cased with everything but letters and digits removed, that mean "raw p-value". */
const P_COLUMN_NAMES = new Set([
  'p', 'pval', 'pvals', 'pvalue', 'pvalues', 'rawp', 'praw', 'rawpvalue', 'pvalueraw',
  'nominalp', 'pnominal', 'nominalpvalue', 'prt', 'prz', 'prf', 'prchisq',
]);


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

/** A column name that looks like a number: the first line may be data, not a header. */
const LOOKS_LIKE_DATA = /^[\s\d.,eE+-]*\d[\s\d.,eE+-]*$/;

function headerHint(names: readonly string[]): string {
  if (!names.some((name) => LOOKS_LIKE_DATA.test(name))) return '';
  return names.length === 1 && /\d\s+\d/.test(names[0] ?? '')
    ? ' (p-values go one per line, or use --values 0.01,0.04,...)'
    : ' (the first line looks like data: if the table has no header, use --no-header with --p-column N)';
}

/** The index of a column given by name or 1-based position; `option` names the option in messages. */
export function resolveColumn(shape: TableShape, wanted: string, option: string): number {
  const names = shape.names;
  if (names) {
    // An exact name first; then the name without surrounding spaces.
    for (const same of [(name: string) => name === wanted, (name: string) => name.trim() === wanted.trim()]) {
      const matches = names.flatMap((name, i) => (same(name) ? [i] : []));
      if (matches.length === 1) return matches[0];
      if (matches.length > 1) {
        throw new UsageError(`${option} ${quoteText(wanted)}: the header has ${matches.length} columns of that name (columns ${matches.map((i) => i + 1).join(', ')}); give the position instead`);
      }
    }
  }
  if (/^\d+$/.test(wanted)) {
    const index = Number(wanted) - 1;
    if (index >= 0 && index < shape.columnCount) return index;
    throw new UsageError(`${option} ${wanted}: the table has columns 1 to ${shape.columnCount}`);
  }
  if (!names) {
    throw new UsageError(`${option} ${quoteText(wanted)}: the table has no header, so give the column's position (1 to ${shape.columnCount})`);
  }
  const sameLetters = names.filter((name) => name.trim().toLowerCase() === wanted.trim().toLowerCase());
  const suggestion = sameLetters.length === 1 ? `did you mean ${quoteText(sameLetters[0] ?? '')}? ` : '';
  throw new UsageError(`${option} ${quoteText(wanted)}: no such column; ${suggestion}the columns are ${listColumns(names)}${headerHint(names)}`);
}

function findPColumn(shape: TableShape): number {
  const names = shape.names;
  if (!names) {
    if (shape.columnCount === 1) return 0;
    throw new UsageError(`the table has no header and ${shape.columnCount} columns: say which holds the p-values with --p-column N`);
  }
  const candidates = names.flatMap((name, i) => (P_COLUMN_NAMES.has(normalizedName(name)) ? [i] : []));
  if (candidates.length === 1) return candidates[0];
  if (candidates.length === 0) {
    throw new UsageError(`no column is named like a p-value column (p, pvalue, p_value, pval, ...); name it with --p-column; the columns are ${listColumns(names)}${headerHint(names)}`);
  }
  const listed = candidates.map((i) => `${quoteText(names[i] ?? '')} (column ${i + 1})`).join(', ');
  throw new UsageError(`several columns could hold the raw p-values: ${listed}; choose one with --p-column`);
}

/** Family columns must be distinct, and distinctly named, to label the families. */
function checkFamilyColumns(shape: TableShape, columns: readonly number[]): void {
  columns.forEach((column, k) => {
    const earlier = columns.indexOf(column);
    if (earlier < k) throw new UsageError(`--family: column ${column + 1} is named twice`);
    const name = shape.names?.[column];
    const twin = columns.find((other) => other !== column && name !== undefined && shape.names?.[other] === name);
    if (twin !== undefined) {
      throw new UsageError(`--family: columns ${Math.min(column, twin) + 1} and ${Math.max(column, twin) + 1} are both named ${quoteText(name ?? '')}, so their families could not be told apart in the summary; rename one`);
    }
  });
}

/** Whether every field is a number or a missing-value mark (so the line is data, not names). */
function allNumbers(view: RecordView): boolean {
  for (let k = 0; k < view.fieldCount; k++) {
    const text = fieldText(view, k).trim();
    if (!isNumberText(text) && !(text !== '' && MISSING_MARKS.includes(text))) return false;
  }
  return true;
}

/**
 * A value's bytes (as latin1 text) shown as UTF-8 text; bytes that are not
 * valid UTF-8 are shown as \xHH, so that values differing only in them
 * still look different.
 */
function shownText(latin1: string): string {
  const bytes = Buffer.from(latin1, 'latin1');
  const text = bytes.toString('utf8');
  if (!text.includes('\ufffd') || Buffer.from(text, 'utf8').equals(bytes)) return text;
  return latin1.replace(/[\x80-\xff]/g, (character) => `\\x${character.charCodeAt(0).toString(16)}`);
}

/** Encodings that famwise does not read, recognised by their first bytes (gzip is decompressed before: io/gzip.ts). */
function refuseUnreadable(head: Buffer, name: string): void {
  if ((head[0] === 0xff && head[1] === 0xfe) || (head[0] === 0xfe && head[1] === 0xff)) {
    throw new DataError(`${name}: the file is UTF-16 text (as some spreadsheet "Unicode text" exports are); convert it to UTF-8 first, e.g. iconv -f UTF-16 -t UTF-8 ${name}`);
  }
}

function fieldCountMessage(view: RecordView, table: TableShape, firstRow: boolean): string {
  const fields = `${view.fieldCount} field${view.fieldCount === 1 ? '' : 's'}`;
  const what = table.names ? 'the header has' : 'the first line has';
  let hint = '(a stray delimiter or quote?)';
  if (view.fieldCount === 1 && fieldText(view, 0).trim() === '') hint = '(a line holding only spaces?)';
  else if (firstRow && table.names && view.fieldCount === table.columnCount + 1) {
    hint = '(is the first column row names? A table written by R with row names has one field fewer in its header: write it with row.names = FALSE, or col.names = NA)';
  }
  return `${fields} where ${what} ${table.columnCount} ${hint}`;
}

/** Reads the p-values and families of a table (the first pass). */
export async function readTable(source: InputSource, options: ReadOptions): Promise<Table> {
  const head = await peek(source, 1 << 16);
  refuseUnreadable(head, source.name);
  const delimiter = options.delimiter ?? sniffDelimiter(head, source.extension);
  const loneCrEndsLine = sniffLoneCr(head);
  // In a table not separated by commas, "0,05" can only be a decimal comma.
  const decimalCommaAllowed = delimiter !== COMMA;
  let decimalCommaSeen = false;
  const notices: Notice[] = [];
  const p = new Growable((size) => new Float64Array(size));
  const familyIds = new Growable((size) => new Int32Array(size));
  const familyIndex = new Map<string, number>();
  const familyValues: string[][] = [];
  let shape: TableShape | undefined;
  let pColumn = -1;
  let familyColumns: number[] = [];
  let weightsColumn = -1;
  const weights = new Growable((size) => new Float64Array(size));
  let claimedColumn = -1;
  const claimedValues = new Growable((size) => new Float64Array(size));
  const claimedHalfUnits = new Growable((size) => new Float64Array(size));
  const lines = new Growable((size) => new Int32Array(size));
  let keyTrackers: { column: number; index: Map<string, number>; ids: Growable<Int32Array> }[] = [];

  const start = (view: RecordView): boolean => {
    const header = options.header ?? !allNumbers(view);
    if (options.header === undefined && !header) {
      notices.push({ id: 'header-guessed', text: 'the first line holds only numbers, so it is read as data, not as a header (say --header if it is one)' });
    }
    const names = header ? Array.from({ length: view.fieldCount }, (_, k) => fieldText(view, k)) : null;
    shape = { delimiter, loneCrEndsLine, names, columnCount: view.fieldCount };
    pColumn = options.pColumn === undefined ? findPColumn(shape) : resolveColumn(shape, options.pColumn, '--p-column');
    familyColumns = (options.familyColumns ?? []).map((wanted) => resolveColumn(shape as TableShape, wanted, '--family'));
    checkFamilyColumns(shape, familyColumns);
    if (options.weightsColumn !== undefined) {
      weightsColumn = resolveColumn(shape, options.weightsColumn, '--weights');
      if (weightsColumn === pColumn) throw new UsageError(`--weights ${quoteText(options.weightsColumn)}: is the p-value column; name the column of weights`);
    }
    if (options.claimedColumn !== undefined) {
      claimedColumn = resolveColumn(shape, options.claimedColumn, '--adjusted-column');
      if (claimedColumn === pColumn) {
        throw new UsageError(`--adjusted-column ${quoteText(options.claimedColumn)}: is the raw p-value column; name the column of adjusted values (or the raw one with --p-column)`);
      }
    }
    if (options.keyColumns) {
      keyTrackers = Array.from({ length: view.fieldCount }, (_, column) => column)
        .filter((column) => column !== pColumn && column !== claimedColumn)
        .slice(0, KEY_COLUMNS)
        .map((column) => ({ column, index: new Map<string, number>(), ids: new Growable((size) => new Int32Array(size)) }));
    }
    return header;
  };

  const readRow = (view: RecordView, table: TableShape): void => {
    if (view.fieldCount !== table.columnCount) {
      throw new DataError(`${source.name}:${view.line}: ${fieldCountMessage(view, table, p.length === 0)}`);
    }
    // Most cells are plain decimals, read from the bytes; the rest go through the text.
    const simple = simpleDecimal(view.buf, view.starts[pColumn], view.ends[pColumn]);
    const value = simple !== NOT_SIMPLE && simple <= 1 ? simple : readRowPValue(view, table);
    p.push(value);
    if (weightsColumn >= 0) weights.push(Number.isNaN(value) ? NaN : readRowWeight(view, table));
    if (claimedColumn >= 0) readRowClaim(view, table);
    if (options.lineNumbers) lines.push(view.line);
    if (keyTrackers.length > 0) trackKeys(view);
    // Without family columns every row is in family 0: nothing to keep per row.
    if (familyColumns.length === 0) return;
    // Keyed on the bytes, so that values differing only in bytes that are not
    // valid UTF-8 stay apart; decoded as UTF-8 only to show them.
    const bytes = familyColumns.map((column) => fieldText(view, column, 'latin1'));
    const key = bytes.length === 1 ? bytes[0] : JSON.stringify(bytes);
    let id = familyIndex.get(key);
    if (id === undefined) {
      id = familyValues.length;
      familyIndex.set(key, id);
      familyValues.push(bytes.map(shownText));
    }
    familyIds.push(id);
  };

  /** The p-value in a row (NaN where missing), read from the field's text; an error names a bad one. */
  const readRowPValue = (view: RecordView, table: TableShape): number => {
    const text = fieldText(view, pColumn);
    const value = readPValue(text, decimalCommaAllowed);
    if (value === 'invalid') {
      throw new DataError(`${source.name}:${view.line}: ${columnLabel(table, pColumn)}: ${quoteText(text)} is not a p-value: ${whyNotPValue(text, decimalCommaAllowed)}`);
    }
    if (decimalCommaAllowed && !decimalCommaSeen && text.includes(',')) decimalCommaSeen = true;
    return value === 'missing' ? NaN : value;
  };

  const readRowWeight = (view: RecordView, table: TableShape): number => {
    const text = fieldText(view, weightsColumn);
    const weight = readWeight(text, decimalCommaAllowed);
    const where = `${source.name}:${view.line}: ${columnLabel(table, weightsColumn)}`;
    if (weight === 'missing') {
      throw new DataError(`${where}: the weight is missing on a row with a p-value; give every tested row a weight (0 if it should never be rejected)`);
    }
    if (weight === 'invalid' || weight < 0 || Object.is(weight, -0)) {
      throw new DataError(`${where}: ${quoteText(text)} is not a weight: ${whyNotWeight(text)}`);
    }
    return weight;
  };

  const readRowClaim = (view: RecordView, table: TableShape): void => {
    const text = fieldText(view, claimedColumn);
    const printed = MISSING_MARKS.includes(text.trim()) ? { value: NaN, halfUnit: NaN } : readPrintedValue(text, decimalCommaAllowed);
    if (printed === undefined || printed.value < 0 || printed.value > 1) {
      throw new DataError(`${source.name}:${view.line}: ${columnLabel(table, claimedColumn)}: ${quoteText(text)} is not an adjusted p-value: expected a number from 0 to 1 or a missing-value mark`);
    }
    claimedValues.push(printed.value);
    claimedHalfUnits.push(printed.halfUnit);
  };

  const trackKeys = (view: RecordView): void => {
    keyTrackers = keyTrackers.filter((tracker) => {
      const key = fieldText(view, tracker.column, 'latin1');
      let id = tracker.index.get(key);
      if (id === undefined) {
        if (tracker.index.size === KEY_LIMIT) return false;
        id = tracker.index.size;
        tracker.index.set(key, id);
      }
      tracker.ids.push(id);
      return true;
    });
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
    ...(weightsColumn >= 0 ? { weightsColumn, weights: weights.toArray() } : {}),
    ...(claimedColumn >= 0 ? { claimed: { column: claimedColumn, values: claimedValues.toArray(), halfUnits: claimedHalfUnits.toArray() } } : {}),
    ...(options.lineNumbers ? { lines: lines.toArray() } : {}),
    ...(options.keyColumns
      ? {
          keys: keyTrackers
            .filter((tracker) => tracker.index.size >= 2)
            .map((tracker) => ({ column: tracker.column, families: { ids: tracker.ids.toArray(), count: tracker.index.size } })),
        }
      : {}),
    families: familyColumns.length === 0 ? singleFamily(p.length) : { ids: familyIds.toArray(), count: familyValues.length },
    familyValues,
    decimalComma: decimalCommaSeen,
    notices,
  };
}

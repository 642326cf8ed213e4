// The first pass over a table: find the header and the columns asked for,
// then read every row's p-value and family into typed arrays. Nothing else
// of the row is kept; writers read the source again to copy it out.

import { readSync } from 'node:fs';
import { DataError, UsageError, quoteText } from '../errors.js';
import { type FamilyGrouping, singleFamily } from '../families.js';
import { type PlainColumn, type RecordView, fieldText } from './csv-scan.js';
import { type Sorted, type SortedParts, sharedFloat64, sortAscendingInPlace } from '../procedures/sorting.js';
import { COMMA, type Dialect, sniffDelimiter, sniffLoneCr } from './dialect.js';
import { Growable } from './growable.js';
import { MISSING_MARKS, type PValueText, isNumberText, readPValue, readUpperBound, readWeight, underflowed, whyNotPValue, whyNotWeight } from './p-value-text.js';
import { NOT_SIMPLE, simpleDecimal } from './number-bytes.js';
import { admissibleClaim, readPrintedValue } from './printed-value.js';
import { type RunningPart, inParts, startPart, warmUp } from './parts.js';
import { releaseMemory } from './release-memory.js';
import { lookAtHead, scanInput } from './scan-input.js';
import { type InputSource, contentEnd, countedInto, rangeSource } from './source.js';
import type { ValueReading } from './statistic-text.js';
import { CellRefusal, type ValueConverter, valueConverter } from './value-converter.js';

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
  /** Keep the precision each p-value was printed with (audit compares to it). */
  readonly pPrecision?: boolean | undefined;
  /** Group rows by every other column with few distinct values (audit tries them as families). */
  readonly keyColumns?: boolean | undefined;
  /**
   * What the value column (pColumn) holds when it is not plain p-values: test
   * statistics or -log10 p, turned into p-values as they are read. Undefined
   * for plain p-values.
   */
  readonly reading?: ValueReading | undefined;
  /**
   * Also sort the p-values when the table is read in two parts
   * (Table.sortedParts), for a caller that adjusts them: each thread sorts
   * its own part.
   */
  readonly sortP?: boolean | undefined;
  /** Read an upper bound ("<2e-16") as its value instead of refusing it. */
  readonly boundsAsValues?: boolean | undefined;
  /**
   * The table's layout, when it is known before reading: the source is then
   * a later part of a table (read in a worker thread, parts.ts), every record
   * is data, and the delimiter and header are not looked for.
   */
  readonly shape?: TableShape | undefined;
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

/**
 * A record near the middle of a table read from a file: the second pass can
 * write the two parts apart, in two threads (io/parallel-write.ts).
 */
export interface SplitPoint {
  /** Where the record's first byte lies in the input. */
  readonly offset: number;
  /** Its data row (0-based, header excluded) and line. */
  readonly row: number;
  readonly line: number;
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
  /** The weights column and its values by data row (NaN where the p-value is missing), when asked for. */
  readonly weightsColumn?: number;
  readonly weights?: Float64Array;
  readonly claimed?: ClaimedColumn;
  /** Line number of each data row, when asked for. */
  readonly lines?: Int32Array;
  /** Half a unit of the last digit each p-value was printed with (BARE_INTEGER for a bare 0 or 1; 0 when computed), when asked for. */
  readonly pHalfUnits?: Float64Array;
  /** Columns with 2 to 1000 distinct values (other than the p-value and claimed columns), when asked for. */
  readonly keys?: readonly KeyColumn[];
  /** Whether p was computed (from statistics or -log10 p) rather than read as written. */
  readonly pComputed: boolean;
  readonly families: FamilyGrouping;
  /** familyValues[f] = the family columns' values that define family f. */
  readonly familyValues: readonly (readonly string[])[];
  /** Whether the p-values were written with decimal commas (then new numbers should be too). */
  readonly decimalComma: boolean;
  /** Things the user should know (how the header was decided, ...). */
  readonly notices: readonly Notice[];
  /** The first data record at or past the middle of the input, when it can be read by position. */
  readonly split?: SplitPoint;
  /**
   * p sorted in its two parts, the first ending at split.row, when the table
   * was read and sorted in two threads (a table with no family columns,
   * weights or missing p-values). Whoever uses it clears it, so that it is
   * not kept longer than needed (12 bytes a row).
   */
  sortedParts?: SortedParts | undefined;
}

/** Something the user should know about how the table was read; the id lets callers choose. */
export interface Notice {
  readonly id: 'header-guessed' | 'underflow' | 'bounds-read';
  readonly text: string;
}

/** Header names, lower-cased with everything but letters and digits removed, that mean "raw p-value". */
const P_COLUMN_NAMES = new Set([
  'p', 'pval', 'pvals', 'pvalue', 'pvalues', 'rawp', 'praw', 'rawpvalue', 'pvalueraw',
  'nominalp', 'pnominal', 'nominalpvalue', 'prt', 'prz', 'prf', 'prchisq',
]);

export function normalizedName(name: string): string {
  return name.toLowerCase().replace(/[^a-z0-9]/g, '');
}

/** A column's name from the header, or its 1-based position in a table without one. */
export function columnName(shape: TableShape, column: number): string {
  return shape.names?.[column] ?? String(column + 1);
}

/** How a column is called in messages. */
export function columnLabel(shape: TableShape, column: number): string {
  return shape.names ? `column ${quoteText(shape.names[column])}` : `column ${column + 1}`;
}

export function listColumns(names: readonly string[]): string {
  return names.map((name) => quoteText(name, 40)).join(', ');
}

/** A column name that looks like a number: the first line may be data, not a header. */
const LOOKS_LIKE_DATA = /^[\s\d.,eE+-]*\d[\s\d.,eE+-]*$/;

function headerHint(names: readonly string[]): string {
  if (names.some((name) => name.includes('\ufffd'))) {
    // The header was decoded as UTF-8; a name that is not cannot be matched by typing it.
    return ' (the header is not valid UTF-8: give the column by position, or convert the file, e.g. iconv -f WINDOWS-1252 -t UTF-8, if it is Latin-1 or Windows-1252 text)';
  }
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

/** A family's key: the bytes (as latin1 text) of its values in the family columns. */
function familyKey(bytes: readonly string[]): string {
  return bytes.length === 1 ? (bytes[0] as string) : JSON.stringify(bytes);
}

/** The values a family key was made of, for a grouping by `columns` columns. */
function familyBytes(key: string, columns: number): string[] {
  return columns === 1 ? [key] : (JSON.parse(key) as string[]);
}

/** Whether the input starts with these bytes. */
function startsWith(head: Buffer, ...bytes: number[]): boolean {
  return bytes.every((byte, i) => head[i] === byte);
}

/**
 * UTF-16 without a byte-order mark: text in the ASCII range has a zero byte
 * in every other position (after each character in little-endian, before it
 * in big-endian). Two such pairs at the start are enough; a text table does
 * not begin with zero bytes. Returns the encoding's name for iconv.
 */
function utf16Without(head: Buffer): string | undefined {
  if (head.length < 4) return undefined;
  if (head[1] === 0 && head[3] === 0) return 'UTF-16LE';
  if (head[0] === 0 && head[2] === 0) return 'UTF-16BE';
  return undefined;
}

/** Encodings and spreadsheet files that famwise does not read, recognised by their first bytes (gzip is decompressed before: io/gzip.ts). */
function refuseUnreadable(head: Buffer, name: string): void {
  const utf16 = startsWith(head, 0xff, 0xfe) || startsWith(head, 0xfe, 0xff) ? 'UTF-16' : utf16Without(head);
  if (utf16) {
    throw new DataError(`${name}: the file is UTF-16 text (as some spreadsheet "Unicode text" exports are); convert it to UTF-8 first, e.g. iconv -f ${utf16} -t UTF-8 ${name}`);
  }
  // ZIP (.xlsx, .ods) and the older compound file format (.xls).
  if (startsWith(head, 0x50, 0x4b, 0x03, 0x04) || startsWith(head, 0xd0, 0xcf, 0x11, 0xe0)) {
    throw new DataError(`${name}: the file is a spreadsheet workbook or an archive, not a text table; save the sheet as CSV (UTF-8) and give famwise that file`);
  }
}

/** Whether the p-value column and the field after it are both whole numbers, as 0,05 split by a comma delimiter would be. */
function splitDecimalComma(view: RecordView, table: TableShape, pColumn: number): boolean {
  const whole = (k: number): boolean => k < view.fieldCount && /^\s*\d+\s*$/.test(fieldText(view, k));
  return table.delimiter === COMMA && view.fieldCount > table.columnCount && whole(pColumn) && whole(pColumn + 1);
}

function fieldCountMessage(view: RecordView, table: TableShape, pColumn: number, firstRow: boolean): string {
  const fields = `${view.fieldCount} field${view.fieldCount === 1 ? '' : 's'}`;
  const what = table.names ? 'the header has' : 'the first line has';
  let hint = '(a stray delimiter or quote?)';
  const hasLoneCr = Array.from({ length: view.fieldCount }, (_, k) => fieldText(view, k)).some((text) => /\r(?!\n)/.test(text));
  if (view.fieldCount === 1 && fieldText(view, 0).trim() === '') hint = '(a line holding only spaces?)';
  else if (hasLoneCr) {
    hint = '(it holds a lone carriage return, the line break of old Mac files, so two lines may run together here: convert the line endings, e.g. tr "\\r" "\\n")';
  } else if (splitDecimalComma(view, table, pColumn)) {
    const text = `${fieldText(view, pColumn)},${fieldText(view, pColumn + 1)}`;
    hint = `(is ${quoteText(text)} a p-value with a decimal comma? In a comma-separated table it must be quoted; or write the table with ";" between fields)`;
  } else if (firstRow && table.names && view.fieldCount === table.columnCount + 1) {
    hint = '(is the first column row names? A table written by R with row names has one field fewer in its header: write it with row.names = FALSE, or col.names = NA)';
  }
  return `${fields} where ${what} ${table.columnCount} ${hint}`;
}

/** Reads the p-values and families of a table (the first pass). */
export async function readTable(source: InputSource, options: ReadOptions): Promise<Table> {
  const { table, withWorker } = await readRecords(source, options);
  // The parts as the threads made them, merged into the table's arrays, are garbage now.
  if (withWorker) releaseMemory();
  return table;
}

/** What a worker thread reads of a later part of a table (parts.ts), by data row of the part. */
export interface ReadPart {
  readonly p: Float64Array;
  readonly weights?: Float64Array | undefined;
  /** Each row's family, an index into familyKeys; undefined without family columns. */
  readonly familyIds?: Int32Array | undefined;
  readonly familyKeys: readonly string[];
  readonly decimalComma: boolean;
  /** p sorted, when asked for and p has no missing values (there are no families or weights then). */
  readonly sorted?: Sorted | undefined;
}

/**
 * Reads a later part of a table whose layout is known (options.shape),
 * starting on line firstLine. A row refused, or a value to remark on,
 * rejects: the main thread then reads the part itself, so that what it
 * says is what one thread would say.
 */
export async function readTablePart(source: InputSource, options: ReadOptions & { readonly shape: TableShape }, firstLine: number, sort: boolean): Promise<ReadPart> {
  const { table, familyKeys, missingRows } = await readRecords(source, options, firstLine);
  if (table.notices.length > 0) throw new Error(`${source.name}: the part has values to remark on`);
  return {
    // In shared memory: the main thread and this one both read it when they adjust the parts (io/parallel-adjust.ts).
    sorted: sort && missingRows === 0 ? sortAscendingInPlace(sharedCopy(table.p), true) : undefined,
    p: table.p,
    weights: table.weights,
    familyIds: table.familyColumns.length > 0 ? table.families.ids : undefined,
    familyKeys,
    decimalComma: table.decimalComma,
  };
}

/** sharedFloat64 typed as the plain arrays it stands in for: nothing here tells the two apart. */
function sharedArray(length: number): Float64Array<ArrayBuffer> {
  return sharedFloat64(length) as unknown as Float64Array<ArrayBuffer>;
}

function sharedCopy(values: Float64Array): Float64Array {
  const copy = sharedFloat64(values.length);
  copy.set(values);
  return copy;
}

/**
 * The first bytes the delimiter and the line endings are told from (they
 * look at the first two records, which can be long: a header of 10,000
 * columns): 4 MB, what a file's first read has always given them.
 */
const SNIFF_BYTES = 4 << 20;

/** Searched past the middle of the input for a line break, to split it there. */
const SPLIT_WINDOW = 1 << 20;

/** The position after the first line break at or past the middle of a source read by position; undefined if none is near. */
function lineStartPastMiddle(source: InputSource): number | undefined {
  const size = source.size as number;
  const middle = Math.floor(size / 2);
  const window = Buffer.allocUnsafe(Math.min(SPLIT_WINDOW, size - middle));
  const got = readSync((source.descriptor as () => number)(), window, 0, window.length, middle);
  const lineFeed = window.subarray(0, got).indexOf(0x0a);
  return lineFeed < 0 || middle + lineFeed + 1 >= size ? undefined : middle + lineFeed + 1;
}

/** A source read by position, in chunks that end at `at` (so that its reading can stop there). */
function endingAt(source: InputSource, at: number): InputSource {
  const fd = (source.descriptor as () => number)();
  return {
    ...source,
    async *chunks(pool) {
      yield* rangeSource(source.name, fd, 0, at).chunks(pool);
      yield* rangeSource(source.name, fd, at, contentEnd(source)).chunks(pool);
    },
  };
}

/** The table, and the key of each family (the bytes of its values), in the order of its index. */
async function readRecords(source: InputSource, options: ReadOptions, firstLine?: number): Promise<{ table: Table; familyKeys: string[]; missingRows: number; withWorker: boolean }> {
  const known = options.shape;
  // Reading in two parts: for a table read from its start, when only p-values, weights and families are wanted.
  const inTwoParts = known === undefined && !options.lineNumbers && !options.pPrecision && !options.keyColumns && options.claimedColumn === undefined;
  if (inTwoParts) warmUp(source);
  // Each thread then sorts its own part too, for a caller that adjusts (sortP) a table that is one
  // family with no weights: the sort is most of the time between the passes, and merging two sorted
  // parts is linear. Other callers (inspect) would only pay for it.
  const sortParts = inTwoParts && options.sortP === true && (options.familyColumns ?? []).length === 0 && options.weightsColumn === undefined;
  let missingRows = 0;
  const { delimiter, loneCrEndsLine } =
    known ??
    (await lookAtHead(source, SNIFF_BYTES, (head) => {
      refuseUnreadable(head, source.name);
      return { delimiter: options.delimiter ?? sniffDelimiter(head, source.extension), loneCrEndsLine: sniffLoneCr(head) };
    }));
  // In a table not separated by commas, "0,05" can only be a decimal comma.
  const decimalCommaAllowed = delimiter !== COMMA;
  let decimalCommaSeen = false;
  const notices: Notice[] = [];
  // Values read with a remark (underflow to 0, a bound read as its value): how many, and where the first was.
  const remarked = { underflow: { count: 0, first: '' }, computedUnderflow: { count: 0, first: '' }, bound: { count: 0, first: '' } };
  const remark = (kind: keyof typeof remarked, view: RecordView, table: TableShape, text: string): void => {
    if (remarked[kind].count++ === 0) remarked[kind].first = `${source.name}:${view.line}: ${columnLabel(table, pColumn)}: ${quoteText(text)}`;
  };
  const p = new Growable((size) => new Float64Array(size));
  /** The scanner's column reader: what readRow does for a row whose p-value is a plain decimal, and nothing else to read. */
  const plain: PlainColumn = { fields: 0, field: 0, until: Infinity, take: (value) => p.push(value) };
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
  const pHalfUnits = new Growable((size) => new Float64Array(size));
  let keyTrackers: { column: number; index: Map<string, number>; ids: Growable<Int32Array> }[] = [];
  let converter: ValueConverter | undefined;

  const start = (view: RecordView): boolean => {
    // Spreadsheets may begin a CSV file with a line naming its delimiter, "sep=;".
    if (view.fieldCount <= 2 && /^sep=.?$/i.test(fieldText(view, 0))) {
      throw new DataError(`${source.name}:${view.line}: the first line, ${quoteText(fieldText(view, 0) + (view.fieldCount === 2 ? String.fromCharCode(delimiter) : ''))}, is a spreadsheet's note of the delimiter, not a header; remove it, e.g. tail -n +2 ${source.name === '<stdin>' ? '' : `${source.name} `}| famwise ...`);
    }
    const header = options.header ?? !allNumbers(view);
    if (options.header === undefined && !header) {
      notices.push({ id: 'header-guessed', text: 'the first line holds only numbers, so it is read as data, not as a header (say --header if it is one)' });
    }
    const names = header ? Array.from({ length: view.fieldCount }, (_, k) => fieldText(view, k)) : null;
    useShape({ delimiter, loneCrEndsLine, names, columnCount: view.fieldCount });
    return header;
  };

  /** Finds the columns asked for in a table of this layout. */
  const useShape = (known: TableShape): void => {
    shape = known;
    if (options.reading === undefined) {
      pColumn = options.pColumn === undefined ? findPColumn(shape) : resolveColumn(shape, options.pColumn, '--p-column');
    } else {
      converter = valueConverter(options.reading, shape, options.pColumn, decimalCommaAllowed);
      pColumn = converter.column;
    }
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
    // Rows with nothing to read but a plain p-value are taken by the scanner's column reader.
    const plainRows = converter === undefined && familyColumns.length === 0 && weightsColumn < 0 && claimedColumn < 0 && !options.lineNumbers && !options.pPrecision && !options.keyColumns;
    if (plainRows) {
      plain.fields = shape.columnCount;
      plain.field = pColumn;
    }
    if (options.keyColumns) {
      keyTrackers = Array.from({ length: shape.columnCount }, (_, column) => column)
        .filter((column) => column !== pColumn && column !== claimedColumn)
        .slice(0, KEY_COLUMNS)
        .map((column) => ({ column, index: new Map<string, number>(), ids: new Growable((size) => new Int32Array(size)) }));
    }
  };

  // A refused row does not stop the reading: the error names the first and counts the rest, so that one run shows how much is wrong.
  let firstRefusal = '';
  let refusedRows = 0;
  const laterLines: number[] = [];
  const refuse = (view: RecordView, reason: () => string): void => {
    if (refusedRows++ === 0) firstRefusal = `${source.name}:${view.line}: ${reason()}`;
    else if (laterLines.length < 5) laterLines.push(view.line);
  };

  const readRow = (view: RecordView, table: TableShape): void => {
    if (view.fieldCount !== table.columnCount) {
      refuse(view, () => fieldCountMessage(view, table, pColumn, p.length === 0));
      return;
    }
    // Most cells are plain decimals, read straight from the bytes (they can be neither bounds nor
    // underflows); the rest, and statistics, go through the text.
    const simple = converter ? NOT_SIMPLE : simpleDecimal(view.buf, view.starts[pColumn], view.ends[pColumn]);
    let text: string | undefined;
    let value: PValueText;
    let bound: number | undefined;
    if (simple !== NOT_SIMPLE && simple <= 1) value = simple;
    else {
      text = fieldText(view, pColumn);
      try {
        value = converter ? converter.pValue(text, view) : readPValue(text, decimalCommaAllowed);
      } catch (error) {
        if (!(error instanceof CellRefusal)) throw error;
        refuse(view, () => error.reason);
        return;
      }
      bound = value === 'invalid' && !converter && options.boundsAsValues ? readUpperBound(text, decimalCommaAllowed) : undefined;
      if (bound !== undefined) {
        value = bound;
        remark('bound', view, table, text);
      }
      if (value === 'invalid') {
        const shown = text;
        refuse(view, () => `${columnLabel(table, pColumn)}: ${quoteText(shown)} is not a p-value: ${whyNotPValue(shown, decimalCommaAllowed, options.boundsAsValues)}`);
        return;
      }
      if (decimalCommaAllowed && !decimalCommaSeen && text.includes(',')) decimalCommaSeen = true;
      if (converter ? value === 0 : underflowed(text, value)) remark(converter ? 'computedUnderflow' : 'underflow', view, table, text);
    }
    if (value === 'missing') missingRows++;
    p.push(value === 'missing' ? NaN : value);
    if (weightsColumn >= 0) {
      const weight = value === 'missing' ? NaN : readRowWeight(view, table);
      if (weight === undefined) return;
      weights.push(weight);
    }
    if (claimedColumn >= 0 && !readRowClaim(view, table)) return;
    if (options.lineNumbers) lines.push(view.line);
    if (options.pPrecision) {
      pHalfUnits.push(value === 'missing' ? NaN : converter || bound !== undefined ? 0 : (readPrintedValue(text ?? fieldText(view, pColumn), decimalCommaAllowed)?.halfUnit ?? 0));
    }
    if (keyTrackers.length > 0) trackKeys(view);
    // Without family columns every row is in family 0: nothing to keep per row.
    if (familyColumns.length === 0) return;
    // Keyed on the bytes, so that values differing only in bytes that are not
    // valid UTF-8 stay apart; decoded as UTF-8 only to show them.
    const bytes = familyColumns.map((column) => fieldText(view, column, 'latin1'));
    const key = familyKey(bytes);
    let id = familyIndex.get(key);
    if (id === undefined) {
      id = familyValues.length;
      familyIndex.set(key, id);
      familyValues.push(bytes.map(shownText));
    }
    familyIds.push(id);
  };

  /** The weight of a row that has a p-value; an error names a missing or bad one. */
  const readRowWeight = (view: RecordView, table: TableShape): number | undefined => {
    const text = fieldText(view, weightsColumn);
    const weight = readWeight(text, decimalCommaAllowed);
    const label = columnLabel(table, weightsColumn);
    if (weight === 'missing') {
      refuse(view, () => `${label}: the weight is missing on a row with a p-value; give every tested row a weight (0 if it should never be rejected)`);
      return undefined;
    }
    if (weight === 'invalid' || weight < 0 || Object.is(weight, -0)) {
      refuse(view, () => `${label}: ${quoteText(text)} is not a weight: ${whyNotWeight(text)}`);
      return undefined;
    }
    return weight;
  };

  /** Reads a row's claimed adjusted value; false when the cell is refused. */
  const readRowClaim = (view: RecordView, table: TableShape): boolean => {
    const text = fieldText(view, claimedColumn);
    const printed = MISSING_MARKS.includes(text.trim()) ? { value: NaN, halfUnit: NaN } : readPrintedValue(text, decimalCommaAllowed);
    if (printed === undefined || !(Number.isNaN(printed.value) || admissibleClaim(printed.value))) {
      refuse(view, () => `${columnLabel(table, claimedColumn)}: ${quoteText(text)} is not an adjusted p-value: expected a number from 0 to 1 or a missing-value mark`);
      return false;
    }
    claimedValues.push(printed.value);
    claimedHalfUnits.push(printed.halfUnit);
    return true;
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

  /** A part read by a worker, to follow the rows read here; its families are matched to these by their keys. */
  let secondPart: ReadPart | undefined;
  const addPart = (part: ReadPart): void => {
    secondPart = part;
    if (part.familyIds) {
      const ids = part.familyKeys.map((key) => {
        let id = familyIndex.get(key);
        if (id === undefined) {
          id = familyValues.length;
          familyIndex.set(key, id);
          familyValues.push(familyBytes(key, familyColumns.length).map(shownText));
        }
        return id;
      });
      const own = part.familyIds;
      for (let i = 0; i < own.length; i++) own[i] = ids[own[i]] as number;
    }
    decimalCommaSeen ||= part.decimalComma;
  };

  if (known) useShape(known);
  const middle = source.descriptor && source.size !== undefined && firstLine === undefined ? source.size / 2 : Infinity;
  // The record at the middle is read here, to note it as the split point.
  plain.until = middle;
  let split: SplitPoint | undefined;
  // The second half is read by a worker thread (parts.ts) when the table is large and read from a
  // file; this thread stops where it starts.
  const half = inTwoParts && inParts(source) ? lineStartPastMiddle(source) : undefined;
  let second: RunningPart<ReadPart> | undefined;
  // A progress line counts what each thread has scanned.
  const counts = half === undefined ? undefined : source.tally?.begin(half);
  const startSecondHalf = (at: number): void => {
    second = startPart<ReadPart>({ kind: 'read', name: source.name, fd: (source.descriptor as () => number)(), start: at, end: contentEnd(source), line: 1, counts: counts?.[1], options: { ...options, shape: shape as TableShape }, sort: sortParts });
  };
  /** Once this thread has read up to the second half: takes the worker's reading of it, if it has one to give. */
  let sortedParts: SortedParts | undefined;
  const takeSecondHalf = async (at: number, line: number): Promise<boolean> => {
    // This part is sorted while the worker finishes its own (it sorts its part when asked to).
    const ownSorted = sortParts && missingRows === 0 ? sortAscendingInPlace(p.toArray(undefined, sharedArray), true) : undefined;
    let part: ReadPart;
    try {
      part = await (second as RunningPart<ReadPart>).result;
    } catch {
      return false;
    }
    // Written in the same two parts (the record noted at the middle may come a line or so before).
    split = { offset: at, row: p.length, line };
    addPart(part);
    if (ownSorted && part.sorted) sortedParts = { first: ownSorted, second: part.sorted };
    return true;
  };
  try {
    await scanInput(half === undefined ? source : countedInto(endingAt(source, half), counts?.[0]), { delimiter, loneCrEndsLine, firstLine }, {
      record(view) {
        if (shape === undefined) {
          const header = start(view);
          if (half !== undefined) startSecondHalf(half);
          if (header) return;
        }
        if (split === undefined && view.bufOffset + view.contentStart >= middle) {
          split = { offset: view.bufOffset + view.contentStart, row: p.length, line: view.line };
          plain.until = Infinity;
        }
        readRow(view, shape as TableShape);
      },
      column: plain,
      ...(half === undefined ? {} : { pause: { at: half, resume: async (line: number) => !(second && (await takeSecondHalf(half, line))) } }),
    });
  } finally {
    second?.stop();
    if (counts) source.tally?.end();
  }

  if (shape === undefined) {
    throw new DataError(`${source.name}: the input is empty: expected a table with a header line and one row per test`);
  }
  if (refusedRows > 0) {
    const others = refusedRows - 1;
    const shown = laterLines.join(', ') + (others > laterLines.length ? ', ...' : '');
    const more = others === 0 ? '' : `; ${others} more row${others === 1 ? ' is' : 's are'} refused too (line${others === 1 ? '' : 's'} ${shown})`;
    throw new DataError(firstRefusal + more);
  }
  const more = (count: number): string => (count > 1 ? ` (and ${count - 1} more p-value${count > 2 ? 's' : ''} like it)` : '');
  const { underflow, computedUnderflow, bound } = remarked;
  if (computedUnderflow.count > 0) {
    notices.push({ id: 'underflow', text: `${computedUnderflow.first} has a p-value below the smallest positive number famwise can hold (about 5e-324), so it is 0${more(computedUnderflow.count)}; its adjusted values are 0 as well, and the decisions are unaffected` });
  }
  if (underflow.count > 0) {
    notices.push({ id: 'underflow', text: `${underflow.first} is below the smallest positive number famwise can hold (about 5e-324), so it is read as 0${more(underflow.count)}; its adjusted values are 0 as well, and the decisions are unaffected` });
  }
  if (bound.count > 0) {
    notices.push({ id: 'bounds-read', text: `${bound.first} is an upper bound, read as its value${more(bound.count)} (--bounds-as-values), so the adjusted values in its family are upper bounds of the exact ones (conservative)` });
  }
  if (familyColumns.length === 0) familyValues.push([]);
  const rowCount = p.length + (secondPart?.p.length ?? 0);
  const table: Table = {
    shape,
    pColumn,
    familyColumns,
    p: p.toArray(secondPart?.p),
    ...(weightsColumn >= 0 ? { weightsColumn, weights: weights.toArray(secondPart?.weights) } : {}),
    ...(claimedColumn >= 0 ? { claimed: { column: claimedColumn, values: claimedValues.toArray(), halfUnits: claimedHalfUnits.toArray() } } : {}),
    ...(options.lineNumbers ? { lines: lines.toArray() } : {}),
    ...(options.pPrecision ? { pHalfUnits: pHalfUnits.toArray() } : {}),
    ...(options.keyColumns
      ? {
          keys: keyTrackers
            .filter((tracker) => tracker.index.size >= 2)
            .map((tracker) => ({ column: tracker.column, families: { ids: tracker.ids.toArray(), count: tracker.index.size } })),
        }
      : {}),
    pComputed: options.reading !== undefined,
    families: familyColumns.length === 0 ? singleFamily(rowCount) : { ids: familyIds.toArray(secondPart?.familyIds), count: familyValues.length },
    familyValues,
    decimalComma: decimalCommaSeen,
    notices,
    ...(split ? { split } : {}),
    ...(sortedParts ? { sortedParts } : {}),
  };
  return { table, familyKeys: [...familyIndex.keys()], missingRows, withWorker: second !== undefined };
}

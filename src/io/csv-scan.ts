// A byte-level scanner for delimited text (RFC 4180 rules, any one-byte
// delimiter). It never copies or decodes: it reports where each record and
// each field lie in the buffer, so that callers decode only the fields they
// need and writers can re-emit the original bytes exactly.
//
// Rules: a field that starts with a double quote is quoted and ends at the
// next lone double quote ("" inside stands for one quote); it may hold
// delimiters and line breaks. A quote elsewhere in a field is an ordinary
// character. Records end at LF or CRLF; in a file whose first line ends
// with a lone CR (classic Mac), at a lone CR too. A line with no bytes at all
// is not a record (blank lines are passed over, but kept by writers).
// A UTF-8 byte-order mark at the start of the input is not part of the first
// field.
//
// Speed: most lines of a large table hold no quote at all. For those the
// scanner takes a fast path: one tight loop finds the line's end and splits
// it at the delimiter, with no other rule to weigh per byte (or, when only
// record bounds are wanted, indexOf finds the line ends and quotes). A line that holds a quote, a file with lone-CR
// line endings, and the unfinished last line of a block go through the
// general path, byte by byte. Both report exactly the same records
// (test/fast-scan.test.ts compares them on a corpus of messy tables). Cost:
// O(bytes) either way.

import { DataError } from '../errors.js';
import { NOT_SIMPLE, simpleDecimal } from './number-bytes.js';

const QUOTE = 0x22;
const LF = 0x0a;
const CR = 0x0d;

/** Where one record lies in the buffer being scanned. Reused between records. */
export interface RecordView {
  buf: Buffer;
  /** 1-based line on which the record starts. */
  line: number;
  /** Where buf[0] lies in the whole input, in bytes. */
  bufOffset: number;
  fieldCount: number;
  /** Field k is buf[starts[k], ends[k]), quotes included. */
  starts: Int32Array;
  ends: Int32Array;
  /** Bytes before the record not part of any record (BOM, blank lines) start here. */
  gapStart: number;
  contentStart: number;
  /** End of the record's bytes, before its line terminator. */
  contentEnd: number;
  /** Start of what follows the terminator (= contentEnd when the input ends without one). */
  next: number;
}

/**
 * The text of field k: quotes removed and "" unescaped for a quoted field.
 * Decoded as UTF-8, or as latin1 to get one character per byte (a key that
 * keeps bytes that are not valid UTF-8 apart).
 */
export function fieldText(view: RecordView, k: number, encoding: 'utf8' | 'latin1' = 'utf8'): string {
  const start = view.starts[k];
  const end = view.ends[k];
  const { buf } = view;
  if (end > start && buf[start] === QUOTE) {
    const inner = buf.toString(encoding, start + 1, end - 1);
    return inner.includes('"') ? inner.replaceAll('""', '"') : inner;
  }
  return buf.toString(encoding, start, end);
}

/** The bytes of field k as they would be written in a field of their own: quotes removed, "" unescaped. */
export function fieldBytes(view: RecordView, k: number): Buffer {
  const start = view.starts[k];
  const end = view.ends[k];
  const { buf } = view;
  if (!(end > start && buf[start] === QUOTE)) return buf.subarray(start, end);
  const inner = buf.subarray(start + 1, end - 1);
  return inner.includes(QUOTE) ? Buffer.from(inner.toString('latin1').replaceAll('""', '"'), 'latin1') : inner;
}

export interface ScanOptions {
  /** false sends every line through the general path (the tests compare the two). */
  readonly fastPath?: boolean;
  /**
   * false when only the bounds of each record are wanted (a writer copying
   * records whole): lines on the fast path are then not split into fields,
   * and the view's fields are not to be read.
   */
  readonly splitFields?: boolean;
  /**
   * For a part of an input that starts at a record other than the first: the
   * line it starts on; a byte-order mark there is then content, not a mark.
   */
  readonly firstLine?: number;
}

/**
 * One column of numbers taken straight from the bytes, for a reader that
 * wants only that (the first pass over a table without families or weights):
 * a line on the fast path with exactly `fields` fields, and in field `field`
 * a plain decimal from 0 to 1 (number-bytes.ts), gives take() its value and
 * no view; every other record goes to onRecord as usual. Only records that
 * start before `until` (an offset in the whole input) are taken, so that the
 * reader sees the record there. Off while fields is 0.
 */
export interface PlainColumn {
  fields: number;
  field: number;
  until: number;
  take(value: number): void;
}

export class RecordScanner {
  /** Line number of the next byte to scan. */
  line: number;
  private atInputStart: boolean;
  /** Where the buffer passed to scan lies in the whole input (set by the caller before each scan). */
  bufOffset = 0;
  private readonly view: RecordView;
  /**
   * The options that matter per block, as fields of their own: options
   * objects of different shapes (a reader's, a writer's) would otherwise make
   * scan's optimised code start over when the next caller's arrives.
   */
  private readonly fastPath: boolean;
  private readonly splitFields: boolean;

  /**
   * loneCrEndsLine: whether a CR not followed by LF ends a line (files with
   * classic Mac line endings). Otherwise only LF and CRLF do, and a lone CR
   * is an ordinary character, as many CSV writers leave it unquoted.
   */
  constructor(
    private readonly delimiter: number,
    private readonly sourceName: string,
    private readonly loneCrEndsLine = false,
    options: ScanOptions = {},
  ) {
    // Lines without a quote take the fast path (not in files with lone-CR line endings).
    this.fastPath = options.fastPath !== false && !loneCrEndsLine;
    this.splitFields = options.splitFields !== false;
    this.line = options.firstLine ?? 1;
    this.atInputStart = options.firstLine === undefined;
    this.view = {
      buf: Buffer.alloc(0),
      line: 1,
      bufOffset: 0,
      fieldCount: 0,
      starts: new Int32Array(64),
      ends: new Int32Array(64),
      gapStart: 0,
      contentStart: 0,
      contentEnd: 0,
      next: 0,
    };
  }

  /**
   * The length of the line break at pos: 0 if there is none, 1 (LF or CR) or
   * 2 (CRLF); -1 if it cannot be told before more input arrives.
   */
  private lineBreakAt(buf: Buffer, pos: number, atEnd: boolean): number {
    const byte = buf[pos];
    if (byte === LF) return 1;
    if (byte !== CR) return 0;
    if (pos + 1 >= buf.length) return atEnd ? 1 : -1;
    if (buf[pos + 1] === LF) return 2;
    return this.loneCrEndsLine ? 1 : 0;
  }

  /**
   * Calls onRecord for every complete record in buf[from..]. Returns the
   * offset just past the last complete record: the caller keeps the bytes
   * from there and passes them again, with more input, on the next call.
   * With atEnd, the input ends at buf.length and every record is complete.
   */
  scan(buf: Buffer, from: number, atEnd: boolean, onRecord: (view: RecordView) => void, column?: PlainColumn): number {
    const view = this.view;
    view.buf = buf;
    view.bufOffset = this.bufOffset;
    const length = buf.length;
    let pos = from;
    let consumed = from;
    if (this.atInputStart) {
      if (length - pos < 3 && !atEnd) return from;
      if (buf[pos] === 0xef && buf[pos + 1] === 0xbb && buf[pos + 2] === 0xbf) pos += 3;
    }
    let gapStart = from;
    let lineAtConsumed = this.line;
    const { fastPath, splitFields } = this;
    let nextQuote = -1;
    for (;;) {
      while (fastPath) {
        if (column !== undefined && column.fields > 0 && this.bufOffset + pos < column.until) {
          const next = this.plainLine(buf, pos, column);
          if (next >= 0) {
            this.line++;
            this.atInputStart = false;
            pos = next;
            consumed = pos;
            gapStart = pos;
            lineAtConsumed = this.line;
            continue;
          }
        }
        let lineEnd: number;
        if (splitFields) {
          lineEnd = this.fastLine(buf, pos);
        } else {
          // Only the line's end is wanted: found with indexOf (memchr), as is the next quote.
          if (nextQuote < pos) {
            const quote = buf.indexOf(QUOTE, pos);
            nextQuote = quote < 0 ? length : quote;
          }
          lineEnd = buf.indexOf(LF, pos);
          if (lineEnd >= nextQuote) lineEnd = -1;
        }
        if (lineEnd < 0) break;
        const contentEnd = lineEnd > pos && buf[lineEnd - 1] === CR ? lineEnd - 1 : lineEnd;
        if (contentEnd === pos) {
          // A blank line (LF or CRLF alone) is not a record.
          pos = lineEnd + 1;
          this.line++;
          continue;
        }
        view.line = this.line++;
        view.gapStart = gapStart;
        view.contentStart = pos;
        view.contentEnd = contentEnd;
        view.next = lineEnd + 1;
        this.atInputStart = false;
        onRecord(view);
        pos = lineEnd + 1;
        consumed = pos;
        gapStart = pos;
        lineAtConsumed = this.line;
      }
      // Blank lines are not records.
      let lineBreak = 0;
      while (pos < length && (lineBreak = this.lineBreakAt(buf, pos, atEnd)) > 0) {
        pos += lineBreak;
        this.line++;
      }
      if (pos >= length || lineBreak === -1) {
        // Trailing blank lines stay unconsumed: the caller passes them on as they are.
        this.line = lineAtConsumed;
        return consumed;
      }
      const recordLine = this.line;
      if (!this.scanRecord(buf, pos, atEnd)) {
        this.line = lineAtConsumed;
        return consumed;
      }
      view.line = recordLine;
      view.gapStart = gapStart;
      view.contentStart = pos;
      this.atInputStart = false;
      onRecord(view);
      pos = view.next;
      consumed = pos;
      gapStart = pos;
      lineAtConsumed = this.line;
    }
  }

  /**
   * The fast path, for the line at start: the position of its LF, with its
   * fields in the view (split at every delimiter, the CR of a CRLF left
   * out); -1 when a quote or the end of the block comes first, and the
   * general path must decide. One loop over the bytes, no calls.
   */
  private fastLine(bytes: Buffer, start: number): number {
    const view = this.view;
    const delimiter = this.delimiter;
    const length = bytes.length;
    let fields = 0;
    let fieldStart = start;
    let pos = start;
    for (; pos < length; pos++) {
      const byte = bytes[pos];
      if (byte === LF) break;
      if (byte === QUOTE) return -1;
      if (byte !== delimiter) continue;
      if (fields === view.starts.length - 1) this.growFields();
      view.starts[fields] = fieldStart;
      view.ends[fields] = pos;
      fields++;
      fieldStart = pos + 1;
    }
    if (pos === length) return -1;
    view.starts[fields] = fieldStart;
    view.ends[fields] = pos > fieldStart && bytes[pos - 1] === CR ? pos - 1 : pos;
    view.fieldCount = fields + 1;
    return pos;
  }

  /**
   * The column reader's path, for the line at start: where the next line
   * starts, once the line's value is given to column.take; -1 when the line
   * is not one it takes (a quote, a blank line, another number of fields, a
   * value that is not a plain decimal from 0 to 1, the end of the block), for
   * the usual paths to decide. Reads the field's bounds as fastLine would,
   * in a loop of its own that keeps no bounds but the one it reads: calling
   * fastLine instead made the first pass about a quarter slower (1M rows,
   * 229-330 ms against 172-201, medians of 9, alternating builds).
   */
  private plainLine(bytes: Buffer, start: number, column: PlainColumn): number {
    const delimiter = this.delimiter;
    // A byte above LF, the quote and the delimiter is ordinary (digits and letters, with a
    // comma or tab delimiter): one comparison decides it.
    const highest = Math.max(LF, QUOTE, delimiter);
    const wanted = column.field;
    const length = bytes.length;
    let fields = 0;
    let fieldStart = start;
    let valueStart = -1;
    let valueEnd = -1;
    let pos = start;
    for (; pos < length; pos++) {
      const byte = bytes[pos] as number;
      if (byte > highest) continue;
      if (byte === LF) break;
      if (byte === QUOTE) return -1;
      if (byte !== delimiter) continue;
      if (fields === wanted) {
        valueStart = fieldStart;
        valueEnd = pos;
      }
      fields++;
      fieldStart = pos + 1;
    }
    if (pos === length || fields + 1 !== column.fields) return -1;
    if (fields === wanted) {
      valueStart = fieldStart;
      valueEnd = pos > fieldStart && bytes[pos - 1] === CR ? pos - 1 : pos;
    }
    const value = simpleDecimal(bytes, valueStart, valueEnd);
    if (value === NOT_SIMPLE || value > 1) return -1;
    column.take(value);
    return pos + 1;
  }

  /** Scans one record starting at pos into the view; false if it is incomplete. */
  private scanRecord(buf: Buffer, start: number, atEnd: boolean): boolean {
    const view = this.view;
    const length = buf.length;
    const delimiter = this.delimiter;
    let pos = start;
    let fields = 0;
    for (;;) {
      if (fields === view.starts.length) this.growFields();
      const fieldStart = pos;
      if (pos < length && buf[pos] === QUOTE) {
        const openLine = this.line;
        pos++;
        for (;;) {
          const quote = buf.indexOf(QUOTE, pos);
          if (quote < 0) {
            if (!atEnd) return false;
            throw new DataError(
              `${this.sourceName}:${openLine}: field ${fields + 1}: a quoted field opened here is never closed (an unmatched " in the table?)`,
            );
          }
          this.countLines(buf, pos, quote);
          if (quote + 1 >= length && !atEnd) return false;
          if (buf[quote + 1] === QUOTE) {
            pos = quote + 2;
            continue;
          }
          pos = quote + 1;
          break;
        }
        if (pos < length && buf[pos] !== delimiter) {
          const lineBreak = this.lineBreakAt(buf, pos, atEnd);
          if (lineBreak < 0) return false;
          if (lineBreak === 0) {
            throw new DataError(
              `${this.sourceName}:${this.line}: field ${fields + 1}: text ${JSON.stringify(String.fromCharCode(buf[pos]))} follows the closing quote of a quoted field; a quote inside a quoted field is written as ""`,
            );
          }
        }
      } else {
        while (pos < length) {
          const byte = buf[pos];
          if (byte === delimiter || byte === LF) break;
          if (byte === CR) {
            const lineBreak = this.lineBreakAt(buf, pos, atEnd);
            if (lineBreak < 0) return false;
            if (lineBreak > 0) break;
          }
          pos++;
        }
      }
      view.starts[fields] = fieldStart;
      view.ends[fields] = pos;
      fields++;
      if (pos >= length) {
        if (!atEnd) return false;
        view.fieldCount = fields;
        view.contentEnd = pos;
        view.next = pos;
        return true;
      }
      if (buf[pos] === delimiter) {
        pos++;
        continue;
      }
      const lineBreak = this.lineBreakAt(buf, pos, atEnd);
      if (lineBreak < 0) return false;
      view.fieldCount = fields;
      view.contentEnd = pos;
      view.next = pos + lineBreak;
      this.line++;
      return true;
    }
  }

  /** Counts the line breaks inside a quoted field, so that later line numbers stay true. */
  private countLines(buf: Buffer, from: number, to: number): void {
    for (let i = from; i < to; i++) {
      if (buf[i] === LF || (this.loneCrEndsLine && buf[i] === CR && buf[i + 1] !== LF)) this.line++;
    }
  }

  private growFields(): void {
    const size = this.view.starts.length * 2;
    const starts = new Int32Array(size);
    const ends = new Int32Array(size);
    starts.set(this.view.starts);
    ends.set(this.view.ends);
    this.view.starts = starts;
    this.view.ends = ends;
  }
}

// A byte-level scanner for delimited text (RFC 4180 rules, any one-byte
// delimiter). It never copies or decodes: it reports where each record and
// each field lie in the buffer, so that callers decode only the fields they
// need and writers can re-emit the original bytes exactly.
//
// Rules: a field that starts with a double quote is quoted and ends at the
// next lone double quote ("" inside stands for one quote); it may hold
// delimiters and line breaks. A quote elsewhere in a field is an ordinary
// character. Records end at LF, CRLF or a lone CR. A line with no bytes at
// all is not a record (blank lines are passed over, but kept by writers).
// A UTF-8 byte-order mark at the start of the input is not part of the first
// field.

import { DataError } from '../errors.js';

const QUOTE = 0x22;
const LF = 0x0a;
const CR = 0x0d;

/** Where one record lies in the buffer being scanned. Reused between records. */
export interface RecordView {
  buf: Buffer;
  /** 1-based line on which the record starts. */
  line: number;
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

/** The text of field k: quotes removed and "" unescaped for a quoted field. */
export function fieldText(view: RecordView, k: number): string {
  const start = view.starts[k];
  const end = view.ends[k];
  const { buf } = view;
  if (end > start && buf[start] === QUOTE) {
    const inner = buf.toString('utf8', start + 1, end - 1);
    return inner.includes('"') ? inner.replaceAll('""', '"') : inner;
  }
  return buf.toString('utf8', start, end);
}

/** Whether field k is quoted in the input. */
export function isQuoted(view: RecordView, k: number): boolean {
  return view.ends[k] > view.starts[k] && view.buf[view.starts[k]] === QUOTE;
}

export class RecordScanner {
  /** Line number of the next byte to scan. */
  line = 1;
  private atInputStart = true;
  private readonly view: RecordView;

  constructor(
    private readonly delimiter: number,
    private readonly sourceName: string,
  ) {
    this.view = {
      buf: Buffer.alloc(0),
      line: 1,
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
   * Calls onRecord for every complete record in buf[from..]. Returns the
   * offset just past the last complete record: the caller keeps the bytes
   * from there and passes them again, with more input, on the next call.
   * With atEnd, the input ends at buf.length and every record is complete.
   */
  scan(buf: Buffer, from: number, atEnd: boolean, onRecord: (view: RecordView) => void): number {
    const view = this.view;
    view.buf = buf;
    const length = buf.length;
    let pos = from;
    let consumed = from;
    if (this.atInputStart) {
      if (length - pos < 3 && !atEnd) return from;
      if (buf[pos] === 0xef && buf[pos + 1] === 0xbb && buf[pos + 2] === 0xbf) pos += 3;
    }
    let gapStart = from;
    let lineAtConsumed = this.line;
    for (;;) {
      // Blank lines are not records.
      while (pos < length && (buf[pos] === LF || buf[pos] === CR)) {
        if (buf[pos] === CR && pos + 1 === length && !atEnd) break;
        if (buf[pos] === CR && buf[pos + 1] === LF) pos++;
        pos++;
        this.line++;
      }
      if (pos >= length || (buf[pos] === CR && !atEnd)) {
        // Trailing blank lines stay unconsumed: the caller passes them on as they are.
        this.line = lineAtConsumed;
        return consumed;
      }
      const recordLine = this.line;
      const end = this.scanRecord(buf, pos, atEnd);
      if (end < 0) {
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

  /** Scans one record starting at pos into the view; -1 if it is incomplete. */
  private scanRecord(buf: Buffer, start: number, atEnd: boolean): number {
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
            if (!atEnd) return -1;
            throw new DataError(
              `${this.sourceName}:${openLine}: field ${fields + 1}: a quoted field opened here is never closed (an unmatched " in the table?)`,
            );
          }
          for (let i = pos; i < quote; i++) if (buf[i] === LF) this.line++;
          if (quote + 1 >= length && !atEnd) return -1;
          if (buf[quote + 1] === QUOTE) {
            pos = quote + 2;
            continue;
          }
          pos = quote + 1;
          break;
        }
        const after = buf[pos];
        if (pos < length && after !== delimiter && after !== LF && after !== CR) {
          throw new DataError(
            `${this.sourceName}:${this.line}: field ${fields + 1}: text ${JSON.stringify(String.fromCharCode(after))} follows the closing quote of a quoted field; a quote inside a quoted field is written as ""`,
          );
        }
      } else {
        while (pos < length) {
          const byte = buf[pos];
          if (byte === delimiter || byte === LF || byte === CR) break;
          pos++;
        }
      }
      view.starts[fields] = fieldStart;
      view.ends[fields] = pos;
      fields++;
      if (pos >= length) {
        if (!atEnd) return -1;
        view.fieldCount = fields;
        view.contentEnd = pos;
        view.next = pos;
        return pos;
      }
      const byte = buf[pos];
      if (byte === delimiter) {
        pos++;
        continue;
      }
      view.fieldCount = fields;
      view.contentEnd = pos;
      if (byte === CR) {
        if (pos + 1 >= length && !atEnd) return -1;
        view.next = buf[pos + 1] === LF ? pos + 2 : pos + 1;
      } else {
        view.next = pos + 1;
      }
      this.line++;
      return view.next;
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

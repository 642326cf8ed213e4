// The byte scanner against an outside CSV parser (csv-parse, npm), and its own
// promises: field boundaries, line numbers, chunk boundaries.
import { parse } from 'csv-parse/sync';
import { describe, expect, it } from 'vitest';
import { RecordScanner, type RecordView, fieldText } from '../src/io/csv-scan.js';
import { DataError } from '../src/errors.js';

interface Scanned {
  fields: string[];
  line: number;
  raw: string;
}

function scanAll(text: string | Buffer, delimiter = ',', splitAt?: number, loneCrEndsLine = false): Scanned[] {
  const bytes = Buffer.isBuffer(text) ? text : Buffer.from(text);
  const scanner = new RecordScanner(delimiter.charCodeAt(0), 'test.csv', loneCrEndsLine);
  const out: Scanned[] = [];
  const onRecord = (view: RecordView): void => {
    out.push({
      fields: Array.from({ length: view.fieldCount }, (_, k) => fieldText(view, k)),
      line: view.line,
      raw: view.buf.toString('utf8', view.gapStart, view.next),
    });
  };
  if (splitAt === undefined) {
    scanner.scan(bytes, 0, true, onRecord);
    return out;
  }
  const first = bytes.subarray(0, splitAt);
  const consumed = scanner.scan(first, 0, false, onRecord);
  scanner.scan(Buffer.concat([first.subarray(consumed), bytes.subarray(splitAt)]), 0, true, onRecord);
  return out;
}

const corpus: Record<string, string> = {
  plain: 'a,b,c\n1,2,3\n4,5,6\n',
  crlf: 'a,b\r\n1,2\r\n3,4\r\n',
  'no final newline': 'a,b\n1,2\n3,4',
  'quoted commas and newlines': 'id,text,p\n1,"x, y",0.1\n2,"line one\nline two",0.2\n3,"say ""hi""",0.3\n',
  'quoted newline with CRLF': 'id,text\r\n1,"a\r\nb"\r\n2,c\r\n',
  'empty fields': 'a,b,c\n,,\n1,,3\n,2,\n',
  unicode: 'gène,p\nβ-actin,0.01\n日本,0.5\n😀,1\n',
  'byte-order mark': '\ufeffa,b\n1,2\n',
  'blank lines between': 'a,b\n1,2\n\n3,4\n\n',
  'empty quoted field': 'a,b\n"",1\n"x",""\n',
  'quote inside an unquoted field': 'a,b\n5" tall,2\n',
  'lone CR inside unquoted fields (left unquoted by many writers)': 'a,b\nx\ry,1\n\r,2\r\nz,\r\n',
  'mixed LF and CRLF': 'a,b\r\n1,2\n3,4\r\n5,6\n',
};

describe('records and fields agree with csv-parse', () => {
  for (const [name, text] of Object.entries(corpus)) {
    it(name, () => {
      // csv-parse 6 (npm) in the same dialect: records end at CRLF or LF, blank lines skipped, BOM removed.
      const expected = parse(text, { bom: true, skip_empty_lines: true, relax_column_count: true, relax_quotes: true, record_delimiter: ['\r\n', '\n'] }) as string[][];
      expect(scanAll(text).map((record) => record.fields)).toEqual(expected);
    });
  }
});

describe('chunk boundaries', () => {
  it('gives the same records wherever the input is cut', () => {
    for (const text of Object.values(corpus)) {
      const whole = scanAll(text);
      for (let cut = 0; cut <= Buffer.byteLength(text); cut++) {
        expect(scanAll(text, ',', cut)).toEqual(whole);
      }
    }
  });
});

describe('bytes and lines', () => {
  it('covers every byte of the input exactly once, blank lines and terminators included', () => {
    const text = '\ufeffa,b\r\n\r\n1,"x\ny"\n\n2,3';
    expect(scanAll(text).map((record) => record.raw).join('')).toBe(text);
  });

  it('numbers lines physically, counting newlines inside quotes and blank lines', () => {
    const lines = scanAll('h,t\n1,"a\nb\nc"\n\n2,x\r\n3,y\n').map((record) => record.line);
    expect(lines).toEqual([1, 2, 6, 7]);
  });

  it('ends lines at a lone CR in a file with classic Mac line endings', () => {
    const text = 'a,b\r1,"x\ry"\r\r2,3\r';
    const records = scanAll(text, ',', undefined, true);
    expect(records.map((record) => record.fields)).toEqual([['a', 'b'], ['1', 'x\ry'], ['2', '3']]);
    expect(records.map((record) => record.line)).toEqual([1, 2, 5]);
    for (let cut = 0; cut <= text.length; cut++) expect(scanAll(text, ',', cut, true)).toEqual(records);
  });

  it('handles tab and semicolon delimiters', () => {
    expect(scanAll('a\tb\n"x\ty"\t2\n', '\t').map((r) => r.fields)).toEqual([['a', 'b'], ['x\ty', '2']]);
    expect(scanAll('a;b\n0,05;1\n', ';').map((r) => r.fields)).toEqual([['a', 'b'], ['0,05', '1']]);
  });

  it('reports an unterminated quote with the line where it opened', () => {
    expect(() => scanAll('a,b\n1,2\n3,"never closed\n4,5\n')).toThrow(/test\.csv:3: field 2: a quoted field opened here is never closed/);
    expect(() => scanAll('a,b\n3,"x\n')).toThrow(DataError);
  });

  it('reports text after a closing quote', () => {
    expect(() => scanAll('a,b\n1,"x"y\n')).toThrow(/test\.csv:2: field 2: text "y" follows the closing quote/);
  });

  it('grows past 64 fields and handles a large field', () => {
    const wide = Array.from({ length: 5000 }, (_, i) => `c${i}`).join(',');
    expect(scanAll(`${wide}\n`)[0]?.fields.length).toBe(5000);
    const big = 'x'.repeat(3_000_000);
    expect(scanAll(`a,b\n"${big}",1\n`)[1]?.fields[0]?.length).toBe(3_000_000);
  });
});

// The scanner's fast path (lines without quotes, split with indexOf) against
// its general path (every byte weighed by the RFC 4180 rules): the same
// records, the same bytes, the same line numbers and the same errors, on a
// corpus of messy tables, cut into blocks anywhere.
import { describe, expect, it } from 'vitest';
import { type PlainColumn, RecordScanner, type RecordView } from '../src/io/csv-scan.js';
import { NOT_SIMPLE, simpleDecimal } from '../src/io/number-bytes.js';
import { seededRandom } from './helpers/random.js';

interface ScannedRecord {
  /** Where the record starts in the whole input. */
  offset: number;
  line: number;
  gap: string;
  content: string;
  fields: string[];
  terminator: string;
}

interface Outcome {
  records: ScannedRecord[];
  trailing: string;
  error?: string;
}

/** Scans bytes fed in blocks ending at `cuts`, as scanInput feeds them, carrying unfinished records. */
function scanInBlocks(bytes: Buffer, delimiter: number, fastPath: boolean, cuts: readonly number[], loneCrEndsLine = false, splitFields = true, column?: PlainColumn): Outcome {
  const scanner = new RecordScanner(delimiter, 'messy.csv', loneCrEndsLine, { fastPath, splitFields });
  const records: ScannedRecord[] = [];
  const onRecord = (view: RecordView): void => {
    const { buf } = view;
    records.push({
      offset: view.bufOffset + view.contentStart,
      line: view.line,
      gap: buf.toString('latin1', view.gapStart, view.contentStart),
      content: buf.toString('latin1', view.contentStart, view.contentEnd),
      // Without splitFields only the record's bounds are reported.
      fields: splitFields ? Array.from({ length: view.fieldCount }, (_, k) => buf.toString('latin1', view.starts[k], view.ends[k])) : [],
      terminator: buf.toString('latin1', view.contentEnd, view.next),
    });
  };
  let carry = Buffer.alloc(0);
  let from = 0;
  try {
    for (const cut of [...cuts, bytes.length]) {
      const block = Buffer.concat([carry, bytes.subarray(from, cut)]);
      const atEnd = cut === bytes.length;
      scanner.bufOffset = from - carry.length;
      carry = block.subarray(scanner.scan(block, 0, atEnd, onRecord, column));
      from = cut;
    }
  } catch (error) {
    return { records, trailing: '', error: (error as Error).message };
  }
  return { records, trailing: carry.toString('latin1') };
}

function reassembled(outcome: Outcome, delimiter: number): string {
  const separator = String.fromCharCode(delimiter);
  return outcome.records.map((record) => record.gap + record.fields.join(separator) + record.terminator).join('') + outcome.trailing;
}

const COMMA = 0x2c;

const messy: Readonly<Record<string, string>> = {
  plain: 'a,b,c\n1,2,3\n4,5,6\n',
  crlf: 'a,b\r\n1,2\r\n3,4\r\n',
  'no final newline': 'a,b\n1,2\n3,4',
  'final CR without LF': 'a,b\n1,2\n3,4\r',
  'quoted commas, quotes and newlines': 'id,text,p\n1,"x, y",0.1\n2,"line one\nline two",0.2\n3,"say ""hi""",0.3\n4,plain,0.4\n',
  'quoted CRLF inside a field': 'id,text\r\n1,"a\r\nb"\r\n2,c\r\n',
  'empty fields': 'a,b,c\n,,\n1,,3\n,2,\n,,\n',
  unicode: 'gène,p\nβ-actin,0.01\n日本,0.5\n😀,1\n',
  'invalid UTF-8 bytes': 'a,b\n\xff\xfe,1\nx\xc3,2\n',
  'byte-order mark': '\ufeffa,b\n1,2\n',
  'byte-order mark and a quoted header': '\ufeff"a",b\n1,2\n',
  'blank lines everywhere': '\n\r\na,b\n1,2\n\n\r\n3,4\n\n\r\n',
  'quote inside an unquoted field': 'a,b\n5" tall,2\n6,"7"\n',
  'lone CRs inside unquoted fields': 'a,b\nx\ry,1\n\r,2\r\nz,\r\n\r\r\n',
  'mixed LF and CRLF': 'a,b\r\n1,2\n3,4\r\n5,6\n',
  'a CR alone on a line': 'a\n\r\nb\n\r',
  'more than 64 fields': `${Array.from({ length: 70 }, (_, k) => `c${k}`).join(',')}\n${Array.from({ length: 70 }, (_, k) => k).join(',')}\n`,
  'unclosed quote': 'a,b\n1,2\n3,"open\n4,5\n',
  'text after a closing quote': 'a,b\n1,2\n"x"y,3\n',
};

function expectSame(text: string, delimiter: number, cuts: readonly number[], loneCrEndsLine = false): void {
  const bytes = Buffer.from(text, 'latin1');
  const fast = scanInBlocks(bytes, delimiter, true, cuts, loneCrEndsLine);
  const general = scanInBlocks(bytes, delimiter, false, cuts, loneCrEndsLine);
  expect(fast).toEqual(general);
  if (!fast.error) expect(reassembled(fast, delimiter)).toBe(bytes.toString('latin1'));
  // A writer copying whole records asks for their bounds only; they must be the same too.
  const bounds = (outcome: Outcome): unknown => ({ ...outcome, records: outcome.records.map((record) => ({ ...record, fields: [] })) });
  expect(bounds(scanInBlocks(bytes, delimiter, true, cuts, loneCrEndsLine, false))).toEqual(bounds(general));
}

/** A random messy table: quoted fields, CRLF and LF, blank lines, empty fields, unicode, long quote-free stretches. */
function randomTable(random: () => number, delimiter: string): string {
  const pieces = ['plain', '', ' ', '0.05', '"quoted"', `"with${delimiter}delimiter"`, '"two\nlines"', '"say ""x"""', 'β', '日本', '\xff', 'a"b', 'x\ry'];
  const columns = 1 + Math.floor(random() * 5);
  let text = random() < 0.2 ? '\ufeff' : '';
  const rows = 1 + Math.floor(random() * 40);
  for (let row = 0; row < rows; row++) {
    const fields = Array.from({ length: columns }, () => (random() < 0.7 ? String(Math.floor(random() * 1000) / 1000) : (pieces[Math.floor(random() * pieces.length)] as string)));
    text += fields.join(delimiter);
    text += random() < 0.3 ? '\r\n' : '\n';
    if (random() < 0.1) text += random() < 0.5 ? '\n' : '\r\n';
  }
  if (random() < 0.3) text = text.replace(/\r?\n$/, random() < 0.5 ? '' : '\r');
  return Buffer.from(text, 'utf8').toString('latin1');
}

/** A random messy table with a comma or tab delimiter, and where to cut it into blocks. */
function randomCase(random: () => number): { text: string; delimiter: number; cuts: number[] } {
  const delimiter = random() < 0.5 ? ',' : '\t';
  const text = randomTable(random, delimiter);
  const length = Buffer.byteLength(text, 'latin1');
  const cuts = Array.from({ length: Math.floor(random() * 4) }, () => Math.floor(random() * (length + 1))).sort((a, b) => a - b);
  return { text, delimiter: delimiter.charCodeAt(0), cuts };
}

describe('fast and general paths give identical records and bytes', () => {
  for (const [name, text] of Object.entries(messy)) {
    it(`${name}, cut at every byte`, () => {
      const length = Buffer.byteLength(text, 'latin1');
      expectSame(text, COMMA, []);
      for (let cut = 0; cut <= length; cut++) expectSame(text, COMMA, [cut]);
    });
  }

  it('with tab and semicolon delimiters', () => {
    expectSame('a\tb\n"x\ty"\t1\r\n2\t\n', 0x09, []);
    expectSame('a;b\n0,05;"x;y"\n1;2', 0x3b, []);
  });

  it('with classic Mac line endings (the general path only)', () => {
    expectSame('a,b\r1,2\r"x\ry",3\r', COMMA, [], true);
  });

  it('on 500 random messy tables cut into random blocks', () => {
    const random = seededRandom(7);
    for (let table = 0; table < 500; table++) {
      const { text, delimiter, cuts } = randomCase(random);
      expectSame(text, delimiter, cuts);
    }
  });
});

describe('the column reader takes exactly the records it should, and hands over the rest as the general path reports them', () => {
  /** The general path's records, each either taken by the reader (its value) or handed over (the record). */
  function expected(general: Outcome, fields: number, field: number, until: number): ({ value: number } | ScannedRecord)[] {
    return general.records.map((record) => {
      // Taken: a whole line with no quote, ended by a line feed, starting before `until`, with the right fields.
      const eligible = record.terminator.includes('\n') && !record.content.includes('"') && record.offset < until && record.fields.length === fields;
      if (!eligible) return record;
      const text = Buffer.from(record.fields[field] as string, 'latin1');
      const value = simpleDecimal(text, 0, text.length);
      return value === NOT_SIMPLE || value > 1 ? record : { value };
    });
  }

  function expectColumn(text: string, delimiter: number, cuts: readonly number[], fields: number, field: number, until: number): void {
    const bytes = Buffer.from(text, 'latin1');
    const general = scanInBlocks(bytes, delimiter, false, cuts);
    const taken: number[] = [];
    const column: PlainColumn = { fields, field, until, take: (value) => taken.push(value) };
    const outcome = scanInBlocks(bytes, delimiter, true, cuts, false, true, column);
    expect(outcome.error).toBe(general.error);
    expect(outcome.trailing).toBe(general.trailing);
    const want = expected(general, fields, field, until);
    expect(taken).toEqual(want.flatMap((event) => ('value' in event ? [event.value] : [])));
    // Handed over with the same line, gap, fields and terminator.
    expect(outcome.records).toEqual(want.filter((event): event is ScannedRecord => 'line' in event));
  }

  it('on the messy tables, for every field, cut at every byte', () => {
    for (const text of Object.values(messy)) {
      const length = Buffer.byteLength(text, 'latin1');
      for (const fields of [1, 2, 3]) {
        for (let field = 0; field < fields; field++) {
          expectColumn(text, COMMA, [], fields, field, Infinity);
          for (let cut = 0; cut <= length; cut++) expectColumn(text, COMMA, [cut], fields, field, Infinity);
        }
      }
    }
  });

  it('only before the offset it is given, on 500 random tables cut into random blocks', () => {
    const random = seededRandom(23);
    for (let table = 0; table < 500; table++) {
      const { text, delimiter, cuts } = randomCase(random);
      const fields = 1 + Math.floor(random() * 5);
      const until = random() < 0.5 ? Infinity : Math.floor(random() * (Buffer.byteLength(text, 'latin1') + 1));
      expectColumn(text, delimiter, cuts, fields, Math.floor(random() * fields), until);
    }
  });
});

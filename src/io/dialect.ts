// How a table is written: its delimiter (given by the user, or sniffed from
// the first line) and whether a lone CR ends a line.

/** What the scanner needs to know to split a table into records and fields. */
export interface Dialect {
  readonly delimiter: number;
  /** True for files with classic Mac line endings (a lone CR ends each line). */
  readonly loneCrEndsLine: boolean;
}

export const TAB = 0x09;
export const COMMA = 0x2c;
const SEMICOLON = 0x3b;
const PIPE = 0x7c;
const QUOTE = 0x22;
const CANDIDATES = [TAB, COMMA, SEMICOLON, PIPE];
const LF = 0x0a;
const CR = 0x0d;

/** Delimiters famwise sniffs and accepts, by the names users may type. */
export const DELIMITERS: Readonly<Record<string, number>> = {
  ',': COMMA,
  comma: COMMA,
  tab: TAB,
  '\\t': TAB,
  '\t': TAB,
  ';': SEMICOLON,
  semicolon: SEMICOLON,
  '|': PIPE,
  pipe: PIPE,
};

/** How often each candidate delimiter occurs outside quotes on each of the first `lines` records. */
function countPerLine(head: Buffer, lines: number): Map<number, number>[] {
  const perLine: Map<number, number>[] = [];
  let counts = new Map<number, number>(CANDIDATES.map((c) => [c, 0]));
  let inQuotes = false;
  let lineEnded = false;
  for (let i = 0; i < head.length && perLine.length < lines; i++) {
    const byte = head[i];
    if (byte === QUOTE) inQuotes = opensOrClosesQuote(head, i, inQuotes) ? !inQuotes : inQuotes;
    if (inQuotes) continue;
    if (byte === LF || byte === CR) {
      lineEnded = true;
      continue;
    }
    if (lineEnded) {
      perLine.push(counts);
      counts = new Map<number, number>(CANDIDATES.map((c) => [c, 0]));
      lineEnded = false;
    }
    if (counts.has(byte)) counts.set(byte, (counts.get(byte) as number) + 1);
  }
  if (perLine.length < lines && (lineEnded || !inQuotes)) perLine.push(counts);
  return perLine.slice(0, lines);
}

/**
 * The delimiter of a table, from its first two lines: among the candidates
 * that occur equally often (and at least once) on both, the most frequent;
 * without a second line, or if none is steady, the most frequent on the
 * first line. Ties go to the one the file name promises (.tsv or .tab: tab;
 * .csv: comma), then to tab, comma, semicolon, pipe. A one-column table has
 * none: then .tsv or .tab means tab, anything else comma.
 */
export function sniffDelimiter(head: Buffer, extension: string): number {
  const [first, second] = countPerLine(withoutByteOrderMark(head), 2);
  const promised = extension === 'tsv' || extension === 'tab' ? TAB : extension === 'csv' ? COMMA : -1;
  const count = (c: number): number => first?.get(c) ?? 0;
  const steady = CANDIDATES.filter((c) => count(c) > 0 && second?.get(c) === count(c));
  const pool = steady.length > 0 ? steady : CANDIDATES.filter((c) => count(c) > 0);
  if (pool.length === 0) return promised === TAB ? TAB : COMMA;
  const most = Math.max(...pool.map(count));
  const best = pool.filter((c) => count(c) === most);
  return best.includes(promised) ? promised : (best[0] as number);
}

function withoutByteOrderMark(head: Buffer): Buffer {
  return head[0] === 0xef && head[1] === 0xbb && head[2] === 0xbf ? head.subarray(3) : head;
}

/**
 * Whether the quote at head[i] starts or ends quoting: inside quotes every
 * quote does ("" toggles twice); outside, only one at the start of a field,
 * as the scanner reads it (a quote inside a field, as in 5" tall, is text).
 */
function opensOrClosesQuote(head: Buffer, i: number, inQuotes: boolean): boolean {
  if (inQuotes) return true;
  const before = i === 0 ? -1 : head[i - 1];
  return before === -1 || before === LF || before === CR || CANDIDATES.includes(before);
}

/** Whether the first line break outside quotes is a lone CR. */
export function sniffLoneCr(head: Buffer): boolean {
  head = withoutByteOrderMark(head);
  let inQuotes = false;
  for (let i = 0; i < head.length; i++) {
    const byte = head[i];
    if (byte === QUOTE) inQuotes = opensOrClosesQuote(head, i, inQuotes) ? !inQuotes : inQuotes;
    else if (!inQuotes && byte === LF) return false;
    else if (!inQuotes && byte === CR) return i + 1 < head.length && head[i + 1] !== LF;
  }
  return false;
}

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


/**
 * The delimiter of the first line of `head`: the one the file name promises
 * (.tsv or .tab: tab; .csv: comma) if it occurs there outside quotes, else
 * the one that occurs most often (ties go to tab, then comma, semicolon,
 * pipe). A one-column table has none: then .tsv or .tab means tab, anything
 * else comma.
 */
export function sniffDelimiter(head: Buffer, extension: string): number {
  const counts = new Map<number, number>(CANDIDATES.map((c) => [c, 0]));
  let inQuotes = false;
  for (let i = 0; i < head.length; i++) {
    const byte = head[i];
    if (byte === QUOTE) inQuotes = opensOrClosesQuote(head, i, inQuotes) ? !inQuotes : inQuotes;
    else if (!inQuotes && (byte === LF || byte === CR)) break;
    else if (!inQuotes && counts.has(byte)) counts.set(byte, (counts.get(byte) as number) + 1);
  }
  const promised = extension === 'tsv' || extension === 'tab' ? TAB : extension === 'csv' ? COMMA : -1;
  if (promised >= 0 && (counts.get(promised) ?? 0) > 0) return promised;
  let best = -1;
  let bestCount = 0;
  for (const candidate of CANDIDATES) {
    const count = counts.get(candidate) as number;
    if (count > bestCount) {
      best = candidate;
      bestCount = count;
    }
  }
  if (best >= 0) return best;
  return extension === 'tsv' || extension === 'tab' ? TAB : COMMA;
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
  let inQuotes = false;
  for (let i = 0; i < head.length; i++) {
    const byte = head[i];
    if (byte === QUOTE) inQuotes = opensOrClosesQuote(head, i, inQuotes) ? !inQuotes : inQuotes;
    else if (!inQuotes && byte === LF) return false;
    else if (!inQuotes && byte === CR) return i + 1 < head.length && head[i + 1] !== LF;
  }
  return false;
}

export function delimiterName(delimiter: number): string {
  return delimiter === TAB ? 'tab' : JSON.stringify(String.fromCharCode(delimiter));
}

// Nothing lost, nothing altered: arbitrary tables of arbitrary strings
// (fast-check, fixed seed), written by an outside CSV writer (csv-stringify)
// with any of the four delimiters and either line ending, go through the
// built CLI; an outside parser (csv-parse) then reads every original field
// back unchanged from the output, followed by the two new cells.
import fc from 'fast-check';
import { parse } from 'csv-parse/sync';
import { stringify } from 'csv-stringify/sync';
import { describe, expect, it } from 'vitest';
import { findMethod, type Method } from '../src/methods.js';
import { famwise } from './helpers/cli.js';

const bh = findMethod('bh') as Method;
const DELIMITERS = { ',': 'comma', '\t': 'tab', ';': 'semicolon', '|': 'pipe' } as const;

/**
 * Any text at all (control characters, astral and unpaired code points),
 * with the characters that matter to a CSV reader mixed in often: every
 * delimiter, quotes, line breaks, a byte-order mark, NUL, spaces.
 */
const text = fc
  .array(
    fc.oneof(
      fc.constantFrom(',', ';', '\t', '|', '"', '""', '\n', '\r', '\r\n', ' ', '\ufeff', '\u0000', 'NA', '0.5', 'é', '日本'),
      fc.string({ unit: 'binary', maxLength: 4 }),
    ),
    { maxLength: 5 },
  )
  .map((parts) => parts.join(''));
/** Header names, except ones that are positions (--p-column takes a name first) or famwise's own new columns. */
const name = text.filter((value) => !/^\s*\d+\s*$/.test(value) && !/^(adj|rej)_/.test(value));
const pCell = fc.oneof(
  fc.double({ min: 0, max: 1, noNaN: true }).map(String),
  fc.constantFrom('NA', '', 'NaN', ' 0.5 ', '1e-3', '5E-2', '.05', '1', '0', '0.000'),
);

const table = fc
  .record({
    delimiter: fc.constantFrom(...(Object.keys(DELIMITERS) as (keyof typeof DELIMITERS)[])),
    ending: fc.constantFrom('\n', '\r\n'),
    others: fc.integer({ min: 1, max: 4 }),
    quoted: fc.boolean(),
  })
  .chain((shape) =>
    fc.record({
      shape: fc.constant(shape),
      pAt: fc.nat(shape.others),
      header: fc.array(name, { minLength: shape.others, maxLength: shape.others }),
      rows: fc.array(fc.tuple(fc.array(text, { minLength: shape.others, maxLength: shape.others }), pCell), { maxLength: 25 }),
    }),
  );

function withP(cells: readonly string[], p: string, at: number): string[] {
  return [...cells.slice(0, at), p, ...cells.slice(at)];
}

describe('arbitrary tables pass through famwise adjust', () => {
  it('with every original field unchanged, as an outside parser reads them', () => {
    fc.assert(
      fc.property(table, ({ shape, pAt, header, rows }) => {
        const { delimiter, ending, quoted } = shape;
        const records = [withP(header, 'p value', pAt), ...rows.map(([cells, p]) => withP(cells, p, pAt))];
        // RFC 4180 quoting of every field with a line break in it (csv-stringify quotes only the record delimiter by default).
        const input = Buffer.from(stringify(records, { delimiter, record_delimiter: ending, quoted, quoted_match: /[\r\n]/ }));
        const run = famwise(['adjust', '--delimiter', DELIMITERS[delimiter], '--header', '--p-column', String(pAt + 1), '-q'], input);
        expect(run.status, run.stderr).toBe(0);
        const options = { delimiter, record_delimiter: ending, bom: false, relax_column_count: false };
        const original = parse(input, options) as string[][];
        const output = parse(run.stdoutBytes, options) as string[][];
        expect(output.map((record) => record.slice(0, -2))).toEqual(original);
        expect(output[0]?.slice(-2)).toEqual(['adj_bh', 'rej_bh']);
        const p = Float64Array.from(rows, ([, cell]) => (/^\s*(NA|NaN)?\s*$/.test(cell) ? NaN : Number(cell)));
        const present = p.filter((value) => !Number.isNaN(value));
        const adjusted = bh.adjust(present, present.length);
        let k = 0;
        output.slice(1).forEach((record, row) => {
          const expected = Number.isNaN(p[row] as number) ? ['', ''] : [String(adjusted[k]), String((adjusted[k++] as number) <= 0.05)];
          expect(record.slice(-2)).toEqual(expected);
        });
      }),
      { seed: 20261201, numRuns: 30 },
    );
    // Each run starts the CLI: allow for a busy machine.
  }, 120_000);
});

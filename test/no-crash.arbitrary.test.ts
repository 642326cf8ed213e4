// famwise never fails with a bug on any input: arbitrary bytes, made likely
// to look like a table (delimiters, quotes, line breaks, a byte-order mark,
// NUL, p-value texts good and bad, and raw bytes), go through the reader,
// every method and the writer, headed or not, with and without families and
// --bounds-as-values; anything thrown must be a famwise error (one line,
// file:line, an exit status), never an unexpected one. fast-check, fixed seed.
import { Writable } from 'node:stream';
import fc from 'fast-check';
import { describe, it } from 'vitest';
import { FamwiseError } from '../src/errors.js';
import { adjustWithinFamilies } from '../src/families.js';
import { ByteSink } from '../src/io/byte-sink.js';
import { readTable } from '../src/io/read-table.js';
import { bufferSource } from '../src/io/source.js';
import { type OutputFormat, writeTable } from '../src/io/write-table.js';
import { METHODS } from '../src/methods.js';

const piece = fc.oneof(
  fc.constantFrom(',', ';', '\t', '|', '"', '\n', '\r', '\r\n', ' ', '\ufeff', '\u0000', 'p', 'g', 'NA', '0.5', '0,5', '<1e-3', '1e-400', '1', '0', '-1', 'x'),
  fc.uint8Array({ maxLength: 4 }).map((bytes) => Buffer.from(bytes).toString('latin1')),
);
const input = fc.array(piece, { maxLength: 40 }).map((parts) => Buffer.from(parts.join(''), 'latin1'));

class Discard extends Writable {
  override _write(_chunk: Buffer, _encoding: string, done: () => void): void {
    done();
  }
}

describe('any input', () => {
  it('is adjusted and written, or refused with a famwise error', async () => {
    await fc.assert(
      fc.asyncProperty(input, fc.boolean(), fc.boolean(), fc.option(fc.boolean()), fc.boolean(), async (bytes, family, bounds, header, aligned) => {
        try {
          const source = bufferSource(bytes, 'any.csv');
          const table = await readTable(source, {
            familyColumns: family ? ['1'] : [],
            pColumn: family ? '2' : undefined,
            boundsAsValues: bounds,
            header: header ?? undefined,
          });
          const result = adjustWithinFamilies(table.p, table.families, METHODS, { alpha: 0.05 });
          const columns = METHODS.map((method, k) => ({ name: `adj_${method.token}`, cell: (row: number) => String(result.adjusted[k]?.[row]) }));
          const format: OutputFormat = aligned ? { headings: Array.from({ length: table.shape.columnCount }, (_, k) => String(k + 1)) } : { delimiter: table.shape.delimiter };
          await writeTable(source, table.shape, columns, format, new ByteSink(new Discard()), table.p.length);
        } catch (error) {
          if (!(error instanceof FamwiseError)) throw error;
        }
      }),
      { seed: 20261201, numRuns: 3000 },
    );
  });
});

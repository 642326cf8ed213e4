// Every original byte survives: random tables of awkward strings, written by
// an outside CSV writer (csv-stringify, npm), go through the reader, the
// adjustment and the writer, and come out with each record unchanged and the
// new cells appended before its own line ending.
import { Writable } from 'node:stream';
import { stringify } from 'csv-stringify/sync';
import { describe, expect, it } from 'vitest';
import { adjustWithinFamilies } from '../src/families.js';
import { ByteSink } from '../src/io/byte-sink.js';
import { plannedColumns } from '../src/io/column-plan.js';
import { readTable } from '../src/io/read-table.js';
import { bufferSource } from '../src/io/source.js';
import { writeTable } from '../src/io/write-table.js';
import { findMethod, type Method } from '../src/methods.js';
import { seededRandom } from './helpers/random.js';

const PIECES = ['a', 'Z', ' ', ',', ';', '\t', '"', '""', '\n', '\r\n', '\r', 'é', '日本', '😀', '0.5', '', 'NA', '\ufeff'];

function randomText(random: () => number): string {
  let text = '';
  const length = Math.floor(random() * 5);
  for (let i = 0; i < length; i++) text += PIECES[Math.floor(random() * PIECES.length)];
  return text;
}

class Collect extends Writable {
  chunks: Buffer[] = [];
  override _write(chunk: Buffer, _encoding: string, done: () => void): void {
    this.chunks.push(chunk);
    done();
  }
}

describe('byte-for-byte passthrough on random tables', () => {
  it('keeps every record and appends the new cells, for 1000 random tables', async () => {
    const random = seededRandom(2026);
    const bh = findMethod('bh') as Method;
    for (let t = 0; t < 1000; t++) {
      const columns = 1 + Math.floor(random() * 4);
      const pColumn = Math.floor(random() * columns);
      const delimiter = random() < 0.7 ? ',' : '\t';
      const ending = random() < 0.5 ? '\n' : '\r\n';
      const rows = Math.floor(random() * 8);
      const header = Array.from({ length: columns }, (_, k) => (k === pColumn ? 'p' : `c${k}${randomText(random).replace(/[\r\n]/g, '')}`));
      const records: string[][] = [header];
      const p: number[] = [];
      for (let r = 0; r < rows; r++) {
        const value = random() < 0.15 ? NaN : Math.round(random() * 1e6) / 1e6;
        p.push(value);
        records.push(Array.from({ length: columns }, (_, k) => (k === pColumn ? (Number.isNaN(value) ? 'NA' : String(value)) : randomText(random))));
      }
      const quoted = random() < 0.3;
      // RFC 4180 quoting of every field with a line break in it (csv-stringify
      // by default quotes only the record delimiter). A one-column row holding
      // only an empty string would be a blank line, which is not a record.
      const raws = records.map((record) => {
        const line = stringify([record], { delimiter, record_delimiter: ending, quoted, quoted_match: /[\r\n]/, quoted_empty: columns === 1 });
        return line.slice(0, line.length - ending.length);
      });
      // Blank lines between records are not records, and are kept where they are.
      const blank = raws.map((_, i) => (i > 0 && random() < 0.15 ? ending : ''));
      const input = raws.map((raw, i) => blank[i] + raw + ending).join('');
      const source = bufferSource(Buffer.from(input), 'random.csv');
      const table = await readTable(source, { delimiter: delimiter.charCodeAt(0), header: true, pColumn: 'p' });
      expect(Array.from(table.p)).toEqual(p);
      const result = adjustWithinFamilies(table.p, table.families, [bh], { alpha: 0.05 });
      const values = result.adjusted[0] as Float64Array;
      const out = new Collect();
      const columnsOut = [
        { name: 'adj_bh', cell: (row: number) => (Number.isNaN(values[row]) ? '' : String(values[row])) },
        { name: 'rej_bh', cell: (row: number) => (Number.isNaN(values[row]) ? '' : String(values[row] <= 0.05)) },
      ];
      await writeTable(source, table.shape, columnsOut, { delimiter: table.shape.delimiter }, new ByteSink(out), p.length);
      const expected = raws
        .map((raw, i) => {
          const cells = i === 0 ? ['adj_bh', 'rej_bh'] : columnsOut.map((column) => column.cell(i - 1));
          return blank[i] + raw + delimiter + cells.join(delimiter) + ending;
        })
        .join('');
      expect(Buffer.concat(out.chunks).toString('utf8')).toBe(expected);
      // The same cells as a plan of numbers and decisions, which the writer writes from the values.
      const planned = plannedColumns({ columns: [{ name: 'adj_bh', kind: 'number', values }, { name: 'rej_bh', kind: 'decision', values }], alpha: 0.05, decimalComma: false });
      const fromValues = new Collect();
      await writeTable(source, table.shape, planned, { delimiter: table.shape.delimiter }, new ByteSink(fromValues), p.length);
      expect(Buffer.concat(fromValues.chunks).toString('utf8')).toBe(expected);
    }
  });
});

// The new columns of an adjusted table, described by data alone (names,
// kinds, the numbers), so that the same cells can be made in another
// thread (io/parallel-write.ts) as in this one.

import { LONGEST_NUMBER, writeNumber } from './number-text.js';
import type { OutputColumn } from './write-table.js';

export interface ColumnPlan {
  readonly name: string;
  /** Index of the existing column it writes over; undefined to append it. */
  readonly replaces?: number | undefined;
  /** number: the value itself (empty where NaN); decision: true where the value is at most alpha, false above, empty where NaN. */
  readonly kind: 'number' | 'decision';
  /** By data row. */
  readonly values: Float64Array;
}

export interface ColumnsPlan {
  readonly columns: readonly ColumnPlan[];
  readonly alpha: number;
  /** Numbers with a decimal comma, as the input had them. */
  readonly decimalComma: boolean;
}

const scratch = Buffer.alloc(LONGEST_NUMBER);

/** A number as the shortest decimal that reads back to the same double (as String() writes it); empty for NaN. */
export function numberText(value: number, decimalComma: boolean): string {
  // The one writer of numbers, so that every output format shows the same text.
  return scratch.toString('latin1', 0, writeNumber(value, scratch, 0, decimalComma));
}

export function plannedColumns(plan: ColumnsPlan): OutputColumn[] {
  const { alpha, decimalComma } = plan;
  return plan.columns.map(({ name, replaces, kind, values }) => {
    if (kind === 'decision') {
      return { name, replaces, cell: (row: number) => (Number.isNaN(values[row]) ? '' : values[row] <= alpha ? 'true' : 'false'), decisions: { values, alpha } };
    }
    return { name, replaces, cell: (row: number) => numberText(values[row] as number, decimalComma), numbers: { values, decimalComma } };
  });
}

/**
 * The plan for the data rows from `first` on (row 0 of the part is row
 * `first` of the table): views of values in shared memory, copies of others.
 */
export function planFrom(plan: ColumnsPlan, first: number): ColumnsPlan {
  const parts = new Map<Float64Array, Float64Array>();
  const part = (values: Float64Array): Float64Array => {
    let later = parts.get(values);
    if (!later) parts.set(values, (later = values.buffer instanceof SharedArrayBuffer ? values.subarray(first) : values.slice(first)));
    return later;
  };
  return { ...plan, columns: plan.columns.map((column) => ({ ...column, values: part(column.values) })) };
}

/** The buffers of a plan's values that can be moved to another thread (shared memory is sent as it is). */
export function movableBuffers(plan: ColumnsPlan): ArrayBuffer[] {
  const buffers = plan.columns.map((column) => column.values.buffer).filter((buffer): buffer is ArrayBuffer => !(buffer instanceof SharedArrayBuffer));
  return [...new Set(buffers)];
}

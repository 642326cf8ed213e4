// The --plot option shared by the subcommands: checking the target before
// any reading, and assembling the figures' panels from what was computed.

import { sortedByFamily } from '../diagnostics/by-family.js';
import { UsageError } from '../errors.js';
import type { WithinFamilies } from '../families.js';
import type { Table } from '../io/read-table.js';
import type { Method } from '../methods.js';
import { discoveriesSvg } from '../plots/discoveries-svg.js';
import { type Figure, MAX_PANELS } from '../plots/svg.js';
import { familyLabel, familyRecord } from '../summary.js';
import { checkWritable, samePath } from './options.js';

/** Fails early when the plot could not be written, or would overwrite another file of the run. */
export function checkPlotTarget(plot: string, others: readonly (readonly [string | undefined, string])[]): void {
  checkWritable(plot, '--plot');
  for (const [other, what] of others) {
    if (other !== undefined && other !== '-' && samePath(other, plot)) throw new UsageError(`--plot ${plot}: is also ${what}; give the plot its own file name`);
  }
}

/** Each family's label, as the summary shows it. */
export function familyTitles(table: Table, familyColumnNames: readonly string[]): string[] {
  if (familyColumnNames.length === 0) return [familyLabel(null)];
  return table.familyValues.map((values) => familyLabel(familyRecord(familyColumnNames, values)));
}

/** The note for a figure that left families out, or null when it drew them all. */
export function omittedNote(figure: Figure): string | null {
  if (figure.omitted === 0) return null;
  return `the plot shows the first ${MAX_PANELS} families, in table order; the other ${figure.omitted} are left out (filter the table to plot them)`;
}

const stderrNote = (text: string): void => {
  process.stderr.write(`famwise: note: ${text}\n`);
};

/** The discoveries-by-level figure of an adjustment; `note` hears about families left out of it. */
export function discoveriesPlot(
  table: Table,
  result: WithinFamilies,
  methods: readonly Method[],
  alpha: number,
  familyColumnNames: readonly string[],
  note: (text: string) => void = stderrNote,
): string {
  const byMethod = result.adjusted.map((adjusted) => sortedByFamily(adjusted, table.families).sorted);
  const panels = familyTitles(table, familyColumnNames).map((title, f) => ({ title, sortedAdjusted: byMethod.map((families) => families[f] as Float64Array) }));
  const figure = discoveriesSvg(
    methods.map((method) => method.token),
    alpha,
    panels,
  );
  const omitted = omittedNote(figure);
  if (omitted !== null) note(omitted);
  return figure.svg;
}

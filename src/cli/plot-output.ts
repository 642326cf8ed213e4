// The --plot option shared by the subcommands: checking the target before
// any reading, and assembling the figures' panels from what was computed.

import { UsageError } from '../errors.js';
import type { WithinFamilies } from '../families.js';
import type { Table } from '../io/read-table.js';
import type { Method } from '../methods.js';
import type { Figure } from '../plots/svg.js';
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

/** The note for a figure of `families` panels that left some out, or null when it drew them all. */
export function omittedNote(figure: Figure, families: number): string | null {
  if (figure.omitted === 0) return null;
  return `the plot shows the first ${families - figure.omitted} families, in table order; the other ${figure.omitted} are left out (filter the table to plot them)`;
}

/**
 * The discoveries-by-level figure of an adjustment; `note` hears about
 * families left out of it. The plotting code loads only when a plot is asked for.
 */
export async function discoveriesPlot(
  table: Table,
  result: WithinFamilies,
  methods: readonly Method[],
  alpha: number,
  familyColumnNames: readonly string[],
  note: (text: string) => void,
): Promise<string> {
  const [{ sortedByFamily }, { discoveriesSvg }] = await Promise.all([import('../diagnostics/by-family.js'), import('../plots/discoveries-svg.js')]);
  const byMethod = result.adjusted.map((adjusted) => sortedByFamily(adjusted, table.families).sorted);
  const panels = familyTitles(table, familyColumnNames).map((title, f) => ({ title, sortedAdjusted: byMethod.map((families) => families[f] as Float64Array) }));
  const figure = discoveriesSvg(
    methods.map((method) => method.token),
    alpha,
    panels,
  );
  const omitted = omittedNote(figure, panels.length);
  if (omitted !== null) note(omitted);
  return figure.svg;
}

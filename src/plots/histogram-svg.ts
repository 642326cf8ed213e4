// The p-value histogram as a standalone SVG: for each family a panel of bars
// (counts per bin over [0, 1]), a dashed line at the level every bin would
// reach if all p-values were null, and a solid line at the level of the nulls
// alone (pi0 times that). Each bar and line carries its number in a data-
// attribute, so that what is drawn can be checked against what was computed.
// The solid pi0 line is drawn wider and first, the dashed line over it, so
// that both stay visible where they coincide (pi0 = 1).
//
// Cost: O(bins) per family.

import type { Histogram } from '../diagnostics/histogram.js';
import { shortNumber } from '../diagnostics/short-number.js';
import { type Figure, type LegendEntry, axes, element, figure, niceTicks, panelFrame, panelTitle } from './svg.js';

export interface HistogramPanel {
  readonly title: string;
  readonly histogram: Histogram;
  readonly pi0: number | null;
}

const BAR = '#6b8fb5';
const UNIFORM = '#333333';
const PI0 = '#c2562d';

const LEGEND: readonly LegendEntry[] = [
  { sample: (x, y) => element('rect', { x, y: y - 6, width: 24, height: 12, fill: BAR }), label: 'p-values per bin' },
  { sample: (x, y) => element('line', { x1: x, y1: y, x2: x + 24, y2: y, stroke: UNIFORM, 'stroke-width': 1.5, 'stroke-dasharray': '5 3' }), label: 'level if every p-value were null' },
  { sample: (x, y) => element('line', { x1: x, y1: y, x2: x + 24, y2: y, stroke: PI0, 'stroke-width': 2 }), label: 'level of the nulls alone (pi0, Storey, lambda = 0.5)' },
];

function panel({ title, histogram, pi0 }: HistogramPanel): (originX: number, originY: number) => string {
  return (originX, originY) => {
    const bins = histogram.counts.length;
    const yTicks = niceTicks(Math.max(histogram.uniformLevel, ...histogram.counts, 1), 5, true);
    const frame = panelFrame(originX, originY, 1, yTicks[yTicks.length - 1] as number);
    const bars = Array.from(histogram.counts, (count, k) => {
      const x = frame.x(k / bins);
      const top = frame.y(count);
      return element('rect', {
        x: x + 0.5,
        y: top,
        width: frame.x((k + 1) / bins) - x - 1,
        height: frame.y(0) - top,
        fill: BAR,
        class: 'bar',
        'data-bin': String(k),
        'data-count': String(count),
      });
    });
    const level = (value: number, attributes: Record<string, string | number>): string =>
      element('line', { x1: frame.x(0), y1: frame.y(value), x2: frame.x(1), y2: frame.y(value), 'data-level': String(value), ...attributes });
    const uniform = level(histogram.uniformLevel, { stroke: UNIFORM, 'stroke-width': 1.5, 'stroke-dasharray': '5 3', class: 'uniform-level' });
    const lines = pi0 === null ? [uniform] : [level(histogram.pi0Level, { stroke: PI0, 'stroke-width': 3, class: 'pi0-level', 'data-pi0': String(pi0) }), uniform];
    const shownTitle = pi0 === null ? panelTitle(title) : panelTitle(title, ` (pi0 = ${shortNumber(pi0)})`);
    return axes(frame, shownTitle, [0, 0.25, 0.5, 0.75, 1], yTicks, 'p-value', 'count') + element('g', { class: 'bars' }, bars) + lines.join('');
  };
}

/** The histograms of the families, one panel each (the first MAX_PANELS), and how many were left out. */
export function histogramSvg(panels: readonly HistogramPanel[]): Figure {
  return figure('p-value histogram', LEGEND, panels.map(panel));
}

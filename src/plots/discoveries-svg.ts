// Discoveries against the level, as a standalone SVG: for each family a
// panel, and in it one step line per method giving the number of adjusted
// p-values at or below each level from 0 to 0.25, with the chosen alpha
// marked by a vertical line and each method's count there by a dot. Every
// dot and step carries its numbers in data- attributes, so that what is
// drawn can be checked against what was computed. Steps closer together
// than half a pixel are merged (the curve stays exact at alpha).
//
// Cost: O(n) per family and method.

import { type DiscoveryCurve, discoveriesAt, discoveryCurve, thinCurve } from '../diagnostics/discoveries.js';
import { type LegendEntry, axes, coordinate, element, figure, niceTicks, panelFrame, text } from './svg.js';

export const MAX_LEVEL = 0.25;

/** Line colours, one per method in the order given; distinct under the common colour-vision deficiencies. */
const PALETTE = ['#1b6ca8', '#d1495b', '#2e933c', '#8c5fbf', '#e08e0b', '#4a4a4a', '#00a6a6', '#a0522d'];

export interface DiscoveriesPanel {
  readonly title: string;
  /** sortedAdjusted[k]: method k's adjusted p-values in this family, ascending, none missing. */
  readonly sortedAdjusted: readonly Float64Array[];
}

const colour = (k: number): string => PALETTE[k % PALETTE.length] as string;

/** A step line through the curve, ending at maxLevel. */
function stepPoints(curve: DiscoveryCurve, x: (level: number) => number, y: (count: number) => number): string {
  const points: string[] = [];
  curve.levels.forEach((level, i) => {
    if (i > 0) points.push(`${coordinate(x(level))},${coordinate(y(curve.counts[i - 1] as number))}`);
    points.push(`${coordinate(x(level))},${coordinate(y(curve.counts[i] as number))}`);
  });
  points.push(`${coordinate(x(MAX_LEVEL))},${coordinate(y(curve.counts[curve.counts.length - 1] as number))}`);
  return points.join(' ');
}

function panel(methods: readonly string[], alpha: number, { title, sortedAdjusted }: DiscoveriesPanel): (originX: number, originY: number) => string {
  return (originX, originY) => {
    const curves = sortedAdjusted.map((sorted) => discoveryCurve(sorted, MAX_LEVEL));
    const yTicks = niceTicks(Math.max(1, ...curves.map((curve) => curve.counts[curve.counts.length - 1] as number)));
    const frame = panelFrame(originX, originY, MAX_LEVEL, yTicks[yTicks.length - 1] as number);
    const parts = [axes(frame, title, [0, 0.05, 0.1, 0.15, 0.2, 0.25], yTicks, 'level (adjusted p-value at most)', 'discoveries')];
    if (alpha <= MAX_LEVEL) {
      parts.push(element('line', { x1: frame.x(alpha), y1: frame.top, x2: frame.x(alpha), y2: frame.top + frame.height, stroke: '#777', 'stroke-dasharray': '4 3', class: 'alpha', 'data-alpha': String(alpha) }));
      parts.push(text(frame.x(alpha) + 3, frame.top + 10, `alpha = ${alpha}`, { fill: '#555', class: 'alpha-label' }));
    }
    // At most one step per half pixel: a million tests draw no larger than a hundred.
    const resolution = MAX_LEVEL / (2 * frame.width);
    curves.forEach((fullCurve, k) => {
      const curve = thinCurve(fullCurve, resolution, alpha);
      const token = methods[k] as string;
      const steps = curve.levels.map((level, i) => `${level}:${curve.counts[i]}`).join(' ');
      parts.push(element('polyline', { points: stepPoints(curve, frame.x, frame.y), fill: 'none', stroke: colour(k), 'stroke-width': 1.8, class: 'curve', 'data-method': token, 'data-steps': steps }));
      if (alpha <= MAX_LEVEL) {
        const count = discoveriesAt(sortedAdjusted[k] as Float64Array, alpha);
        parts.push(element('circle', { cx: frame.x(alpha), cy: frame.y(count), r: 3.5, fill: colour(k), class: 'at-alpha', 'data-method': token, 'data-count': String(count) }));
      }
    });
    return parts.join('');
  };
}

/** The discoveries of each method in each family, one panel per family. */
export function discoveriesSvg(methods: readonly string[], alpha: number, panels: readonly DiscoveriesPanel[]): string {
  const legend: LegendEntry[] = methods.map((token, k) => ({
    sample: (x, y) => element('line', { x1: x, y1: y, x2: x + 24, y2: y, stroke: colour(k), 'stroke-width': 2.5 }),
    label: token,
  }));
  legend.push({
    sample: (x, y) => element('line', { x1: x + 12, y1: y - 8, x2: x + 12, y2: y + 8, stroke: '#777', 'stroke-dasharray': '4 3' }),
    label: alpha <= MAX_LEVEL ? `alpha = ${alpha} (dots: discoveries there)` : `alpha = ${alpha} (beyond the plotted range)`,
  });
  return figure('Discoveries by level', legend, panels.map((entry) => panel(methods, alpha, entry)));
}

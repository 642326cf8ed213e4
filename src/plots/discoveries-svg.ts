// Discoveries against the level, as a standalone SVG: for each family a
// panel, and in it one step line per method giving the number of adjusted
// p-values at or below each level from 0 to 0.25, with the chosen alpha
// marked by a vertical line and each method's count there by a dot. Every
// dot and step carries its numbers in data- attributes, so that what is
// drawn can be checked against what was computed. Steps closer together
// than half a pixel are merged (the curve stays exact at alpha).
// Each method has its own colour and its own dash pattern: ten colours cannot
// all stay apart under the common colour-vision deficiencies (nor in a
// grey-scale print), but colour and pattern together can.
//
// Cost: O(n) per family and method.

import { type DiscoveryCurve, discoveriesAt, discoveryCurve, thinCurve } from '../diagnostics/discoveries.js';
import { type Figure, type LegendEntry, axes, coordinate, element, figure, niceTicks, panelFrame, panelTitle, text } from './svg.js';

export const MAX_LEVEL = 0.25;

/**
 * Line colours and dash patterns, one pair per method in the order given, as
 * many as there are methods in the registry. The first seven colours are
 * Okabe & Ito's colour-universal palette without its yellow, too pale on white
 * (Okabe, M. & Ito, K. (2008). Color Universal Design; from memory), then
 * grey, wine and olive.
 */
const PALETTE = ['#0072b2', '#d55e00', '#009e73', '#cc79a7', '#e69f00', '#56b4e9', '#000000', '#888888', '#882255', '#6b6b00'];
const DASHES = ['none', '7 3', '2 2', '9 3 2 3', '1 3', '12 4', '5 2 1 2 1 2', '3 5', '9 2 2 2 2 2', '14 3 3 3'];

export interface DiscoveriesPanel {
  readonly title: string;
  /** sortedAdjusted[k]: method k's adjusted p-values in this family, ascending, none missing. */
  readonly sortedAdjusted: readonly Float64Array[];
}

const colour = (k: number): string => PALETTE[k % PALETTE.length] as string;
const dashes = (k: number): string => DASHES[k % DASHES.length] as string;

/** An alpha label takes about this many pixels per character (11 px sans-serif). */
const LABEL_CHARACTER_WIDTH = 6;

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
    const yTicks = niceTicks(Math.max(1, ...curves.map((curve) => curve.counts[curve.counts.length - 1] as number)), 5, true);
    const frame = panelFrame(originX, originY, MAX_LEVEL, yTicks[yTicks.length - 1] as number);
    const parts = [axes(frame, panelTitle(title), [0, 0.05, 0.1, 0.15, 0.2, 0.25], yTicks, 'level (adjusted p-value at most)', 'discoveries')];
    if (alpha <= MAX_LEVEL) {
      parts.push(element('line', { x1: frame.x(alpha), y1: frame.top, x2: frame.x(alpha), y2: frame.top + frame.height, stroke: '#777', 'stroke-dasharray': '4 3', class: 'alpha', 'data-alpha': String(alpha) }));
      // The label goes right of the line, or left of it where it would run past the panel.
      const label = `alpha = ${alpha}`;
      const fitsRight = frame.x(alpha) + 3 + label.length * LABEL_CHARACTER_WIDTH <= frame.left + frame.width;
      parts.push(text(frame.x(alpha) + (fitsRight ? 3 : -3), frame.top + 10, label, { fill: '#555', 'text-anchor': fitsRight ? 'start' : 'end', class: 'alpha-label' }));
    }
    // At most one step per half pixel: a million tests draw no larger than a hundred.
    const resolution = MAX_LEVEL / (2 * frame.width);
    curves.forEach((fullCurve, k) => {
      const curve = thinCurve(fullCurve, resolution, alpha);
      const token = methods[k] as string;
      const steps = curve.levels.map((level, i) => `${level}:${curve.counts[i]}`).join(' ');
      parts.push(element('polyline', { points: stepPoints(curve, frame.x, frame.y), fill: 'none', stroke: colour(k), 'stroke-width': 1.8, 'stroke-dasharray': dashes(k), class: 'curve', 'data-method': token, 'data-steps': steps }));
      if (alpha <= MAX_LEVEL) {
        const count = discoveriesAt(sortedAdjusted[k] as Float64Array, alpha);
        parts.push(element('circle', { cx: frame.x(alpha), cy: frame.y(count), r: 3.5, fill: colour(k), class: 'at-alpha', 'data-method': token, 'data-count': String(count) }));
      }
    });
    return parts.join('');
  };
}

/** The discoveries of each method in each family, one panel per family (the first MAX_PANELS), and how many families were left out. */
export function discoveriesSvg(methods: readonly string[], alpha: number, panels: readonly DiscoveriesPanel[]): Figure {
  const legend: LegendEntry[] = methods.map((token, k) => ({
    sample: (x, y) => element('line', { x1: x, y1: y, x2: x + 28, y2: y, stroke: colour(k), 'stroke-width': 2.5, 'stroke-dasharray': dashes(k) }),
    label: token,
  }));
  legend.push({
    sample: (x, y) => element('line', { x1: x + 12, y1: y - 8, x2: x + 12, y2: y + 8, stroke: '#777', 'stroke-dasharray': '4 3' }),
    label: alpha <= MAX_LEVEL ? `alpha = ${alpha} (dots: discoveries there)` : `alpha = ${alpha} (beyond the plotted range)`,
  });
  return figure('Discoveries by level', legend, panels.map((entry) => panel(methods, alpha, entry)));
}

// Building blocks for the standalone SVG plots: escaping, elements, tick
// values, and a panel with axes, tick labels and axis titles. The plots are
// small multiples (one panel per family) in a grid, with one legend on top.
// No scripts, fonts, images or styles from outside the file: a browser shows
// it as it is. Output is deterministic (same input, same bytes): coordinates
// are rounded to two decimals.
//
// Cost: proportional to what is drawn.

/** Text made safe for XML content and attribute values. */
export function escapeXml(text: string): string {
  return text.replace(/[<>&"']/g, (character) => `&${({ '<': 'lt', '>': 'gt', '&': 'amp', '"': 'quot', "'": 'apos' } as Record<string, string>)[character]};`);
}

/** A coordinate rounded to two decimals, without trailing zeros. */
export function coordinate(value: number): string {
  return String(Math.round(value * 100) / 100);
}

type Attributes = Readonly<Record<string, string | number>>;

/** An element with attributes (numbers rounded as coordinates) and children (already serialized). */
export function element(tag: string, attributes: Attributes, children: readonly string[] = []): string {
  const attributeText = Object.entries(attributes)
    .map(([name, value]) => ` ${name}="${typeof value === 'number' ? coordinate(value) : escapeXml(value)}"`)
    .join('');
  return children.length === 0 ? `<${tag}${attributeText}/>` : `<${tag}${attributeText}>${children.join('')}</${tag}>`;
}

export function text(x: number, y: number, content: string, attributes: Attributes = {}): string {
  return element('text', { x, y, ...attributes }, [escapeXml(content)]);
}

/**
 * Round tick values from 0 to at least max: steps of 1, 2 or 5 times a power
 * of ten, about `count` of them; whole steps only for counts (`whole`), since
 * "1.5 discoveries" is not a count.
 */
export function niceTicks(max: number, count = 5, whole = false): number[] {
  if (!(max > 0)) return [0, 1];
  const rough = max / count;
  const power = 10 ** Math.floor(Math.log10(rough));
  const nice = ([1, 2, 5, 10].find((factor) => factor * power >= rough) ?? 10) * power;
  const step = whole ? Math.max(1, Math.round(nice)) : nice;
  const ticks: number[] = [];
  for (let k = 0; ; k++) {
    const tick = Number((k * step).toPrecision(12));
    ticks.push(tick);
    if (tick >= max) return ticks;
  }
}

/** A tick label: short, without floating-point noise. */
export function tickLabel(value: number): string {
  return String(Number(value.toPrecision(6)));
}

export interface PanelFrame {
  /** Left, top, width and height of the plotting area inside the panel. */
  readonly left: number;
  readonly top: number;
  readonly width: number;
  readonly height: number;
  /** Data to canvas coordinates. */
  readonly x: (value: number) => number;
  readonly y: (value: number) => number;
}

export const PANEL_WIDTH = 380;
export const PANEL_HEIGHT = 250;
const MARGIN = { left: 56, right: 14, top: 28, bottom: 44 };

/** The frame of the panel at (originX, originY), for data ranges [0, xMax] x [0, yMax]. */
export function panelFrame(originX: number, originY: number, xMax: number, yMax: number): PanelFrame {
  const left = originX + MARGIN.left;
  const top = originY + MARGIN.top;
  const width = PANEL_WIDTH - MARGIN.left - MARGIN.right;
  const height = PANEL_HEIGHT - MARGIN.top - MARGIN.bottom;
  return { left, top, width, height, x: (value) => left + (value / xMax) * width, y: (value) => top + height - (value / yMax) * height };
}

/** The most characters of a panel title that fit above its panel without running into the next one. */
export const TITLE_CHARACTERS = 42;

/** `title` cut to `max` characters (whole code points), ending in an ellipsis when cut. */
export function shortTitle(title: string, max: number): string {
  const characters = Array.from(title);
  return characters.length <= max ? title : `${characters.slice(0, Math.max(0, max - 1)).join('')}…`;
}

/** A panel's title: what is shown (cut to fit) and the full text, kept in a <title> element that viewers show on hover. */
export interface PanelTitle {
  readonly shown: string;
  readonly full: string;
}

/** The panel title for a family's name, with a suffix (such as its pi0) that is never cut. */
export function panelTitle(name: string, suffix = ''): PanelTitle {
  return { shown: shortTitle(name, TITLE_CHARACTERS - Array.from(suffix).length) + suffix, full: name + suffix };
}

/** Axes with ticks, tick labels, axis titles and the panel's title. */
export function axes(frame: PanelFrame, title: PanelTitle, xTicks: readonly number[], yTicks: readonly number[], xTitle: string, yTitle: string): string {
  const bottom = frame.top + frame.height;
  const titleAttributes = { x: frame.left + frame.width / 2, y: frame.top - 10, 'text-anchor': 'middle', 'font-weight': 'bold', class: 'panel-title' };
  const parts = [
    element('text', titleAttributes, [element('title', {}, [escapeXml(title.full)]), escapeXml(title.shown)]),
    element('line', { x1: frame.left, y1: bottom, x2: frame.left + frame.width, y2: bottom, stroke: '#333' }),
    element('line', { x1: frame.left, y1: frame.top, x2: frame.left, y2: bottom, stroke: '#333' }),
  ];
  for (const tick of xTicks) {
    const x = frame.x(tick);
    parts.push(element('line', { x1: x, y1: bottom, x2: x, y2: bottom + 4, stroke: '#333' }));
    parts.push(text(x, bottom + 16, tickLabel(tick), { 'text-anchor': 'middle', class: 'x-tick', 'data-value': String(tick) }));
  }
  for (const tick of yTicks) {
    const y = frame.y(tick);
    parts.push(element('line', { x1: frame.left - 4, y1: y, x2: frame.left, y2: y, stroke: '#333' }));
    parts.push(element('line', { x1: frame.left, y1: y, x2: frame.left + frame.width, y2: y, stroke: '#e4e4e4' }));
    parts.push(text(frame.left - 7, y + 4, tickLabel(tick), { 'text-anchor': 'end', class: 'y-tick', 'data-value': String(tick) }));
  }
  parts.push(text(frame.left + frame.width / 2, bottom + 36, xTitle, { 'text-anchor': 'middle', class: 'axis-title' }));
  const middle = frame.top + frame.height / 2;
  parts.push(text(frame.left - 42, middle, yTitle, { 'text-anchor': 'middle', transform: `rotate(-90 ${coordinate(frame.left - 42)} ${coordinate(middle)})`, class: 'axis-title' }));
  return element('g', { class: 'axes' }, parts);
}

/** One legend entry: a sample of the mark, then its words. */
export interface LegendEntry {
  readonly sample: (x: number, y: number) => string;
  readonly label: string;
}

const LEGEND_HEIGHT = 26;
const LEGEND_WIDTH = 360;
const COLUMNS = 3;
const NOTE_HEIGHT = 20;

/** The most panels a figure draws: beyond a few dozen, small multiples are no longer read, and the file grows without bound. */
export const MAX_PANELS = 60;

/** A figure, and how many panels were left out of it (those after the first MAX_PANELS, in table order). */
export interface Figure {
  readonly svg: string;
  readonly omitted: number;
}

/** The whole figure: a title, a legend row, and one panel per family (at most MAX_PANELS) in a grid of up to three columns. */
export function figure(title: string, legend: readonly LegendEntry[], allPanels: readonly ((originX: number, originY: number) => string)[]): Figure {
  const panels = allPanels.slice(0, MAX_PANELS);
  const omitted = allPanels.length - panels.length;
  const columns = Math.min(COLUMNS, Math.max(1, panels.length));
  const rows = Math.max(1, Math.ceil(panels.length / columns));
  const perRow = Math.max(1, Math.floor((columns * PANEL_WIDTH - 16) / LEGEND_WIDTH));
  const legendRows = Math.ceil(legend.length / perRow);
  const noteHeight = omitted > 0 ? NOTE_HEIGHT : 0;
  const headerHeight = 34 + legendRows * LEGEND_HEIGHT + noteHeight;
  const width = columns * PANEL_WIDTH;
  const height = headerHeight + rows * PANEL_HEIGHT;
  const parts = [
    element('rect', { x: 0, y: 0, width, height, fill: '#ffffff' }),
    text(12, 22, title, { 'font-size': 15, 'font-weight': 'bold', class: 'figure-title' }),
  ];
  legend.forEach((entry, k) => {
    const x = 16 + (k % perRow) * LEGEND_WIDTH;
    const y = 34 + Math.floor(k / perRow) * LEGEND_HEIGHT + 12;
    parts.push(element('g', { class: 'legend-entry' }, [entry.sample(x, y), text(x + 34, y + 4, entry.label)]));
  });
  if (omitted > 0) {
    const note = `Showing the first ${panels.length} of ${allPanels.length} families, in table order; ${omitted} left out.`;
    parts.push(text(12, headerHeight - 8, note, { fill: '#a33', class: 'omitted-note', 'data-omitted': String(omitted) }));
  }
  panels.forEach((panel, k) => {
    parts.push(element('g', { class: 'panel', 'data-index': String(k) }, [panel((k % columns) * PANEL_WIDTH, headerHeight + Math.floor(k / columns) * PANEL_HEIGHT)]));
  });
  const svg = `<?xml version="1.0" encoding="UTF-8"?>\n${element(
    'svg',
    { xmlns: 'http://www.w3.org/2000/svg', width, height, viewBox: `0 0 ${width} ${height}`, 'font-family': 'Helvetica, Arial, sans-serif', 'font-size': 11 },
    parts,
  )}\n`;
  return { svg, omitted };
}

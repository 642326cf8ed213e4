// famwise inspect, and the SVG plots of inspect and adjust, through the built CLI.
import { existsSync, mkdtempSync, readFileSync, readdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { XMLParser, XMLValidator } from 'fast-xml-parser';
import { afterAll, describe, expect, it } from 'vitest';
import { famwise } from './helpers/cli.js';
import { seededRandom } from './helpers/random.js';
import { removeTemporaryFolders, temporaryFolder } from './helpers/temporary-folder.js';

afterAll(removeTemporaryFolders);

const work = temporaryFolder('famwise-inspect-');
const demo = readFileSync(new URL('../demo-data/enzyme-screen.csv', import.meta.url), 'utf8');

/** A table of two families: one of uniform nulls, one with signal and three exact zeros. */
function twoFamilies(): string {
  const random = seededRandom(5);
  const lines = ['id,group,p'];
  for (let i = 0; i < 400; i++) lines.push(`a${i},null,${random()}`);
  for (let i = 0; i < 400; i++) lines.push(`b${i},signal,${i < 3 ? 0 : i < 100 ? random() ** 8 : random()}`);
  lines.push('c,signal,NA');
  return `${lines.join('\n')}\n`;
}

interface InspectJson {
  families: {
    family: Record<string, string> | null;
    counts: { tested: number; missing: number; zeros: number; ones: number; distinct: number; below05: number };
    shareBelow05: number;
    pi0: { lambda: number; estimate: number };
    histogram: { bins: number; counts: number[]; uniformLevel: number; pi0Level: number };
    inflation: { lambda: number };
    uniformity: { n: number; statistic: number; p: number };
    findings: { id: string; text: string }[];
  }[];
}

describe('famwise inspect', () => {
  it('describes each family in text: counts, share below 0.05, pi0, lambda, uniformity, histogram, findings', () => {
    const run = famwise(['inspect', '--family', 'group'], twoFamilies());
    expect(run.status).toBe(0);
    expect(run.stderr).toBe('');
    const [nulls, signal] = run.stdout.split('\n\n');
    expect(nulls).toMatch(/^group=null\n  p-values: 400 \(missing 0\); exactly 0: 0; exactly 1: 0; distinct: 400\n/);
    expect(nulls).toMatch(/\n  findings: none$/);
    expect(signal).toMatch(/^group=signal\n  p-values: 400 \(missing 1\); exactly 0: 3;/);
    expect(signal).toMatch(/below 0\.05: [\d.]+% \(\d+\); null p-values alone would give 5%/);
    expect(signal).toMatch(/inflation factor lambda: [\d.]+/);
    expect(signal).toMatch(/Kolmogorov-Smirnov test of the \d+ p-values above 0\.5: D = [\d.]+, p = [\d.e-]+/);
    expect(signal).toMatch(/\n    \[exact-zeros\] 3 p-values are exactly 0,/);
    // 20 bins, each a line with its range, a bar and its count.
    const bars = (signal ?? '').split('\n').filter((line) => /^    \d\.\d\d-\d\.\d\d  /.test(line));
    expect(bars).toHaveLength(20);
    expect(bars[0]).toMatch(/^    0\.00-0\.05  █+.*\d+$/);
    expect(signal).toMatch(/\| 20 per bin if every p-value were null/);
  });

  it('--json: the same numbers, every digit, findings with ids; the same bytes every run', () => {
    const run = famwise(['inspect', '--family', 'group', '--json', '--bins', '10'], twoFamilies());
    expect(run.status).toBe(0);
    const report = JSON.parse(run.stdout) as InspectJson;
    expect(report.families.map((family) => family.family)).toEqual([{ group: 'null' }, { group: 'signal' }]);
    const signal = report.families[1];
    expect(signal?.counts).toMatchObject({ tested: 400, missing: 1, zeros: 3 });
    expect(signal?.histogram.bins).toBe(10);
    expect(signal?.histogram.counts.reduce((a, b) => a + b, 0)).toBe(400);
    expect(signal?.histogram.uniformLevel).toBe(40);
    expect(signal?.histogram.pi0Level).toBeCloseTo((signal?.pi0.estimate ?? 0) * 40, 12);
    expect(signal?.findings.map((finding) => finding.id)).toContain('exact-zeros');
    expect(report.families[0]?.findings).toEqual([]);
    expect(famwise(['inspect', '--family', 'group', '--json', '--bins', '10'], twoFamilies()).stdout).toBe(run.stdout);
  });

  it('reads statistics and -log10 p-values like adjust, with the same options', () => {
    const fromZ = JSON.parse(famwise(['inspect', '--statistic', 'z', '--json'], 'z\n1.959964\n0\n-3\n').stdout) as InspectJson;
    expect(fromZ.families[0]?.counts).toMatchObject({ tested: 3, ones: 1, below05: 2 });
    const fromLog = JSON.parse(famwise(['inspect', '--p-scale', 'minus-log10', '--json'], 'log10p\n2\n0\n').stdout) as InspectJson;
    expect(fromLog.families[0]?.counts).toMatchObject({ tested: 2, ones: 1, below05: 1 });
  });

  it('says so for a family with no p-values', () => {
    const run = famwise(['inspect'], 'p\nNA\n');
    expect(run.status).toBe(0);
    expect(run.stdout).toBe('(all rows)\n  p-values: 0 (missing 1); exactly 0: 0; exactly 1: 0; distinct: 0\n  nothing to inspect\n');
  });

  it('fails like adjust on bad input and bad options', () => {
    const bad = famwise(['inspect'], 'p\n0.2\n1.5\n');
    expect(bad.status).toBe(1);
    expect(bad.stderr).toMatch(/^famwise: <stdin>:3: column "p": "1.5" is not a p-value/);
    expect(famwise(['inspect', '--bins', '0'], 'p\n0.1\n').stderr).toMatch(/--bins "0": needs a whole number of histogram bins from 1 to 200/);
    expect(famwise(['inspect', '--bins', '0'], 'p\n0.1\n').status).toBe(2);
    expect(famwise(['inspect', '--family', 'nope'], 'p\n0.1\n').status).toBe(2);
  });
});

const parser = new XMLParser({ ignoreAttributes: false, attributeNamePrefix: '', isArray: (name) => ['g', 'rect', 'line', 'text', 'polyline', 'circle'].includes(name) });

type Node = Record<string, unknown>;
/** Every element named `tag` below `node`, depth first. */
function all(node: unknown, tag: string): Node[] {
  if (node === null || typeof node !== 'object') return [];
  const found: Node[] = [];
  for (const [key, value] of Object.entries(node as Node)) {
    const children = Array.isArray(value) ? value : [value];
    if (key === tag) found.push(...(children as Node[]));
    for (const child of children) found.push(...all(child, tag));
  }
  return found;
}

function parseSvg(path: string): { svg: Node; panels: Node[] } {
  const text = readFileSync(path, 'utf8');
  expect(XMLValidator.validate(text)).toBe(true);
  const svg = (parser.parse(text) as { svg: Node }).svg;
  expect(svg.xmlns).toBe('http://www.w3.org/2000/svg');
  // Standalone: no links to anything outside the file.
  expect(text).not.toMatch(/href|<image|<script|@import|url\(/);
  return { svg, panels: all(svg, 'g').filter((g) => g.class === 'panel') };
}

describe('inspect --plot: the histograms as SVG', () => {
  it('is well-formed XML with one panel per family, and draws the numbers the JSON reports', () => {
    const plot = join(work, 'histograms.svg');
    const run = famwise(['inspect', '--family', 'group', '--json', '--plot', plot], twoFamilies());
    expect(run.status).toBe(0);
    const report = JSON.parse(run.stdout) as InspectJson;
    const { svg, panels } = parseSvg(plot);
    expect(panels).toHaveLength(2);
    expect(all(svg, 'g').filter((g) => g.class === 'legend-entry')).toHaveLength(3);
    panels.forEach((panel, f) => {
      const family = report.families[f];
      const titles = all(panel, 'text').filter((t) => t.class === 'panel-title');
      expect(titles[0]?.['#text']).toBe(`group=${f === 0 ? 'null' : 'signal'} (pi0 = ${Number(family?.pi0.estimate.toPrecision(3))})`);
      const bars = all(panel, 'rect').filter((rect) => rect.class === 'bar');
      expect(bars.map((bar) => Number(bar['data-count']))).toEqual(family?.histogram.counts);
      // Heights are proportional to the counts, from one baseline.
      const baseline = Number(bars[0]?.y) + Number(bars[0]?.height);
      const nonEmpty = bars.filter((bar) => Number(bar['data-count']) > 0);
      const scale = Number(nonEmpty[0]?.height) / Number(nonEmpty[0]?.['data-count']);
      for (const bar of bars) {
        expect(Number(bar.y) + Number(bar.height)).toBeCloseTo(baseline, 1);
        expect(Number(bar.height)).toBeCloseTo(Number(bar['data-count']) * scale, 1);
      }
      const lines = all(panel, 'line');
      const uniform = lines.find((line) => line.class === 'uniform-level');
      const pi0 = lines.find((line) => line.class === 'pi0-level');
      expect(Number(uniform?.['data-level'])).toBe(family?.histogram.uniformLevel);
      expect(Number(pi0?.['data-level'])).toBe(family?.histogram.pi0Level);
      expect(baseline - Number(uniform?.y1)).toBeCloseTo((family?.histogram.uniformLevel ?? 0) * scale, 1);
      expect(baseline - Number(pi0?.y1)).toBeCloseTo((family?.histogram.pi0Level ?? 0) * scale, 1);
      // The y tick labels sit where their values are.
      for (const tick of all(panel, 'text').filter((t) => t.class === 'y-tick')) {
        expect(baseline - (Number(tick.y) - 4)).toBeCloseTo(Number(tick['#text']) * scale, 1);
      }
      expect(all(panel, 'text').filter((t) => t.class === 'x-tick').map((t) => t['#text'])).toEqual([0, 0.25, 0.5, 0.75, 1]);
      expect(all(panel, 'text').filter((t) => t.class === 'axis-title').map((t) => t['#text'])).toEqual(['p-value', 'count']);
    });
    const again = join(work, 'histograms-again.svg');
    famwise(['inspect', '--family', 'group', '--plot', again], twoFamilies());
    expect(readFileSync(again).equals(readFileSync(plot))).toBe(true);
  });

  it('refuses a folder that does not exist, before reading', () => {
    const run = famwise(['inspect', '--plot', join(work, 'missing', 'x.svg')], 'p\n0.1\n');
    expect(run.status).toBe(2);
    expect(run.stderr).toMatch(/--plot .*: the folder .* does not exist/);
  });
});

describe('adjust --plot: discoveries against the level, as SVG', () => {
  it('draws one step line per method per family, with the counts at alpha that the summary reports', () => {
    const plot = join(work, 'discoveries.svg');
    const summary = join(work, 'summary.json');
    const input = join(work, 'demo.csv');
    writeFileSync(input, demo);
    const run = famwise(['adjust', input, '--family', 'storage_temp', '--methods', 'holm,bh', '--alpha', '0.1', '-o', join(work, 'out.csv'), '--summary', summary, '--plot', plot, '-q']);
    expect(run.status).toBe(0);
    const rows = (JSON.parse(readFileSync(summary, 'utf8')) as { rows: { family: Record<string, string>; method: string; rejected: number; tested: number }[] }).rows;
    const { svg, panels } = parseSvg(plot);
    expect(panels).toHaveLength(3);
    expect(all(svg, 'g').filter((g) => g.class === 'legend-entry').map((g) => all(g, 'text')[0]?.['#text'])).toEqual(['holm', 'bh', 'alpha = 0.1 (dots: discoveries there)']);
    panels.forEach((panel, f) => {
      const family = ['4C', '25C', '37C'][f];
      for (const method of ['holm', 'bh']) {
        const row = rows.find((r) => r.family.storage_temp === family && r.method === method);
        const dot = all(panel, 'circle').find((circle) => circle['data-method'] === method);
        expect(Number(dot?.['data-count'])).toBe(row?.rejected);
        // The step line reaches the same count at alpha, and never exceeds the family's tests.
        const curve = all(panel, 'polyline').find((line) => line['data-method'] === method);
        const steps = String(curve?.['data-steps']).split(' ').map((step) => step.split(':').map(Number) as [number, number]);
        const atAlpha = steps.filter(([level]) => level <= 0.1).pop()?.[1];
        expect(atAlpha).toBe(row?.rejected);
        for (let i = 1; i < steps.length; i++) {
          expect(steps[i]?.[0]).toBeGreaterThan(steps[i - 1]?.[0] as number);
          expect(steps[i]?.[1]).toBeGreaterThan(steps[i - 1]?.[1] as number);
        }
        expect(steps[steps.length - 1]?.[1]).toBeLessThanOrEqual(row?.tested as number);
      }
      const alpha = all(panel, 'line').find((line) => line.class === 'alpha');
      expect(Number(alpha?.['data-alpha'])).toBe(0.1);
      expect(all(panel, 'text').filter((t) => t.class === 'x-tick').map((t) => t['#text'])).toEqual([0, 0.05, 0.1, 0.15, 0.2, 0.25]);
    });
    // The same input draws the same bytes.
    const again = join(work, 'discoveries-again.svg');
    famwise(['adjust', input, '--family', 'storage_temp', '--methods', 'holm,bh', '--alpha', '0.1', '-o', join(work, 'out2.csv'), '--plot', again, '-q']);
    expect(readFileSync(again).equals(readFileSync(plot))).toBe(true);
  });

  it('leaves no plot behind when the table is bad, and refuses to plot over the input', () => {
    const folder = mkdtempSync(join(work, 'bad-'));
    const plot = join(folder, 'plot.svg');
    const run = famwise(['adjust', '--plot', plot, '-q'], 'p\n0.1\nx\n');
    expect(run.status).toBe(1);
    expect(existsSync(plot)).toBe(false);
    expect(readdirSync(folder)).toEqual([]);
    const input = join(folder, 'in.csv');
    writeFileSync(input, 'p\n0.1\n');
    const same = famwise(['adjust', input, '--plot', input, '-q']);
    expect(same.status).toBe(2);
    expect(same.stderr).toMatch(/--plot .*: is also the input table/);
    expect(readFileSync(input, 'utf8')).toBe('p\n0.1\n');
  });
});

describe('edge cases of lambda and exact zeros, in text and JSON alike', () => {
  it('lambda is unbounded when half the p-values are 0: the text says so, the JSON has null with unbounded: true', () => {
    const input = 'p\n0\n0\n0\n0.5\n0.7\n';
    expect(famwise(['inspect'], input).stdout).toMatch(/\n  inflation factor lambda: unbounded \(half or more of the p-values are exactly 0\)\n/);
    const report = JSON.parse(famwise(['inspect', '--json'], input).stdout) as { families: { inflation: Record<string, unknown> }[] };
    expect(report.families[0]?.inflation).toMatchObject({ lambda: null, unbounded: true, medianStatistic: null });
    const finite = JSON.parse(famwise(['inspect', '--json'], 'p\n0.1\n0.5\n').stdout) as { families: { inflation: Record<string, unknown> }[] };
    expect(finite.families[0]?.inflation).toMatchObject({ unbounded: false });
    expect(finite.families[0]?.inflation.lambda).toBeGreaterThan(0);
  });

  it('exact zeros computed by famwise from statistics (z = 40) are blamed on double precision, not on the upstream tool', () => {
    const fromStatistics = famwise(['inspect', '--statistic', 'z', '--json'], 'z\n40\n1\n0.5\n');
    const finding = (JSON.parse(fromStatistics.stdout) as InspectJson).families[0]?.findings.find((entry) => entry.id === 'exact-zeros');
    expect(finding?.text).toMatch(/famwise computed them from statistics too large for double precision/);
    expect(finding?.text).not.toMatch(/--statistic/);
    const read = (JSON.parse(famwise(['inspect', '--json'], 'p\n0\n0.3\n0.5\n').stdout) as InspectJson).families[0]?.findings.find((entry) => entry.id === 'exact-zeros');
    expect(read?.text).toMatch(/--statistic/);
  });
});

describe('readable plots', () => {
  const methods = ['bonferroni', 'holm', 'sidak', 'holm-sidak', 'hochberg', 'hommel', 'bh', 'by', 'storey', 'bky'];

  /** Families of 300 p-values, a fifth of them small, named by `name`. */
  function table(families: number, name: (f: number) => string, size = 300): string {
    const random = seededRandom(9);
    const lines = ['family,p'];
    for (let f = 0; f < families; f++) for (let i = 0; i < size; i++) lines.push(`${name(f)},${i < size / 5 ? random() ** 6 : random()}`);
    return `${lines.join('\n')}\n`;
  }

  it('cuts a long family name to fit its panel, with an ellipsis, and keeps the full name in a <title>', () => {
    const long = `g${'x'.repeat(299)}`;
    const plot = join(work, 'long.svg');
    expect(famwise(['inspect', '--family', 'family', '--plot', plot], table(2, (f) => (f === 0 ? long : 'short'))).status).toBe(0);
    const { panels } = parseSvg(plot);
    const heading = all(panels[0], 'text').find((t) => t.class === 'panel-title');
    const shown = String(heading?.['#text']);
    expect(Array.from(shown).length).toBeLessThanOrEqual(42);
    expect(shown).toMatch(/^family=gxxx+… \(pi0 = [\d.]+\)$/);
    expect(heading?.title).toMatch(new RegExp(`^family=${long} \\(pi0 = [\\d.]+\\)$`));
    expect(all(panels[1], 'text').find((t) => t.class === 'panel-title')?.['#text']).toMatch(/^family=short \(pi0 = [\d.]+\)$/);
  });

  it('gives each of the ten methods its own colour and its own dash pattern, in the lines and in the legend', () => {
    const plot = join(work, 'ten.svg');
    const run = famwise(['adjust', '--family', 'family', '--methods', methods.join(','), '--plot', plot, '-o', join(work, 'ten.csv'), '-q'], table(1, () => 'a'));
    expect(run.status).toBe(0);
    const { svg, panels } = parseSvg(plot);
    const curves = all(panels[0], 'polyline');
    expect(curves.map((curve) => curve['data-method'])).toEqual(methods);
    expect(new Set(curves.map((curve) => curve.stroke)).size).toBe(10);
    expect(new Set(curves.map((curve) => curve['stroke-dasharray'])).size).toBe(10);
    const samples = all(svg, 'g').filter((g) => g.class === 'legend-entry').slice(0, 10).map((g) => all(g, 'line')[0]);
    expect(samples.map((line) => `${line?.stroke} ${line?.['stroke-dasharray']}`)).toEqual(curves.map((curve) => `${curve.stroke} ${curve['stroke-dasharray']}`));
  });

  it('keeps the alpha label inside the panel at alpha = 0.25, and counts on whole ticks only', () => {
    const plot = join(work, 'alpha.svg');
    expect(famwise(['adjust', '--family', 'family', '--methods', 'holm', '--alpha', '0.25', '--plot', plot, '-o', join(work, 'alpha.csv'), '-q'], table(1, () => 'a', 10)).status).toBe(0);
    const { panels } = parseSvg(plot);
    const label = all(panels[0], 'text').find((t) => t.class === 'alpha-label');
    const line = all(panels[0], 'line').find((l) => l.class === 'alpha');
    expect(label?.['text-anchor']).toBe('end');
    expect(Number(label?.x)).toBeLessThan(Number(line?.x1));
    for (const tick of all(panels[0], 'text').filter((t) => t.class === 'y-tick')) expect(Number.isInteger(Number(tick['data-value']))).toBe(true);
    // Few p-values in the histogram too: whole counts only.
    const histogram = join(work, 'few.svg');
    expect(famwise(['inspect', '--plot', histogram], 'p\n0.1\n0.6\n').status).toBe(0);
    for (const tick of all(parseSvg(histogram).panels[0], 'text').filter((t) => t.class === 'y-tick')) expect(Number.isInteger(Number(tick['data-value']))).toBe(true);
  });

  it('draws the dashed uniform line over the solid pi0 line, so both show when pi0 = 1', () => {
    const plot = join(work, 'pi0-one.svg');
    const input = `p\n${Array.from({ length: 200 }, (_, i) => 0.5 + (i + 0.5) / 400).join('\n')}\n`;
    expect(famwise(['inspect', '--plot', plot], input).status).toBe(0);
    const lines = all(parseSvg(plot).panels[0], 'line').filter((line) => line.class === 'uniform-level' || line.class === 'pi0-level');
    expect(lines.map((line) => line.class)).toEqual(['pi0-level', 'uniform-level']);
    expect(lines[0]?.y1).toBe(lines[1]?.y1);
    expect(Number(lines[0]?.['stroke-width'])).toBeGreaterThan(Number(lines[1]?.['stroke-width']));
  });

  it('draws at most 60 families, in table order, and says in the SVG and on stderr how many it left out', () => {
    const input = table(75, (f) => `f${String(f).padStart(2, '0')}`, 20);
    const plot = join(work, 'many.svg');
    const run = famwise(['inspect', '--family', 'family', '--plot', plot], input);
    expect(run.status).toBe(0);
    expect(run.stderr).toBe('famwise: note: the plot shows the first 60 families, in table order; the other 15 are left out (filter the table to plot them)\n');
    const { svg, panels } = parseSvg(plot);
    expect(panels).toHaveLength(60);
    expect(all(panels[59], 'text').find((t) => t.class === 'panel-title')?.['#text']).toMatch(/^family=f59 /);
    const note = all(svg, 'text').find((t) => t.class === 'omitted-note');
    expect(note?.['data-omitted']).toBe('15');
    expect(note?.['#text']).toBe('Showing the first 60 of 75 families, in table order; 15 left out.');
    expect(famwise(['inspect', '--family', 'family', '--plot', plot, '-q'], input).stderr).toBe('');
    const adjusted = famwise(['adjust', '--family', 'family', '--plot', join(work, 'many-adjust.svg'), '-o', join(work, 'many.csv')], input);
    expect(adjusted.stderr).toMatch(/famwise: note: the plot shows the first 60 families, in table order; the other 15 are left out/);
    const quiet = famwise(['adjust', '--family', 'family', '--plot', join(work, 'many-adjust.svg'), '-o', join(work, 'many.csv'), '-q'], input);
    expect(quiet.stderr).toBe('');
    expect(parseSvg(join(work, 'many-adjust.svg')).panels).toHaveLength(60);
    // Fewer families: no note anywhere.
    const few = join(work, 'few-families.svg');
    expect(famwise(['inspect', '--family', 'family', '--plot', few], table(3, (f) => `f${f}`, 20)).stderr).toBe('');
    expect(readFileSync(few, 'utf8')).not.toMatch(/omitted-note/);
  });
});

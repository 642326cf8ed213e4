// Every finding has a table that triggers it and one that does not; uniform
// null p-values of any size trigger none (common practice, no source: null
// p-values are uniform, so a healthy table should raise nothing).
import { describe, expect, it } from 'vitest';
import { RULES } from '../src/diagnostics/findings.js';
import { inspectFamily } from '../src/diagnostics/inspect-family.js';
import { pFromStatistic } from '../src/distributions/p-from-statistic.js';
import { seededRandom } from './helpers/random.js';

function ids(values: ArrayLike<number>): string[] {
  return inspectFamily(Float64Array.from(values).sort(), 0, 20).findings.map((finding) => finding.id);
}

function uniform(seed: number, size: number): number[] {
  const random = seededRandom(seed);
  return Array.from({ length: size }, () => random());
}

function between(seed: number, size: number, low: number, high: number): number[] {
  return uniform(seed, size).map((u) => low + u * (high - low));
}

function scaledZ(seed: number, size: number, scale: number): number[] {
  const random = seededRandom(seed);
  return Array.from({ length: size }, () => {
    const z = Math.sqrt(-2 * Math.log(1 - random())) * Math.cos(2 * Math.PI * random());
    return pFromStatistic('z', 'two', scale * z);
  });
}

const cases: Record<string, { triggers: number[]; quiet: number[] }> = {
  'exact-zeros': { triggers: [...uniform(1, 200), 0], quiet: [...uniform(1, 200), 1e-300] },
  'spike-at-one': { triggers: [...uniform(2, 1000), ...Array(50).fill(1)], quiet: [...uniform(2, 1000), 1, 1] },
  'few-distinct': {
    triggers: uniform(3, 400).map((p) => Math.round(p * 20) / 20),
    quiet: uniform(3, 400).map((p) => Math.round(p * 1000) / 1000),
  },
  'u-shape': { triggers: [...uniform(4, 1000), ...between(5, 200, 0.9, 1)], quiet: [...uniform(4, 1000), ...between(5, 200, 0, 0.05)] },
  'hill-shape': { triggers: [...between(6, 1000, 0, 0.9), ...between(7, 10, 0.9, 1)], quiet: uniform(6, 1000) },
  inflation: { triggers: scaledZ(8, 2000, 1.3), quiet: scaledZ(8, 2000, 1) },
  'excess-below-05': {
    triggers: [...uniform(9, 1000), ...between(10, 30, 0.045, 0.05)],
    quiet: [...uniform(9, 1000), ...between(10, 30, 0.045, 0.055)],
  },
};

describe('each finding: a table that triggers it, and one that does not', () => {
  for (const rule of RULES) {
    it(rule.id, () => {
      const table = cases[rule.id];
      expect(table, `add test tables for ${rule.id}`).toBeDefined();
      expect(ids(table?.triggers ?? [])).toContain(rule.id);
      expect(ids(table?.quiet ?? [])).not.toContain(rule.id);
    });
  }

  it('the identifiers are unique and stable (scripts match on them)', () => {
    expect(RULES.map((rule) => rule.id)).toEqual(['exact-zeros', 'spike-at-one', 'few-distinct', 'u-shape', 'hill-shape', 'inflation', 'excess-below-05']);
  });
});

describe('uniform null p-values raise no finding', () => {
  for (const size of [20, 100, 1_000, 10_000, 200_000]) {
    it(`${size} of them, five seeds`, () => {
      for (let seed = 100; seed < 105; seed++) expect(ids(uniform(seed * size, size))).toEqual([]);
    });
  }

  it('nor do null p-values computed from z statistics', () => {
    expect(ids(scaledZ(21, 50_000, 1))).toEqual([]);
  });
});

describe('the sentences', () => {
  it('are one sentence each, naming the counts they rest on', () => {
    const findings = inspectFamily(Float64Array.from([...uniform(2, 1000), 0, 0, ...Array(50).fill(1)]).sort(), 0, 20).findings;
    const text = Object.fromEntries(findings.map((finding) => [finding.id, finding.text]));
    expect(text['exact-zeros']).toMatch(/^2 p-values are exactly 0, /);
    expect(text['spike-at-one']).toMatch(/^50 p-values of 1052 are exactly 1, /);
    for (const finding of findings) expect(finding.text.match(/\. /g)).toBeNull();
  });
});

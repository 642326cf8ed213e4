// The package's seeded generator (mulberry32) so that property checks are repeatable.
export { seededUniform as seededRandom } from '../../src/random.js';

/** p-values with the awkward cases mixed in: ties, 0, 1, tiny and subnormal values. */
export function awkwardPValues(random: () => number, size: number): Float64Array {
  const p = new Float64Array(size);
  for (let i = 0; i < size; i++) {
    const u = random();
    if (u < 0.05) p[i] = 0;
    else if (u < 0.1) p[i] = 1;
    else if (u < 0.13) p[i] = 5e-324 * (1 + Math.floor(random() * 10));
    else if (u < 0.3) p[i] = Math.round(random() * 20) / 20;
    else if (u < 0.5) p[i] = random() ** 12;
    else p[i] = random();
  }
  return p;
}

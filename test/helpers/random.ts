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

/**
 * Ties that cross any split of p into two parts: -0 near the start and 0
 * near the end, the first value again at the end and in the middle (for p
 * of more than 10 values; it is changed in place and returned).
 */
export function withTiesAcross(p: Float64Array): Float64Array {
  const size = p.length;
  if (size <= 10) return p;
  p[1] = -0;
  p[size - 2] = 0;
  p[size - 1] = p[0] as number;
  p[Math.floor(size / 2)] = p[3] as number;
  return p;
}

// Numbers of every kind that number-text.ts must write as String() does: the
// same samples for the test (a few hundred thousand) and for
// scripts/check-number-text.mjs (as many as it is asked for).

/** A double from its two 32-bit words. */
function fromWords(low: number, high: number): number {
  const words = new Uint32Array(2);
  words[0] = low;
  words[1] = high;
  return new Float64Array(words.buffer)[0] as number;
}

/** The double `steps` units in the last place away from v (v > 0). */
export function stepsAway(v: number, steps: number): number {
  const words = new Uint32Array(new Float64Array([v]).buffer);
  const low = (words[0] as number) + steps;
  const carry = Math.floor(low / 2 ** 32);
  return fromWords(low - carry * 2 ** 32, (words[1] as number) + carry);
}

/** Calls each(v) on `count` numbers of each kind, drawn with `random` (uniform on [0, 1)). */
export function numberSamples(random: () => number, count: number, each: (v: number) => void): void {
  const bits = (): number => Math.floor(random() * 2 ** 32);
  for (let i = 0; i < count; i++) {
    // Any double from 2^-22 to 1: every exponent, every mantissa.
    each(fromWords(bits(), 0x3e900000 + Math.floor(random() * (0x3ff00000 - 0x3e900000))));
    // Short decimals of 1 to 17 digits in every decade from 1e-8 to 1.
    each(Number(`${random().toPrecision(1 + Math.floor(random() * 17))}e-${Math.floor(random() * 8)}`));
    // Adjusted p-values as the procedures make them: m p / i and (m / i) p, capped at 1.
    const m = 1 + Math.floor(random() ** 3 * 5e7);
    const rank = 1 + Math.floor(random() * m);
    const p = Number(random().toPrecision(1 + Math.floor(random() * 8)));
    each(Math.min(1, (p * m) / rank));
    each(Math.min(1, (m / rank) * p));
  }
  // Near the edges: powers of ten, of two, halves, 1e-6 and 1, some hundred units in the last place either way.
  for (let k = 0; k <= 24; k++) {
    for (const edge of [10 ** -k, 2 ** -k, 5 * 10 ** -(k + 1), 2.5 * 10 ** -k]) {
      for (let steps = -120; steps <= 120; steps++) each(stepsAway(edge, steps));
    }
  }
  for (const special of [NaN, 0, -0, 1, 5e-324, 2.2250738585072014e-308, 1e-7, 1e-6, 0.1, 0.5, 2, 1e21, -0.5]) each(special);
}

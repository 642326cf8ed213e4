// A seeded stream of uniform numbers, for the computations that resample
// (the bootstrap choice of lambda) and for the tests' random vectors: the
// same seed gives the same numbers on every machine and Node version, which
// Math.random cannot promise.
//
// mulberry32 (a widely used public-domain generator; common practice, no
// published source): 32 bits of state, one add and a few multiply-xorshift
// rounds per number, period 2^32, ample for resampling. Each number is a
// multiple of 2^-32 in [0, 1).
// Cost: O(1) per number.

/** A seeded stream of uniform numbers in [0, 1). */
export function seededUniform(seed: number): () => number {
  let state = seed >>> 0;
  return () => {
    state = (state + 0x6d2b79f5) >>> 0;
    let mixed = state;
    mixed = Math.imul(mixed ^ (mixed >>> 15), mixed | 1);
    mixed ^= mixed + Math.imul(mixed ^ (mixed >>> 7), mixed | 61);
    return ((mixed ^ (mixed >>> 14)) >>> 0) / 4294967296;
  };
}

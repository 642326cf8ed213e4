// How many discoveries a procedure makes as the level changes: the number
// of adjusted p-values at or below each level. The curve is a step function
// that rises at each adjusted value; drawn per method, it shows how much a
// choice of procedure or level matters (a curve that rises steeply just
// above alpha says that a slightly different level would change the list a lot).
//
// Cost: O(n) on sorted adjusted values.

/** The step points of the curve on [0, maxLevel]: counts[i] discoveries from levels[i] up to the next level. */
export interface DiscoveryCurve {
  readonly levels: number[];
  readonly counts: number[];
}

/** The number of ascending adjusted values at or below `level`. */
export function discoveriesAt(sortedAdjusted: Float64Array, level: number): number {
  let low = 0;
  let high = sortedAdjusted.length;
  while (low < high) {
    const mid = (low + high) >>> 1;
    if ((sortedAdjusted[mid] as number) <= level) low = mid + 1;
    else high = mid;
  }
  return low;
}

/** The curve from level 0 to maxLevel, on ascending adjusted values (none missing). */
export function discoveryCurve(sortedAdjusted: Float64Array, maxLevel: number): DiscoveryCurve {
  const levels = [0];
  const counts = [discoveriesAt(sortedAdjusted, 0)];
  for (let i = counts[0] as number; i < sortedAdjusted.length && (sortedAdjusted[i] as number) <= maxLevel; i++) {
    const level = sortedAdjusted[i] as number;
    // Tied adjusted values make one step.
    if (i + 1 < sortedAdjusted.length && sortedAdjusted[i + 1] === level) continue;
    levels.push(level);
    counts.push(i + 1);
  }
  return { levels, counts };
}

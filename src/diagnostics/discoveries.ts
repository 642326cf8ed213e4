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

/**
 * The curve with the steps that fall in the same interval of width
 * `resolution` merged into the last of them (the one with the highest
 * count), so that a drawing holds at most one step per half pixel however
 * many tests there are. The step at or just below `exactAt` (alpha) is always
 * kept, so that the curve is exact there.
 */
export function thinCurve(curve: DiscoveryCurve, resolution: number, exactAt: number): DiscoveryCurve {
  const { levels: allLevels, counts: allCounts } = curve;
  const levels: number[] = [];
  const counts: number[] = [];
  const cell = (level: number): number => Math.floor(level / resolution);
  for (let i = 0; i < allLevels.length; i++) {
    const level = allLevels[i] as number;
    const next = allLevels[i + 1];
    const lastInCell = next === undefined || cell(next) !== cell(level);
    const lastAtOrBelowExact = level <= exactAt && (next === undefined || next > exactAt);
    if (i === 0 || lastInCell || lastAtOrBelowExact) {
      levels.push(level);
      counts.push(allCounts[i] as number);
    }
  }
  return { levels, counts };
}

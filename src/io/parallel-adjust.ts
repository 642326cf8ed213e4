// Adjusting a table read in two parts, in two threads. The two threads that
// read the parts also sorted them (read-table.ts); the step procedures
// (procedures/step-parts.ts) then adjust each part where it is, this thread
// the first and the worker the second, with no merge and no pass over the
// whole in one thread: each finds its values' ranks in the whole family and
// its running values; then, with the other part's running values, writes its
// adjusted values into its own rows; one method after another, so that the
// running values of only one are held. The results are bit for bit those of
// one thread (test/parallel.e2e.test.ts compares the commands' output;
// test/step-parts.test.ts the procedures'). Should the worker fail at
// either stage, this thread does its share too.

import { DataError } from '../errors.js';
import { type FamilyOutcome, TooFewTestsError, type WithinFamilies } from '../families.js';
import { METHODS, type Method } from '../methods.js';
import { type Sorted, type SortedParts, sharedFloat64 } from '../procedures/sorting.js';
import { type PartRejections, type StepForm, adjustPart, partMeasure, partRunning, ranksInWhole } from '../procedures/step-parts.js';
import { checkedTestCount } from '../procedures/validate.js';
import { numberTextLength } from './number-text.js';
import { type StepsJob, startPart } from './parts.js';

/** Values of the first part measured at a time, by whichever thread claims them (StepsJob.measureFirst). */
export const MEASURE_CHUNK = 1 << 14;

/** What a part's adjust stage gives: its rejections, and what it measured of the first part. */
export interface StageOutcome extends PartRejections {
  readonly measured: number;
}

/** What one part does at each stage, in whichever thread runs it. */
export function stepsStage(job: StepsJob): StageOutcome | null {
  const form = METHODS.find((method) => method.token === job.token)?.stepForm as StepForm;
  if (job.stage === 'running') {
    if (job.withRanks) ranksInWhole(job.own.sorted, job.other, job.rowOffset === 0, job.ranks);
    partRunning(form, job.own.sorted, job.ranks, job.m, job.ownRunning);
    return null;
  }
  const own = adjustPart(form, job.own, job.ranks, job.ownRunning, job.otherRunning, job.m, job.alpha, job.target, job.rowOffset);
  const { measureFirst } = job;
  if (measureFirst === undefined) return { ...own, measured: 0 };
  const { next, to, firstRanks } = measureFirst;
  // The first part's running values are the second part's job's other ones.
  const [firstRunning, secondRunning] = job.rowOffset === 0 ? [job.ownRunning, job.otherRunning] : [job.otherRunning, job.ownRunning];
  let measured = 0;
  for (let from = Atomics.add(next, 0, MEASURE_CHUNK); from < to; from = Atomics.add(next, 0, MEASURE_CHUNK)) {
    measured += partMeasure(form, firstRanks, firstRunning, secondRunning, job.m, from, Math.min(to, from + MEASURE_CHUNK), numberTextLength);
  }
  return { ...own, measured };
}

/** The part in shared memory (the sort leaves it there, but for a table with -0 in it). */
function shared(part: Sorted): Sorted {
  if (part.sorted.buffer instanceof SharedArrayBuffer && part.order.buffer instanceof SharedArrayBuffer) return part;
  const order = new Uint32Array(new SharedArrayBuffer(4 * part.order.length));
  order.set(part.order);
  const sorted = sharedFloat64(part.sorted.length);
  sorted.set(part.sorted);
  return { order, sorted };
}

/** Each method's adjusted values in the first part: their measure summed, and how many are rejected. */
export interface FirstPartMeasures {
  readonly rows: number;
  readonly byMethod: readonly { readonly measured: number; readonly rejected: number }[];
}

/**
 * p adjusted by each method, when the table is one family sorted in two
 * parts and every method is a step procedure; undefined otherwise (the
 * caller adjusts it in this thread). tests: the number of tests, when the
 * table holds only some. With measureFirst, the length of the text of each
 * method's adjusted values in the first part (number-text.ts,
 * numberTextLength) is summed too, shared between the two threads:
 * parallel-write.ts then knows where the second part's output starts.
 */
export async function adjustInTwoThreads(
  p: Float64Array,
  parts: SortedParts,
  methods: readonly Method[],
  alpha: number,
  tests: number | undefined,
  measureFirst = false,
): Promise<(WithinFamilies & { readonly firstPart?: FirstPartMeasures }) | undefined> {
  if (!methods.every((method) => method.stepForm !== undefined)) return undefined;
  const n = p.length;
  const split = parts.first.order.length;
  if (split + parts.second.order.length !== n) return undefined;
  if (tests !== undefined && tests < n) throw new TooFewTestsError(0, n, tests);
  const m = checkedTestCount(p, tests ?? n);
  const first = shared(parts.first);
  const second = shared(parts.second);
  // Each part's running values, used by one method after another (a step form's fill at most n + 1).
  const firstRunning = sharedFloat64(split + 1);
  const secondRunning = sharedFloat64(n - split + 1);
  const firstRanks = new Uint32Array(new SharedArrayBuffer(4 * split));
  const secondRanks = new Uint32Array(new SharedArrayBuffer(4 * (n - split)));
  const adjusted: Float64Array[] = [];
  const outcomes: FamilyOutcome[] = [];
  const byMethod: { measured: number; rejected: number }[] = [];
  for (const [k, method] of methods.entries()) {
    const target = sharedFloat64(n);
    adjusted.push(target);
    const common = { kind: 'steps' as const, withRanks: k === 0, token: method.token, m, alpha, target };
    const firstJob: StepsJob = { ...common, stage: 'running', own: first, other: second.sorted, ranks: firstRanks, ownRunning: firstRunning, otherRunning: secondRunning, rowOffset: 0 };
    const secondJob: StepsJob = { ...common, stage: 'running', own: second, other: first.sorted, ranks: secondRanks, ownRunning: secondRunning, otherRunning: firstRunning, rowOffset: split };
    await inBoth(secondJob, () => stepsStage(firstJob));
    // Measured by both threads: the worker would otherwise wait while this one measured them all.
    const measure = measureFirst ? { next: new Int32Array(new SharedArrayBuffer(4)), to: split, firstRanks } : undefined;
    const [a, b] = (await inBoth({ ...secondJob, stage: 'adjust', measureFirst: measure }, () => stepsStage({ ...firstJob, stage: 'adjust', measureFirst: measure }))) as [StageOutcome, StageOutcome];
    byMethod.push({ measured: a.measured + b.measured, rejected: a.rejected });
    const rejected = a.rejected + b.rejected;
    outcomes.push({ tested: n, missing: 0, m, rejected, threshold: rejected > 0 ? Math.max(a.threshold, b.threshold) : null, pi0: null });
  }
  return { adjusted, outcomes: [outcomes], ...(measureFirst ? { firstPart: { rows: split, byMethod } } : {}) };
}

/**
 * Runs the second part's job in the worker while this thread does `here`;
 * if the worker cannot (it failed to start, say), this thread runs the job
 * too. Both answers, this thread's first.
 */
async function inBoth(job: StepsJob, here: () => StageOutcome | null): Promise<[StageOutcome | null, StageOutcome | null]> {
  let running: ReturnType<typeof startPart<StageOutcome | null>> | undefined;
  try {
    running = startPart<StageOutcome | null>(job);
  } catch {
    // No worker to be had (none is built beside the sources, say).
  }
  const mine = here();
  if (running) {
    try {
      return [mine, await running.result];
    } catch (error) {
      if (error instanceof DataError) throw error;
    }
  }
  return [mine, stepsStage(job)];
}

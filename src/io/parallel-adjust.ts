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
import { type PartRejections, type StepForm, adjustPart, partRunning, ranksInWhole } from '../procedures/step-parts.js';
import { checkedTestCount } from '../procedures/validate.js';
import { type StepsJob, startPart } from './parts.js';

/** What one part does at each stage, in whichever thread runs it. */
export function stepsStage(job: StepsJob, measure?: (value: number) => number): PartRejections | null {
  const form = METHODS.find((method) => method.token === job.token)?.stepForm as StepForm;
  if (job.stage === 'running') {
    if (job.withRanks) ranksInWhole(job.own.sorted, job.other, job.rowOffset === 0, job.ranks);
    partRunning(form, job.own.sorted, job.ranks, job.m, job.ownRunning);
    return null;
  }
  return adjustPart(form, job.own, job.ranks, job.ownRunning, job.otherRunning, job.m, job.alpha, job.target, job.rowOffset, measure);
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
 * table holds only some. measureFirst, if given, is summed over each
 * method's adjusted values in the first part (the writer's text of them:
 * parallel-write.ts then knows where the second part's output starts).
 */
export async function adjustInTwoThreads(
  p: Float64Array,
  parts: SortedParts,
  methods: readonly Method[],
  alpha: number,
  tests: number | undefined,
  measureFirst?: (value: number) => number,
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
  const firstRanks = new Uint32Array(split);
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
    const [a, b] = (await inBoth({ ...secondJob, stage: 'adjust' }, () => stepsStage({ ...firstJob, stage: 'adjust' }, measureFirst))) as [PartRejections, PartRejections];
    byMethod.push({ measured: a.measured, rejected: a.rejected });
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
async function inBoth(job: StepsJob, here: () => PartRejections | null): Promise<[PartRejections | null, PartRejections | null]> {
  let running: ReturnType<typeof startPart<PartRejections | null>> | undefined;
  try {
    running = startPart<PartRejections | null>(job);
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

// Append-only typed arrays: rows are kept as numbers, never as per-row
// objects. Values go into fixed blocks of BLOCK values each, so that growing
// never copies what is already kept, and the final array is assembled once:
// at most twice the values are held at any moment (the blocks and the result),
// not three times as with an array that doubles and is then trimmed.

type NumberArray = Float64Array | Int32Array;

const BLOCK = 1 << 16;
/**
 * The first two blocks are tiny, so that the path that starts a new block
 * runs early, before the engine optimises the loop that pushes (a path it
 * has not seen run would make it compile that loop again when it came): the
 * reader's line loop is optimised within its first thousand lines. Twice,
 * because the list of full blocks changes its kind of elements the first time.
 */
const FIRST_BLOCK = 16;

export class Growable<T extends NumberArray> {
  private readonly full: T[] = [];
  /** Values held by the full blocks. */
  private inFull = 0;
  private block: T;
  private used = 0;
  length = 0;

  constructor(private readonly allocate: (size: number) => T) {
    // The first block is allocated at the first push: many tables never fill some arrays.
    this.block = allocate(0);
  }

  push(value: number): void {
    if (this.used === this.block.length) {
      if (this.used > 0) {
        this.full.push(this.block);
        this.inFull += this.used;
      }
      this.block = this.allocate(this.length < 2 * FIRST_BLOCK ? FIRST_BLOCK : BLOCK);
      this.used = 0;
    }
    this.block[this.used++] = value;
    this.length++;
  }

  /**
   * The values pushed, in one array of exactly length (a copy, so later
   * pushes do not show), followed by those of `then` when given; allocated
   * as the constructor's function does, or as `allocate` does.
   */
  toArray(then?: NumberArray, allocate: (size: number) => T = this.allocate): T {
    const out = allocate(this.length + (then?.length ?? 0));
    let at = 0;
    for (const block of this.full) {
      out.set(block, at);
      at += block.length;
    }
    out.set(this.block.subarray(0, this.used), this.inFull);
    if (then) out.set(then, this.length);
    return out;
  }
}

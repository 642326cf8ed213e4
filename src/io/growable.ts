// Append-only typed arrays: rows are kept as numbers, never as per-row
// objects. Values go into fixed blocks of BLOCK values each, so that growing
// never copies what is already kept, and the final array is assembled once:
// at most twice the values are held at any moment (the blocks and the result),
// not three times as with an array that doubles and is then trimmed.

type NumberArray = Float64Array | Int32Array;

const BLOCK = 1 << 16;

export class Growable<T extends NumberArray> {
  private readonly full: T[] = [];
  private block: T;
  private used = 0;
  length = 0;

  constructor(private readonly allocate: (size: number) => T) {
    // The first block is allocated at the first push: many tables never fill some arrays.
    this.block = allocate(0);
  }

  push(value: number): void {
    if (this.used === this.block.length) {
      if (this.used > 0) this.full.push(this.block);
      this.block = this.allocate(BLOCK);
      this.used = 0;
    }
    this.block[this.used++] = value;
    this.length++;
  }

  /**
   * The values pushed, in one array of exactly length (a copy, so later
   * pushes do not show), followed by those of `then` when given.
   */
  toArray(then?: NumberArray): T {
    const out = this.allocate(this.length + (then?.length ?? 0));
    this.full.forEach((block, k) => out.set(block, k * BLOCK));
    out.set(this.block.subarray(0, this.used), this.full.length * BLOCK);
    if (then) out.set(then, this.length);
    return out;
  }
}

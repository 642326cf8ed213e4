// Append-only typed arrays that double their capacity as they fill: rows are
// kept as numbers in one buffer each, never as per-row objects.

type NumberArray = Float64Array | Int32Array;

export class Growable<T extends NumberArray> {
  private data: T;
  length = 0;

  constructor(private readonly allocate: (size: number) => T) {
    this.data = allocate(1024);
  }

  push(value: number): void {
    if (this.length === this.data.length) {
      const bigger = this.allocate(this.data.length * 2);
      bigger.set(this.data);
      this.data = bigger;
    }
    this.data[this.length++] = value;
  }

  /** The values pushed, trimmed to length (a copy, so later pushes do not show). */
  toArray(): T {
    return this.data.slice(0, this.length) as T;
  }
}

// Append-only typed arrays that double their capacity as they fill: rows are
// kept as numbers in one buffer each, never as per-row objects.

export class GrowableFloat64 {
  private data = new Float64Array(1024);
  length = 0;

  push(value: number): void {
    if (this.length === this.data.length) {
      const bigger = new Float64Array(this.data.length * 2);
      bigger.set(this.data);
      this.data = bigger;
    }
    this.data[this.length++] = value;
  }

  /** The values pushed, trimmed to length (a copy, so later pushes do not show). */
  toArray(): Float64Array {
    return this.data.slice(0, this.length);
  }
}

export class GrowableInt32 {
  private data = new Int32Array(1024);
  length = 0;

  push(value: number): void {
    if (this.length === this.data.length) {
      const bigger = new Int32Array(this.data.length * 2);
      bigger.set(this.data);
      this.data = bigger;
    }
    this.data[this.length++] = value;
  }

  toArray(): Int32Array {
    return this.data.slice(0, this.length);
  }
}

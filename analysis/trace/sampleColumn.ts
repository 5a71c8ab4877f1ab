/**
 * One column of a trace being read: a typed array that grows by doubling, so rows never become
 * objects. A column that keeps no samples (an upload checked as it streams) holds one slot,
 * overwritten by every row.
 */
export class SampleColumn<T extends Float64Array | Int32Array> {
  data: T;
  constructor(
    private readonly make: (n: number) => T,
    readonly keep: boolean,
  ) {
    this.data = make(keep ? 1024 : 1);
  }

  /** Stores row i's value. */
  set(i: number, v: number): void {
    const at = this.keep ? i : 0;
    if (at >= this.data.length) this.grow();
    this.data[at] = v;
  }

  /** Stores rows at, at + 1, … (kept samples only). */
  setRows(at: number, values: T): void {
    while (at + values.length > this.data.length) this.grow();
    this.data.set(values, at);
  }

  /** Room for n rows at least (kept samples only): one copy now rather than a doubling's each time it fills. */
  reserve(n: number): void {
    if (!this.keep || n <= this.data.length) return;
    const next = this.make(n);
    next.set(this.data);
    this.data = next;
  }

  /** Doubles the storage. */
  grow(): void {
    const next = this.make(this.data.length * 2);
    next.set(this.data);
    this.data = next;
  }

  /** The first n rows, as a copy of their own length. */
  take(n: number): T {
    if (!this.keep) throw new Error('the trace was read without keeping its samples');
    return this.data.slice(0, n) as T;
  }
}

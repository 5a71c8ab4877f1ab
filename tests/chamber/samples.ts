/** Growable typed columns for the simulated samples. */
export class Samples {
  length = 0;
  private cap = 1 << 14;
  private t = new Float64Array(this.cap);
  private y = new Float64Array(this.cap);
  private f = new Float64Array(this.cap);
  private l = new Int32Array(this.cap);
  private c = new Int32Array(this.cap);
  private x: Float64Array | null;
  private ref: Float64Array | null;

  constructor(crystal: boolean, reference = false) {
    this.x = crystal ? new Float64Array(this.cap) : null;
    this.ref = reference ? new Float64Array(this.cap) : null;
  }

  push(timeS: number, signal: number, fraction: number, layer: number, chip: number, crystal: number, reference = 0): void {
    if (this.length === this.cap) this.grow();
    const i = this.length++;
    this.t[i] = timeS;
    this.y[i] = signal;
    this.f[i] = fraction;
    this.l[i] = layer;
    this.c[i] = chip;
    if (this.x) this.x[i] = crystal;
    if (this.ref) this.ref[i] = reference;
  }

  timeAt(i: number): number {
    return this.t[i];
  }

  private grow(): void {
    this.cap *= 2;
    const g = <T extends Float64Array | Int32Array>(a: T, make: (n: number) => T): T => {
      const b = make(this.cap);
      b.set(a);
      return b;
    };
    const f64 = (n: number) => new Float64Array(n), i32 = (n: number) => new Int32Array(n);
    this.t = g(this.t, f64);
    this.y = g(this.y, f64);
    this.f = g(this.f, f64);
    this.l = g(this.l, i32);
    this.c = g(this.c, i32);
    if (this.x) this.x = g(this.x, f64);
    if (this.ref) this.ref = g(this.ref, f64);
  }

  take() {
    const n = this.length;
    return {
      timeS: this.t.slice(0, n), signal: this.y.slice(0, n), fraction: this.f.slice(0, n), layer: this.l.slice(0, n), chip: this.c.slice(0, n),
      crystalNm: this.x ? this.x.slice(0, n) : null,
      reference: this.ref ? this.ref.slice(0, n) : null,
    };
  }
}

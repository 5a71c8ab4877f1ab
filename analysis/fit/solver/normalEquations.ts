/**
 * A = JᵀWJ and g = JᵀWe for a column-major Jacobian (column j at j·n). With `rows`, column j is
 * taken as zero outside [start[j], end[j]), so each product runs only over the rows both columns
 * share and the zero blocks of a joint fit cost nothing.
 */
export function normalEquations(
  jac: Float64Array, e: Float64Array, w: Float64Array | undefined, n: number, p: number,
  rows: { start: Int32Array; end: Int32Array } | undefined, a: Float64Array, g: Float64Array,
): void {
  const s0 = (j: number) => (rows ? rows.start[j] : 0);
  const s1 = (j: number) => (rows ? rows.end[j] : n);
  for (let i = 0; i < p; i++) {
    const oi = i * n;
    const lo = s0(i), hi = s1(i);
    let s = 0;
    if (w) for (let k = lo; k < hi; k++) s += jac[oi + k] * w[k] * e[k];
    else for (let k = lo; k < hi; k++) s += jac[oi + k] * e[k];
    g[i] = s;
    for (let j = i; j < p; j++) {
      const oj = j * n;
      const from = Math.max(lo, s0(j)), to = Math.min(hi, s1(j));
      let t = 0;
      if (w) for (let k = from; k < to; k++) t += jac[oi + k] * w[k] * jac[oj + k];
      else for (let k = from; k < to; k++) t += jac[oi + k] * jac[oj + k];
      a[i * p + j] = t;
      a[j * p + i] = t;
    }
  }
}

/**
 * Cholesky factor L (row-major, lower) of D·A·D, D = diag(1/√a_ii), a symmetric positive-definite
 * p×p A scaled to unit diagonal so that parameters of very different sizes do not matter. Null
 * when A is not positive definite to working precision.
 */
export function choleskyScaled(a: ArrayLike<number>, p: number): { l: Float64Array; d: Float64Array } | null {
  const d = new Float64Array(p);
  for (let i = 0; i < p; i++) {
    const v = a[i * p + i];
    if (!(v > 0) || !Number.isFinite(v)) return null;
    d[i] = 1 / Math.sqrt(v);
  }
  const l = new Float64Array(p * p);
  for (let i = 0; i < p; i++) {
    for (let j = 0; j <= i; j++) {
      let s = a[i * p + j] * d[i] * d[j];
      for (let k = 0; k < j; k++) s -= l[i * p + k] * l[j * p + k];
      if (i === j) {
        if (!(s > 1e-13)) return null;
        l[i * p + i] = Math.sqrt(s);
      } else l[i * p + j] = s / l[j * p + j];
    }
  }
  return { l, d };
}

/** Solves A·x = b for a symmetric positive-definite A (see choleskyScaled); null when it is not. */
export function choleskySolve(a: Float64Array, b: Float64Array, p: number): Float64Array | null {
  const f = choleskyScaled(a, p);
  return f ? solveScaled(f, b, p) : null;
}

/** Solves A·x = b with A's factor from choleskyScaled (one factor, many right-hand sides). */
export function solveScaled(f: { l: Float64Array; d: Float64Array }, b: ArrayLike<number>, p: number): Float64Array {
  const { l, d } = f;
  const x = new Float64Array(p);
  for (let i = 0; i < p; i++) {
    let s = b[i] * d[i];
    for (let k = 0; k < i; k++) s -= l[i * p + k] * x[k];
    x[i] = s / l[i * p + i];
  }
  for (let i = p - 1; i >= 0; i--) {
    let s = x[i];
    for (let k = i + 1; k < p; k++) s -= l[k * p + i] * x[k];
    x[i] = s / l[i * p + i];
  }
  for (let i = 0; i < p; i++) x[i] *= d[i];
  return x;
}

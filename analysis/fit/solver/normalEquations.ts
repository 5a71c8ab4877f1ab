/**
 * Rows over which a column is a multiple of another (its base): a layer's growth-law columns
 * (rate, drift, wander knots) on the later layers' samples, which see the layer only through its
 * end thickness (fit/layerModel.ts jacobianLayers: ∂d(T)/∂θ times one ∂y/∂d). Column j is
 * f_j·column base[j] on rows [from[j], to) (base −1: none); f_j is read from the Jacobian itself
 * and a column that is not such a multiple to rounding is summed row by row.
 */
export interface ColumnTails {
  from: Int32Array;
  to: number;
  base: Int32Array;
}

/**
 * A = JᵀWJ and g = JᵀWe for a column-major Jacobian (column j at j·n). With `rows`, column j is
 * taken as zero outside [start[j], end[j]), so each product runs only over the rows both columns
 * share and the zero blocks of a joint fit cost nothing. With `tails`, two columns' products over
 * their tails are f_i·f_j times their bases' product, summed once per pair of bases.
 */
export function normalEquations(
  jac: Float64Array, e: Float64Array, w: Float64Array | undefined, n: number, p: number,
  rows: { start: Int32Array; end: Int32Array } | undefined, a: Float64Array, g: Float64Array, tails?: ColumnTails,
): void {
  const s0 = (j: number) => (rows ? rows.start[j] : 0);
  const s1 = (j: number) => (rows ? rows.end[j] : n);
  const f = tails ? tailFactors(jac, n, p, tails) : null;
  const baseProducts = new Map<number, number>();
  const product = (i: number, j: number, from: number, to: number) => {
    const oi = i * n, oj = j * n;
    let t = 0;
    if (w) for (let k = from; k < to; k++) t += jac[oi + k] * w[k] * jac[oj + k];
    else for (let k = from; k < to; k++) t += jac[oi + k] * jac[oj + k];
    return t;
  };
  // Column i times the weights, made once for all of its pairs: (J_ki·w_k)·J_kj is the very
  // product `product` forms left to right, so the same figures with one load and one multiply
  // less in each pair's loop.
  const weighted = w ? new Float64Array(n) : null;
  /** product(i, j, from, to) with column i's weighted copy in `weighted` (or no weights). */
  const productWith = (i: number, j: number, from: number, to: number) => {
    const oj = j * n;
    let t = 0;
    if (weighted) for (let k = from; k < to; k++) t += weighted[k] * jac[oj + k];
    else {
      const oi = i * n;
      for (let k = from; k < to; k++) t += jac[oi + k] * jac[oj + k];
    }
    return t;
  };
  for (let i = 0; i < p; i++) {
    const oi = i * n;
    const lo = s0(i), hi = s1(i);
    let s = 0;
    if (w && weighted) {
      for (let k = lo; k < hi; k++) weighted[k] = jac[oi + k] * w[k];
      for (let k = lo; k < hi; k++) s += weighted[k] * e[k];
    } else for (let k = lo; k < hi; k++) s += jac[oi + k] * e[k];
    g[i] = s;
    for (let j = i; j < p; j++) {
      const from = Math.max(lo, s0(j)), to = Math.min(hi, s1(j));
      let t: number;
      if (f && tails && Number.isFinite(f[i]) && Number.isFinite(f[j])) {
        const t0 = Math.max(from, tails.from[i], tails.from[j]), t1 = Math.min(to, tails.to);
        if (t1 > t0) {
          const bi = Math.min(tails.base[i], tails.base[j]), bj = Math.max(tails.base[i], tails.base[j]);
          const key = ((bi * p + bj) * (n + 1) + t0) * (n + 1) + t1;
          let b = baseProducts.get(key);
          if (b === undefined) baseProducts.set(key, (b = product(bi, bj, t0, t1)));
          t = productWith(i, j, from, t0) + f[i] * f[j] * b + productWith(i, j, t1, to);
        } else t = productWith(i, j, from, to);
      } else t = productWith(i, j, from, to);
      a[i * p + j] = t;
      a[j * p + i] = t;
    }
  }
}

/** f_j of each column with a tail (NaN for the others, and for a column its base does not span to rounding). */
function tailFactors(jac: Float64Array, n: number, p: number, tails: ColumnTails): Float64Array {
  const f = new Float64Array(p).fill(NaN);
  for (let j = 0; j < p; j++) {
    const b = tails.base[j];
    if (b < 0) continue;
    const oj = j * n, ob = b * n, from = tails.from[j], to = tails.to;
    let jb = 0, bb = 0, jj = 0;
    for (let k = from; k < to; k++) {
      jb += jac[oj + k] * jac[ob + k];
      bb += jac[ob + k] * jac[ob + k];
      jj += jac[oj + k] * jac[oj + k];
    }
    const r = bb > 0 ? jb / bb : jj === 0 ? 0 : NaN;
    if (!Number.isFinite(r)) continue;
    let miss = 0;
    for (let k = from; k < to; k++) miss += (jac[oj + k] - r * jac[ob + k]) ** 2;
    if (miss <= 1e-20 * jj) f[j] = r;
  }
  return f;
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

/**
 * Solves the small dense system A x = b in place by Gaussian elimination with partial
 * pivoting; A is row-major n×n. Returns null when A is singular to working precision.
 */
export function solveDense(A: Float64Array, b: Float64Array, n: number): Float64Array | null {
  for (let c = 0; c < n; c++) {
    let p = c;
    for (let r = c + 1; r < n; r++) if (Math.abs(A[r * n + c]) > Math.abs(A[p * n + c])) p = r;
    const pivot = A[p * n + c];
    if (!(Math.abs(pivot) > 1e-300)) return null;
    if (p !== c) {
      for (let k = 0; k < n; k++) {
        const t = A[c * n + k];
        A[c * n + k] = A[p * n + k];
        A[p * n + k] = t;
      }
      const t = b[c];
      b[c] = b[p];
      b[p] = t;
    }
    for (let r = c + 1; r < n; r++) {
      const f = A[r * n + c] / pivot;
      if (f === 0) continue;
      for (let k = c; k < n; k++) A[r * n + k] -= f * A[c * n + k];
      b[r] -= f * b[c];
    }
  }
  const x = new Float64Array(n);
  for (let r = n - 1; r >= 0; r--) {
    let s = b[r];
    for (let k = r + 1; k < n; k++) s -= A[r * n + k] * x[k];
    x[r] = s / A[r * n + r];
  }
  return x;
}

/**
 * Least-squares polynomial of the given order through (x[i], y[i]) for i in [start, end),
 * in the scaled variable u = (x − x0) / scale (scaling keeps the normal equations well
 * conditioned). Returns coefficients c[0..order] of Σ c_j u^j, or null if underdetermined.
 */
export function fitPolynomial(
  x: ArrayLike<number>,
  y: ArrayLike<number>,
  start: number,
  end: number,
  order: number,
  x0: number,
  scale: number,
): Float64Array | null {
  const m = order + 1;
  if (end - start < m) return null;
  const A = new Float64Array(m * m);
  const b = new Float64Array(m);
  const pw = new Float64Array(2 * m - 1);
  for (let i = start; i < end; i++) {
    const u = (x[i] - x0) / scale;
    pw[0] = 1;
    for (let k = 1; k < pw.length; k++) pw[k] = pw[k - 1] * u;
    for (let r = 0; r < m; r++) {
      b[r] += pw[r] * y[i];
      for (let c = 0; c < m; c++) A[r * m + c] += pw[r + c];
    }
  }
  return solveDense(A, b, m);
}

/**
 * Inverse of a symmetric positive-definite n×n matrix (row-major) by Cholesky decomposition,
 * after scaling to unit diagonal so that parameters of very different sizes do not matter.
 * Returns null when the matrix is not positive definite (to working precision).
 */
export function invertSymmetric(a: ArrayLike<number>, n: number): Float64Array | null {
  const d = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const v = a[i * n + i];
    if (!(v > 0)) return null;
    d[i] = 1 / Math.sqrt(v);
  }
  const l = new Float64Array(n * n);
  for (let i = 0; i < n; i++) {
    for (let j = 0; j <= i; j++) {
      let s = a[i * n + j] * d[i] * d[j];
      for (let k = 0; k < j; k++) s -= l[i * n + k] * l[j * n + k];
      if (i === j) {
        if (!(s > 1e-13)) return null;
        l[i * n + i] = Math.sqrt(s);
      } else {
        l[i * n + j] = s / l[j * n + j];
      }
    }
  }
  // inv(L), lower triangular
  const li = new Float64Array(n * n);
  for (let i = 0; i < n; i++) {
    li[i * n + i] = 1 / l[i * n + i];
    for (let j = 0; j < i; j++) {
      let s = 0;
      for (let k = j; k < i; k++) s -= l[i * n + k] * li[k * n + j];
      li[i * n + j] = s / l[i * n + i];
    }
  }
  const inv = new Float64Array(n * n);
  for (let i = 0; i < n; i++) {
    for (let j = 0; j <= i; j++) {
      let s = 0;
      for (let k = i; k < n; k++) s += li[k * n + i] * li[k * n + j];
      const v = s * d[i] * d[j];
      inv[i * n + j] = v;
      inv[j * n + i] = v;
    }
  }
  return inv;
}

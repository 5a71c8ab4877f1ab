import { choleskyScaled } from './solver/normalEquations';

/**
 * Inverse of a symmetric positive-definite n×n matrix (row-major) by Cholesky decomposition,
 * after scaling to unit diagonal so that parameters of very different sizes do not matter.
 * Returns null when the matrix is not positive definite (to working precision).
 */
export function invertSymmetric(a: ArrayLike<number>, n: number): Float64Array | null {
  const f = choleskyScaled(a, n);
  if (!f) return null;
  const { l, d } = f;
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

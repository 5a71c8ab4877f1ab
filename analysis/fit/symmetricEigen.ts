/**
 * Eigenvalues and eigenvectors (columns of `vectors`, row-major) of a small symmetric matrix by
 * cyclic Jacobi rotations (G. H. Golub, C. F. Van Loan, "Matrix Computations", 4th ed., §8.5).
 */
export function symmetricEigen(matrix: ArrayLike<number>, m: number): { values: Float64Array; vectors: Float64Array } {
  const a = Float64Array.from(matrix);
  const v = new Float64Array(m * m);
  for (let i = 0; i < m; i++) v[i * m + i] = 1;
  for (let sweep = 0; sweep < 60; sweep++) {
    let off = 0, diag = 0;
    for (let p = 0; p < m; p++) {
      diag += a[p * m + p] ** 2;
      for (let q = p + 1; q < m; q++) off += a[p * m + q] ** 2;
    }
    if (off <= 1e-30 * diag || off === 0) break;
    for (let p = 0; p < m; p++) {
      for (let q = p + 1; q < m; q++) {
        const apq = a[p * m + q];
        if (apq === 0) continue;
        const theta = (a[q * m + q] - a[p * m + p]) / (2 * apq);
        const t = Math.sign(theta || 1) / (Math.abs(theta) + Math.sqrt(theta * theta + 1));
        const c = 1 / Math.sqrt(t * t + 1), s = t * c;
        for (let k = 0; k < m; k++) {
          const akp = a[k * m + p], akq = a[k * m + q];
          a[k * m + p] = c * akp - s * akq;
          a[k * m + q] = s * akp + c * akq;
        }
        for (let k = 0; k < m; k++) {
          const apk = a[p * m + k], aqk = a[q * m + k];
          a[p * m + k] = c * apk - s * aqk;
          a[q * m + k] = s * apk + c * aqk;
        }
        for (let k = 0; k < m; k++) {
          const vkp = v[k * m + p], vkq = v[k * m + q];
          v[k * m + p] = c * vkp - s * vkq;
          v[k * m + q] = s * vkp + c * vkq;
        }
      }
    }
  }
  return { values: Float64Array.from({ length: m }, (_, i) => a[i * m + i]), vectors: v };
}

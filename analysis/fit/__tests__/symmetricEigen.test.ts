import { describe, expect, it } from 'vitest';
import { symmetricEigen } from '../symmetricEigen';

describe('symmetricEigen', () => {
  it('the second-difference matrix tridiag(−1, 2, −1) of order m: eigenvalues 2 − 2·cos(kπ/(m + 1)) (closed form, from memory; e.g. G. Strang, "Introduction to Applied Mathematics", 1986, §1.5)', () => {
    const m = 5;
    const a = new Float64Array(m * m);
    for (let i = 0; i < m; i++) {
      a[i * m + i] = 2;
      if (i > 0) a[i * m + i - 1] = a[(i - 1) * m + i] = -1;
    }
    const { values, vectors } = symmetricEigen(a, m);
    const expected = Array.from({ length: m }, (_, k) => 2 - 2 * Math.cos(((k + 1) * Math.PI) / (m + 1))).sort((x, y) => x - y);
    expect(Array.from(values).sort((x, y) => x - y).map((v, i) => Math.abs(v - expected[i]))).toSatisfy((d: number[]) => d.every((x) => x < 1e-12));
    // each column an eigenvector of unit length (the eigenvector of kπ/(m+1) is sin(j·kπ/(m+1)), up to sign and scale)
    for (let j = 0; j < m; j++) {
      let norm = 0;
      for (let r = 0; r < m; r++) {
        let av = 0;
        for (let c = 0; c < m; c++) av += a[r * m + c] * vectors[c * m + j];
        expect(Math.abs(av - values[j] * vectors[r * m + j])).toBeLessThan(1e-12);
        norm += vectors[r * m + j] ** 2;
      }
      expect(Math.abs(norm - 1)).toBeLessThan(1e-12);
    }
  });

  it('a singular covariance (two fully correlated entries) has a zero eigenvalue', () => {
    // [[1, 2], [2, 4]]: rank one, eigenvalues 0 and 5 (trace 5, determinant 0)
    const { values } = symmetricEigen([1, 2, 2, 4], 2);
    const sorted = Array.from(values).sort((x, y) => x - y);
    expect(Math.abs(sorted[0])).toBeLessThan(1e-12);
    expect(Math.abs(sorted[1] - 5)).toBeLessThan(1e-12);
  });
});

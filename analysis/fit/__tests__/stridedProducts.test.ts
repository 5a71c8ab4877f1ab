import { describe, expect, it } from 'vitest';
import { createRng } from '../../synth';
import { stridedProductsWith } from '../wanderChoice';

/**
 * The wander choice's Gram matrix sums each product of two columns on the first row and on rows
 * 1, 3, 5, … (a stride of 2), each of those times the rows it stands for (2, the last one 1 when
 * the rows run out): written out here row by row, one pair of columns at a time.
 */
function byRows(jac: Float64Array, a: number, c: number, N: number): number {
  let t = jac[a * N] * jac[c * N];
  for (let i = 1; i < N; i += 2) t += jac[a * N + i] * jac[c * N + i] * (i + 1 < N ? 2 : 1);
  return t;
}

describe('stridedProductsWith (four columns a pass)', () => {
  it('gives each product of column a with the columns after it exactly as summed one pair at a time, for every count of columns and rows odd or even', () => {
    const rng = createRng(7);
    for (const N of [1, 2, 3, 100, 101, 6701]) {
      for (const np of [1, 2, 3, 4, 5, 8, 9, 23]) {
        const jac = Float64Array.from({ length: np * N }, () => rng.normal());
        const out = new Float64Array(np).fill(NaN);
        for (let a = 0; a < np; a++) {
          stridedProductsWith(jac, a, np, N, out);
          // the same sums, bit for bit (same terms in the same order)
          for (let c = a; c < np; c++) expect(out[c]).toBe(byRows(jac, a, c, N));
        }
      }
    }
  });

  it('weighs the last row of an even count once and the others twice (a column of ones)', () => {
    const N = 10, jac = new Float64Array(N).fill(1), out = new Float64Array(1);
    stridedProductsWith(jac, 0, 1, N, out);
    // row 0, then rows 1, 3, 5, 7 twice and row 9 once: 1 + 8 + 1
    expect(out[0]).toBe(N);
  });
});

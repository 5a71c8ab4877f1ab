import { describe, expect, it } from 'vitest';
import { createRng } from '../../../synth';
import { normalEquations } from '..';

/** JᵀWJ and JᵀWe summed row by row over every row (column-major J). */
function direct(jac: Float64Array, e: Float64Array, w: Float64Array | undefined, n: number, p: number) {
  const a = new Float64Array(p * p), g = new Float64Array(p);
  for (let i = 0; i < p; i++) {
    for (let k = 0; k < n; k++) g[i] += jac[i * n + k] * (w ? w[k] : 1) * e[k];
    for (let j = 0; j < p; j++) for (let k = 0; k < n; k++) a[i * p + j] += jac[i * n + k] * (w ? w[k] : 1) * jac[j * n + k];
  }
  return { a, g };
}

/**
 * Two layers' growth-law columns as a joint fit lays them out: layer 1's three columns on rows
 * 0–39 and, as multiples of its first, on rows 40–99 (layer 2's); layer 2's two on rows 40–99;
 * a last column on every row, not a multiple of anything; 10 prior rows at the end.
 */
function jointLike(seed: number, breakTail = false) {
  const rng = createRng(seed);
  const n = 110, p = 6, data = 100;
  const jac = new Float64Array(n * p);
  const upper = Array.from({ length: data }, () => rng.normal());
  const factors = [1, 0.5 * 37, -2.5];
  for (let c = 0; c < 3; c++) {
    for (let k = 0; k < 40; k++) jac[c * n + k] = rng.normal();
    for (let k = 40; k < data; k++) jac[c * n + k] = factors[c] * upper[k];
  }
  if (breakTail) jac[2 * n + 70] += 1e-3;
  for (let c = 3; c < 5; c++) for (let k = 40; k < data; k++) jac[c * n + k] = rng.normal();
  for (let k = 0; k < data; k++) jac[5 * n + k] = rng.normal();
  for (let c = 0; c < p; c++) jac[c * n + data + c] = 0.3;
  const e = Float64Array.from({ length: n }, () => rng.normal());
  const w = Float64Array.from({ length: n }, () => 0.5 + rng.uniform());
  const rows = { start: Int32Array.from([0, 0, 0, 40, 40, 0]), end: new Int32Array(p).fill(n) };
  const tails = { from: Int32Array.from([40, 40, 40, 100, 100, 0]), to: data, base: Int32Array.from([0, 0, 0, 3, 3, -1]) };
  return { jac, e, w, n, p, rows, tails };
}

describe('normalEquations', () => {
  for (const weighted of [false, true]) {
    it(`sums the columns' tails through their bases as row by row${weighted ? ', weighted' : ''}`, () => {
      const { jac, e, w, n, p, rows, tails } = jointLike(3);
      const a = new Float64Array(p * p), g = new Float64Array(p);
      normalEquations(jac, e, weighted ? w : undefined, n, p, rows, a, g, tails);
      const ref = direct(jac, e, weighted ? w : undefined, n, p);
      for (let i = 0; i < p * p; i++) expect(a[i]).toBeCloseTo(ref.a[i], 10);
      for (let i = 0; i < p; i++) expect(g[i]).toBeCloseTo(ref.g[i], 10);
    });
  }

  it('sums a column row by row where it is not the multiple its tail says', () => {
    const { jac, e, w, n, p, rows, tails } = jointLike(4, true);
    const a = new Float64Array(p * p), g = new Float64Array(p);
    normalEquations(jac, e, w, n, p, rows, a, g, tails);
    const ref = direct(jac, e, w, n, p);
    for (let i = 0; i < p * p; i++) expect(a[i]).toBeCloseTo(ref.a[i], 10);
  });
});

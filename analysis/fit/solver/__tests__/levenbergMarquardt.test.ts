import { levenbergMarquardt as mlLevenbergMarquardt } from 'ml-levenberg-marquardt';
import { describe, expect, it } from 'vitest';
import { leastSquares } from '../../leastSquares';
import { createRng } from '../../../synth';
import { huberFit, levenbergMarquardt, madScale, type SolverProblem } from '..';

/** A problem in the solver's own terms from a model f(x; b) with central-difference Jacobian. */
function problemOf(x: readonly number[], y: readonly number[], f: (x: number, b: Float64Array) => number, p: number): SolverProblem {
  const n = x.length;
  const model = (b: Float64Array, out: Float64Array) => x.forEach((xi, i) => (out[i] = f(xi, b)));
  return {
    n, p, y, model,
    jacobian: (b, _at, out) => {
      const q = new Float64Array(b);
      for (let j = 0; j < p; j++) {
        const h = 1e-7 * Math.max(Math.abs(b[j]), 1e-3);
        q[j] = b[j] + h;
        const hi = x.map((xi) => f(xi, q));
        q[j] = b[j] - h;
        const lo = x.map((xi) => f(xi, q));
        q[j] = b[j];
        for (let i = 0; i < n; i++) out[j * n + i] = (hi[i] - lo[i]) / (2 * h);
      }
    },
  };
}

// NIST Statistical Reference Datasets, nonlinear regression: Misra1a (lower difficulty) and MGH09
// (higher difficulty), data, starting values and certified values from
// https://www.itl.nist.gov/div898/strd/nls/data/misra1a.shtml and …/mgh09.shtml.
const MISRA1A = {
  x: [77.6, 114.9, 141.1, 190.8, 239.9, 289.0, 332.8, 378.4, 434.8, 477.3, 536.8, 593.1, 689.1, 760.0],
  y: [10.07, 14.73, 17.94, 23.93, 29.61, 35.18, 40.02, 44.82, 50.76, 55.05, 61.01, 66.40, 75.47, 81.78],
  f: (x: number, b: ArrayLike<number>) => b[0] * (1 - Math.exp(-b[1] * x)),
  starts: [[500, 1e-4], [250, 5e-4]],
  certified: [2.3894212918e2, 5.5015643181e-4],
  sd: [2.7070075241, 7.2668688436e-6],
  rss: 1.2455138894e-1,
};
const MGH09 = {
  x: [4, 2, 1, 0.5, 0.25, 0.167, 0.125, 0.1, 0.0833, 0.0714, 0.0625],
  y: [0.1957, 0.1947, 0.1735, 0.16, 0.0844, 0.0627, 0.0456, 0.0342, 0.0323, 0.0235, 0.0246],
  f: (x: number, b: ArrayLike<number>) => (b[0] * (x * x + x * b[1])) / (x * x + x * b[2] + b[3]),
  starts: [[0.25, 0.39, 0.415, 0.39]],
  certified: [1.9280693458e-1, 1.9128232873e-1, 1.2305650693e-1, 1.3606233068e-1],
  sd: [1.1435312227e-2, 1.9633220911e-1, 8.0842031232e-2, 9.0025542308e-2],
  rss: 3.0750560385e-4,
};

describe('levenbergMarquardt (own solver)', () => {
  for (const [name, d] of [['Misra1a', MISRA1A], ['MGH09', MGH09]] as const) {
    it(`reproduces the NIST StRD certified values of ${name} (parameters, their standard deviations, residual sum of squares)`, () => {
      for (const start of d.starts) {
        const fit = leastSquares(
          { y: d.y, start, scale: start.map((v) => 0.01 * Math.abs(v)), model: (b, out) => d.x.forEach((xi, i) => (out[i] = d.f(xi, b))) },
          { tolerance: 1e-12, gradientStep: 1e-6 },
        );
        expect(fit.converged, `${name} from ${start.join(', ')}: ${fit.reason}`).toBe(true);
        expect(fit.ssr / d.rss - 1).toBeCloseTo(0, 6);
        d.certified.forEach((c, j) => expect(fit.params[j] / c - 1, `b${j + 1}`).toBeCloseTo(0, 5));
        d.sd.forEach((c, j) => expect(fit.sigma[j] / c - 1, `sd(b${j + 1})`).toBeCloseTo(0, 3));
      }
    });
  }

  it('agrees with ml-levenberg-marquardt where both converge (a damped sine, a Gaussian peak)', () => {
    const rng = createRng(7);
    const cases = [
      { f: (x: number, b: ArrayLike<number>) => b[0] * Math.exp(-b[1] * x) * Math.sin(b[2] * x), truth: [2, 0.3, 1.7], start: [1.5, 0.2, 1.6] },
      { f: (x: number, b: ArrayLike<number>) => b[0] * Math.exp(-(((x - b[1]) / b[2]) ** 2)) + b[3], truth: [3, 4.2, 1.1, 0.5], start: [2.5, 4, 1.4, 0.3] },
    ];
    for (const c of cases) {
      const x = Array.from({ length: 80 }, (_, i) => i * 0.1);
      const y = x.map((xi) => c.f(xi, c.truth) + 0.02 * rng.normal());
      const ours = levenbergMarquardt(problemOf(x, y, c.f, c.start.length), c.start, { tolerance: 1e-14 });
      const theirs = mlLevenbergMarquardt({ x, y }, (b: number[]) => (xi: number) => c.f(xi, b), {
        initialValues: c.start, maxIterations: 500, errorTolerance: 1e-14, damping: 1e-2, gradientDifference: 1e-7,
      });
      expect(ours.converged).toBe(true);
      ours.u.forEach((v, j) => expect(v).toBeCloseTo(theirs.parameterValues[j], 4));
      // parameterError is the library's sum of squared residuals.
      expect(ours.ssr).toBeLessThanOrEqual(theirs.parameterError * (1 + 1e-6));
    }
  });

  it('rejects steps that raise the sum and says when it runs out of iterations', () => {
    // A start far out on MGH09 (NIST start 1): three iterations cannot reach the minimum.
    const p = problemOf(MGH09.x, MGH09.y, MGH09.f, 4);
    const short = levenbergMarquardt(p, [25, 39, 41.5, 39], { maxIterations: 3 });
    expect(short.converged).toBe(false);
    expect(short.reason).toBe('max-iterations');
    // Every accepted step lowers the sum: the final sum never exceeds the start's.
    const at0 = new Float64Array(11);
    p.model(Float64Array.of(25, 39, 41.5, 39), at0);
    const ssr0 = MGH09.y.reduce((s, yi, i) => s + (yi - at0[i]) ** 2, 0);
    expect(short.ssr).toBeLessThan(ssr0);
  });

  it('keeps parameters within bounds', () => {
    const p = { ...problemOf(MISRA1A.x, MISRA1A.y, MISRA1A.f, 2), lower: [0, 0], upper: [200, 1] };
    const fit = levenbergMarquardt(p, [150, 5e-4], { maxIterations: 200 });
    expect(fit.u[0]).toBeLessThanOrEqual(200);
    expect(fit.u[0]).toBeCloseTo(200, 6);
  });
});

describe('huberFit', () => {
  it('recovers a line through white noise with 5 % spikes, where least squares is pulled off', () => {
    const rng = createRng(3);
    const x = Array.from({ length: 400 }, (_, i) => i / 40);
    const truth = [0.3, 0.8];
    const y = x.map((xi) => truth[0] + truth[1] * xi + 0.01 * rng.normal());
    // One-sided spikes (a detector glitch), on every twentieth sample.
    for (let i = 5; i < y.length; i += 20) y[i] += 0.5;
    const f = (xi: number, b: ArrayLike<number>) => b[0] + b[1] * xi;
    const plain = levenbergMarquardt(problemOf(x, y, f, 2), [0, 1]);
    const robust = huberFit(problemOf(x, y, f, 2), [0, 1]);
    expect(Math.abs(plain.u[0] - truth[0])).toBeGreaterThan(0.02);
    expect(robust.u[0]).toBeCloseTo(truth[0], 2);
    expect(robust.u[1]).toBeCloseTo(truth[1], 3);
    expect(robust.scale).toBeCloseTo(0.01, 2);
    expect(robust.weights[5]).toBeLessThan(0.1);
  });

  it('gives the MAD scale of a normal sample as its σ (Huber & Ronchetti §5.1)', () => {
    const rng = createRng(11);
    const v = Array.from({ length: 20000 }, () => 3 + 0.7 * rng.normal());
    expect(madScale(v)).toBeCloseTo(0.7, 1);
  });
});

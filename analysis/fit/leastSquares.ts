import { levenbergMarquardt } from 'ml-levenberg-marquardt';
import { invertSymmetric } from './invertSymmetric';

/** A nonlinear least-squares problem in physical parameters p. */
export interface LeastSquaresProblem {
  y: ArrayLike<number>;
  /** Writes the model at parameters p into out (length y.length). */
  model: (p: Float64Array, out: Float64Array) => void;
  start: ArrayLike<number>;
  /**
   * Typical size of each parameter's change. The solver works on u with p = start + scale·u,
   * so all scaled parameters are of order one.
   */
  scale: ArrayLike<number>;
  min?: ArrayLike<number>;
  max?: ArrayLike<number>;
  /**
   * Writes ∂model/∂p_j for every parameter into out (row-major, parameter j at j·N), given the
   * model at p and the step h_j to use for finite differences. When absent, central differences
   * of `model` are used.
   */
  jacobian?: (p: Float64Array, modelAtP: Float64Array, stepNm: Float64Array, out: Float64Array) => void;
}

export interface LeastSquaresOptions {
  /** Finite-difference step, in scaled units. @default 0.001 */
  gradientStep?: number;
  /** Levenberg–Marquardt iterations per round; convergence is checked between rounds. @default 2 */
  iterationsPerRound?: number;
  /** @default 15 */
  maxRounds?: number;
  /**
   * A round that lowers χ² = SSR/s² (s² = SSR/(N − p)) by less than this ends the fit: the
   * parameters then move by a negligible fraction of their σ (Numerical Recipes, 3rd ed.,
   * §15.5.2, from memory). @default 0.01
   */
  tolerance?: number;
}

export interface LeastSquaresResult {
  params: Float64Array;
  /** 1σ from cov = s²·(JᵀJ)⁻¹, s² = SSR/(N − p); NaN where JᵀJ is singular. */
  sigma: Float64Array;
  /** Row-major p×p covariance. */
  covariance: Float64Array;
  ssr: number;
  dof: number;
  residualRms: number;
  iterations: number;
  rounds: number;
  converged: boolean;
  /** False when JᵀJ was singular at the solution (a parameter the data do not determine). */
  wellDetermined: boolean;
}

const DEFAULTS: Required<LeastSquaresOptions> = {
  gradientStep: 0.001,
  iterationsPerRound: 2,
  maxRounds: 15,
  tolerance: 0.01,
};

/**
 * Fits with ml-levenberg-marquardt in rounds: the library runs a fixed number of iterations and
 * keeps its best point, so convergence is judged here from the sum of squares between rounds.
 * Uncertainties come from a central-difference Jacobian at the solution.
 */
export function leastSquares(problem: LeastSquaresProblem, options: LeastSquaresOptions = {}): LeastSquaresResult {
  const opt = { ...DEFAULTS, ...options };
  const n = problem.y.length;
  const np = problem.start.length;
  if (problem.scale.length !== np) throw new RangeError(`leastSquares: scale has ${problem.scale.length} entries, start has ${np}`);
  if (n < np) throw new RangeError(`leastSquares: ${n} points cannot determine ${np} parameters`);
  const start = Float64Array.from(problem.start);
  const scale = Float64Array.from(problem.scale);
  const steps = new Float64Array(np);
  for (let j = 0; j < np; j++) steps[j] = opt.gradientStep * scale[j];
  // Solver units: each parameter scaled by its Jacobian column norm at the start, so JᵀJ has a
  // unit diagonal and the library's fixed damping means the same for every parameter
  // (D. W. Marquardt, J. SIAM 11, 431 (1963): the normal equations scaled to unit diagonal; from memory).
  const unit = new Float64Array(np);
  const j0 = jacobianAt(problem, start, scale, opt.gradientStep);
  for (let j = 0; j < np; j++) {
    let c = 0;
    for (let i = 0; i < n; i++) c += j0[j * n + i] ** 2;
    unit[j] = c > 0 && Number.isFinite(c) ? 1 / Math.sqrt(c) : scale[j];
  }
  const toPhysical = (u: ArrayLike<number>, out = new Float64Array(np)): Float64Array => {
    for (let i = 0; i < np; i++) out[i] = start[i] + unit[i] * u[i];
    return out;
  };
  const minU = new Array<number>(np), maxU = new Array<number>(np);
  const gradientDifference = new Array<number>(np);
  for (let i = 0; i < np; i++) {
    minU[i] = problem.min ? (problem.min[i] - start[i]) / unit[i] : -Number.MAX_VALUE;
    maxU[i] = problem.max ? (problem.max[i] - start[i]) / unit[i] : Number.MAX_VALUE;
    gradientDifference[i] = steps[i] / unit[i];
  }
  const p = new Float64Array(np);
  // The library asks for the model at the same point again for the Jacobian: keep the last one.
  let lastU: number[] | null = null;
  let lastBuf = new Float64Array(0);
  const fn = (u: number[]) => {
    const buf = new Float64Array(n);
    problem.model(toPhysical(u, p), buf);
    lastU = u.slice();
    lastBuf = buf;
    return (x: number) => buf[x];
  };
  const sameAsLast = (u: number[]) => lastU !== null && u.every((v, i) => v === lastU![i]);
  const x = new Float64Array(n);
  for (let i = 0; i < n; i++) x[i] = i;
  const data = { x, y: problem.y };

  const jacobianFunction = problem.jacobian
    ? (uu: number[]) => {
        const q = toPhysical(uu);
        let at = lastBuf;
        if (!sameAsLast(uu)) {
          at = new Float64Array(n);
          problem.model(q, at);
        }
        const jac = new Float64Array(np * n);
        problem.jacobian!(q, at, steps, jac);
        const row = new Array<number>(np);
        return (xi: number) => {
          for (let j = 0; j < np; j++) row[j] = jac[j * n + xi] * unit[j];
          return row;
        };
      }
    : undefined;
  let u = new Array<number>(np).fill(0);
  let ssr = sumSquares(problem, toPhysical(u));
  let iterations = 0, rounds = 0, converged = false;
  while (rounds < opt.maxRounds) {
    rounds++;
    let result;
    try {
      result = levenbergMarquardt(data, fn, {
        initialValues: u,
        gradientDifference,
        maxIterations: opt.iterationsPerRound,
        errorTolerance: 1e-300,
        damping: 0.001,
        minValues: minU,
        maxValues: maxU,
        ...(jacobianFunction ? { jacobianFunction } : {}),
      });
    } catch {
      break;
    }
    iterations += result.iterations;
    const next = result.parameterValues;
    const nextSsr = sumSquares(problem, toPhysical(next));
    if (!(nextSsr <= ssr)) break;
    const drop = ssr - nextSsr;
    u = next;
    ssr = nextSsr;
    if (drop <= (opt.tolerance * ssr) / Math.max(n - np, 1) || ssr === 0) {
      converged = true;
      break;
    }
  }
  const params = toPhysical(u);
  const dof = n - np;
  const { covariance, sigma, ok } = covarianceAt(problem, params, scale, opt.gradientStep, ssr / Math.max(dof, 1));
  return { params, sigma, covariance, ssr, dof, residualRms: Math.sqrt(ssr / n), iterations, rounds, converged, wellDetermined: ok };
}

function sumSquares(problem: LeastSquaresProblem, p: Float64Array): number {
  const out = new Float64Array(problem.y.length);
  problem.model(p, out);
  let s = 0, c = 0;
  for (let i = 0; i < out.length; i++) {
    // Kahan-compensated sum of squared residuals
    const r = problem.y[i] - out[i];
    const t = r * r - c;
    const next = s + t;
    c = next - s - t;
    s = next;
  }
  return Number.isFinite(s) ? s : Infinity;
}

function covarianceAt(problem: LeastSquaresProblem, params: Float64Array, scale: Float64Array, stepU: number, s2: number) {
  return covarianceFrom(jacobianAt(problem, params, scale, stepU), problem.y.length, params.length, s2);
}

function jacobianAt(problem: LeastSquaresProblem, params: Float64Array, scale: Float64Array, stepU: number): Float64Array {
  const n = problem.y.length, np = params.length;
  const jac = new Float64Array(np * n);
  if (problem.jacobian) {
    const at = new Float64Array(n);
    problem.model(params, at);
    const steps = new Float64Array(np);
    for (let j = 0; j < np; j++) steps[j] = stepU * scale[j];
    problem.jacobian(params, at, steps, jac);
  } else fillCentralJacobian(problem, params, scale, stepU, jac);
  return jac;
}

function fillCentralJacobian(problem: LeastSquaresProblem, params: Float64Array, scale: Float64Array, stepU: number, jac: Float64Array): void {
  const n = problem.y.length, np = params.length;
  const plus = new Float64Array(n), minus = new Float64Array(n);
  const q = new Float64Array(params);
  for (let j = 0; j < np; j++) {
    const h = stepU * scale[j];
    q[j] = params[j] + h;
    problem.model(q, plus);
    q[j] = params[j] - h;
    problem.model(q, minus);
    q[j] = params[j];
    for (let i = 0; i < n; i++) jac[j * n + i] = (plus[i] - minus[i]) / (2 * h);
  }
}

function covarianceFrom(jac: Float64Array, n: number, np: number, s2: number) {
  const jtj = new Float64Array(np * np);
  for (let a = 0; a < np; a++) {
    for (let b = a; b < np; b++) {
      let s = 0;
      const oa = a * n, ob = b * n;
      for (let i = 0; i < n; i++) s += jac[oa + i] * jac[ob + i];
      jtj[a * np + b] = s;
      jtj[b * np + a] = s;
    }
  }
  const inv = invertSymmetric(jtj, np);
  const covariance = new Float64Array(np * np);
  const sigma = new Float64Array(np).fill(NaN);
  if (!inv) return { covariance: covariance.fill(NaN), sigma, ok: false };
  for (let i = 0; i < np * np; i++) covariance[i] = s2 * inv[i];
  for (let j = 0; j < np; j++) sigma[j] = Math.sqrt(Math.max(0, covariance[j * np + j]));
  return { covariance, sigma, ok: true };
}

import { levenbergMarquardt, type SolverOptions, type SolverProblem, type SolverResult } from './levenbergMarquardt';

/**
 * Huber's tuning constant: 95 % asymptotic efficiency at the normal distribution (P. J. Huber,
 * E. M. Ronchetti, "Robust Statistics", 2nd ed., Wiley (2009), §4.5; from memory).
 */
export const HUBER_K = 1.345;

/** 1.4826·median|e − median e|: a σ estimate that spikes do not move (Huber & Ronchetti §5.1). */
export function madScale(e: ArrayLike<number>): number {
  const n = e.length;
  if (n === 0) return NaN;
  const v = Float64Array.from(e).sort();
  const med = n % 2 ? v[(n - 1) / 2] : 0.5 * (v[n / 2 - 1] + v[n / 2]);
  for (let i = 0; i < n; i++) v[i] = Math.abs(v[i] - med);
  v.sort();
  return 1.4826 * (n % 2 ? v[(n - 1) / 2] : 0.5 * (v[n / 2 - 1] + v[n / 2]));
}

/** IRLS weights of Huber's loss: 1 within k·s, k·s/|e| outside (ψ(e)/e). */
export function huberWeights(e: ArrayLike<number>, s: number, k: number, out: Float64Array): Float64Array {
  const c = k * s;
  for (let i = 0; i < e.length; i++) {
    const a = Math.abs(e[i]);
    out[i] = a <= c || !(c > 0) ? 1 : c / a;
  }
  return out;
}

export interface RobustResult extends SolverResult {
  /** Final IRLS weights (all 1 without outliers beyond k·s). */
  weights: Float64Array;
  /** The MAD scale of the residuals the weights were made with. */
  scale: number;
  /** IRLS rounds run. */
  rounds: number;
}

/**
 * Huber M-estimate by iteratively reweighted least squares (P. J. Huber, "Robust estimation of a
 * location parameter", Ann. Math. Statist. 35, 73–101 (1964); IRLS as in Huber & Ronchetti
 * §7.8): Levenberg–Marquardt on the weighted sum, then new weights from the residuals and their
 * MAD scale, until the weights settle. The damping carries over between rounds.
 */
export function huberFit(problem: SolverProblem, u0: ArrayLike<number>, options: SolverOptions & { k?: number; maxRounds?: number } = {}): RobustResult {
  const k = options.k ?? HUBER_K;
  const maxRounds = options.maxRounds ?? 8;
  const e = new Float64Array(problem.n);
  let weights: Float64Array = new Float64Array(problem.n).fill(1);
  let result = levenbergMarquardt(problem, u0, { ...options, weights });
  let iterations = result.iterations, evaluations = result.evaluations, jacobians = result.jacobians;
  let scale = NaN, rounds = 1;
  for (; rounds <= maxRounds; rounds++) {
    for (let i = 0; i < problem.n; i++) e[i] = problem.y[i] - result.fit[i];
    scale = madScale(e);
    const next = huberWeights(e, scale, k, new Float64Array(problem.n));
    let change = 0;
    for (let i = 0; i < problem.n; i++) change = Math.max(change, Math.abs(next[i] - weights[i]));
    weights = next;
    if (change < 0.01 || rounds === maxRounds) break;
    result = levenbergMarquardt(problem, result.u, { ...options, weights, damping: result.damping });
    iterations += result.iterations;
    evaluations += result.evaluations;
    jacobians += result.jacobians;
  }
  // The sum of squares under the final weights.
  let ssr = 0;
  for (let i = 0; i < problem.n; i++) ssr += weights[i] * (problem.y[i] - result.fit[i]) ** 2;
  return { ...result, ssr, iterations, evaluations, jacobians, weights, scale, rounds };
}

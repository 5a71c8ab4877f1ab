import { choleskySolve, normalEquations, type ColumnTails } from './normalEquations';

/**
 * A nonlinear least-squares problem for the solver, in solver units u (the caller scales its
 * parameters so that all u are of order one). Residual e = y − f(u), weighted by √w.
 */
export interface SolverProblem {
  /** Number of residuals. */
  n: number;
  /** Number of parameters. */
  p: number;
  /** Writes the model f(u) into out (length n). */
  model: (u: Float64Array, out: Float64Array) => void;
  /** Writes ∂f/∂u_j into out, column j at j·n, given f(u). */
  jacobian: (u: Float64Array, fAtU: Float64Array, out: Float64Array) => void;
  y: ArrayLike<number>;
  /**
   * Rows [start[j], end[j]) outside which column j of the Jacobian is zero (the joint fit's
   * block structure: a layer's parameters touch only its own samples and the later layers').
   * The normal matrix then sums only over the rows two columns share.
   */
  columnRows?: { start: Int32Array; end: Int32Array };
  /** Rows over which a column is a multiple of another (see ColumnTails). */
  columnTails?: ColumnTails;
  lower?: ArrayLike<number>;
  upper?: ArrayLike<number>;
}

export interface SolverOptions {
  /** @default 100 */
  maxIterations?: number;
  /**
   * Converged when the Gauss–Newton step still to go would lower the sum of squares by less than
   * this many s² (s² = SSR/(N − p)): the parameters are then within √tolerance of their σ of the
   * minimum. @default 1e-4
   */
  tolerance?: number;
  /** Converged when ‖h‖∞ falls below this (solver units) after an accepted step. @default 1e-10 */
  stepTolerance?: number;
  /** τ of the initial damping μ₀ = τ·max diag(JᵀWJ). @default 1e-3 */
  initialDamping?: number;
  /** Weights of the residuals (IRLS); all 1 when absent. */
  weights?: Float64Array;
  /** Damping to start from (a warm start keeps the previous fit's μ). */
  damping?: number;
}

export type StopReason = 'gradient' | 'step' | 'cost' | 'max-iterations' | 'singular';

export interface SolverResult {
  u: Float64Array;
  /** Weighted sum of squared residuals at u. */
  ssr: number;
  iterations: number;
  /** Model evaluations (for the Jacobian calls count separately). */
  evaluations: number;
  jacobians: number;
  converged: boolean;
  reason: StopReason;
  /** Damping at the end (for a warm restart). */
  damping: number;
  /** f(u) at the solution. */
  fit: Float64Array;
  /** The Jacobian at the solution (column-major, as `jacobian` writes it). */
  jac: Float64Array;
}

/**
 * Levenberg–Marquardt with gain-ratio step control and Nielsen's damping update: a step is
 * accepted only when it lowers the sum of squares; μ is kept across iterations, lowered by
 * max(1/3, 1 − (2ϱ − 1)³) after a good step and raised by ν (doubling) after each rejected one
 * (K. Madsen, H. B. Nielsen, O. Tingleff, "Methods for Non-Linear Least Squares Problems",
 * 2nd ed., IMM, DTU (2004), Algorithm 3.16 and eq. 3.15). Bounds by projection of the step.
 */
export function levenbergMarquardt(problem: SolverProblem, u0: ArrayLike<number>, options: SolverOptions = {}): SolverResult {
  const { n, p } = problem;
  const maxIterations = options.maxIterations ?? 100;
  const tolerance = options.tolerance ?? 1e-4;
  const stepTolerance = options.stepTolerance ?? 1e-10;
  const w = options.weights;
  const lower = problem.lower, upper = problem.upper;
  const clamp = (j: number, v: number) => Math.min(upper ? upper[j] : Infinity, Math.max(lower ? lower[j] : -Infinity, v));

  const u = Float64Array.from(u0, (v, j) => clamp(j, v));
  let f = new Float64Array(n), fTry = new Float64Array(n);
  const e = new Float64Array(n);
  const jac = new Float64Array(n * p);
  const a = new Float64Array(p * p), g = new Float64Array(p), h = new Float64Array(p), uTry = new Float64Array(p);
  const damped = new Float64Array(p * p);
  let evaluations = 0, jacobians = 0;

  const residualsOf = (model: Float64Array, out: Float64Array | null): number => {
    let s = 0;
    for (let i = 0; i < n; i++) {
      const r = problem.y[i] - model[i];
      const wr = w ? w[i] * r * r : r * r;
      if (out) out[i] = r;
      s += wr;
    }
    return Number.isFinite(s) ? s : Infinity;
  };
  problem.model(u, f);
  evaluations++;
  let ssr = residualsOf(f, e);
  const linearize = () => {
    problem.jacobian(u, f, jac);
    jacobians++;
    normalEquations(jac, e, w, n, p, problem.columnRows, a, g, problem.columnTails);
  };
  linearize();
  let maxDiag = 0;
  for (let j = 0; j < p; j++) maxDiag = Math.max(maxDiag, a[j * p + j]);
  let mu = options.damping ?? (options.initialDamping ?? 1e-3) * maxDiag;
  let nu = 2;
  const dof = Math.max(n - p, 1);
  let iterations = 0;
  let reason: StopReason = 'max-iterations';

  // Converged when the undamped (Gauss–Newton) step would gain less than tolerance·s².
  const gaussNewtonGain = (): number | null => {
    const step = choleskySolve(a, g, p);
    if (!step) return null;
    let s = 0;
    for (let j = 0; j < p; j++) s += g[j] * step[j];
    return s;
  };
  // s² with a floor at 1e-10 of the data's RMS, so noiseless data converge at roundoff.
  let yy = 0;
  for (let i = 0; i < n; i++) yy += problem.y[i] * problem.y[i];
  const floor = 1e-20 * (yy / n) * n;
  const done = (): boolean => {
    if (ssr === 0) return ((reason = 'cost'), true);
    const step = choleskySolve(a, g, p);
    if (!step) return false;
    let gain = 0;
    for (let j = 0; j < p; j++) gain += g[j] * step[j];
    if (gain > tolerance * Math.max(ssr / dof, floor / dof)) return false;
    reason = 'gradient';
    // Close enough: one undamped Gauss–Newton step finishes it when it lowers the sum.
    for (let j = 0; j < p; j++) uTry[j] = clamp(j, u[j] + step[j]);
    problem.model(uTry, fTry);
    evaluations++;
    const ssrTry = residualsOf(fTry, null);
    if (ssrTry < ssr) {
      u.set(uTry);
      [f, fTry] = [fTry, f];
      ssr = residualsOf(f, e);
    }
    return true;
  };
  // No step lowers the sum any more: a minimum to working precision when the Gauss–Newton step
  // left is within the parameters' 1σ.
  const nearMinimum = () => {
    const gain = gaussNewtonGain();
    return gain !== null && gain <= Math.max(ssr, floor) / dof;
  };
  if (done()) return finish(true);

  while (iterations < maxIterations) {
    iterations++;
    damped.set(a);
    for (let j = 0; j < p; j++) damped[j * p + j] += mu;
    const step = choleskySolve(damped, g, p);
    if (!step) {
      mu *= nu;
      nu *= 2;
      if (!Number.isFinite(mu)) return ((reason = 'singular'), finish(false));
      continue;
    }
    // Project onto the bounds; the predicted gain is that of the projected step.
    let hMax = 0;
    for (let j = 0; j < p; j++) {
      uTry[j] = clamp(j, u[j] + step[j]);
      h[j] = uTry[j] - u[j];
      hMax = Math.max(hMax, Math.abs(h[j]));
    }
    if (hMax <= stepTolerance * (1 + maxAbs(u))) return ((reason = 'step'), finish(nearMinimum()));
    // L(0) − L(h) = hᵀg − ½hᵀAh (the linear model's predicted drop of ½·SSR), times 2 for SSR.
    let hg = 0, hah = 0;
    for (let i = 0; i < p; i++) {
      hg += h[i] * g[i];
      let s = 0;
      for (let j = 0; j < p; j++) s += a[i * p + j] * h[j];
      hah += h[i] * s;
    }
    const predicted = 2 * hg - hah;
    problem.model(uTry, fTry);
    evaluations++;
    const ssrTry = residualsOf(fTry, null);
    const rho = predicted > 0 ? (ssr - ssrTry) / predicted : -1;
    if (rho > 0 && ssrTry < ssr) {
      u.set(uTry);
      [f, fTry] = [fTry, f];
      ssr = residualsOf(f, e);
      linearize();
      mu *= Math.max(1 / 3, 1 - (2 * rho - 1) ** 3);
      nu = 2;
      if (done()) return finish(true);
    } else {
      mu *= nu;
      nu *= 2;
      if (!Number.isFinite(mu) || mu > 1e30 * (maxDiag || 1)) return ((reason = 'step'), finish(nearMinimum()));
    }
  }
  return finish(false);

  function finish(converged: boolean): SolverResult {
    return { u, ssr, iterations, evaluations, jacobians, converged, reason, damping: mu, fit: f, jac };
  }
}

function maxAbs(v: Float64Array): number {
  let m = 0;
  for (const x of v) m = Math.max(m, Math.abs(x));
  return m;
}

import { invertSymmetric } from './invertSymmetric';
import { choleskyScaled, huberFit, levenbergMarquardt, normalEquations, solveScaled, type ColumnTails, type SolverResult, type StopReason } from './solver';

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
  /** Rows outside which each Jacobian column is zero (see SolverProblem.columnRows). */
  columnRows?: { start: Int32Array; end: Int32Array };
  /** Rows over which a column is a multiple of another (see SolverProblem.columnTails). */
  columnTails?: ColumnTails;
}

export interface LeastSquaresOptions {
  /** Finite-difference step, in scaled units. @default 0.001 */
  gradientStep?: number;
  /** @default 100 */
  maxIterations?: number;
  /**
   * Converged when the Gauss–Newton step still to go would lower χ² = SSR/s² by less than this
   * (the parameters within √tolerance·σ of the minimum). @default 0.001
   */
  tolerance?: number;
  /** Huber's loss by IRLS (spikes and outliers count less). @default false */
  robust?: boolean;
}

export interface LeastSquaresResult {
  params: Float64Array;
  /** 1σ from cov = s²·(JᵀJ)⁻¹ (robust: Huber's M-estimate form); NaN where JᵀJ is singular. */
  sigma: Float64Array;
  /** Row-major p×p covariance. */
  covariance: Float64Array;
  ssr: number;
  dof: number;
  residualRms: number;
  iterations: number;
  converged: boolean;
  /** Why the solver stopped. */
  reason: StopReason;
  /** False when JᵀJ was singular at the solution (a parameter the data do not determine). */
  wellDetermined: boolean;
  /** Residuals y − model at the solution (unweighted). */
  residuals: Float64Array;
  /** IRLS weights (robust fits), else null. */
  weights: Float64Array | null;
  /**
   * The parameters' change for a change Δy of the data, to first order: one Gauss–Newton step
   * from the solution, Δp = (JᵀWJ)⁻¹JᵀW·Δy with the Jacobian of the covariance (W the IRLS
   * weights, held). Null where JᵀWJ is singular.
   */
  shiftFor?: (deltaY: ArrayLike<number>) => Float64Array | null;
  /** What shiftFor reads, as plain data: shiftWith takes the same steps from it on any thread. */
  shiftBasis?: ShiftBasis;
}

/**
 * The Jacobian at the solution (column-major, scaled to unit columns at the start: `unit`), the
 * IRLS weights, the rows each column spans and the normal matrix's factor once made (`factored`;
 * `factor` null where it is singular). Structured-cloneable, so a step can be taken elsewhere
 * (fit/wanderSigma.ts on the second thread) with the same figures.
 */
export interface ShiftBasis {
  jac: Float64Array;
  weights: Float64Array | null;
  n: number;
  np: number;
  unit: Float64Array;
  columnRows?: { start: Int32Array; end: Int32Array };
  columnTails?: ColumnTails;
  factored: boolean;
  factor: ReturnType<typeof choleskyScaled>;
}

/**
 * LeastSquaresResult.shiftFor on its basis: one Gauss–Newton step from the solution,
 * Δp = (JᵀWJ)⁻¹JᵀW·Δy. The normal matrix and its factor once, on the first call; each call then
 * forms Jᵀ·W·dy only (fit/wanderSigma.ts takes one step per wander knot).
 */
export function shiftWith(b: ShiftBasis, deltaY: ArrayLike<number>): Float64Array | null {
  const { jac, weights, n, np, unit, columnRows } = b;
  const dy = Float64Array.from(deltaY), g = new Float64Array(np);
  if (!b.factored) {
    const a = new Float64Array(np * np);
    normalEquations(jac, dy, weights ?? undefined, n, np, columnRows, a, g, b.columnTails);
    b.factor = choleskyScaled(a, np);
    b.factored = true;
  } else {
    // only the rows where dy is not 0 (a wander's knot moves its layer and those above it):
    // the terms left out are ±0, which leave every sum as it was
    // (the loops in functions of their own: see columnTimes)
    const r0 = firstNonZero(dy, n), r1 = endOfNonZero(dy, r0, n);
    for (let j = 0; j < np; j++) {
      const o = j * n;
      const lo = Math.max(r0, columnRows ? columnRows.start[j] : 0), hi = Math.min(r1, columnRows ? columnRows.end[j] : n);
      g[j] = weights ? weightedColumnTimes(jac, o, weights, dy, lo, hi) : columnTimes(jac, o, dy, lo, hi);
    }
  }
  if (!b.factor) return null;
  const du = solveScaled(b.factor, g, np);
  for (let j = 0; j < np; j++) du[j] *= unit[j];
  return du;
}

/** The basis's factor made now (with no step taken), so every step after it forms Jᵀ·W·dy alike, wherever it is taken. */
export function factorShiftBasis(b: ShiftBasis): void {
  if (!b.factored) shiftWith(b, new Float64Array(b.n));
}

const DEFAULTS: Required<LeastSquaresOptions> = { gradientStep: 0.001, maxIterations: 100, tolerance: 0.001, robust: false };

/**
 * Fits with the Levenberg–Marquardt of ./solver on parameters scaled to unit Jacobian columns at
 * the start (D. W. Marquardt, J. SIAM 11, 431 (1963): the normal equations scaled to unit
 * diagonal; from memory), so one damping μ means the same for every parameter. Uncertainties
 * come from the Jacobian at the solution.
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
  const physicalJacobian = (q: Float64Array, at: Float64Array, out: Float64Array) => {
    if (problem.jacobian) problem.jacobian(q, at, steps, out);
    else fillCentralJacobian(problem, q, steps, out);
  };
  const at0 = new Float64Array(n);
  problem.model(start, at0);
  const j0 = new Float64Array(np * n);
  physicalJacobian(start, at0, j0);
  const unit = new Float64Array(np);
  for (let j = 0; j < np; j++) {
    let c = 0;
    for (let i = 0; i < n; i++) c += j0[j * n + i] ** 2;
    unit[j] = c > 0 && Number.isFinite(c) ? 1 / Math.sqrt(c) : scale[j];
  }
  const q = new Float64Array(np);
  const toPhysical = (u: ArrayLike<number>, out = q): Float64Array => {
    for (let i = 0; i < np; i++) out[i] = start[i] + unit[i] * u[i];
    return out;
  };
  const lower = new Float64Array(np), upper = new Float64Array(np);
  for (let i = 0; i < np; i++) {
    lower[i] = problem.min ? (problem.min[i] - start[i]) / unit[i] : -Infinity;
    upper[i] = problem.max ? (problem.max[i] - start[i]) / unit[i] : Infinity;
  }
  // The solver starts at u = 0, where the model and the Jacobian are those just computed at the
  // start (toPhysical(0) is the start exactly): taken from there, not computed again.
  const atStart = (u: Float64Array) => u.every((v) => v === 0);
  const solverProblem = {
    n, p: np, y: problem.y, lower, upper, columnRows: problem.columnRows, columnTails: problem.columnTails,
    model: (u: Float64Array, out: Float64Array) => (atStart(u) ? out.set(at0) : problem.model(toPhysical(u), out)),
    jacobian: (u: Float64Array, at: Float64Array, out: Float64Array) => {
      if (atStart(u)) out.set(j0);
      else physicalJacobian(toPhysical(u), at, out);
      for (let j = 0; j < np; j++) {
        const c = unit[j];
        for (let i = j * n, end = i + n; i < end; i++) out[i] *= c;
      }
    },
  };
  const solverOptions = { maxIterations: opt.maxIterations, tolerance: opt.tolerance };
  const u0 = new Float64Array(np);
  const result: SolverResult & { weights?: Float64Array } = opt.robust ? huberFit(solverProblem, u0, solverOptions) : levenbergMarquardt(solverProblem, u0, solverOptions);
  const params = toPhysical(result.u, new Float64Array(np));
  const residuals = new Float64Array(n);
  let ssr = 0;
  for (let i = 0; i < n; i++) {
    residuals[i] = problem.y[i] - result.fit[i];
    ssr += residuals[i] * residuals[i];
  }
  const dof = n - np;
  const weights = result.weights ?? null;
  const { covariance, sigma, ok } = covarianceFrom(result.jac, residuals, weights, n, np, unit, problem.columnRows);
  const shiftBasis: ShiftBasis = {
    jac: result.jac, weights, n, np, unit, ...(problem.columnRows ? { columnRows: problem.columnRows } : {}),
    ...(problem.columnTails ? { columnTails: problem.columnTails } : {}), factored: false, factor: null,
  };
  const shiftFor = (deltaY: ArrayLike<number>): Float64Array | null => shiftWith(shiftBasis, deltaY);
  return {
    params, sigma, covariance, ssr, dof, residualRms: Math.sqrt(ssr / n), iterations: result.iterations,
    converged: result.converged, reason: result.reason, wellDetermined: ok, residuals, weights, shiftFor, shiftBasis,
  };
}

function fillCentralJacobian(problem: LeastSquaresProblem, params: Float64Array, steps: Float64Array, jac: Float64Array): void {
  const n = problem.y.length, np = params.length;
  const plus = new Float64Array(n), minus = new Float64Array(n);
  const q = new Float64Array(params);
  for (let j = 0; j < np; j++) {
    const h = steps[j];
    q[j] = params[j] + h;
    problem.model(q, plus);
    q[j] = params[j] - h;
    problem.model(q, minus);
    q[j] = params[j];
    for (let i = 0; i < n; i++) jac[j * n + i] = (plus[i] - minus[i]) / (2 * h);
  }
}

/**
 * cov = s²·(JᵀJ)⁻¹ with s² = SSR/(N − p); for a Huber fit the M-estimate's form
 * [Σψ²/(N − p)]/[Σψ′/N]²·(JᵀJ)⁻¹ (P. J. Huber, "Robust Statistics", Wiley (1981), §7.6, the
 * correction factor κ ≈ 1 for N ≫ p dropped; from memory), which is the same without outliers.
 * jac is in solver units; unit maps back to physical parameters.
 */
function covarianceFrom(
  jac: Float64Array, e: Float64Array, w: Float64Array | null, n: number, np: number, unit: Float64Array,
  rows?: { start: Int32Array; end: Int32Array },
) {
  const jtj = new Float64Array(np * np);
  for (let a = 0; a < np; a++) {
    for (let b = a; b < np; b++) {
      let s = 0;
      const oa = a * n, ob = b * n;
      // only the rows both columns share (outside them one is exactly 0: the same sum)
      const from = rows ? Math.max(rows.start[a], rows.start[b]) : 0, to = rows ? Math.min(rows.end[a], rows.end[b]) : n;
      for (let i = from; i < to; i++) s += jac[oa + i] * jac[ob + i];
      jtj[a * np + b] = s;
      jtj[b * np + a] = s;
    }
  }
  let psi2 = 0, inside = 0;
  for (let i = 0; i < n; i++) {
    const wi = w ? w[i] : 1;
    psi2 += (wi * e[i]) ** 2;
    if (wi === 1) inside++;
  }
  const dof = Math.max(n - np, 1);
  const s2 = psi2 / dof / ((inside || 1) / n) ** 2;
  const inv = invertSymmetric(jtj, np);
  const covariance = new Float64Array(np * np);
  const sigma = new Float64Array(np).fill(NaN);
  if (!inv) return { covariance: covariance.fill(NaN), sigma, ok: false };
  for (let a = 0; a < np; a++) for (let b = 0; b < np; b++) covariance[a * np + b] = s2 * inv[a * np + b] * unit[a] * unit[b];
  for (let j = 0; j < np; j++) sigma[j] = Math.sqrt(Math.max(0, covariance[j * np + j]));
  return { covariance, sigma, ok: true };
}

// shiftFor's loops over the rows, each alone in a function that returns right after it: inside
// shiftFor, the engine compiled them on the stack, and that code left at a call after them with
// no type feedback on every later call (some 30 times a run), running the rest unoptimised.

/** The first i < n with dy[i] ≠ 0 (n if none). */
function firstNonZero(dy: Float64Array, n: number): number {
  let i = 0;
  while (i < n && dy[i] === 0) i++;
  return i;
}

/** One past the last i ≥ from, i < n, with dy[i] ≠ 0 (from if none). */
function endOfNonZero(dy: Float64Array, from: number, n: number): number {
  let i = n;
  while (i > from && dy[i - 1] === 0) i--;
  return i;
}

/** Σ jac[o + k]·dy[k] over lo ≤ k < hi, in order. */
function columnTimes(jac: Float64Array, o: number, dy: Float64Array, lo: number, hi: number): number {
  let s = 0;
  for (let k = lo; k < hi; k++) s += jac[o + k] * dy[k];
  return s;
}

/** Σ jac[o + k]·w[k]·dy[k] over lo ≤ k < hi, in order. */
function weightedColumnTimes(jac: Float64Array, o: number, w: ArrayLike<number>, dy: Float64Array, lo: number, hi: number): number {
  let s = 0;
  for (let k = lo; k < hi; k++) s += jac[o + k] * w[k] * dy[k];
  return s;
}

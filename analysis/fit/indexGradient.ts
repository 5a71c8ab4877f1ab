import { type JointFitResult } from './fitLayers';

/**
 * Layers thinner than this many quarter-waves at the monitor wavelength get no gradient trial.
 * At the quarter-wave point a linear gradient changes the assembly's admittance only to second
 * order (WKB: Y = na·nb/Y_below against n̄²/Y_below), at the half-wave point to first (Y =
 * Y_below·nb/na: the turning point no longer returns to the level below). Up to a quarter-wave
 * Δn shows only in the curve's shape, where it trades against the index and the rate drift:
 * measured on the chamber simulator (T at 600 nm), a 1-QWOT layer's trial σ(Δn) is 0.03–0.04
 * under white noise of 0.05 %, a 2-QWOT layer's 0.0002–0.0004, and 0.001–0.009 under the real
 * chamber's correlated noise; in the real-chamber mirror (1-QWOT layers) 0.05–2, the trial
 * running to its bound. Pooling a material's
 * quarter-waves would not reach a Δn of a few 0.001 either.
 */
export const GRADIENT_MIN_QWOT = 1.5;

/** A gradient is kept when the trial fit puts it this many σ from 0 (a Wald test, 3σ: common practice). */
export const GRADIENT_KEEP_Z = 3;

/** What a layer's trial fit with a free linear index gradient found. */
export interface GradientTrial {
  /** Δn from the layer's bottom to its top in the trial fit, and its 1σ (with the correlated-noise scaling of fitLayers). */
  deltaN: number;
  sigma: number;
  /** Kept: the layer is fitted as graded from here on; otherwise it stays uniform (Δn held at 0). */
  kept: boolean;
}

/**
 * Judges a free-gradient trial fit of one layer against the uniform fit it was started from: the
 * gradient is kept when |Δn| > GRADIENT_KEEP_Z·σ, inside its bound, and the trial lowered the sum of squares (a
 * likelihood-ratio test of one parameter is, to first order, the same test as the Wald z on
 * the trial's σ; the σ already carries the residuals' autocorrelation, so correlated noise does
 * not pass as a gradient as easily as a plain Δχ² on bin means would let it).
 */
export function judgeGradient(uniform: JointFitResult, trial: JointFitResult, bound: number): GradientTrial {
  const t = reviewGradient(trial, bound);
  return { ...t, kept: t.kept && trial.solver.ssr < uniform.solver.ssr };
}

/**
 * Whether a fit with the gradient free still puts it beyond GRADIENT_KEEP_Z·σ, inside its bound
 * (a fit at its bound has no meaningful σ), e.g. after the stack below was corrected.
 */
export function reviewGradient(fit: JointFitResult, bound: number): GradientTrial {
  const e = fit.layers[0];
  const deltaN = e.indexGradient ?? 0;
  const sigma = fit.solver.wellDetermined ? e.indexGradientSigma ?? NaN : NaN;
  const kept = Math.abs(deltaN) < 0.99 * bound && Number.isFinite(sigma) && sigma > 0 && Math.abs(deltaN) > GRADIENT_KEEP_Z * sigma;
  return { deltaN, sigma, kept };
}

/**
 * How much correlated noise inflates the variance of a least-squares estimate over white noise
 * of the same σ: the integrated autocorrelation time τ = 1 + 2·Σ_{k≥1} (1 − k/n)·ρ_k of the
 * residuals, the sum taken up to the first lag with ρ_k ≤ 0, so that n/τ is the effective number
 * of independent samples (G. V. Bayley, J. M. Hammersley, "The 'effective' number of independent
 * observations in an autocorrelated time series", Suppl. J. R. Stat. Soc. 8, 184–197 (1946); the
 * truncation at the first zero crossing as in H. von Storch, F. W. Zwiers, "Statistical Analysis
 * in Climate Research", CUP (1999), §17.1; both from memory). For AR(1) noise with lag-one
 * correlation ρ this gives τ → (1 + ρ)/(1 − ρ).
 *
 * Valid when the model's Jacobian varies slowly over the correlation time (fringes much slower
 * than the noise's memory), the usual case with 10⁴ samples a layer. Returns 1 for fewer than
 * 8 residuals.
 */
export function autocorrelationTime(e: ArrayLike<number>, from = 0, to = e.length): number {
  const n = to - from;
  if (n < 8) return 1;
  let mean = 0;
  for (let i = from; i < to; i++) mean += e[i];
  mean /= n;
  let c0 = 0;
  for (let i = from; i < to; i++) c0 += (e[i] - mean) ** 2;
  if (!(c0 > 0)) return 1;
  let tau = 1;
  const maxLag = Math.floor(n / 4);
  for (let k = 1; k <= maxLag; k++) {
    let c = 0;
    for (let i = from; i + k < to; i++) c += (e[i] - mean) * (e[i + k] - mean);
    const rho = c / c0;
    if (rho <= 0) break;
    tau += 2 * (1 - k / n) * rho;
  }
  return tau;
}

/** The effective number of independent samples, n/τ (see autocorrelationTime). */
export function effectiveSampleCount(e: ArrayLike<number>): number {
  return e.length / autocorrelationTime(e);
}

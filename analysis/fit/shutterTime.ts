/**
 * The shutter's closing time as the run shows it, as a hierarchical (empirical Bayes) prior on
 * each layer's growth after its cut. Each layer whose growth the data determine gives
 * t̂ = δ̂ / r ± σ (the growth over the layer's final rate: half the closing time when the rate
 * falls linearly; whatever the law, the time at full rate that grows as much). The true times
 * scatter from cut to cut about a mean t̄ with a spread τ; with the layers' own σ known, the
 * spread is τ² = max(0, s² − mean σ²) (s² the sample variance of the t̂), and a layer's own time
 * is predicted as t̄ with variance τ² + s²/m (s² no less than mean σ²): the normal hierarchical model, its moment
 * estimates (B. Efron, C. Morris, "Data analysis using Stein's estimator and its
 * generalizations", J. Am. Stat. Assoc. 70, 311–319 (1975); A. Gelman et al., Bayesian Data
 * Analysis, 3rd ed., §5.4; from memory). A layer whose growth its own data tell poorly (most
 * turning-point cuts) is pulled towards the run's time; one they do not tell at all (a
 * turning-point cut, last on its chip) takes it, with its spread.
 */
export class ShutterTime {
  private readonly times = new Map<number, { timeS: number; sigmaS: number }>();

  /** Records (or replaces) a layer's own estimate of its time, s (unbounded: a noisy one may be negative). */
  add(layer: number, timeS: number, sigmaS: number): void {
    this.times.set(layer, { timeS, sigmaS });
  }

  remove(layer: number): void {
    this.times.delete(layer);
  }

  get count(): number {
    return this.times.size;
  }

  /**
   * The time of a layer's shutter as the other layers predict it (the layer's own estimate left
   * out, so it is not counted twice), with its σ; null with fewer than 3 other layers.
   */
  predict(exceptLayer?: number): { timeS: number; sigmaS: number; from: number } | null {
    const v = [...this.times].filter(([l]) => l !== exceptLayer).map(([, t]) => t);
    const m = v.length;
    if (m < 3) return null;
    const mean = v.reduce((a, t) => a + t.timeS, 0) / m;
    const s2 = v.reduce((a, t) => a + (t.timeS - mean) ** 2, 0) / (m - 1);
    const own2 = v.reduce((a, t) => a + t.sigmaS ** 2, 0) / m;
    const spread2 = Math.max(0, s2 - own2);
    // The mean's variance never below the layers' own σ²/m (identical values do not make it exact).
    return { timeS: mean, sigmaS: Math.sqrt(spread2 + Math.max(s2, own2) / m), from: m };
  }
}

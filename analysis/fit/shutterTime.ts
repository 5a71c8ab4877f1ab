/**
 * The shutter's closing time as the run shows it, as a hierarchical (empirical Bayes) prior on
 * each layer's growth after its cut. Each layer whose growth the data determine gives
 * t̂ = δ̂ / r ± σ (the growth over the layer's final rate: half the closing time when the rate
 * falls linearly; whatever the law, the time at full rate that grows as much). The true times
 * scatter from cut to cut about a mean t̄ with a spread τ, each seen through its own σᵢ: the
 * normal random-effects model, t̂ᵢ ~ N(t̄, τ² + σᵢ²). τ² by the moment estimator of
 * R. DerSimonian, N. Laird, "Meta-analysis in clinical trials", Controlled Clinical Trials 7,
 * 177–188 (1986) (from memory): Q = Σ wᵢ(t̂ᵢ − t̄_w)² with wᵢ = 1/σᵢ², τ² = max(0, (Q − (m − 1)) /
 * (Σw − Σw²/Σw)); then t̄ = Σ wᵢ*·t̂ᵢ / Σ wᵢ* with wᵢ* = 1/(σᵢ² + τ²), Var t̄ = 1/Σ wᵢ*, and a
 * layer's own time is predicted as t̄ with variance τ² + Var t̄. With equal σᵢ these are the
 * moment estimates of B. Efron, C. Morris, J. Am. Stat. Assoc. 70, 311–319 (1975) (τ² = s² − σ²,
 * Var t̄ = max(s², σ²)/m). The weights matter: a layer's σ in time is its growth's σ over its
 * rate, and the readings of one run span a factor of ten (0.3–3 s on the chamber simulator's
 * mirror, slow high-index layers the loosest), so an unweighted mean follows the loosest few. A
 * layer whose growth its own data tell poorly (most turning-point cuts) is pulled towards the
 * run's time; one they do not tell at all (a turning-point cut, last on its chip) takes it, with
 * its spread.
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
    let sw = 0, sw2 = 0, swt = 0;
    for (const t of v) {
      const w = 1 / (t.sigmaS * t.sigmaS);
      sw += w;
      sw2 += w * w;
      swt += w * t.timeS;
    }
    const fixed = swt / sw;
    let q = 0;
    for (const t of v) q += (t.timeS - fixed) ** 2 / (t.sigmaS * t.sigmaS);
    const spread2 = Math.max(0, (q - (m - 1)) / (sw - sw2 / sw));
    let sws = 0, swst = 0;
    for (const t of v) {
      const w = 1 / (t.sigmaS * t.sigmaS + spread2);
      sws += w;
      swst += w * t.timeS;
    }
    return { timeS: swst / sws, sigmaS: Math.sqrt(spread2 + 1 / sws), from: m };
  }
}

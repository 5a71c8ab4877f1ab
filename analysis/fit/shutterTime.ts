import { logNormalCdf } from './growthPosterior';

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
  /**
   * `truncated`: the true times as a normal population cut at 0 (a shutter does not un-grow a
   * film), its mean and spread by marginal maximum likelihood (truncatedPopulation); else the
   * uncut normal by DerSimonian–Laird above.
   */
  constructor(readonly truncated = true, private readonly maxS = 2) {}

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
    if (this.truncated) {
      // The spread widened by the mean's own variance at that spread (as the uncut model's
      // prediction): a few readings that agree would otherwise fix every layer's time at their mean.
      const p = truncatedPopulation(v, this.maxS);
      let sw = 0;
      for (const t of v) sw += 1 / (t.sigmaS * t.sigmaS + p.spreadS * p.spreadS);
      return { timeS: p.meanS, sigmaS: Math.sqrt(p.spreadS * p.spreadS + 1 / sw), from: m };
    }
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

/**
 * The readings' log marginal likelihood when the true times are N(μ, τ²) cut at 0 and each is
 * seen through N(0, σᵢ²): for each, N(t̂ᵢ; μ, τ² + σᵢ²)·Φ(mᵢ/sᵢ)/Φ(μ/τ) with mᵢ = (μσᵢ² + t̂ᵢτ²)/(τ²
 * + σᵢ²), sᵢ = τσᵢ/√(τ² + σᵢ²) (the product of two Gaussians integrated over t ≥ 0). τ → 0 with
 * μ < 0 is a point mass at 0.
 */
export function truncatedLogLikelihood(v: readonly { timeS: number; sigmaS: number }[], mu: number, tau: number): number {
  let ll = 0;
  if (tau <= 0) {
    const at = Math.max(mu, 0);
    for (const t of v) ll -= 0.5 * ((t.timeS - at) / t.sigmaS) ** 2 + Math.log(t.sigmaS);
    return ll;
  }
  const norm = logNormalCdf(mu / tau);
  for (const t of v) {
    const v2 = tau * tau + t.sigmaS * t.sigmaS;
    const m = (mu * t.sigmaS * t.sigmaS + t.timeS * tau * tau) / v2, s = (tau * t.sigmaS) / Math.sqrt(v2);
    ll += -0.5 * (t.timeS - mu) ** 2 / v2 - 0.5 * Math.log(v2) + logNormalCdf(m / s) - norm;
  }
  return ll;
}

/**
 * The population of true times under the cut at 0: μ and τ maximizing truncatedLogLikelihood, on
 * a grid refined twice about its best point (μ over ±4 times the readings' span, τ from 0). A run
 * whose readings scatter about 0 gets a population piled at 0 (μ ≤ 0, τ small) where the uncut
 * normal's spread, cut at 0 afterwards, stood about 0.8τ above it for every layer.
 */
export function truncatedPopulation(v: readonly { timeS: number; sigmaS: number }[], maxS: number): { meanS: number; spreadS: number } {
  // μ below −maxS adds nothing the grid's corner (a pile at 0) does not already give.
  const [mu0, mu1, tau0, tau1] = [-maxS, maxS, 0.01 * maxS, maxS];
  let [muLo, muHi, tauLo, tauHi] = [mu0, mu1, tau0, tau1];
  let best = { mu: 0, tau: 0, ll: -Infinity };
  const K = 41;
  for (let round = 0; round < 3; round++) {
    for (let i = 0; i < K; i++) {
      const mu = muLo + ((muHi - muLo) * i) / (K - 1);
      for (let j = 0; j < K; j++) {
        const tau = tauLo + ((tauHi - tauLo) * j) / (K - 1);
        const ll = truncatedLogLikelihood(v, mu, tau);
        if (ll > best.ll) best = { mu, tau, ll };
      }
    }
    const dm = (2 * (muHi - muLo)) / (K - 1), dt = (2 * (tauHi - tauLo)) / (K - 1);
    [muLo, muHi] = [Math.max(mu0, best.mu - dm), Math.min(mu1, best.mu + dm)];
    [tauLo, tauHi] = [Math.max(tau0, best.tau - dt), Math.min(tau1, best.tau + dt)];
  }
  return { meanS: best.mu, spreadS: best.tau };
}

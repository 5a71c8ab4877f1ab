/** One model's offset: its value and σ (total, and the random part the layers' σ take up). */
export interface OffsetModel {
  offset: number;
  sigma: number;
  sigmaRandom: number;
}

export interface AveragedOffset extends OffsetModel {
  /** Weight of the fitted model (0–1). */
  weight: number;
}

/**
 * A chip's offset averaged over two models, "the offset assumed" (zero, or an earlier chip's, with
 * its σ) and "the offset fitted" (one parameter more), instead of taking one of them past a
 * threshold: each weighed by w ∝ exp(−IC/2), the estimate their weighted mean and its variance the
 * weighted within-model variances plus the models' spread about it, σ² = Σ wᵢ(σᵢ² + (oᵢ − ō)²)
 * (S. T. Buckland, K. P. Burnham, N. H. Augustin, Biometrics 53, 603–618 (1997); K. P. Burnham,
 * D. R. Anderson, Model Selection and Multimodel Inference, 2nd ed. (2002), §4.2–4.3; both from
 * memory). The profile is a parabola about the fitted offset, so the assumed model's
 * −2 log-likelihood exceeds the fitted one's by z² = ((ô − o₀)/σ)², σ the fitted offset's total σ
 * (with the systematic part for the rate model, which a wandering rate turns into a misfit the
 * profile does not see). The penalty for the fitted parameter is Hannan and Quinn's, 2·ln ln n
 * (E. J. Hannan, B. G. Quinn, J. R. Statist. Soc. B 41, 190–195 (1979), from memory), n the
 * independent readings the fit rests on (`effectivePoints`, 500–1000 on the chamber harness:
 * a penalty of 3.6–3.9), the weights formed as Akaike's are:
 * w = 1/(1 + exp(−(z² − 2·ln ln n)/2)). Measured against the other two criteria (12-layer T run
 * with 0.5 % stray light, seeds 55–66; rate-wander mirror without any, seeds 15–30): Akaike's 2
 * took a quarter of every fit with no evidence at all, the mirror's sequential index RMS 0.0054 →
 * 0.0066 (0.0061 here) and its harness seeds' index 0.0019 → 0.012 (0.0082 here); Schwarz's
 * ln n (6.2–6.9) left the T run's 0.47 % fits at 2.9σ two-thirds taken, its sequential index
 * 0.0103 (0.0046 here).
 */
export function averagedOffset(assumed: OffsetModel, fitted: OffsetModel, effectivePoints: number): AveragedOffset {
  // a fit its profile does not bound is no model to weigh
  if (!(fitted.sigma > 0 && Number.isFinite(fitted.sigma) && Number.isFinite(fitted.offset))) return { ...assumed, weight: 0 };
  const delta = fitted.offset - assumed.offset;
  const z2 = (delta / fitted.sigma) ** 2;
  const penalty = 2 * Math.log(Math.log(Math.max(effectivePoints, Math.E ** Math.E)));
  const weight = 1 / (1 + Math.exp(-(z2 - penalty) / 2));
  const offset = assumed.offset + weight * delta;
  // Σ wᵢ(oᵢ − ō)² for two models is w(1 − w)Δ²
  const between = weight * (1 - weight) * delta * delta;
  const mix = (a: number, b: number) => Math.sqrt((1 - weight) * a * a + weight * b * b + between);
  return { offset, sigma: mix(assumed.sigma, fitted.sigma), sigmaRandom: mix(assumed.sigmaRandom, fitted.sigmaRandom), weight };
}

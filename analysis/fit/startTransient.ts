import { type LayerSamples } from './layerSamples';

/**
 * The rate's start-up as the source shutter opens: the blade sweeps across the plume and the
 * source settles, so the rate rises from 0 to its full value over the first second or two. We
 * model the onset as a linear ramp over 2δ (the exposed part of the plume growing at the
 * blade's constant speed): ḋ = R(τ)·s(τ), s(τ) = τ/(2δ) for τ < 2δ, 1 after. Its only parameter
 * is the effective start delay δ = ∫₀^∞ (1 − s), the thickness deficit over the rate: the one
 * property of the onset a trace with noise tells (its shape within the first 2δ barely shows).
 *
 * The fit keeps its thickness law d = L(t) (fit/rateWander.ts) and reads it in exposure time
 * t = E(τ) = ∫₀^τ s, the time at the full rate that grows the same film:
 *   E(τ) = τ²/(4δ) for τ < 2δ, τ − δ after (textbook calculus).
 * L(E(τ)) differs from ∫₀^τ s·ḋ_L by δ·(ḋ_L(τ) − ḋ_L(0)) at most, the rate's drift over the
 * layer times δ: a few 10⁻⁴ of the thickness for a drift of some % and δ under 2 s. Only the
 * layer's first start is delayed: a paused layer's resumptions are taken as instant.
 */

/** Exposure time E(τ) (see above) at real time τ ≥ 0 since the layer's start, s. */
export function exposureTime(tauS: number, delayS: number): number {
  if (!(delayS > 0)) return tauS;
  if (tauS <= 0) return 0;
  return tauS < 2 * delayS ? (tauS * tauS) / (4 * delayS) : tauS - delayS;
}

/** The real time τ at which the exposure time is exposureS: E⁻¹ (τ = 2·√(δ·E) below E = δ). */
export function realTime(exposureS: number, delayS: number): number {
  if (!(delayS > 0)) return exposureS;
  if (exposureS <= 0) return exposureS;
  return exposureS < delayS ? 2 * Math.sqrt(delayS * exposureS) : exposureS + delayS;
}

/** E(τ) at every τ of tauS. */
export function exposureTimes(tauS: ArrayLike<number>, delayS: number): Float64Array {
  const out = new Float64Array(tauS.length);
  for (let i = 0; i < tauS.length; i++) out[i] = exposureTime(tauS[i], delayS);
  return out;
}

/** The onset s(τ) = ḋ/R: the fraction of the full rate reached at τ. */
export function onsetFraction(tauS: number, delayS: number): number {
  if (!(delayS > 0)) return tauS >= 0 ? 1 : 0;
  return tauS <= 0 ? 0 : Math.min(1, tauS / (2 * delayS));
}

/** The layer's samples with τ on the exposure clock of delay δ (the fit's clock; startDelayS tells how to go back). */
export function onExposureClock(samples: LayerSamples, delayS: number): LayerSamples {
  return delayS > 0 ? { ...samples, tauS: exposureTimes(samples.tauS, delayS), startDelayS: delayS } : samples;
}

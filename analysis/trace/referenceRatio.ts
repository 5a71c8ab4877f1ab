import { median } from './robustStats';

/**
 * A centred running mean of `values` over `windowS` seconds of `timeS` (strictly increasing):
 * each sample's mean over the samples within ±windowS/2 of it (fewer at the ends), by prefix
 * sums and two pointers, O(n). A boxcar smoother, common practice for a slow channel.
 */
export function runningMean(timeS: ArrayLike<number>, values: ArrayLike<number>, windowS: number): Float64Array {
  // (a hair wider than half the window: time stamps i·Δt in floating point then fall alike on both sides)
  const n = values.length, half = (windowS / 2) * (1 + 1e-9);
  const sums = new Float64Array(n + 1);
  for (let i = 0; i < n; i++) sums[i + 1] = sums[i] + values[i];
  const out = new Float64Array(n);
  let lo = 0, hi = 0;
  for (let i = 0; i < n; i++) {
    const t = timeS[i];
    while (timeS[lo] < t - half) lo++;
    if (hi < i + 1) hi = i + 1;
    while (hi < n && timeS[hi] <= t + half) hi++;
    out[i] = (sums[hi] - sums[lo]) / (hi - lo);
  }
  return out;
}

/**
 * The signal of a dual-beam monitor with the lamp divided out (`signal`), and the divisor (`lamp`,
 * the lamp relative to its run median, to put modelled readings back in detector units): signal ÷ (smoothed reference ÷ its
 * run median). The reference detector reads the lamp directly, so the ratio removes the lamp's
 * drift while keeping the signal's scale (the median's lamp); the reference is smoothed first
 * (runningMean) so that its own noise adds little to the signal's (white noise σ_r becomes about
 * σ_r/√(samples in the window)). A detector offset in the signal is divided too, by a factor that
 * stays within the lamp's drift of 1. Within half a window of either end the mean is one-sided:
 * a lamp drifting 1 %/h is then read off by up to (window/4)·1 %/h (1.4e-5 for 20 s).
 */
export function referenceRatio(timeS: ArrayLike<number>, signal: ArrayLike<number>, reference: ArrayLike<number>, windowS: number): { signal: Float64Array; lamp: Float64Array } {
  const lamp = runningMean(timeS, reference, windowS);
  const mid = median(lamp);
  const out = new Float64Array(signal.length);
  for (let i = 0; i < out.length; i++) {
    lamp[i] /= mid;
    out[i] = signal[i] / lamp[i];
  }
  return { signal: out, lamp };
}

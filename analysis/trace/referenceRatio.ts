import { median } from './robustStats';

/**
 * A centred running mean of `values` over `windowS` seconds of `timeS` (strictly increasing):
 * each sample's mean over the samples within ±windowS/2 of it (fewer at the ends), by prefix
 * sums and two pointers, O(n). A boxcar smoother, common practice for a slow channel.
 */
export function runningMean(timeS: ArrayLike<number>, values: ArrayLike<number>, windowS: number): Float64Array {
  return meanOverSpans(values, windowSpans(timeS, windowS));
}

/** Each sample's mean over its window [lo, hi), by prefix sums. */
function meanOverSpans(values: ArrayLike<number>, { lo, hi }: { lo: Int32Array; hi: Int32Array }): Float64Array {
  const n = values.length;
  const sums = new Float64Array(n + 1);
  for (let i = 0; i < n; i++) sums[i + 1] = sums[i] + values[i];
  const out = new Float64Array(n);
  for (let i = 0; i < n; i++) out[i] = (sums[hi[i]] - sums[lo[i]]) / (hi[i] - lo[i]);
  return out;
}

/** Each sample's centred window [lo, hi) over ±windowS/2 of its time, by two pointers. */
function windowSpans(timeS: ArrayLike<number>, windowS: number): { lo: Int32Array; hi: Int32Array } {
  // (a hair wider than half the window: time stamps i·Δt in floating point then fall alike on both sides)
  const n = timeS.length, half = (windowS / 2) * (1 + 1e-9);
  const los = new Int32Array(n), his = new Int32Array(n);
  let lo = 0, hi = 0;
  for (let i = 0; i < n; i++) {
    const t = timeS[i];
    while (timeS[lo] < t - half) lo++;
    if (hi < i + 1) hi = i + 1;
    while (hi < n && timeS[hi] <= t + half) hi++;
    los[i] = lo;
    his[i] = hi;
  }
  return { lo: los, hi: his };
}

/** Running-mean windows the reference may be smoothed over, s (a choice here: 20 s, the longest, was the fixed one). */
export const REFERENCE_WINDOWS_S = [0.5, 1, 2, 5, 10, 20] as const;

/**
 * The running-mean window for the reference, chosen among `windowsS` by Mallows' C_L (the
 * unbiased risk estimate of a linear smoother: C. L. Mallows, "Some comments on C_p",
 * Technometrics 15 (1973) 661–675; for smoothers, T. Hastie & R. Tibshirani, "Generalized
 * Additive Models" (1990), §3.4; both from memory): ‖r − S·r‖² − n·σ² + 2σ²·tr S, where tr S = Σ 1/nᵢ for a boxcar
 * of nᵢ samples. σ², the reference's white noise, from its lag-one differences (half their mean
 * square; a lamp that changes little between neighbouring samples adds little to them). A lamp
 * that only drifts keeps the longest window; one that also flickers faster (a mains ripple aliased
 * by the sampling into a slow beat) gets the window that follows it without letting much of the
 * reference's own noise through.
 */
export function referenceWindowS(timeS: ArrayLike<number>, reference: ArrayLike<number>, windowsS: readonly number[] = REFERENCE_WINDOWS_S): { windowS: number; risk: number[] } {
  const n = reference.length;
  let d2 = 0;
  for (let i = 1; i < n; i++) d2 += (reference[i] - reference[i - 1]) ** 2;
  const sigma2 = n > 1 ? d2 / (2 * (n - 1)) : 0;
  const risk = windowsS.map((w) => {
    // (the windows found once, for the mean and its trace alike)
    const spans = windowSpans(timeS, w);
    const m = meanOverSpans(reference, spans);
    const { lo, hi } = spans;
    let rss = 0, trace = 0;
    for (let i = 0; i < n; i++) {
      rss += (reference[i] - m[i]) ** 2;
      trace += 1 / (hi[i] - lo[i]);
    }
    return (rss - n * sigma2 + 2 * sigma2 * trace) / Math.max(n, 1);
  });
  let best = windowsS.length - 1;
  // ties (a reference with no noise) go to the longest window
  for (let k = windowsS.length - 2; k >= 0; k--) if (risk[k] < risk[best]) best = k;
  return { windowS: windowsS[best], risk };
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

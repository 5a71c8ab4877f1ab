import { exposureTime } from './startTransient';
import { binMeans } from './subsample';

/**
 * A layer's bin means on the exposure clock of any start delay δ (fit/startTransient.ts), the
 * bins cut once in real time: the same as binMeans(tauS, …, exposureTimes(tauS, δ)) for each δ,
 * without going over every sample per δ. E(τ) = τ − δ from τ = 2δ on, so a bin wholly past 2δ
 * has τ̄ − δ as its mean exposure time; only the bins that reach below 2δ are summed sample by
 * sample.
 */
export function binsOnExposureClocks(
  tauS: ArrayLike<number>, indices: ArrayLike<number>, signal: ArrayLike<number>, maxPoints: number,
): (delayS: number) => { tauS: Float64Array; y: Float64Array } {
  const n = tauS.length;
  if (n <= maxPoints) {
    const y = Float64Array.from({ length: n }, (_, i) => signal[indices[i]]);
    return (delayS) => ({ tauS: Float64Array.from({ length: n }, (_, i) => exposureTime(tauS[i], delayS)), y });
  }
  const real = binMeans(tauS, indices, signal, maxPoints);
  // Each kept bin's first sample and end (binMeans drops empty bins, keeping order).
  const t0 = tauS[0], span = tauS[n - 1] - t0 || 1;
  const first: number[] = [], end: number[] = [];
  binStarts(tauS, maxPoints, t0, span, first, end);
  end.push(n);
  return (delayS) => {
    const out = new Float64Array(real.tauS.length);
    for (let b = 0; b < out.length; b++) {
      if (!(delayS > 0) || tauS[first[b]] >= 2 * delayS) {
        out[b] = real.tauS[b] - (delayS > 0 ? delayS : 0);
        continue;
      }
      let sum = 0;
      for (let i = first[b]; i < end[b]; i++) sum += exposureTime(tauS[i], delayS);
      out[b] = sum / (end[b] - first[b]);
    }
    return { tauS: out, y: real.y };
  };
}

/**
 * Each bin's first sample into `first` and the ends of all but the last bin into `end`, the bins
 * those of binMeans (each sample's bin computed once; a function of its own so the engine
 * optimises the loop apart, with nothing after the loop: a call there, with no type feedback
 * when the loop was compiled on the stack, left that code on every later call).
 */
function binStarts(tauS: ArrayLike<number>, maxPoints: number, t0: number, span: number, first: number[], end: number[]): void {
  const n = tauS.length;
  let last = -1;
  for (let i = 0; i < n; i++) {
    const b = Math.min(maxPoints - 1, Math.floor(((tauS[i] - t0) / span) * maxPoints));
    if (i === 0 || b !== last) {
      if (i > 0) end.push(i);
      first.push(i);
    }
    last = b;
  }
}

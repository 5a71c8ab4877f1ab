/**
 * Indices of at most maxPoints samples in [start, end), spread uniformly in time (the sample
 * nearest each of maxPoints evenly spaced times; duplicates dropped). All indices when the
 * stretch has no more than maxPoints samples.
 */
export function subsampleUniform(timeS: ArrayLike<number>, start: number, end: number, maxPoints: number): Int32Array {
  const count = end - start;
  if (count <= 0) return new Int32Array(0);
  if (count <= maxPoints) return Int32Array.from({ length: count }, (_, i) => start + i);
  if (maxPoints < 2) return Int32Array.of(start);
  const out = new Int32Array(maxPoints);
  return out.slice(0, nearestSamples(timeS, start, end, out));
}

/** The loop of subsampleUniform, a function of its own so the engine optimises it apart: fills out, returns the count. */
function nearestSamples(timeS: ArrayLike<number>, start: number, end: number, out: Int32Array): number {
  const maxPoints = out.length;
  const t0 = timeS[start], t1 = timeS[end - 1];
  let k = 0, j = start, last = -1;
  for (let i = 0; i < maxPoints; i++) {
    const target = t0 + ((t1 - t0) * i) / (maxPoints - 1);
    while (j + 1 < end && Math.abs(timeS[j + 1] - target) <= Math.abs(timeS[j] - target)) j++;
    if (j !== last) out[k++] = j;
    last = j;
  }
  return k;
}

/**
 * At most maxPoints bin means of a layer's samples, bins equal in time: (τ̄, ȳ) per non-empty
 * bin. Unlike picking samples, averaging keeps the information of every sample (white noise
 * falls by √m in a bin of m), and the model at τ̄ differs from the bin's mean model only by
 * the curvature times the bin width² / 24 (midpoint rule), negligible for bins far shorter than a
 * fringe. All samples, unbinned, when there are no more than maxPoints. With valueTauS the bins
 * are still cut in tauS but each bin's τ̄ is the mean of valueTauS (another clock of the same
 * samples, e.g. fit/startTransient's exposure time), so fits on either clock see the same ȳ.
 */
export function binMeans(
  tauS: ArrayLike<number>, indices: ArrayLike<number>, signal: ArrayLike<number>, maxPoints: number, valueTauS: ArrayLike<number> = tauS,
): { tauS: Float64Array; y: Float64Array } {
  const n = tauS.length;
  if (n <= maxPoints) {
    return { tauS: Float64Array.from(valueTauS), y: Float64Array.from({ length: n }, (_, i) => signal[indices[i]]) };
  }
  const t0 = tauS[0], span = tauS[n - 1] - t0 || 1;
  const sumT = new Float64Array(maxPoints), sumY = new Float64Array(maxPoints), count = new Int32Array(maxPoints);
  binSums(tauS, indices, signal, maxPoints, valueTauS, t0, span, sumT, sumY, count);
  const k = binMeansInPlace(sumT, sumY, count);
  return { tauS: sumT.slice(0, k), y: sumY.slice(0, k) };
}

// binMeans's two loops in functions of their own: the engine compiled the first on the stack
// (on-stack replacement) before the second had run, and that code then left at the second's
// first comparison on every later call (dozens of times a run); the same sums.

/** Each sample's τ and reading summed into its bin, and counted. */
function binSums(
  tauS: ArrayLike<number>, indices: ArrayLike<number>, signal: ArrayLike<number>, maxPoints: number, valueTauS: ArrayLike<number>,
  t0: number, span: number, sumT: Float64Array, sumY: Float64Array, count: Int32Array,
): void {
  // A run of samples in one bin (in time order a bin's samples come in one run) summed in locals
  // and stored once, when a sample falls in another bin: the same bins and the same additions in
  // the same order as a store after every sample, at half its time (measured here: 10 → 6 ns a
  // sample, 20,000 samples into 100–400 bins). Nothing after the outer loop (code there, never
  // reached when the engine compiled the loop on the stack, would leave that code on every later
  // call).
  const n = tauS.length, last = maxPoints - 1;
  let i = 0;
  while (i < n) {
    const b = Math.min(last, Math.floor(((tauS[i] - t0) / span) * maxPoints));
    let t = sumT[b], y = sumY[b], c = count[b];
    let j = i;
    for (; j < n; j++) {
      if (Math.min(last, Math.floor(((tauS[j] - t0) / span) * maxPoints)) !== b) break;
      t += valueTauS[j];
      y += signal[indices[j]];
      c++;
    }
    sumT[b] = t;
    sumY[b] = y;
    count[b] = c;
    // (a τ of NaN has no bin: skipped, as a typed array ignores a store at NaN)
    i = j > i ? j : i + 1;
  }
}

/** The non-empty bins' means, packed to the front; returns how many. */
function binMeansInPlace(sumT: Float64Array, sumY: Float64Array, count: Int32Array): number {
  let k = 0;
  for (let b = 0; b < count.length; b++) {
    if (count[b] === 0) continue;
    sumT[k] = sumT[b] / count[b];
    sumY[k] = sumY[b] / count[b];
    k++;
  }
  return k;
}

/**
 * Shrinks a series for plotting: the samples are split into ⌊maxPoints / 2⌋ buckets and each
 * keeps its minimum and maximum, in time order, so peaks and spikes survive. A series of at
 * most maxPoints samples is returned as a copy.
 */
export function decimateMinMax(
  timeS: ArrayLike<number>,
  y: ArrayLike<number>,
  maxPoints: number,
): { timeS: Float64Array; y: Float64Array } {
  const n = y.length;
  if (timeS.length !== n) throw new RangeError(`decimateMinMax: timeS has ${timeS.length} samples but y has ${n}`);
  if (!Number.isInteger(maxPoints) || maxPoints < 2) throw new RangeError(`decimateMinMax: maxPoints must be an integer ≥ 2, got ${maxPoints}`);
  if (n <= maxPoints) return { timeS: Float64Array.from(timeS), y: Float64Array.from(y) };
  const buckets = Math.floor(maxPoints / 2);
  const outT = new Float64Array(2 * buckets);
  const outY = new Float64Array(2 * buckets);
  let w = 0;
  for (let b = 0; b < buckets; b++) {
    const start = Math.floor((b * n) / buckets);
    const end = Math.floor(((b + 1) * n) / buckets);
    let lo = start;
    let hi = start;
    for (let i = start + 1; i < end; i++) {
      // NaN never wins a comparison, so a bucket of gaps keeps its first sample
      if (y[i] < y[lo]) lo = i;
      if (y[i] > y[hi]) hi = i;
    }
    const first = Math.min(lo, hi);
    const second = Math.max(lo, hi);
    outT[w] = timeS[first];
    outY[w++] = y[first];
    if (second !== first) {
      outT[w] = timeS[second];
      outY[w++] = y[second];
    }
  }
  return { timeS: outT.slice(0, w), y: outY.slice(0, w) };
}

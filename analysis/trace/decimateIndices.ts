/**
 * Which samples of [from, to) to plot when there are too many: the stretch is split into
 * ⌊maxPoints / 3⌋ buckets and each keeps the sample of its lowest and highest y and, when
 * `also` is given (e.g. the residual), of its largest |also|, in order. Peaks, spikes and the
 * worst misfit survive; a stretch of at most maxPoints samples is returned whole.
 */
export function decimateIndices(y: ArrayLike<number>, from: number, to: number, maxPoints: number, also?: ArrayLike<number>): Int32Array {
  if (!Number.isInteger(from) || !Number.isInteger(to) || from < 0 || to > y.length || from > to) {
    throw new RangeError(`decimateIndices: [${from}, ${to}) is not a range of the ${y.length} samples`);
  }
  if (!Number.isInteger(maxPoints) || maxPoints < 3) throw new RangeError(`decimateIndices: maxPoints must be an integer ≥ 3, got ${maxPoints}`);
  if (also && also.length !== y.length) throw new RangeError(`decimateIndices: also has ${also.length} samples but y has ${y.length}`);
  const n = to - from;
  if (n <= maxPoints) return Int32Array.from({ length: n }, (_, i) => from + i);
  const buckets = Math.floor(maxPoints / 3);
  const out = new Int32Array(3 * buckets);
  let w = 0;
  for (let b = 0; b < buckets; b++) {
    const start = from + Math.floor((b * n) / buckets);
    const end = from + Math.floor(((b + 1) * n) / buckets);
    let lo = start, hi = start, worst = -1, worstAbs = -1;
    for (let i = start; i < end; i++) {
      // NaN never wins a comparison, so gaps are passed over
      if (y[i] < y[lo]) lo = i;
      if (y[i] > y[hi]) hi = i;
      if (also) {
        const a = Math.abs(also[i]);
        if (a > worstAbs) {
          worstAbs = a;
          worst = i;
        }
      }
    }
    const picked = [lo, hi, worst].filter((i) => i >= 0).sort((a, c) => a - c);
    for (let k = 0; k < picked.length; k++) if (k === 0 || picked[k] !== picked[k - 1]) out[w++] = picked[k];
  }
  return out.slice(0, w);
}

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
  const t0 = timeS[start], t1 = timeS[end - 1];
  const out = new Int32Array(maxPoints);
  let k = 0, j = start, last = -1;
  for (let i = 0; i < maxPoints; i++) {
    const target = t0 + ((t1 - t0) * i) / (maxPoints - 1);
    while (j + 1 < end && Math.abs(timeS[j + 1] - target) <= Math.abs(timeS[j] - target)) j++;
    if (j !== last) out[k++] = j;
    last = j;
  }
  return out.slice(0, k);
}

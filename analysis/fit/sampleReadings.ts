/**
 * A column's values at the samples `indices` (increasing), for another thread: where they are
 * consecutive and the column lies on shared memory (readTraceRows with a second thread), a view
 * of it, which that thread reads in place (neither gathered here nor copied into the message);
 * else a copy. Its readers only read it.
 */
export function sampleReadings(values: Float64Array, indices: Int32Array): Float64Array {
  const n = indices.length;
  if (n > 0 && values.buffer instanceof SharedArrayBuffer && indices[n - 1] - indices[0] === n - 1) return values.subarray(indices[0], indices[0] + n);
  const out = new Float64Array(n);
  for (let i = 0; i < n; i++) out[i] = values[indices[i]];
  return out;
}

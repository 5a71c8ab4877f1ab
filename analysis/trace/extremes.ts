// The largest and smallest of a typed array's first n values, each loop alone in its function:
// the engine compiles a hot loop on the stack during the first call, and an operation after the
// loop, never reached then, made the compiled code leave at it on every later call. NaN is
// passed over (a comparison with it is false).

/** Largest of a[0, n); −Infinity when n is 0. */
export function largest(a: Float64Array, n = a.length): number {
  let max = -Infinity;
  for (let i = 0; i < n; i++) if (a[i] > max) max = a[i];
  return max;
}

/** Smallest of a[0, n); Infinity when n is 0. */
export function smallest(a: Float64Array, n = a.length): number {
  let min = Infinity;
  for (let i = 0; i < n; i++) if (a[i] < min) min = a[i];
  return min;
}

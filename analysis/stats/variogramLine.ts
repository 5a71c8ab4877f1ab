/** ρ^k at each lag k: fitVariogramLine's x (a caller that fits the same lags and ρ again passes them in). */
export function powersAtLags(lags: readonly number[], rho: number): Float64Array {
  const logRho = rho > 0 ? Math.log(rho) : -Infinity;
  const x = new Float64Array(lags.length);
  for (let q = 0; q < lags.length; q++) x[q] = Math.exp(lags[q] * logRho);
  return x;
}

/**
 * Weighted least squares of the white + AR(1) variogram γ(k) = A − B·ρ^k in (A, B) at one ρ
 * (A = σ_w² + σ_x², B = σ_x²), with 0 ≤ B ≤ A: where the free solution breaks that, no AR(1) part
 * (γ flat) or no white part (γ = B·(1 − ρ^k)). Unit weights give ordinary least squares.
 */
export function fitVariogramLine(
  lags: readonly number[], gamma: readonly number[], w: readonly number[], rho: number, x: ArrayLike<number> = powersAtLags(lags, rho),
): { ssr: number; A: number; B: number } {
  const out = new Float64Array(3);
  fitVariogramLineInto(Float64Array.from(gamma), Float64Array.from(w), rho, Float64Array.from(x), out);
  return { ssr: out[0], A: out[1], B: out[2] };
}

/**
 * fitVariogramLine with (ssr, A, B) written into out[0..2]: for a search over a grid of ρ, which
 * would otherwise make an object (and its numbers) on the heap at every ρ of every fit. Its
 * series in Float64Arrays (the same numbers): plain arrays of numbers come as integers (unit
 * weights, ρ^k = 0 at ρ = 0) or as doubles, and each kind met after the engine had compiled the
 * loops for the other sent them back to the interpreter. γ at each lag, w and x alike.
 */
export function fitVariogramLineInto(gamma: Float64Array, w: Float64Array, rho: number, x: Float64Array, out: Float64Array): void {
  const lags = gamma.length;
  let s1 = 0, sx = 0, sxx = 0, sy = 0, sxy = 0;
  for (let q = 0; q < lags; q++) {
    s1 += w[q]; sx += w[q] * x[q]; sxx += w[q] * x[q] * x[q]; sy += w[q] * gamma[q]; sxy += w[q] * x[q] * gamma[q];
  }
  const det = s1 * sxx - sx * sx;
  let A: number, B: number;
  if (rho > 0 && det > 1e-12 * s1 * sxx) {
    A = (sy * sxx - sx * sxy) / det;
    B = -(s1 * sxy - sx * sy) / det;
  } else {
    A = sy / s1;
    B = 0;
  }
  if (B < 0) {
    // no AR(1) part: γ flat
    B = 0;
    A = sy / s1;
  } else if (B > A) {
    // no white part: γ = B·(1 − ρ^k)
    let num = 0, den = 0;
    for (let q = 0; q < lags; q++) {
      num += w[q] * gamma[q] * (1 - x[q]);
      den += w[q] * (1 - x[q]) ** 2;
    }
    A = B = den > 0 ? num / den : 0;
  }
  let ssr = 0;
  for (let q = 0; q < lags; q++) ssr += w[q] * (gamma[q] - (A - B * x[q])) ** 2;
  out[0] = ssr;
  out[1] = A;
  out[2] = B;
}

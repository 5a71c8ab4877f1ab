/** cos and sin of 2πk/n, k < n/2, per transform length (a run asks for a few lengths, many times). */
const twiddles = new Map<number, { cos: Float64Array; sin: Float64Array }>();

function twiddlesFor(n: number): { cos: Float64Array; sin: Float64Array } {
  let t = twiddles.get(n);
  if (!t) {
    const cos = new Float64Array(n / 2), sin = new Float64Array(n / 2);
    for (let k = 0; k < n / 2; k++) {
      cos[k] = Math.cos((2 * Math.PI * k) / n);
      sin[k] = Math.sin((2 * Math.PI * k) / n);
    }
    twiddles.set(n, (t = { cos, sin }));
  }
  return t;
}

/**
 * |X[k]|, k = 0 … N/2 − 1, of the DFT X[k] = Σ x_j·e^(−2πi·jk/N) of a real series of
 * power-of-two length N ≥ 4: the iterative radix-2 Cooley–Tukey transform (bit-reversal
 * permutation, then log₂N stages of butterflies; T. H. Cormen et al., "Introduction to
 * Algorithms", 3rd ed., MIT Press (2009), §30.3, ITERATIVE-FFT), on typed arrays with the
 * twiddle factors tabulated once per length, so a layer's spectrum costs no allocation per
 * butterfly.
 */
export function realFftMagnitude(x: ArrayLike<number>): Float64Array {
  const n = x.length;
  if (n < 4 || (n & (n - 1)) !== 0) throw new RangeError(`realFftMagnitude: length must be a power of two ≥ 4, got ${n}`);
  const re = new Float64Array(n), im = new Float64Array(n);
  bitReversed(x, re);
  butterflies(re, im, twiddlesFor(n));
  const mag = new Float64Array(n / 2);
  for (let k = 0; k < n / 2; k++) mag[k] = Math.hypot(re[k], im[k]);
  return mag;
}

/** out[rev(j)] = x[j], rev reversing the log₂N bits of j. */
function bitReversed(x: ArrayLike<number>, out: Float64Array): void {
  const n = out.length;
  for (let j = 0, r = 0; j < n; j++) {
    out[r] = x[j];
    // r ← rev(j + 1): add one from the top bit down
    let bit = n >> 1;
    while (r & bit) {
      r ^= bit;
      bit >>= 1;
    }
    r |= bit;
  }
}

/** The butterflies of every stage, in place: stage of span 2h combines pairs h apart with w = e^(−2πi·k/2h). */
function butterflies(re: Float64Array, im: Float64Array, t: { cos: Float64Array; sin: Float64Array }): void {
  const n = re.length;
  for (let h = 1; h < n; h <<= 1) {
    const stride = n / (2 * h);
    for (let start = 0; start < n; start += 2 * h) {
      for (let k = 0; k < h; k++) {
        const wr = t.cos[k * stride], wi = -t.sin[k * stride];
        const a = start + k, b = a + h;
        const xr = re[b] * wr - im[b] * wi, xi = re[b] * wi + im[b] * wr;
        re[b] = re[a] - xr;
        im[b] = im[a] - xi;
        re[a] += xr;
        im[a] += xi;
      }
    }
  }
}

/** A spectral peak as the side-lobe test reads it. */
export interface LobePeak {
  frequencyHz: number;
  amplitude: number;
}

/**
 * Upper envelope of the Hann window's side lobes at distance `bins` (unpadded DFT bins) from a
 * peak of the given amplitude: first side lobe −31.5 dB near 2.5 bins, decaying as 1/bins³
 * (Harris 1978, Proc. IEEE 66, 51, Table I: Hann, −31.5 dB, 18 dB/octave; values from memory).
 */
export function hannLeakage(amplitude: number, bins: number): number {
  return amplitude * 0.0266 * Math.min(1, (2.5 / bins) ** 3);
}

/**
 * The peaks (sorted by amplitude, largest first) that no larger one can hide in its side lobes:
 * p is hidden where some q with 3·0.0266·A_q > A_p has A_p < 3·hannLeakage(A_q, |f_p − f_q|/bin), bin the unpadded DFT bin (lobeHz).
 * The same test as over every larger peak, read only where it can hold: A_p < 3·0.0266·A_q·(2.5/b)³
 * needs b < 2.5·∛(3·0.0266·A_q/A_p), at most that with the largest A_q, so each peak looks only at
 * the peaks within that many bins of it (byFrequency: the same peaks by frequency, ascending).
 * A noise spectrum has thousands of local peaks, and the test over every larger one took most of
 * a layer's spectrum.
 */
export function peaksClearOfSideLobes<P extends LobePeak>(byAmplitude: readonly P[], byFrequency: readonly P[], lobeHz: number): P[] {
  const top = byAmplitude[0]?.amplitude ?? 0;
  const f = Float64Array.from(byFrequency, (p) => p.frequencyHz);
  return byAmplitude.filter((p) => {
    if (!(top * 3 * 0.0266 > p.amplitude)) return true;
    // (1 % and a tenth of a bin beyond the bound: rounding never leaves out a peak the test would read)
    const span = (2.5 * Math.cbrt((3 * 0.0266 * top) / p.amplitude) * 1.01 + 0.1) * lobeHz;
    let lo = 0, hi = f.length;
    while (lo < hi) {
      const mid = (lo + hi) >> 1;
      if (f[mid] < p.frequencyHz - span) lo = mid + 1;
      else hi = mid;
    }
    for (let j = lo; j < f.length && f[j] <= p.frequencyHz + span; j++) {
      const q = byFrequency[j];
      if (q.amplitude * 3 * 0.0266 > p.amplitude && p.amplitude < 3 * hannLeakage(q.amplitude, Math.abs(p.frequencyHz - q.frequencyHz) / lobeHz)) return false;
    }
    return true;
  });
}

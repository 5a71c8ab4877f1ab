import { peaksClearOfSideLobes } from './sideLobes';
import { realFftMagnitude } from './realFftMagnitude';
import { median, medianInPlace } from './robustStats';

export interface FringeSpectrumOptions {
  /** Largest FFT length (power of two); longer series are block-averaged first. @default 8192 */
  maxFftSize?: number;
  /** Zero-padding: the FFT length is the power of two ≥ padFactor × samples. @default 2 */
  padFactor?: number;
  /** Peaks below this are ignored (less than ~1.5 cycles in the record). @default 1.5 / duration */
  minFrequencyHz?: number;
  /** Peaks listed down to this fraction of the dominant amplitude. @default 0.05 */
  peakThreshold?: number;
  /** Most peaks listed. @default 8 */
  maxPeaks?: number;
  /** Disturbances are sought above this multiple of the fringe frequency. @default 3 */
  disturbanceMinRatio?: number;
  /** A disturbance must stand this many times above the median spectral amplitude. @default 10 */
  disturbanceSnr?: number;
  /** Mains frequencies whose aliases are recognised. @default [50, 60] */
  mainsHz?: number[];
}

export interface SpectrumPeak {
  frequencyHz: number;
  /** Amplitude of the equivalent sinusoid, in signal units. */
  amplitude: number;
  /** amplitude / dominant amplitude. */
  relative: number;
}

export interface Disturbance {
  frequencyHz: number;
  amplitude: number;
  note: string;
}

export interface FringeSpectrum {
  /** NaN when no peak stands above minFrequencyHz (e.g. a layer of under one fringe). */
  dominantFrequencyHz: number;
  dominantPeriodS: number;
  peaks: SpectrumPeak[];
  disturbances: Disturbance[];
  /** Sample rate of the series that was transformed (after any resampling and averaging). */
  sampleRateHz: number;
  /** Highest frequency examined (half of sampleRateHz). */
  nyquistHz: number;
  fftSize: number;
  binHz: number;
  /** Samples averaged into one before the transform. */
  blockSize: number;
  /** True when the input was not uniformly sampled and was interpolated onto a uniform grid. */
  resampled: boolean;
}

/**
 * Amplitude spectrum of a (segment of a) monitor trace: uniform resampling if needed, block
 * averaging to fit maxFftSize, linear detrend, Hann window, zero padding, a radix-2 FFT
 * (realFftMagnitude), and peaks
 * refined by a parabola through the log-amplitudes of the three top bins (common practice).
 * The dominant peak is the fringe frequency; narrow peaks well above it are reported as
 * periodic disturbances (substrate rotation, aliased mains).
 */
export function fringeSpectrum(timeS: ArrayLike<number>, y: ArrayLike<number>, options: FringeSpectrumOptions = {}): FringeSpectrum {
  const n = y.length;
  if (timeS.length !== n) throw new RangeError(`fringeSpectrum: timeS has ${timeS.length} samples but y has ${n}`);
  if (n < 8) throw new RangeError(`fringeSpectrum: needs at least 8 samples, got ${n}`);
  assertSeries(timeS, y);
  const maxFft = options.maxFftSize ?? 8192;
  const pad = options.padFactor ?? 2;
  if (!(maxFft >= 16) || (maxFft & (maxFft - 1)) !== 0) throw new RangeError(`fringeSpectrum: maxFftSize must be a power of two ≥ 16, got ${maxFft}`);
  if (!(pad >= 1)) throw new RangeError(`fringeSpectrum: padFactor must be ≥ 1, got ${pad}`);

  const { amp, dtS, block, m, size, sampleRateHz, binHz, resampled } = amplitudeSpectrum(timeS, y, maxFft, pad);
  const durationS = m * dtS * block;
  const kMin = Math.max(1, Math.ceil((options.minFrequencyHz ?? 1.5 / durationS) / binHz));

  // (in frequency order as found)
  const byFrequency = localPeaks(amp, kMin, binHz);
  const found = byFrequency.slice().sort((p, q) => q.amplitude - p.amplitude);
  const lobeHz = sampleRateHz / m;
  // only a peak ≥ 1 / (3 × 0.0266) ≈ 12.5 times larger can hide p in its side lobes
  const real = peaksClearOfSideLobes(found, byFrequency, lobeHz);
  const dom = real[0];
  const empty = { sampleRateHz, nyquistHz: sampleRateHz / 2, fftSize: size, binHz, blockSize: block, resampled };
  const scaleY = largestMagnitude(y);
  // a residual at rounding level (a straight line, a constant) has no fringe
  if (!dom || dom.amplitude <= 1e-10 * scaleY) return { dominantFrequencyHz: NaN, dominantPeriodS: NaN, peaks: [], disturbances: [], ...empty };
  for (const p of real) p.relative = p.amplitude / dom.amplitude;

  const threshold = options.peakThreshold ?? 0.05;
  const peaks = real
    .filter((p) => p.relative >= threshold)
    .slice(0, options.maxPeaks ?? 8)
    .map(({ frequencyHz, amplitude, relative }) => ({ frequencyHz, amplitude, relative }));

  const floor = median(amp.slice(kMin));
  const snr = options.disturbanceSnr ?? 10;
  const ratio = options.disturbanceMinRatio ?? 3;
  const narrowBins = 3 * (size / m);
  const rawRateHz = 1 / dtS;
  const disturbances = real
    .filter((p) => p.frequencyHz > ratio * dom.frequencyHz && p.amplitude >= snr * floor && p.widthBins <= narrowBins)
    .filter((p) => p.amplitude >= snr * localFloor(amp, p.frequencyHz / binHz, kMin, narrowBins))
    .filter((p) => !isHarmonic(p.frequencyHz, dom.frequencyHz, binHz))
    .map((p) => ({ frequencyHz: p.frequencyHz, amplitude: p.amplitude, note: describe(p, dom, rawRateHz, binHz, options.mainsHz ?? [50, 60]) }));

  return { dominantFrequencyHz: dom.frequencyHz, dominantPeriodS: 1 / dom.frequencyHz, peaks, disturbances, ...empty };
}

// Each loop sits in a small function of its own: the engine then optimises it with the feedback
// of that loop alone (a long function with several loops, called once per layer, was optimised
// mid-loop and thrown back at the next loop, call after call).

/**
 * The amplitude spectrum both readers share: uniform resampling if needed, block averaging to fit
 * maxFft, linear detrend, Hann window, zero padding to the power of two ≥ pad × samples, a radix-2
 * FFT; each bin as the amplitude of the equivalent sinusoid.
 */
function amplitudeSpectrum(timeS: ArrayLike<number>, y: ArrayLike<number>, maxFft: number, pad: number) {
  const { values, dtS, resampled } = uniform(timeS, y);
  const block = Math.max(1, Math.ceil((values.length * pad) / maxFft));
  const m = Math.floor(values.length / block);
  const x = blockMeans(values, block, m);
  detrend(x);
  const size = Math.min(maxFft, nextPow2(Math.ceil(m * pad)));
  const input = new Float64Array(size);
  const wSum = hannInto(x, input);
  const amp = amplitudes(realFftMagnitude(input), wSum);
  const sampleRateHz = 1 / (dtS * block);
  return { amp, dtS, block, m, size, sampleRateHz, binHz: sampleRateHz / size, resampled };
}

/**
 * The least a line must stand above its continuum, whatever the false-alarm count asks: the count
 * takes the bins as independent and Gaussian, which a short series' Hann-windowed bins and a fit's
 * misfit are not (a single layer's residuals, 1,450 samples: a 4.4× bump at 0.22 Hz on one seed of ten).
 */
const MIN_LINE_SNR = 5;

export interface SpectrumLinesOptions {
  /** Lines are sought from this frequency up (the caller's: e.g. well above a layer's own time scale). */
  minFrequencyHz: number;
  /** Largest FFT length (power of two); longer series are block-averaged first. @default 32768 */
  maxFftSize?: number;
  /** A line must stand this many times above its local continuum. @default from the false-alarm rate, at least MIN_LINE_SNR */
  snr?: number;
  /** The least amplitude reported, in the series' units. @default 0 */
  minAmplitude?: number;
  /** The chance, per series, that noise alone passes for a line (sets the default snr). @default 0.001 */
  falseAlarm?: number;
  /** Mains frequencies whose aliases are recognised. @default [50, 60] */
  mainsHz?: number[];
  /**
   * How far the mains frequency strays, a fraction: ±0.2 % (0.1 Hz at 50 Hz), the grid's usual
   * band (common practice; EN 50160 allows ±1 %, from memory). @default 0.002
   */
  mainsTolerance?: number;
  /** The rate the series was sampled at when logged, Hz (for the aliases; the series may be resampled). */
  rawRateHz: number;
}

export interface SpectrumLine {
  frequencyHz: number;
  /** Amplitude of the equivalent sinusoid, in the series' units. */
  amplitude: number;
  /** amplitude over the local continuum's median. */
  snr: number;
  /** What it may be: a mains harmonic's alias (which) or the holder's rotation, else a rotation or a vibration. */
  note: string;
}

/**
 * Narrow lines in a series with no carrier of its own (e.g. a run's residuals): local maxima of
 * the amplitude spectrum from minFrequencyHz up that stand `snr` times above the median of the
 * bins within an octave (the local continuum, as for a fringe spectrum's disturbances), at most
 * three padded bins per lobe wide; of lines within 10 % of each other in frequency only the
 * strongest (an amplitude-modulated line, e.g. a ripple on a varying level, spreads into
 * sidebands). The default snr follows from the false-alarm rate: a noise bin's amplitude is
 * Rayleigh-distributed, so it exceeds k times the median with probability 2^(−k²); with N
 * independent frequencies k² = log2(N / falseAlarm) (the periodogram's false-alarm test of
 * J. D. Scargle, ApJ 263, 835 (1982), in amplitude; from memory).
 */
export function spectrumLines(timeS: ArrayLike<number>, y: ArrayLike<number>, options: SpectrumLinesOptions): SpectrumLine[] {
  const n = y.length;
  if (timeS.length !== n) throw new RangeError(`spectrumLines: timeS has ${timeS.length} samples but y has ${n}`);
  if (n < 64) return [];
  assertSeries(timeS, y);
  const maxFft = options.maxFftSize ?? 32768;
  const { amp, m, size, binHz } = amplitudeSpectrum(timeS, y, maxFft, 2);
  const kMin = Math.max(1, Math.ceil(options.minFrequencyHz / binHz));
  if (kMin >= amp.length - 2) return [];
  const independent = Math.max(1, (amp.length - kMin) * (m / size));
  const snr = options.snr ?? Math.max(MIN_LINE_SNR, Math.sqrt(Math.log2(independent / (options.falseAlarm ?? 0.001))));
  const narrowBins = 3 * (size / m);
  const found = localPeaks(amp, kMin, binHz).sort((p, q) => q.amplitude - p.amplitude);
  const continuum = octaveContinuum(amp, kMin, narrowBins);
  const lines: SpectrumLine[] = [];
  for (const p of found) {
    if (p.amplitude < (options.minAmplitude ?? 0)) break;
    if (p.widthBins > narrowBins) continue;
    const floor = continuum(Math.round(p.frequencyHz / binHz));
    if (!(floor > 0) || p.amplitude < snr * floor) continue;
    if (lines.some((l) => Math.abs(l.frequencyHz - p.frequencyHz) <= 0.1 * l.frequencyHz)) continue;
    lines.push({ frequencyHz: p.frequencyHz, amplitude: p.amplitude, snr: p.amplitude / floor, note: lineSource(p.frequencyHz, options, binHz) });
  }
  return lines;
}

/**
 * Each bin's continuum, the median of the bins within an octave of it (localFloor), for every
 * peak of a long spectrum at little cost: exact where the octave holds few bins (there a line's
 * own bins weigh in the median and are left out), else interpolated in log k between exact
 * medians at bins 2^(1/8) apart, eight an octave (the median over an octave moves little
 * across an eighth of one, and a line's few bins among hundreds move it less).
 */
function octaveContinuum(amp: Float64Array, kMin: number, narrowBins: number): (k: number) => number {
  const top = amp.length - 1;
  const exactBelow = Math.max(kMin, Math.ceil(100 * narrowBins));
  const ks: number[] = [], medians: number[] = [];
  for (let k = exactBelow; ; k = Math.ceil(k * 2 ** (1 / 8))) {
    const at = Math.min(k, top);
    const lo = Math.max(kMin, Math.floor(at / 2)), hi = Math.min(top, Math.ceil(2 * at));
    ks.push(at);
    medians.push(medianInPlace(amp.slice(lo, hi + 1)));
    if (at >= top) break;
  }
  return (k) => {
    if (k < exactBelow || ks.length < 2) return localFloor(amp, k, kMin, narrowBins);
    let j = 1;
    while (j < ks.length - 1 && ks[j] < k) j++;
    const f = Math.min(1, Math.max(0, Math.log(k / ks[j - 1]) / Math.log(ks[j] / ks[j - 1])));
    return medians[j - 1] * (medians[j] / medians[j - 1]) ** f;
  };
}

/** A line's likely source: where the mains and its harmonics (within the mains' tolerance) fall at the logged rate, else rotation or vibration. */
function lineSource(f: number, o: SpectrumLinesOptions, binHz: number): string {
  const fs = o.rawRateHz, tol = o.mainsTolerance ?? 0.002;
  const alias = (x: number) => Math.abs(x - fs * Math.round(x / fs));
  const reaches = (centre: number) => {
    const span = centre * tol;
    // the aliases of every frequency the harmonic may take, on a grid finer than a bin
    const steps = Math.min(20000, Math.ceil((2 * span) / (binHz / 2)));
    for (let i = 0; i <= steps; i++) if (Math.abs(alias(centre - span + (2 * span * i) / steps) - f) <= 2 * binHz) return true;
    return false;
  };
  for (const mains of o.mainsHz ?? [50, 60]) {
    const hits = [1, 2, 3].map((h) => h * mains).filter(reaches);
    if (hits.length > 0) {
      const list = hits.length > 1 ? `${hits.slice(0, -1).join(', ')} or ${hits[hits.length - 1]}` : `${hits[0]}`;
      return `where ${list} Hz (the ${mains} Hz mains${hits.some((x) => x !== mains) ? ' and its harmonics' : ''}, within ±${+(tol * 100).toFixed(1)} %) ${hits.length > 1 ? 'fall' : 'falls'} when sampled at ${Number(fs.toPrecision(4))} Hz (a lamp's ripple the detection leaves?), or the holder's rotation`;
    }
  }
  return 'e.g. the holder\'s rotation or a vibration';
}

function assertSeries(timeS: ArrayLike<number>, y: ArrayLike<number>): void {
  for (let i = 0; i < y.length; i++) {
    if (!Number.isFinite(y[i]) || !Number.isFinite(timeS[i])) throw new RangeError(`fringeSpectrum: sample ${i} is not finite`);
    if (i > 0 && !(timeS[i] > timeS[i - 1])) throw new RangeError(`fringeSpectrum: timeS is not strictly increasing at sample ${i}`);
  }
}

/** Means of m consecutive blocks of `block` values. */
function blockMeans(values: Float64Array, block: number, m: number): Float64Array {
  const x = new Float64Array(m);
  for (let i = 0; i < m; i++) {
    let s = 0;
    for (let k = 0; k < block; k++) s += values[i * block + k];
    x[i] = s / block;
  }
  return x;
}

/** x times a Hann window over its length, into the start of out (the rest stays zero padding); returns Σ w. */
function hannInto(x: Float64Array, out: Float64Array): number {
  const m = x.length;
  let wSum = 0;
  for (let i = 0; i < m; i++) {
    const w = 0.5 * (1 - Math.cos((2 * Math.PI * i) / (m - 1)));
    wSum += w;
    out[i] = x[i] * w;
  }
  return wSum;
}

/** Amplitude of the equivalent sinusoid per bin: 2|X[k]| / Σ w. */
function amplitudes(mag: Float64Array, wSum: number): Float64Array {
  const amp = new Float64Array(mag.length);
  for (let k = 0; k < mag.length; k++) amp[k] = (2 * mag[k]) / wSum;
  return amp;
}

/** Local maxima from bin kMin on, each refined by a parabola through the log-amplitudes of its three bins. */
function localPeaks(amp: Float64Array, kMin: number, binHz: number): (SpectrumPeak & { widthBins: number })[] {
  const found: (SpectrumPeak & { widthBins: number })[] = [];
  for (let k = Math.max(kMin, 1); k < amp.length - 1; k++) {
    if (!(amp[k] > amp[k + 1] && amp[k] >= amp[k - 1]) || amp[k] === 0) continue;
    const a = Math.log(amp[k - 1] || Number.MIN_VALUE);
    const b = Math.log(amp[k]);
    const c = Math.log(amp[k + 1] || Number.MIN_VALUE);
    const den = a - 2 * b + c;
    const d = den < 0 ? Math.max(-0.5, Math.min(0.5, (0.5 * (a - c)) / den)) : 0;
    found.push({ frequencyHz: (k + d) * binHz, amplitude: Math.exp(b - 0.25 * (a - c) * d), relative: 0, widthBins: halfWidth(amp, k) });
  }
  return found;
}

function largestMagnitude(y: ArrayLike<number>): number {
  let v = 0;
  for (let i = 0; i < y.length; i++) v = Math.max(v, Math.abs(y[i]));
  return v;
}

function uniform(timeS: ArrayLike<number>, y: ArrayLike<number>): { values: Float64Array; dtS: number; resampled: boolean } {
  const steps = differences(timeS);
  // in place: only the multiset of steps matters below
  const dtS = medianInPlace(steps);
  if (allNear(steps, dtS, 0.01 * dtS)) return { values: Float64Array.from(y), dtS, resampled: false };
  return { values: resample(timeS, y, dtS), dtS, resampled: true };
}

function differences(t: ArrayLike<number>): Float64Array {
  const steps = new Float64Array(t.length - 1);
  for (let i = 1; i < t.length; i++) steps[i - 1] = t[i] - t[i - 1];
  return steps;
}

function allNear(v: Float64Array, to: number, within: number): boolean {
  for (let i = 0; i < v.length; i++) if (!(Math.abs(v[i] - to) <= within)) return false;
  return true;
}

/** y linearly interpolated onto a grid of step dtS from timeS[0] to the last time. */
function resample(timeS: ArrayLike<number>, y: ArrayLike<number>, dtS: number): Float64Array {
  const n = y.length;
  const t0 = timeS[0];
  const count = Math.floor((timeS[n - 1] - t0) / dtS) + 1;
  const values = new Float64Array(count);
  let j = 0;
  for (let i = 0; i < count; i++) {
    const t = t0 + i * dtS;
    while (j < n - 2 && timeS[j + 1] < t) j++;
    const f = (t - timeS[j]) / (timeS[j + 1] - timeS[j]);
    values[i] = y[j] + Math.min(1, Math.max(0, f)) * (y[j + 1] - y[j]);
  }
  return values;
}

function detrend(x: Float64Array): void {
  const m = x.length;
  const mid = (m - 1) / 2;
  let sx = 0;
  let sxx = 0;
  let sy = 0;
  for (let i = 0; i < m; i++) {
    sy += x[i];
    sx += (i - mid) * x[i];
    sxx += (i - mid) ** 2;
  }
  const mean = sy / m;
  const slope = sxx > 0 ? sx / sxx : 0;
  for (let i = 0; i < m; i++) x[i] -= mean + slope * (i - mid);
}

function nextPow2(v: number): number {
  let p = 16;
  while (p < v) p *= 2;
  return p;
}

/** Full width, in bins, where the peak stays above half its amplitude. */
function halfWidth(amp: Float64Array, k: number): number {
  const half = amp[k] / 2;
  let a = k;
  while (a > 0 && amp[a - 1] > half) a--;
  let b = k;
  while (b < amp.length - 1 && amp[b + 1] > half) b++;
  return b - a + 1;
}

/**
 * The median amplitude of the bins within an octave either side of bin k, the peak's own bins
 * left out. Correlated noise (a lock-in's, a rotating holder's) has a red spectrum: below its
 * corner frequency it stands far above the whole band's median, and its random bumps there
 * passed for periodic lines. A line is judged against the local continuum instead (the
 * approach of Vaughan 2005, A&A 431, 391, for periodicities in red noise; from memory).
 */
function localFloor(amp: Float64Array, k: number, kMin: number, narrowBins: number): number {
  const lo = Math.max(kMin, Math.floor(k / 2)), hi = Math.min(amp.length - 1, Math.ceil(2 * k));
  const values: number[] = [];
  for (let j = lo; j <= hi; j++) if (Math.abs(j - k) > narrowBins) values.push(amp[j]);
  return values.length === 0 ? 0 : medianInPlace(Float64Array.from(values));
}

/** Monitor fringes are not pure sinusoids: their low harmonics (up to the 6th) are expected, not disturbances. */
function isHarmonic(f: number, f0: number, binHz: number): boolean {
  const order = Math.round(f / f0);
  return order >= 2 && order <= 6 && Math.abs(f - order * f0) <= Math.max(3 * binHz, 0.05 * order * f0);
}

function describe(p: SpectrumPeak, dom: SpectrumPeak, rawRateHz: number, binHz: number, mainsHz: number[]): string {
  const pct = ((100 * p.amplitude) / dom.amplitude).toPrecision(2);
  const base = `periodic disturbance at ${p.frequencyHz.toPrecision(4)} Hz (period ${(1 / p.frequencyHz).toPrecision(4)} s), ${pct} % of the fringe amplitude`;
  for (const mains of mainsHz) {
    for (let harmonic = 1; harmonic <= 3; harmonic++) {
      const f = harmonic * mains;
      const alias = Math.abs(f - rawRateHz * Math.round(f / rawRateHz));
      if (alias > 0 && Math.abs(alias - p.frequencyHz) <= 2 * binHz) {
        return `${base}: matches ${f} Hz mains${harmonic > 1 ? ` (harmonic ${harmonic} of ${mains} Hz)` : ''} aliased by sampling at ${Number(rawRateHz.toPrecision(4))} Hz`;
      }
    }
  }
  return `${base}: e.g. substrate rotation or a vibration`;
}

/** What the chamber simulator adds to an ideal run; every effect is off unless switched on. */
export interface ChamberOptions {
  /** @default 1 */
  seed?: number;
  /** True sampling interval, s. @default 0.1 */
  sampleIntervalS?: number;
  /** `# key: value` lines of the trace. @default {} */
  meta?: Record<string, string>;
  /** Which optional columns to write (reference: only with the option reference). @default { layer: true, chip: true, reference: true } */
  columns?: { layer?: boolean; chip?: boolean; reference?: boolean };

  /** Detector gain (reading of a fraction 1.0) at t = 0. @default 1 */
  gain?: number;
  /** Lamp drift: linear gain change, fraction per hour. @default 0 */
  lampDriftPerHour?: number;
  /** Electronic offset of the detector (what dark samples read), in reading units. @default 0 */
  darkOffset?: number;
  /** Stray light reaching the detector, as a fraction of full scale (scales with the lamp). @default 0 */
  strayFraction?: number;
  /** Lamp-off (dark) samples before the first chip, s. @default 0 */
  darkS?: number;
  /**
   * A dual-beam monitor's reference detector, reading the lamp directly: its own gain times the
   * lamp's intensity (the drift of lampDriftPerHour), plus its own white noise (σ as a fraction of
   * its reading), independent of the signal's noise. Lamp-off samples (darkS) are not modelled
   * with it. @default none (no reference column)
   */
  reference?: { gain: number; whiteNoise: number };

  /**
   * The monitor's spectral bandwidth: FWHM (nm) of a triangular slit function (equal entrance and
   * exit slits) centred on the monitor wavelength, triangular in wavelength. Each sample is the
   * slit-weighted mean of R or T over the band, the lamp's spectrum and the detector's response
   * taken as flat across it (band.ts: Gauss–Legendre, 3 nodes on each half). Turning-point cuts
   * are made on that averaged curve; level cuts' trigger stays the design's single-wavelength
   * value. The truth (thickness, index at the monitor wavelength) is unchanged by it.
   * @default none (the monitor wavelength alone)
   */
  bandwidthNm?: number;

  /**
   * A ripple on the lamp's intensity that the detection leaves (a lamp on mains-derived power
   * ripples at twice the mains frequency; a lock-in or a DC supply removes most of it): relative
   * amplitude and frequency. Sampled at each reading's true time, so at the log's sample interval
   * it aliases to a slow beat (100.05 Hz read every 0.1 s: a 20 s period). A reference column sees
   * the same ripple. @default none
   */
  lampRipple?: {
    fraction: number;
    frequencyHz: number;
    /**
     * The mains frequency wanders (a grid holds 50 Hz within about ±0.05 Hz, drifting over
     * minutes; from memory): the ripple's frequency about frequencyHz as an Ornstein–Uhlenbeck process of this
     * σ (Hz, at the ripple: twice the mains') and correlation time, its phase the integral.
     */
    frequencyWander?: { sigmaHz: number; correlationS: number };
  };
  /**
   * A detector chain that reads low toward the top of its range: each reading v becomes
   * v·(1 − β·v/gain), β this value (0.005: 0.5 % low at full scale). Applied before the noise. @default 0
   */
  nonlinearity?: number;

  /** White noise σ, fraction of full scale. @default 0.0005 */
  whiteNoise?: number;
  /** Correlated noise (AR(1), exact discretisation of Ornstein–Uhlenbeck): σ as a fraction of full scale, correlation time. @default none */
  correlatedNoise?: { fraction: number; correlationS: number };
  /** Short spikes (spits, arcs): how often, how large (fraction of full scale), how many samples. @default none */
  spikes?: { perMinute: number; amplitude: [number, number]; maxSamples: number };
  /** Time-stamp jitter: the logged time is the true one ± up to this fraction of the interval (uniform). @default 0 */
  jitterFraction?: number;

  /** Mean rate per material (nm/s); others get defaultRateNmPerS. @default {} */
  rateNmPerS?: Record<string, number>;
  /** @default 0.3 */
  defaultRateNmPerS?: number;
  /** Layer-to-layer rate scatter (σ, fraction). @default 0.02 */
  rateScatter?: number;
  /** Rate ramp as the shutter opens: r·(1 − e^(−t/τ)), τ in s. @default 0 (instant) */
  rampS?: number;
  /** Linear rate change over each layer, as a fraction of its rate over the layer's nominal duration. @default 0 */
  rateDriftFraction?: number;
  /** Rate jumps: ×factor for durationS, from atFraction of the layer's nominal duration. @default [] */
  rateSpikes?: { layer: number; atFraction: number; durationS: number; factor: number }[];
  /** Rate wandering within a layer (OU, σ as a fraction of the rate, correlation time). @default none */
  rateWander?: { fraction: number; correlationS: number };

  /** Constant index deviation per material. @default {} */
  indexOffset?: Record<string, number>;
  /** Index drift across the run per material, per hour. @default {} */
  indexDriftPerHour?: Record<string, number>;
  /** Index change from the start to the end of each layer (graded film), per material. @default {} */
  indexWithinLayer?: Record<string, number>;
  /** Random index deviation per layer (σ). @default 0 */
  indexScatter?: number;

  /** Turning-point cuts: overshoot past the true turning point, % of the layer (mean, σ; never negative). @default { meanPct: 0, sigmaPct: 0 } */
  turningPointOvershoot?: { meanPct: number; sigmaPct: number };
  /** Level cuts: the controller's reaction time after the true signal crosses the trigger level, s (uniform range). @default [0, 0] */
  levelLatencyS?: [number, number];
  /** Extra thickness per layer from the operator's cut (overshoot), fraction, by layer number. @default {} */
  overshoot?: Record<number, number>;
  /** Growth after the logged cut: the shutter takes this long to close (uniform range, s); the rate falls linearly to 0. @default [0, 0] */
  shutterCloseS?: [number, number];

  /** Bare-chip stretch before each chip's first layer, s. @default 20 */
  bareChipS?: number;
  /** Idle time between layers on a chip, s. @default 3 */
  settleS?: number;
  /** A chip change shows the old chip's last level for oldLevelS, then a dark transient, then the bare new chip. @default none (the bare chip at once) */
  chipChange?: { oldLevelS: [number, number]; darkS: [number, number] };

  /** crystal_nm column: the crystal reads physical thickness / tooling (per material) during a layer, 0 when idle. @default none */
  tooling?: Record<string, number>;
}

export interface LayerTruth {
  layer: number;
  material: string;
  chip: number;
  wavelengthNm: number;
  mode: 'R' | 'T';
  /** Deposited physical thickness (with the growth after the logged cut). */
  thicknessNm: number;
  designThicknessNm: number;
  /** Mean (thickness-weighted) real index at the monitor wavelength. */
  index: number;
  /** The design material's index at the monitor wavelength. */
  nominalIndex: number;
  /** (n̄·d − n_design·d_design)/(λ/4)·100 at the monitor wavelength (shared/FORMATS.md). */
  cutErrorQwotPct: number;
  /** Design optical thickness in quarter-waves at the monitor wavelength. */
  qwotAtMonitor: number;
  /** Mean rate over the logged layer (thickness at the logged cut / logged duration). */
  rateNmPerS: number;
  /** Logged time of the layer's first and last samples. */
  startTimeS: number;
  endTimeS: number;
  /** Thickness grown after the logged cut while the shutter closed. */
  afterCutNm: number;
  shutterCloseS: number;
  /** Index at the layer's start and end (graded film). */
  indexStart: number;
  indexEnd: number;
}

export interface ChipTruth {
  chip: number;
  /** Detector gain when the chip's first layer starts. */
  gain: number;
  /** Reading with no light from the chip: dark offset + stray light, when its first layer starts. */
  offset: number;
  /** Logged time when the bare chip is first in the beam. */
  bareFromS: number;
}

export interface ChamberRun {
  meta: Record<string, string>;
  columns: { layer: boolean; chip: boolean; crystal: boolean; reference: boolean };
  /** Logged time (with jitter). */
  timeS: Float64Array;
  signal: Float64Array;
  /** Noise-free optical response (fraction) at each sample's true time. */
  fraction: Float64Array;
  layer: Int32Array;
  chip: Int32Array;
  crystalNm: Float64Array | null;
  /** The reference detector's reading (option reference), else null. */
  reference: Float64Array | null;
  sampleIntervalS: number;
  truth: { layers: LayerTruth[]; chips: ChipTruth[] };
}

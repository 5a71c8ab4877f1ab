import { fromNK } from '../optics';
import { fitLayers } from './fitLayers';
import { type FitLayerData, type LayerParams } from './layerModel';
import { startValues } from './startValues';

export interface OffsetFitInput {
  /** The chip's first layers in deposition order, gain unset (heldGain is set here per candidate). */
  layers: FitLayerData[];
  /** Bare-chip reading B (detector units) and the modelled bare signal M₀: gain = (B − offset)/M₀. */
  bareLevel: number;
  modelledBare: number;
  /** Where to start, detector units (an earlier chip's offset, or 0). */
  startOffset: number;
  /** Design rate guess of each layer, nm/s. */
  rateGuess: number[];
  /**
   * Factor on the profile's σ for noise correlated between fit points (√ of the integrated
   * autocorrelation time of the residuals). @default from the fit's own residuals
   */
  correlationFactor?: number;
  /**
   * σ of the bare reading B: with it the gain is fitted (one for the chip) under B's prior
   * (B − o)/M₀ ± σ_B/M₀ at each trial offset, instead of tied to it.
   */
  bareSigma?: number;
}

export interface OffsetFit {
  offset: number;
  /** 1σ from the curvature of the profile sum of squares, Δχ² = 1 with s² from the best fit. */
  sigma: number;
  /** Sum of squares at the offset found. */
  ssr: number;
  /** Residual RMS there, detector units. */
  residualRms: number;
  evaluations: number;
  /** The chip's gain at the offset found, and its σ with the offset's (B's prior and the layers'). */
  gain: number;
  gainSigma: number;
  /** dG/do along the profile (−1/M₀ with the gain tied to B). */
  gainSlope: number;
  /** Fit points over their correlation time (the factor² on σ): the independent readings the profile rests on. */
  effectivePoints: number;
}

/** Largest offset searched, as a fraction of the full-scale reading B/M₀ either side of the start. */
const SEARCH_FRACTION = 0.05;
/** First scan step, as a fraction of the full-scale reading. */
const SCAN_STEP = 0.004;

/**
 * The detector offset (stray light) of a chip with no dark samples, by profiling: for each trial
 * offset o the gain is tied to the bare-chip reading, g = (B − o)/M₀, and the chip's first layers
 * are fitted jointly (index, rate); the sum of squares against o is a parabola near its minimum
 * (profile likelihood: W. H. Press et al., Numerical Recipes, 3rd ed., §15.6, from memory), whose
 * vertex is the offset and whose curvature gives σ: σ² = 2s²/SSR''. The layers' growth shape
 * (turning-point levels against the bare level, and each layer starting where the one below
 * ended) is what separates offset from gain and index.
 *
 * With bareSigma the gain is not tied but fitted, one for the chip, under the bare reading's
 * Gaussian prior (B − o)/M₀ ± σ_B/M₀ as one more observation (C. M. Bishop, Pattern Recognition
 * and Machine Learning (2006), §3.3, from memory), weighed against the fit points by their σ
 * with its correlation time (fit/gainDriftPrior.ts driftPriorWeight): where the layers pin the
 * gain down (reflectance: a bare chip reading a few % of full scale), the offset takes up the
 * bare reading's error and the gain does not; the gain's σ is its own at the offset found with
 * the offset's through the profile's slope dG/do, Var G = Var(G | o) + (dG/do)²·σ_o².
 *
 * The profile is first scanned outward from the start in steps of 0.4 % of full scale, each
 * trial fit started from its neighbour's solution (a far trial from a fixed start does not
 * converge, and the profile then has no shape), then refined by parabolas on the best three.
 */
export function fitChipOffset(input: OffsetFitInput): OffsetFit {
  const { layers, bareLevel: B, modelledBare: M0 } = input;
  const gainAt = (o: number) => (B - o) / M0;
  const fullScale = Math.abs(B / M0);
  const o0 = input.startOffset;
  const starts: LayerParams[] = [];
  const below: ReturnType<typeof layerEnd>[] = [];
  layers.forEach((l, j) => {
    const sv = startValues({
      optics: l.optics, below, extinction: l.extinction, tauS: l.tauS, y: l.y, offsetSignal: o0,
      index: l.heldIndex ?? l.nominalAt(l.optics.wavelengthNm).re, searchIndex: l.heldIndex === null, gain: gainAt(o0), rateGuessNmPerS: input.rateGuess[j],
    });
    const p = { index: sv.index, rateNmPerS: sv.rateNmPerS, rateDriftNmPerS2: 0, gain: gainAt(o0) };
    starts.push(p);
    below.push(layerEnd(l, p));
  });
  let evaluations = 0;
  interface Point { o: number; ssr: number; dof: number; rms: number; params: LayerParams[]; correlation: number; gain: number; gainSigma: number }
  /** σ of a fit point as the covariance counts it (√τ·s), once known; 0 while the gain is tied. */
  let pointNoise = 0;
  const evaluated: Point[] = [];
  const profile = (o: number, from: LayerParams[]): Point => {
    evaluations++;
    const g = gainAt(o);
    const free = pointNoise > 0 && (input.bareSigma ?? 0) > 0;
    const data = layers.map((l) => ({ ...l, heldGain: g }));
    // (a free gain starts from the neighbour's, the tied one at B's)
    const sharedGain = free ? { sharedGain: { gain: from[0].gain, driftPerS: 0, fitDrift: false, gainPrior: { mean: g, sigma: input.bareSigma! / Math.abs(M0), noiseSigma: pointNoise } } } : {};
    const fit = fitLayers({ fixedBelow: [], layers: data, start: from.map((s) => ({ ...s, gain: free ? s.gain : g })), offsetSignal: o, ...sharedGain }, { maxIterations: 20 });
    const correlation = fit.layers.reduce((a, l) => a + l.noiseCorrelation, 0) / Math.max(fit.layers.length, 1);
    const gain = fit.sharedGain?.gain ?? g;
    const point = { o, ssr: fit.solver.ssr, dof: fit.solver.dof, rms: fit.solver.residualRms, params: fit.layers.map((l) => ({ ...l, gain })), correlation, gain, gainSigma: fit.sharedGain?.gainSigma ?? 0 };
    evaluated.push(point);
    return point;
  };
  // Scan outward both ways, chaining starts, until the profile has risen twice in a row.
  const step = SCAN_STEP * fullScale, reach = SEARCH_FRACTION * fullScale;
  let centre = profile(o0, starts);
  if ((input.bareSigma ?? 0) > 0) {
    // the tied fit's points' σ (with their correlation time) weighs B's prior against them
    pointNoise = Math.sqrt((centre.ssr / Math.max(centre.dof, 1)) * Math.max(centre.correlation, 1));
    evaluated.length = 0;
    centre = profile(o0, centre.params);
  }
  const points: Point[] = [centre];
  for (const dir of [-1, 1]) {
    let prev = centre, rises = 0;
    for (let k = 1; k * step <= reach && rises < 2; k++) {
      const p = profile(o0 + dir * k * step, prev.params);
      points.push(p);
      rises = p.ssr > prev.ssr ? rises + 1 : 0;
      prev = p;
    }
  }
  points.sort((a, b) => a.o - b.o);
  let best = points.reduce((a, p) => (p.ssr < a.ssr ? p : a));
  // Refine: parabolas through the best and its neighbours at ±h, started from the best's solution,
  // h shrinking by 3 a pass (a wide parabola misplaces the vertex of an asymmetric profile) until
  // it is within the offset's own σ.
  let h = step, curvature = NaN;
  for (let pass = 0; pass < 5; pass++) {
    const mid = profile(best.o, best.params);
    const lo = profile(best.o - h, mid.params), hi = profile(best.o + h, mid.params);
    curvature = (lo.ssr - 2 * mid.ssr + hi.ssr) / (h * h);
    if (!(curvature > 0)) break;
    const shift = (-0.5 * (hi.ssr - lo.ssr)) / (h * curvature);
    const at = profile(best.o + Math.max(-h, Math.min(h, shift)), mid.params);
    best = [lo, mid, hi, at].reduce((a, p) => (p.ssr < a.ssr ? p : a));
    const sigma = Math.sqrt((2 * mid.ssr) / Math.max(mid.dof, 1) / curvature);
    if (h < sigma && Math.abs(shift) < h) break;
    h /= 3;
  }
  const s2 = best.ssr / Math.max(best.dof, 1);
  const factor = input.correlationFactor ?? Math.sqrt(Math.max(best.correlation, 1));
  const sigma = curvature > 0 ? factor * Math.sqrt((2 * s2) / curvature) : Infinity;
  // A minimum at the edge of the search is no minimum.
  const edge = Math.abs(best.o - o0) >= reach - 1e-12;
  // the gain's σ: its own at the offset found, and the offset's through dG/do (the profile's slope)
  const near = evaluated.filter((p) => p !== best && Math.abs(p.o - best.o) > 0).sort((a, b) => Math.abs(a.o - best.o) - Math.abs(b.o - best.o))[0];
  const slope = near ? (near.gain - best.gain) / (near.o - best.o) : -1 / M0;
  const gainSigma = Math.hypot(best.gainSigma, slope * sigma);
  const effectivePoints = layers.reduce((a, l) => a + l.tauS.length, 0) / (factor * factor);
  return { effectivePoints, offset: best.o, sigma: edge ? Infinity : sigma, ssr: best.ssr, residualRms: best.rms, evaluations, gain: best.gain, gainSigma: edge ? Infinity : gainSigma, gainSlope: slope };
}

function layerEnd(l: FitLayerData, p: LayerParams) {
  return { n: fromNK(p.index, l.extinction), thicknessNm: p.rateNmPerS * l.durationS };
}

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
  interface Point { o: number; ssr: number; dof: number; rms: number; params: LayerParams[]; correlation: number }
  const profile = (o: number, from: LayerParams[]): Point => {
    evaluations++;
    const g = gainAt(o);
    const data = layers.map((l) => ({ ...l, heldGain: g }));
    const fit = fitLayers({ fixedBelow: [], layers: data, start: from.map((s) => ({ ...s, gain: g })), offsetSignal: o }, { maxIterations: 20 });
    const correlation = fit.layers.reduce((a, l) => a + l.noiseCorrelation, 0) / Math.max(fit.layers.length, 1);
    return { o, ssr: fit.solver.ssr, dof: fit.solver.dof, rms: fit.solver.residualRms, params: fit.layers, correlation };
  };
  // Scan outward both ways, chaining starts, until the profile has risen twice in a row.
  const step = SCAN_STEP * fullScale, reach = SEARCH_FRACTION * fullScale;
  const centre = profile(o0, starts);
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
  return { offset: best.o, sigma: edge ? Infinity : sigma, ssr: best.ssr, residualRms: best.rms, evaluations };
}

function layerEnd(l: FitLayerData, p: LayerParams) {
  return { n: fromNK(p.index, l.extinction), thicknessNm: p.rateNmPerS * l.durationS };
}

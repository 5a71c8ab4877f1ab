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

/**
 * The detector offset (stray light) of a chip with no dark samples, by profiling: for each trial
 * offset o the gain is tied to the bare-chip reading, g = (B − o)/M₀, and the chip's first layers
 * are fitted jointly (index, rate); the sum of squares against o is a parabola near its minimum
 * (profile likelihood: W. H. Press et al., Numerical Recipes, 3rd ed., §15.6, from memory), whose
 * vertex is the offset and whose curvature gives σ: σ² = 2s²/SSR''. The layers' growth shape
 * (turning-point levels against the bare level) is what separates offset from gain and index.
 */
export function fitChipOffset(input: OffsetFitInput): OffsetFit {
  const { layers, bareLevel: B, modelledBare: M0 } = input;
  const gainAt = (o: number) => (B - o) / M0;
  // Start values once, at the start offset: sequential coarse grids layer by layer.
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
  const profile = (o: number): { ssr: number; dof: number; rms: number } => {
    evaluations++;
    const g = gainAt(o);
    const data = layers.map((l) => ({ ...l, heldGain: g }));
    // Every trial from the same start, so the profile is a function of o alone (not of the path).
    const fit = fitLayers({ fixedBelow: [], layers: data, start: starts.map((s) => ({ ...s, gain: g })), offsetSignal: o }, { maxIterations: 10 });
    return { ssr: fit.solver.ssr, dof: fit.solver.dof, rms: fit.solver.residualRms };
  };
  // Step: 1 % of the bare reading; two parabola passes, the second centred on the first vertex.
  let h = 0.01 * Math.abs(B);
  let centre = o0;
  let vertex = o0, curvature = 0, best = profile(o0);
  for (let pass = 0; pass < 3; pass++) {
    const mid = pass === 0 ? best : profile(centre);
    const lo = profile(centre - h), hi = profile(centre + h);
    curvature = (lo.ssr - 2 * mid.ssr + hi.ssr) / (h * h);
    if (!(curvature > 0)) {
      // No minimum in reach: step downhill and try again.
      centre += lo.ssr < hi.ssr ? -2 * h : 2 * h;
      best = mid;
      continue;
    }
    vertex = centre - (0.5 * (hi.ssr - lo.ssr)) / (h * curvature);
    // Keep the vertex within a bare reading's half either side (a far vertex is extrapolation).
    vertex = Math.min(Math.max(vertex, centre - 0.5 * Math.abs(B)), centre + 0.5 * Math.abs(B));
    if (Math.abs(vertex - centre) < 0.25 * h) break;
    centre = vertex;
    h *= 0.5;
  }
  const at = profile(vertex);
  const s2 = at.ssr / Math.max(at.dof, 1);
  return { offset: vertex, sigma: curvature > 0 ? Math.sqrt((2 * s2) / curvature) : Infinity, ssr: at.ssr, residualRms: at.rms, evaluations };
}

function layerEnd(l: FitLayerData, p: LayerParams) {
  return { n: fromNK(p.index, l.extinction), thicknessNm: p.rateNmPerS * l.durationS };
}

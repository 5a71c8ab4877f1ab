// The Cramér–Rao bound of each layer of a simulated run, given the true stack below it: the
// signal is the chamber simulator's own optics (thinFilm.ts), nothing from analysis/.
import { type ChamberDesign, dispersion } from '../design';
import { type ChamberOptions, type ChamberRun, type LayerTruth } from '../options';
import { layerMatrix, mul, response, stackMatrices, type FilmLayer, type Media } from '../thinFilm';
import { fisherInformation, invert, quadratic, type Ar1WhiteNoise } from './cramerRao';

export interface LayerBoundOptions {
  /**
   * The gain's information besides the layer's own samples: 'free' (none), 'known' (held at the
   * truth), or a Gaussian prior of this σ as a fraction of the gain (the analysis's sequential
   * per-layer gain has gainPriorFraction 0.005). @default 'free'
   */
  gain?: 'free' | 'known' | number;
  /** Free rate drift a in d = r·τ + a·τ²/2. @default true */
  rateDrift?: boolean;
}

export interface LayerBound {
  layer: number;
  samples: number;
  thicknessNm: number;
  /** σ_CRB of the end thickness d = r·τ_end + a·τ_end²/2, nm, and of n and of n·d (nm). */
  thicknessSigmaNm: number;
  indexSigma: number;
  opticalSigmaNm: number;
  /** σ_CRB of the cut error, % QWOT: σ(n·d)/(λ/4)·100. */
  cutSigmaQwotPct: number;
}

/** The simulator's detector noise as σ_w, σ_x (fractions of full scale) and ρ per sample. */
export function detectorNoise(options: ChamberOptions): Ar1WhiteNoise {
  const dt = options.sampleIntervalS ?? 0.1, fullScale = options.gain ?? 1;
  const c = options.correlatedNoise;
  return {
    whiteSigma: fullScale * (options.whiteNoise ?? 0.0005),
    ar1Sigma: c ? fullScale * c.fraction : 0,
    rho: c ? Math.exp(-dt / c.correlationS) : 0,
  };
}

function media(design: ChamberDesign, wavelengthNm: number): Media {
  return {
    ambient: design.ambient ? dispersion(design.ambient, wavelengthNm).n : 1,
    substrate: dispersion(design.substrate, wavelengthNm).n,
    backside: design.substrateBackside,
  };
}

/** One layer's noise-free reading as a function of θ = (n, r, a, G), at its samples τ_i = i·Δt. */
export interface LayerSignalModel {
  samples: number;
  tauEndS: number;
  /** Thickness at the last logged sample (the growth after the cut, if any, taken as known). */
  endNm: number;
  /** The truth (a = 0: the simulator's rate is constant where nothing wanders). */
  theta: number[];
  /** Central-difference steps per parameter. */
  steps: number[];
  signal: (theta: readonly number[]) => Float64Array;
}

/**
 * G·T(d(τ_i)) (or R) with d = r·τ + a·τ²/2 on the stack below as deposited (each earlier layer
 * on the chip homogeneous at its true mean index: exact where the simulator grades no index).
 */
export function layerSignalModel(design: ChamberDesign, options: ChamberOptions, run: ChamberRun, truth: LayerTruth): LayerSignalModel {
  const dt = run.sampleIntervalS;
  let samples = 0;
  for (let i = 0; i < run.layer.length; i++) if (run.layer[i] === truth.layer) samples++;
  const below: FilmLayer[] = run.truth.layers
    .filter((l) => l.chip === truth.chip && l.layer < truth.layer)
    .map((l) => ({ n: l.index, k: dispersion(design.materials[l.material], truth.wavelengthNm).k, thicknessNm: l.thicknessNm }));
  const wl = truth.wavelengthNm, k = dispersion(design.materials[truth.material], wl).k;
  const m = media(design, wl), stack = stackMatrices(below, wl);
  const tauEndS = (samples - 1) * dt;
  const endNm = truth.thicknessNm - truth.afterCutNm;
  const rate = endNm / tauEndS;
  const gain = 1 + ((options.lampDriftPerHour ?? 0) * truth.startTimeS) / 3600;
  const fullScale = options.gain ?? 1;
  const signal = ([n, r, a, g]: readonly number[]) => {
    const out = new Float64Array(samples);
    const lm = new Float64Array(8), f = new Float64Array(8), rv = new Float64Array(8);
    for (let i = 0; i < samples; i++) {
      const tau = i * dt;
      layerMatrix(n, k, r * tau + 0.5 * a * tau * tau, wl, lm);
      mul(lm, stack.forward, f);
      mul(stack.reverse, lm, rv);
      const x = response(f, rv, m);
      out[i] = fullScale * g * (truth.mode === 'R' ? x.R : x.T);
    }
    return out;
  };
  return { samples, tauEndS, endNm, theta: [truth.index, rate, 0, gain], steps: [1e-4, 1e-4 * rate, (1e-4 * rate) / tauEndS, 1e-4], signal };
}

/** ∂s/∂θ_p by central differences, for the parameters `free`. */
export function jacobianColumns(model: LayerSignalModel, free: readonly number[], at: readonly number[] = model.theta): Float64Array[] {
  return free.map((p) => {
    const up = [...at], down = [...at];
    up[p] += model.steps[p];
    down[p] -= model.steps[p];
    const a = model.signal(up), b = model.signal(down);
    return a.map((v, i) => (v - b[i]) / (2 * model.steps[p]));
  });
}

/** The bound for one layer: Fisher information of (n, r, a, G) from the layer's own samples, CRB = F⁻¹. */
export function layerBound(design: ChamberDesign, options: ChamberOptions, run: ChamberRun, truth: LayerTruth, o: LayerBoundOptions = {}): LayerBound {
  const model = layerSignalModel(design, options, run, truth);
  const { tauEndS: tauEnd, endNm, samples } = model;
  const gain = model.theta[3];
  const gainMode = o.gain ?? 'free', drift = o.rateDrift ?? true;
  const free = [0, 1, ...(drift ? [2] : []), ...(gainMode === 'known' ? [] : [3])];
  const fisher = fisherInformation(jacobianColumns(model, free), detectorNoise(options));
  if (typeof gainMode === 'number') {
    const g = free.indexOf(3);
    fisher[g][g] += 1 / (gainMode * gain) ** 2;
  }
  const crb = invert(fisher);
  // d = r·τ + a·τ²/2 and n·d: their gradients in the free parameters (the delta method)
  const gradD = free.map((p) => (p === 1 ? tauEnd : p === 2 ? 0.5 * tauEnd * tauEnd : 0));
  const gradND = free.map((p) => (p === 0 ? endNm : p === 1 ? truth.index * tauEnd : p === 2 ? 0.5 * truth.index * tauEnd * tauEnd : 0));
  const opticalSigmaNm = Math.sqrt(quadratic(crb, gradND));
  return {
    layer: truth.layer, samples, thicknessNm: truth.thicknessNm,
    thicknessSigmaNm: Math.sqrt(quadratic(crb, gradD)), indexSigma: Math.sqrt(crb[0][0]), opticalSigmaNm,
    cutSigmaQwotPct: (opticalSigmaNm / (truth.wavelengthNm / 4)) * 100,
  };
}

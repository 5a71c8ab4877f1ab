import { type LayerAt } from '../optics';
import { fitLayers } from './fitLayers';
import { growthFromNext } from './growthFromNext';
import { type FitLayerData, type LayerParams } from './layerModel';
import { START_DELAY_GRID_S, type StartDelayProfile } from './startDelay';

/** One layer of a chip's chain in the start delay's profile (fit/startDelay.ts), in the order deposited. */
export interface StartDelayChainLayer {
  /** The layer's fit data at delay δ (its samples on δ's exposure clock where the fits put them there, else on real time). */
  dataAt: (delayS: number) => FitLayerData;
  /** Its fit in the pass (at δ = 0): where each fit starts, and what the stack's entries are shifted from. */
  start: LayerParams;
  /** Its time from start to the last logged sample in real time, s (dataAt(δ)'s durationS is this on δ's clock: where its thickness in the stack is read). */
  loggedS: number;
  /**
   * The stack under it as the pass held it (the chip's layers below, each with its growth as held
   * then): at each δ each of those entries is moved by what its own refit at δ moved it.
   */
  below: readonly LayerAt[];
  offsetSignal: number;
  gainPrior?: { fraction: number; noiseSigma: number };
  /** Its χ² counts in the profile (a turning-point cut with its index fitted). */
  profiled: boolean;
  /** The growth held in `below` after the cut of the layer below and the rate it grew at, where this layer's start tells it. */
  growthBelow?: { heldNm: number; rateNmPerS: number };
}

/**
 * The profiles of a chip's layers in the start delay with the stack under each fitted at the
 * same δ. Each layer's fit at δ stands on its layers below as they fit at δ: a layer's end
 * thickness moves with δ (its rate and drift take up the start-up where it is not modelled), and
 * the next layer's start reads that move as a slope, as it would read a delay. Profiled on the
 * pass's own stack (fitted at δ = 0), every layer above a chip's first read δ high: on the
 * chamber simulator's mirror with only its 1.5 s ramp, 1.8–4.3 s (the chips' first layers
 * 1.48–1.53 s); each on a stack refitted at its own δ, 1.34–1.55 s
 * (tests/chamber/__tests__/startTransient.test.ts).
 *
 * χ² is in units of the layer's residual variance (times its residuals' autocorrelation time)
 * at its best δ on the grid, the noise the fit leaves where the model fits best: at δ = 0, the
 * unit the profiles had before, the start-up's own misfit weighed the layers that show it most
 * the least. The growth below's Gauss–Newton step and σ (growthFromNext) at each δ, on the
 * stack at that δ and in the same unit.
 */
export function chainedStartDelayProfiles(chain: readonly StartDelayChainLayer[]): (StartDelayProfile | null)[] {
  const m = START_DELAY_GRID_S.length, L = chain.length;
  // each layer's parameters at each δ (null where its fit failed) and, for profiled layers, its fit's figures
  const params: (LayerParams | null)[][] = chain.map(() => new Array<LayerParams | null>(m).fill(null));
  const ssr = chain.map(() => new Float64Array(m).fill(NaN));
  const unitAt = chain.map(() => new Float64Array(m).fill(NaN));
  const step = chain.map(() => new Float64Array(m).fill(NaN));
  const sigma1 = chain.map(() => new Float64Array(m).fill(NaN));
  const points = new Int32Array(L);
  /** The entry of layer i in a stack, moved from the pass's by its refit at δ (thickness at its logged end, index). */
  const moved = (i: number, entry: LayerAt, k: number, data: FitLayerData): LayerAt | null => {
    const p = params[i][k];
    if (!p) return null;
    const s0 = chain[i].start;
    // (dataAt(δ) puts the logged end on the samples' clock)
    const e = data.durationS;
    const dNow = p.rateNmPerS * e + (p.rateDriftNmPerS2 * e * e) / 2;
    const dPass = s0.rateNmPerS * chain[i].loggedS + (s0.rateDriftNmPerS2 * chain[i].loggedS ** 2) / 2;
    return { ...entry, n: { re: entry.n.re + (p.index - s0.index), im: entry.n.im }, thicknessNm: entry.thicknessNm + (dNow - dPass) };
  };
  for (let k = 0; k < m; k++) {
    const delayS = START_DELAY_GRID_S[k];
    const dataK = chain.map((c) => c.dataAt(delayS));
    for (let j = 0; j < L; j++) {
      const c = chain[j];
      // the chip's layers below are the last entries of `below`, in the chain's order
      const first = c.below.length - j;
      let below: LayerAt[] | null = c.below.slice();
      for (let i = Math.max(0, -first); i < j && below; i++) {
        const at = moved(i, c.below[first + i], k, dataK[i]);
        if (at) below[first + i] = at;
        else below = null;
      }
      if (!below) continue;
      const data = dataK[j];
      const from = k > 0 && params[j][k - 1] ? { ...params[j][k - 1]!, gain: c.start.gain } : c.start;
      const fit = fitLayers({ fixedBelow: below, layers: [data], start: [from], offsetSignal: c.offsetSignal, ...(c.gainPrior ? { gainPrior: c.gainPrior } : {}) }, { maxIterations: 30 });
      if (!Number.isFinite(fit.solver.ssr)) continue;
      params[j][k] = fit.layers[0];
      if (!c.profiled) continue;
      ssr[j][k] = fit.solver.ssr;
      unitAt[j][k] = (fit.solver.ssr / Math.max(fit.solver.dof, 1)) * Math.max(1, fit.layers[0].noiseCorrelation);
      points[j] = data.tauS.length;
      if (c.growthBelow && below.length > 0) {
        const w = c.gainPrior && data.heldGain === null ? c.gainPrior.noiseSigma / (c.gainPrior.fraction * Math.abs(c.start.gain)) : 0;
        const g = growthFromNext({ below, layer: data, params: fit.solver.params, offsetSignal: c.offsetSignal, gainPriorWeight: w, residualVariance: 1, noiseCorrelation: 1 });
        if (g && g.sigmaNm > 0 && Number.isFinite(g.deltaNm)) {
          step[j][k] = g.deltaNm;
          sigma1[j][k] = g.sigmaNm;
        }
      }
    }
  }
  return chain.map((c, j) => {
    if (!c.profiled || !ssr[j].every(Number.isFinite)) return null;
    let best = 0;
    for (let k = 1; k < m; k++) if (ssr[j][k] < ssr[j][best]) best = k;
    const unit = unitAt[j][best];
    if (!(unit > 0)) return null;
    const chi2 = Float64Array.from(ssr[j], (s) => (s - ssr[j][0]) / unit);
    const linked = c.growthBelow && c.below.length > 0;
    if (linked && !(step[j].every(Number.isFinite) && sigma1[j].every(Number.isFinite))) return null;
    return {
      chi2, points: points[j],
      ...(linked ? { growth: { ...c.growthBelow!, stepNm: Float64Array.from(step[j]), sigmaNm: Float64Array.from(sigma1[j], (s) => s * Math.sqrt(unit)) } } : {}),
    };
  });
}

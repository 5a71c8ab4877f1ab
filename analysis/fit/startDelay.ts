import { type LayerAt } from '../optics';
import { fitLayers } from './fitLayers';
import { growthFromNext } from './growthFromNext';
import { type FitLayerData, type LayerParams } from './layerModel';
import { MAX_SHUTTER_S } from './layerEnds';

/**
 * The start delays δ (fit/startTransient.ts) at which each layer's fit is profiled, s: 0 to 3 s
 * in steps of 0.5 s, the pooled minimum placed by a parabola through the three grid points about
 * it (χ² is near quadratic in δ over a step: measured on the chamber simulator's 40-layer run,
 * δ̂ and σ moved by under a tenth of σ against a 0.25 s grid).
 */
export const START_DELAY_GRID_S: readonly number[] = Array.from({ length: 7 }, (_, i) => 0.5 * i);

/**
 * Fit points (bin means) per layer in the profile: χ² differences need the fringe's shape, not
 * every sample. Measured against 100 on the bench's 40-layer run and 8 chamber runs (REAL_CHAMBER,
 * 18 and 40 layers, ramp 1.5 s): δ̂ moved by at most 0.26 σ (bench 1.253 ± 0.374 →
 * 1.307 ± 0.405 s), RMS (δ̂ − 1.5 s)/σ 1.06 → 1.08, largest |z| 2.24 → 2.32.
 */
export const PROFILE_POINTS = 50;

export interface StartDelayProfileInput {
  /** The stack under the layer at its wavelength (the layer below with its growth as held so far). */
  below: readonly LayerAt[];
  /** The layer's fit data with its samples on the exposure clock of delay δ (bins cut in real time, so ȳ is the same for every δ). */
  dataAt: (delayS: number) => FitLayerData;
  /** Where each fit starts (the layer's fit at δ = 0). */
  start: LayerParams;
  offsetSignal: number;
  gainPrior?: { fraction: number; noiseSigma: number };
  /**
   * The growth after the cut of the layer below, where this layer's start tells it (a
   * turning-point cut): the growth held in `below` and the rate it grew at. Near an extremum a
   * start delay and a growth below both act first as a slope at the start, so each layer's
   * profile carries its growth's likelihood, for the run's shutter time to be profiled with δ.
   */
  growthBelow?: { heldNm: number; rateNmPerS: number };
}

/**
 * One layer's χ²(δ) − χ²(0) on START_DELAY_GRID_S (on the stack below as held) and the number
 * of its fit points; with a growth below, at each δ the growth's Gauss–Newton step from the
 * held stack and its σ (the χ² is then that minimum plus ((g − step)/σ)² for an added growth g).
 */
export interface StartDelayProfile {
  chi2: Float64Array;
  points: number;
  growth?: { heldNm: number; rateNmPerS: number; stepNm: Float64Array; sigmaNm: Float64Array };
}

/**
 * One layer's profile of χ² in the start delay: at each δ on the grid the layer's own parameters
 * refitted, the sum of squares in units of the δ = 0 fit's residual variance times its
 * residuals' autocorrelation time (white-equivalent χ² under correlated noise), and the growth
 * below as growthFromNext reads it at that δ. Null when a fit fails.
 */
export function startDelayProfile(input: StartDelayProfileInput): StartDelayProfile | null {
  const { below, offsetSignal } = input;
  const m = START_DELAY_GRID_S.length;
  const chi = new Float64Array(m), stepNm = new Float64Array(m), sigmaNm = new Float64Array(m);
  let unit = NaN, points = 0;
  // Each δ's fit starts from the previous δ's (a step of δ moves the parameters little); the gain
  // starts where the prior is centred (the prior's centre is the start gain).
  let from: LayerParams = input.start;
  for (let k = 0; k < m; k++) {
    const data = input.dataAt(START_DELAY_GRID_S[k]);
    const fit = fitLayers({ fixedBelow: below, layers: [data], start: [from], offsetSignal, ...(input.gainPrior ? { gainPrior: input.gainPrior } : {}) }, { maxIterations: 30 });
    if (!Number.isFinite(fit.solver.ssr)) return null;
    if (k === 0) unit = (fit.solver.ssr / Math.max(fit.solver.dof, 1)) * Math.max(1, fit.layers[0].noiseCorrelation);
    if (!(unit > 0)) return null;
    points = data.tauS.length;
    chi[k] = fit.solver.ssr / unit;
    from = { ...fit.layers[0], gain: input.start.gain };
    if (input.growthBelow && below.length > 0) {
      const c = input.gainPrior && data.heldGain === null ? input.gainPrior.noiseSigma / (input.gainPrior.fraction * Math.abs(input.start.gain)) : 0;
      const g = growthFromNext({ below, layer: data, params: fit.solver.params, offsetSignal, gainPriorWeight: c, residualVariance: unit, noiseCorrelation: 1 });
      if (!g || !(g.sigmaNm > 0) || !Number.isFinite(g.deltaNm)) return null;
      stepNm[k] = g.deltaNm;
      sigmaNm[k] = g.sigmaNm;
    }
  }
  for (let k = m - 1; k >= 0; k--) chi[k] -= chi[0];
  return { chi2: chi, points, ...(input.growthBelow && below.length > 0 ? { growth: { ...input.growthBelow, stepNm, sigmaNm } } : {}) };
}

export interface PooledStartDelay {
  delayS: number;
  sigmaS: number;
  /** The run's growth after a turning-point cut as a time at the full rate, profiled with δ (at δ̂), s. */
  shutterS: number | null;
  /** χ²(0) − χ²(δ̂) of the pooled profile. */
  gainChi2: number;
  layers: number;
  /** The margin the gain in χ² must clear: Schwarz's criterion for one parameter, ln N over the profiles' N fit points. */
  marginChi2: number;
  /**
   * The layers' disagreement beyond their own profiles at δ̂ (the Birge ratio, ≥ 1): the factor by
   * which their χ² understate the scatter (a rate wander no layer's law follows, a misfit).
   */
  dispersion: number;
  /** Kept over no delay: δ̂ past the grid's first step and gainChi2 / dispersion > marginChi2 (the gain judged on the scatter the layers show, as quasi-likelihood does). */
  kept: boolean;
}

/**
 * Each layer's χ² at every grid δ with the run's shutter time t profiled out: a growth below
 * of r_below·t (t ∈ [0, MAX_SHUTTER_S], shared by the run: each start alone cannot tell its
 * growth from a delay) adds ((r·t − held − step)/σ)² − (step/σ)² to a layer's χ². The t that
 * minimises the sum is closed-form (weighted least squares in one variable, clipped).
 */
export function withShutterProfiled(layers: readonly StartDelayProfile[]): { curves: Float64Array[]; shutterS: Float64Array | null } {
  const m = START_DELAY_GRID_S.length;
  const curves = layers.map((l) => Float64Array.from(l.chi2));
  const linked = layers.filter((l) => l.growth);
  if (linked.length === 0) return { curves, shutterS: null };
  const shutterS = new Float64Array(m);
  for (let k = 0; k < m; k++) {
    let num = 0, den = 0;
    for (const l of linked) {
      const g = l.growth!, w = 1 / g.sigmaNm[k] ** 2;
      num += g.rateNmPerS * (g.heldNm + g.stepNm[k]) * w;
      den += g.rateNmPerS ** 2 * w;
    }
    shutterS[k] = Math.min(Math.max(num / den, 0), MAX_SHUTTER_S);
  }
  layers.forEach((l, j) => {
    if (!l.growth) return;
    const g = l.growth;
    for (let k = 0; k < m; k++) {
      const s = g.sigmaNm[k], step = g.stepNm[k], added = g.rateNmPerS * shutterS[k] - g.heldNm;
      curves[j][k] += ((added - step) / s) ** 2 - (step / s) ** 2;
    }
  });
  const base = curves.map((c) => c[0]);
  curves.forEach((c, j) => c.forEach((_, k) => (c[k] -= base[j])));
  return { curves, shutterS };
}

/**
 * The run's start delay from the layers' profiles (the shutter time profiled with it): their
 * sum's minimum (a parabola through the grid's three points about it), σ from its curvature (χ²
 * rises by 1 at ±σ), widened by the Birge ratio when the layers disagree more than their own
 * profiles allow (a delay or a shutter time that differs per material or per layer), and no
 * smaller than the delete-one-layer jackknife's σ (B. Efron and C. Stein, "The jackknife
 * estimate of variance", Ann. Statist. 9, 586–596 (1981); from memory): the curvature takes
 * each layer's χ² as exact, and the chamber simulator's runs put δ̂ 2–3 σ from the truth
 * (RMS z 1.25 over 16 runs of 18 and 40 layers, ramp 1.5 s), where the jackknife, which sees
 * the layers' actual scatter, gave RMS z 1.0. Null without profiles.
 */
export function pooledStartDelay(layers: readonly StartDelayProfile[]): PooledStartDelay | null {
  const all = poolProfiles(layers);
  if (!all) return null;
  let sigmaS = all.sigmaS;
  const L = layers.length;
  if (L >= 3 && Number.isFinite(sigmaS)) {
    const left = layers.map((_, i) => poolProfiles(layers.filter((__, j) => j !== i))?.delayS ?? NaN);
    if (left.every(Number.isFinite)) {
      const mean = left.reduce((a, b) => a + b, 0) / L;
      const jackknife = Math.sqrt(((L - 1) / L) * left.reduce((a, b) => a + (b - mean) ** 2, 0));
      sigmaS = Math.max(sigmaS, jackknife);
    }
  }
  return { ...all, sigmaS, kept: all.kept && Number.isFinite(sigmaS) };
}

/**
 * The parabola through `values` at grid points c − 1, c and c + 1 (START_DELAY_GRID_S, equal steps
 * h): its vertex, its curvature (a − 2b + d)/h², and its value at x (three-point parabolic
 * interpolation, e.g. W. H. Press et al., Numerical Recipes, 3rd ed., §10.3, from memory).
 */
export function gridParabola(values: ArrayLike<number>, c: number): { vertexS: number; curvature: number; valueAt: (x: number) => number } {
  const grid = START_DELAY_GRID_S, h = grid[1] - grid[0];
  const [a, b, d] = [values[c - 1], values[c], values[c + 1]];
  return {
    vertexS: grid[c] + (h * (a - d)) / (2 * (a - 2 * b + d)),
    curvature: (a - 2 * b + d) / (h * h),
    valueAt: (x) => {
      const u = (x - grid[c]) / h;
      return b + 0.5 * u * (d - a) + 0.5 * u * u * (a - 2 * b + d);
    },
  };
}

/** pooledStartDelay with σ from the curvature and the Birge ratio only. */
function poolProfiles(layers: readonly StartDelayProfile[]): PooledStartDelay | null {
  if (layers.length === 0) return null;
  const { curves: profiles, shutterS } = withShutterProfiled(layers);
  const grid = START_DELAY_GRID_S, m = grid.length, h = grid[1] - grid[0];
  const total = new Float64Array(m);
  for (const p of profiles) for (let k = 0; k < m; k++) total[k] += p[k];
  let k = 0;
  for (let i = 1; i < m; i++) if (total[i] < total[k]) k = i;
  const c = Math.min(Math.max(k, 1), m - 2);
  const parabola = gridParabola(total, c);
  const curvature = parabola.curvature;
  let delayS = grid[k], minChi = total[k];
  // With the pooled minimum on the grid's first point no delay is placed inside the first step:
  // profiles on stacks refitted at each δ (fit/startDelayChain.ts) can rise from 0 faster than a
  // parabola, whose vertex through 0, 0.5 and 1 s then fell inside the first step below every
  // layer's own minimum (a synthetic reflectance run with no delay, each layer's minimum at 0:
  // 0.12 ± 0.05 s kept on a χ² "gain" of 1600).
  if (curvature > 0 && k > 0) {
    delayS = Math.min(Math.max(parabola.vertexS, 0), grid[m - 1]);
    minChi = parabola.valueAt(delayS);
  }
  // Consistency: each layer's excess over its own minimum at the pooled grid point.
  let q = 0;
  for (const p of profiles) q += p[k] - Math.min(...p);
  const birge = profiles.length > 1 ? Math.max(1, q / (profiles.length - 1)) : 1;
  const sigmaS = curvature > 0 ? Math.sqrt((2 / curvature) * birge) : Infinity;
  const gainChi2 = total[0] - minChi;
  const marginChi2 = Math.log(layers.reduce((acc, l) => acc + l.points, 0));
  // A vertex inside the first step (0 < δ̂ < h) is not kept either: there the grid has the
  // profile at 0 and h only, and the parabola's value between them is the shape the first step
  // does not resolve (above). On the chamber simulator without a ramp the stray light's misfit at
  // each start put it there ('R monitoring with an offset', seeds 52 and 56: 0.27 ± 0.09 and
  // 0.34 ± 0.06 s, kept on gains of 53 and 94), while the real ramp's runs read 1.1–2.1 s.
  // (Its root mean square about 0 is carried into the layers' σ instead: unresolvedDelaySigma.)
  return {
    delayS, sigmaS, shutterS: shutterS ? shutterS[k] : null, gainChi2, marginChi2, layers: profiles.length, dispersion: birge,
    kept: delayS >= h && gainChi2 / birge > marginChi2 && Number.isFinite(sigmaS),
  };
}

/**
 * The start delay's σ to carry into the layers where the pooled delay is not kept only because
 * the grid does not resolve it: δ̂ inside the first step (0 < δ̂ < h) on a gain that clears the
 * margin on the layers' own scatter, so Schwarz's criterion chooses a delay that the analysis,
 * fitting the layers at δ = 0, does not hold. Holding 0 errs by the data's δ, whose mean square
 * about 0 under the pooled profile is δ̂² + σ_δ²: its root is carried as a kept delay's σ is
 * (fit/startDelaySigma.ts, the fits moved from the clock of 0 to that of σ_0). On the chamber
 * simulator's R run with stray light and no ramp (seed 52: 0.27 ± 0.09 s, the stray light's
 * misfit at the chip's first starts) layer 2's index, 0.0020 off, stood at 3.7σ with nothing
 * carried, 2.2σ with this. 0 elsewhere: a delay kept carries its own σ, and one that does not
 * clear the margin is not chosen (its Schwarz weight carried instead, exp(−ΔBIC/2), widened
 * σ_d on the correlated-noise mirror with spikes by about 5 % where its errors did not call for
 * it: σ over the Cramér–Rao bound, median over seeds 15–18, 1.48 → 1.55 in refit, 2.10 → 2.19
 * in sequential).
 */
export function unresolvedDelaySigma(p: PooledStartDelay): number {
  const firstStep = START_DELAY_GRID_S[1];
  const chosen = p.delayS > 0 && p.delayS < firstStep && p.gainChi2 / p.dispersion > p.marginChi2;
  return !p.kept && chosen && Number.isFinite(p.sigmaS) ? Math.hypot(p.delayS, p.sigmaS) : 0;
}

/**
 * The start delay's σ to carry into the level cuts of a run cut on level only, where the chips'
 * pooled delay (fit/jointStartDelay.ts) is not applied (not kept, or option levelStartTransient
 * off): the layers are fitted at δ = 0, so the δ the profile allows, its root mean square about 0,
 * √(δ̂² + σ_δ²) (the second moment of N(δ̂, σ_δ²) about 0). A profile with no curvature (σ_δ not
 * finite) gives δ̂ alone. 0 for a delay that does not lie past 0.
 */
export function unresolvedLevelDelaySigma(p: PooledStartDelay): number {
  if (!(p.delayS > 0)) return 0;
  return Number.isFinite(p.sigmaS) ? Math.hypot(p.delayS, p.sigmaS) : p.delayS;
}

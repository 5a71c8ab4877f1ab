import { fitLayers, type LayerEstimate, type SharedGain } from './fitLayers';
import { type FitLayerData } from './layerModel';
import { pooledStartDelay, START_DELAY_GRID_S, type PooledStartDelay, type StartDelayProfile } from './startDelay';
import { exposureTime } from './startTransient';

/**
 * A chip's start delay δ (fit/startTransient.ts) profiled in its joint fit, with the chip-wide
 * gain and its drift under the lamp's prior (fit/gainDriftPrior.ts) refitted at every δ: for runs
 * cut on level, where fit/startDelay.ts's layer-by-layer profiles find little. There each layer's
 * fit holds the gain drift, and on a level cut a slow start and a lamp drifting down both bend
 * the start of the curve the same way: on the chamber simulator's four-layer AR (one chip, lamp
 * −1 %/h, ramp 1.5 s) the layers' profiles came out flat on one seed and 1.95 ± 0.73 s on the
 * other, while the drift fitted at δ = 0 read the ramp as −0.9 %/h of drift of its own. Refitted
 * together on the same bin means, the two separate: the joint χ²(δ) is smooth with one minimum
 * (δ̂ 1.25, 2.0, 1.0, 0.6, 2.0, 1.75 s on six seeds), and at δ = 1.5 s held the drift came back as
 * −0.95 ± 0.31 and −0.89 ± 0.34 %/h.
 */
export interface JointStartDelayInput {
  /** The chip's layers as its joint fit takes them, on real time (δ = 0), each with its samples to re-bin. */
  layers: readonly FitLayerData[];
  /** Per layer: the bin means of its samples on the exposure clock of δ, the bins cut in real time (fit/profileBins.ts). */
  binsAt: readonly ((delayS: number) => { tauS: Float64Array; y: Float64Array })[];
  /** Per layer: whether it is fitted on the exposure clock (the others stay on real time). */
  onClock: readonly boolean[];
  /** Where the fits start: the chip's joint fit at δ = 0. */
  start: readonly LayerEstimate[];
  offsetSignal: number;
  /** The chip-wide gain with its drift free under its prior (as the joint fit at δ = 0 ended). */
  sharedGain: SharedGain;
  robust?: boolean;
}

/** A chip's profile, with the gain drift γ fitted at each δ of the grid (per second) and its σ. */
export interface JointStartDelayProfile extends StartDelayProfile {
  driftPerS: Float64Array;
  driftSigmaPerS: Float64Array;
}

/**
 * The chip's χ²(δ) − χ²(0) on START_DELAY_GRID_S (the objective with the drift's prior row, in
 * units of the δ = 0 fit's residual variance times its residuals' autocorrelation time, as
 * fit/startDelay.ts's layer profiles), ready for pooledStartDelay; null when a fit fails.
 */
export function jointStartDelayProfile(input: JointStartDelayInput): JointStartDelayProfile | null {
  const m = START_DELAY_GRID_S.length;
  const chi = new Float64Array(m), driftPerS = new Float64Array(m), driftSigmaPerS = new Float64Array(m);
  let unit = NaN, points = 0;
  let from: LayerEstimate[] = input.start.slice();
  let gain: SharedGain = { ...input.sharedGain, ...(input.sharedGain.driftPrior ? { driftPrior: { ...input.sharedGain.driftPrior } } : {}) };
  for (let k = 0; k < m; k++) {
    const delayS = START_DELAY_GRID_S[k];
    const layers = input.layers.map((d, j) => {
      if (!input.onClock[j]) return d;
      const b = input.binsAt[j](delayS);
      return { ...d, tauS: b.tauS, y: b.y, durationS: exposureTime(d.durationS, delayS) };
    });
    // Each δ's fit starts from the previous δ's (a step of δ moves the parameters little).
    const fit = fitLayers({ fixedBelow: [], layers, start: from, offsetSignal: input.offsetSignal, sharedGain: gain }, { robust: input.robust ?? false, maxIterations: 30 });
    if (!Number.isFinite(fit.solver.ssr) || !fit.sharedGain) return null;
    if (k === 0) {
      let tau = 0;
      points = 0;
      fit.layers.forEach((l, j) => {
        tau += Math.max(1, l.noiseCorrelation) * layers[j].y.length;
        points += layers[j].y.length;
      });
      unit = (fit.solver.ssr / Math.max(fit.solver.dof, 1)) * (tau / Math.max(points, 1));
      if (!(unit > 0)) return null;
    }
    chi[k] = fit.solver.ssr / unit;
    driftPerS[k] = fit.sharedGain.driftPerS;
    driftSigmaPerS[k] = fit.sharedGain.driftSigmaPerS;
    from = fit.layers;
    gain = { ...gain, gain: fit.sharedGain.gain, driftPerS: fit.sharedGain.driftPerS };
  }
  for (let k = m - 1; k >= 0; k--) chi[k] -= chi[0];
  return { chi2: chi, points, driftPerS, driftSigmaPerS };
}

/**
 * The chip's gain drift at the run's delay δ̂ ± σ_δ, for a fit that holds it (sequential mode):
 * γ and its σ read linearly between the grid's points about δ̂, the σ widened by γ's change over
 * ±σ_δ (γ and δ trade off: on the chamber simulator's four-layer AR γ moved about 0.6 %/h per
 * second of δ), since the fits then hold γ while δ's σ is carried with γ as held.
 */
export function driftAtDelay(profile: JointStartDelayProfile, delayS: number, sigmaS: number): { perS: number; sigmaPerS: number } {
  const grid = START_DELAY_GRID_S;
  const at = (v: Float64Array, x: number) => {
    const c = Math.min(Math.max(x, grid[0]), grid[grid.length - 1]);
    let k = 0;
    while (k < grid.length - 2 && grid[k + 1] < c) k++;
    const u = (c - grid[k]) / (grid[k + 1] - grid[k]);
    return v[k] + u * (v[k + 1] - v[k]);
  };
  const perS = at(profile.driftPerS, delayS);
  const spread = Number.isFinite(sigmaS) ? Math.abs(at(profile.driftPerS, delayS + sigmaS) - at(profile.driftPerS, delayS - sigmaS)) / 2 : Infinity;
  return { perS, sigmaPerS: Math.hypot(at(profile.driftSigmaPerS, delayS), spread) };
}

/**
 * The χ² gain a level-cut run's delay must clear: 1, δ̂ about 1σ past 0. With one chip or few
 * the gain stays small whatever δ: Schwarz's ln N (about 7.4) kept 6 of 12 ramped chamber BBAR runs
 * (gains 10–23; the others 1.0–7.2, their δ̂ 0.6–1.7 s for the 1.5 s ramp); 1 kept all 12, and of
 * 12 runs without a ramp one (0.71 ± 0.47 s). The delay is then held with its σ carried.
 */
export const LEVEL_MARGIN_CHI2 = 1;

/**
 * The chips' profiles pooled as fit/startDelay.ts pools layers', kept past LEVEL_MARGIN_CHI2 and
 * only where a grid point past 0 lies lower than δ = 0: a profile rising from 0 gets its
 * parabola's vertex past 0 too when it is not quadratic (the sample four-layer AR without a ramp:
 * χ² 0, 7.3, 47 at 0, 0.5, 1 s put δ̂ at 0.14 ± 0.12 s, 1.25 lower). Nor inside the grid's first
 * step (0 < δ̂ < h), as the layers' pool keeps none there (fit/startDelay.ts): the white-noise BBAR
 * of the chamber simulator, with no ramp, kept 0.26 and 0.38 s on seeds 17 and 20 of 11–26 with
 * option levelStartTransient (refit 0.73 and 0.78 % thick, index 0.0077 and 0.0099 off; without
 * them 0.28 %, 0.0029 over the 16), where its ramped runs read 0.6–2.0 s (real chamber, seeds 21–26).
 */
export function pooledLevelDelay(profiles: readonly StartDelayProfile[]): PooledStartDelay | null {
  const p = pooledStartDelay(profiles);
  if (!p) return null;
  const total = START_DELAY_GRID_S.map((_, k) => profiles.reduce((a, c) => a + c.chi2[k], 0));
  const past0 = total.some((v, k) => k > 0 && v < total[0]);
  const firstStep = START_DELAY_GRID_S[1] - START_DELAY_GRID_S[0];
  return { ...p, marginChi2: LEVEL_MARGIN_CHI2, kept: past0 && p.delayS >= firstStep && p.gainChi2 > LEVEL_MARGIN_CHI2 && Number.isFinite(p.sigmaS) };
}

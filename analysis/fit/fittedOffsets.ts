import { type Design, type DesignLayer } from '../design';
import { indexAt } from '../materials';
import { NOMINAL_INDEX_SIGMA } from '../stats';
import { type TraceData } from '../trace';
import { type ChipCalibration } from './calibrateChip';
import { type ChipStart } from './chipCalibrations';
import { fitChipOffset, type OffsetFit } from './chipOffset';
import { averagedOffset } from './offsetAveraging';
import { type FitLayerData } from './layerModel';
import { type LayerSamples } from './layerSamples';
import { subsampleUniform } from './subsample';

/**
 * Layers the offset fit uses: the chip's first ones, per monitor mode. In transmittance the first
 * layers read high and cannot tell an offset from the gain (σ of 0.2–0.3 % of full scale from
 * three layers of a quarter-wave mirror); six, reaching down to a third of the bare reading,
 * bring σ to about 0.05 % of full scale on the chamber harness. In reflectance the bare chip
 * reads a few % of full scale and its reading tells the gain only to ±0.2–0.8 %; the layers'
 * extremes at several levels tell it better: with the gain free under the bare reading's prior,
 * eight layers (the 8-layer R run, seeds 51–60) put it within 0.15 % of the truth (σ 0.09–0.10 %)
 * where three left it 0.2–0.66 % off, the offset taking up the bare reading's own error.
 */
const OFFSET_FIT_LAYERS = { R: 8, T: 6 } as const;
/** Samples per layer in the offset fit. */
const OFFSET_FIT_POINTS = 100;
/** A fit counts only with σ under this fraction of full scale (bare reading / modelled bare signal). */
const WELL_DETERMINED = 0.002;
/**
 * Systematic σ of a fitted offset, as a fraction of full scale, per monitor mode: the profile
 * holds each layer's rate constant (a free rate drift leaves the offset undetermined in
 * transmittance), so a rate that wanders within the layer biases it, alike on every chip of a
 * run: by 0.3–0.4 % of full scale in transmittance (1.5 % wander, 15 s correlation) and about
 * 0.1 % in reflectance on the chamber harness. Not reduced by pooling chips.
 */
const MODEL_SIGMA = { R: 0.001, T: 0.0015 } as const;

/**
 * The detector offset (stray light) of chips that had no dark reading (nor one shared from
 * another chip): fitted from each chip's first layers (fitChipOffset), with σ. The offset is
 * the detector's, so fits of chips at one monitor wavelength and mode that agree (each within
 * 3σ of their weighted mean) are pooled. The σ reported adds a systematic part (MODEL_SIGMA) to
 * the profile's, and where the chips disagree their spread beyond their σ (betweenChipSigma): on
 * the rate-wander mirror (seeds 15–30) 6 of 48 chips had taken an offset 0.7–0.9 % of full scale
 * off at 3.4–4σ, their H layers then up to 2.4 % thick (refit RMS 0.58 → 0.45 %). The offset assumed before (0, or an earlier chip's) is kept unless the fit is
 * more than 3σ (option offsetAdoptionSigma) away from it. A chip whose layers do not determine it gets a warning in
 * reflectance (there a bare chip reads a few % of full scale, and an offset of 0.5 % of full
 * scale taken as 0 puts thicknesses 10–30 % off). Option offsetAveraging (on by default) instead
 * averages the assumed offset and the fitted one (fit/offsetAveraging.ts), the chips' fits
 * giving their random-effects mean (randomEffectsMean; the pool where they scatter no more than
 * their σ), the zero assumed carrying unmeasuredSigma. A chip whose offset its layers do not
 * determine keeps the one assumed, the layers' σ carrying `unmeasuredSigma` (option
 * unmeasuredOffsetSigma, a fraction of full scale) where that is the zero assumed.
 */
export function fitOffsets(
  design: Design, trace: TraceData, order: readonly DesignLayer[], samplesByLayer: ReadonlyMap<number, LayerSamples>,
  chips: Map<number, ChipStart>, warnings: string[], adoptionSigma = 3, averaging = true, unmeasuredSigma = 0,
): void {
  const todo = [...chips.values()].filter((c) => c.calibration.bareLevel !== null && (c.calibration.offsetSource === 'assumed' || c.calibration.offsetSource === 'earlier-chip'));
  const fits = todo.map((start) => ({ start, fit: fitOne(design, trace, order, samplesByLayer, start) }));
  const good = (f: (typeof fits)[number]) => f.fit !== null && f.fit.sigma < WELL_DETERMINED * Math.abs(f.start.calibration.bareLevel! / f.start.modelledBare);
  for (const f of fits) {
    const cal = f.start.calibration;
    const scale = Math.abs(cal.bareLevel! / f.start.modelledBare);
    const group = fits.filter((g) => good(g) && g.start.wavelengthNm === f.start.wavelengthNm && g.start.mode === f.start.mode);
    // Averaged (fit/offsetAveraging.ts), two or more chips give the detector's one offset as their
    // random-effects mean (DerSimonian–Laird, below), its σ with their spread beyond their own σ,
    // the inverse-variance pool where they scatter no more than their σ (Cochran's Q at most its
    // degrees of freedom). A chip's own fit, averaged with zero on its own, took a partial offset of
    // either sign per chip; a pool of chips each within 3σ of their mean (pool, as without
    // averaging) took three 1 Hz chips at 0.0039 ± 0.0016, 0.0096 ± 0.0009 and 0.0011 ± 0.0023
    // (Q = 19 on 2) as 0.0076 ± 0.0007 for a true 0.003.
    const pooled = averaging && group.length >= 2 ? randomEffectsMean(group.map((g) => g.fit!)) : pool(group.map((g) => g.fit!));
    const own = pooled ?? (good(f) ? { offset: f.fit!.offset, sigma: f.fit!.sigma } : null);
    // Chips that disagree (the detector has one offset) show a bias their profiles do not carry,
    // e.g. a rate that wanders: their spread beyond their σ joins each chip's σ.
    const spread = pooled ? 0 : betweenChipSigma(group.map((g) => g.fit!));
    const est = own && { offset: own.offset, sigma: Math.hypot(own.sigma, MODEL_SIGMA[f.start.mode] * scale, spread) };
    const firstLayer = order.find((l) => samplesByLayer.get(l.layer)!.chip === cal.chip)?.layer;
    if (!est) {
      if (f.fit === null) continue;
      const sigma = f.fit.sigma;
      // In transmittance few layers rarely determine it (a single layer never does): its σ in the
      // chip's calibration says so, and a warning on every such run would flag ordinary runs.
      if (f.start.mode === 'R') warnings.push(`chip ${cal.chip}: no dark samples before layer ${firstLayer}, and its layers do not determine a detector offset (σ ${Number.isFinite(sigma) ? `${fmt(sigma / scale)} % of full scale` : 'unbounded'}); ${cal.offsetSource === 'assumed' ? 'offset taken as 0' : "an earlier chip's offset used"}: thicknesses may carry a bias`);
      // Reported, but not carried into the layers: an offset the data do not bound is no Gaussian
      // error. The zero assumed in its place is no exact figure either: the layers carry the stray
      // light a monitor may hide, option unmeasuredOffsetSigma (a fraction of full scale), with the
      // gain moving as the bare reading ties it to the offset (in sequential: analyzeRun's
      // carryOffsetSigmaThroughChip; without the gain moving, the chamber BBAR's sequential σ_n
      // grew about fourfold, where the stray light really there moves its indices as in refit).
      set(chips, f.start, { ...cal, offsetSigma: Number.isFinite(sigma) ? sigma : 0 }, cal.offsetSource === 'assumed' ? unmeasuredSigma * scale : 0);
      chips.get(cal.chip)!.offsetGainSlope = f.start.mode === 'R' && Number.isFinite(f.fit.gainSigma) ? f.fit.gainSlope : -1 / f.start.modelledBare;
      continue;
    }
    // In reflectance the chip's gain as its layers and bare reading tell it together (the profile's,
    // at the offset taken, kept or fitted: ChipCalibration.layerGainSigma); in transmittance the
    // bare reading tells it alone as well (the 12-layer T run: no figure moved by over 0.0001).
    const fit = f.fit && Number.isFinite(f.fit.gainSigma) && f.start.mode === 'R' ? f.fit : null;
    const gainOf = (g: OffsetFit, offset: number) => g.gain + g.gainSlope * (offset - g.offset);
    const fromLayers = (offset: number) => (fit ? { gain: gainOf(fit, offset), layerGainSigma: fit.gainSigma } : {});
    // The same fit under a small lamp drift: how the offset and gain it gives move with the drift
    // (made when first asked for: only a sequential analysis's held drift reads it).
    // (`share`: how much of the fit the offset taken follows: 1 adopted, 0 kept, the weight averaged)
    const response = (offset: number, share: number): ChipStart['gainDrift'] => {
      if (!fit) return undefined;
      let memo: ReturnType<NonNullable<ChipStart['gainDrift']>> | undefined;
      return () => {
        if (memo !== undefined) return memo;
        const drifted = fitOne(design, trace, order, samplesByLayer, f.start, PROBE_DRIFT_PER_S, false);
        const moved = drifted ? offset + share * (drifted.offset - fit.offset) : offset;
        memo = drifted && Number.isFinite(drifted.gain)
          ? { offsetPerDrift: (moved - offset) / PROBE_DRIFT_PER_S, gainPerDrift: (gainOf(drifted, moved) - gainOf(fit, offset)) / PROBE_DRIFT_PER_S }
          : null;
        return memo;
      };
    };
    if (averaging) {
      // the assumed offset and the fitted one, each by its weight (fit/offsetAveraging.ts); the
      // layers' σ take the average's random part (fit/offsetSigma.ts, and in sequential analyzeRun)
      const points = pooled ? group.reduce((a, g) => a + g.fit!.effectivePoints, 0) : f.fit!.effectivePoints;
      // The zero assumed (or an earlier chip's offset that was itself assumed) is no exact figure
      // either: a stray light of unmeasuredOffsetSigma a shop cannot see (its σ where the layers do
      // not determine the offset, above), sharpened by the fit as a prior N(0, u²) would be, σ =
      // (1/u² + 1/σ_fit²)^(−1/2). Taken as exact, a fit that came out near zero for a true 0.003
      // (a 1 Hz real-chamber mirror, seed 21: −0.0001 ± 0.0018) was averaged to 0.0000 ± 0.0007.
      const u = cal.offsetSource === 'assumed' || !(cal.offsetSigma > 0) ? unmeasuredSigma * scale : 0;
      const sharpened = (sigma: number) => (u > 0 ? 1 / Math.hypot(1 / u, 1 / sigma) : cal.offsetSigma);
      const avg = averagedOffset({ offset: cal.offset, sigma: sharpened(est.sigma), sigmaRandom: sharpened(own!.sigma) }, { ...est, sigmaRandom: own!.sigma }, points);
      set(chips, f.start, { ...cal, offset: avg.offset, offsetSigma: avg.sigma, offsetSource: 'averaged', offsetWeight: avg.weight, gain: (cal.bareLevel! - avg.offset) / f.start.modelledBare, ...fromLayers(avg.offset) }, avg.sigmaRandom, response(avg.offset, avg.weight));
      chips.get(cal.chip)!.offsetGainSlope = fit ? fit.gainSlope : -1 / f.start.modelledBare;
      continue;
    }
    const shift = Math.abs(est.offset - cal.offset);
    if (shift <= adoptionSigma * est.sigma) {
      set(chips, f.start, { ...cal, offsetSigma: est.sigma, ...fromLayers(cal.offset) }, own!.sigma, response(cal.offset, 0));
      continue;
    }
    set(chips, f.start, { ...cal, offset: est.offset, offsetSigma: est.sigma, offsetSource: 'fitted', gain: (cal.bareLevel! - est.offset) / f.start.modelledBare, ...fromLayers(est.offset) }, own!.sigma, response(est.offset, 1));
  }
}

function set(chips: Map<number, ChipStart>, start: ChipStart, calibration: ChipCalibration, offsetSigmaRandom: number, gainDrift?: ChipStart['gainDrift']): void {
  chips.set(calibration.chip, { ...start, calibration, offsetSigmaRandom, ...(gainDrift ? { gainDrift } : {}) });
}

/**
 * The spread of the fits beyond their own σ: DerSimonian–Laird's between-study τ
 * (R. DerSimonian, N. Laird, Controlled Clinical Trials 7, 177–188 (1986)), 0 for fewer than two.
 */
export function betweenChipSigma(fits: readonly Pick<OffsetFit, 'offset' | 'sigma'>[]): number {
  if (fits.length < 2) return 0;
  const w = fits.map((f) => 1 / (f.sigma * f.sigma));
  const sw = w.reduce((a, b) => a + b, 0), sw2 = w.reduce((a, b) => a + b * b, 0);
  const mean = fits.reduce((a, f, i) => a + w[i] * f.offset, 0) / sw;
  const q = fits.reduce((a, f, i) => a + w[i] * (f.offset - mean) ** 2, 0);
  return Math.sqrt(Math.max(0, (q - (fits.length - 1)) / (sw - sw2 / sw)));
}

/** The fits' mean weighted by 1/(σᵢ² + τ²), τ their spread (betweenChipSigma), σ² = 1/Σ 1/(σᵢ² + τ²) (DerSimonian–Laird, as above). */
export function randomEffectsMean(fits: readonly Pick<OffsetFit, 'offset' | 'sigma'>[]): { offset: number; sigma: number } {
  const tau = betweenChipSigma(fits);
  const w = fits.map((f) => 1 / (f.sigma * f.sigma + tau * tau));
  const sw = w.reduce((a, b) => a + b, 0);
  return { offset: fits.reduce((a, f, i) => a + w[i] * f.offset, 0) / sw, sigma: 1 / Math.sqrt(sw) };
}

/** Inverse-variance weighted mean of agreeing fits (each within 3σ of it); null when none or they disagree. */
export function pool(fits: readonly Pick<OffsetFit, 'offset' | 'sigma'>[]): { offset: number; sigma: number } | null {
  if (fits.length === 0) return null;
  const w = fits.map((f) => 1 / (f.sigma * f.sigma));
  const sw = w.reduce((a, b) => a + b, 0);
  const offset = fits.reduce((a, f, i) => a + w[i] * f.offset, 0) / sw;
  if (fits.some((f) => Math.abs(f.offset - offset) > 3 * f.sigma)) return null;
  return { offset, sigma: 1 / Math.sqrt(sw) };
}

/**
 * The lamp drift, per second, of the second offset fit of a reflectance chip (0.36 %/h: small
 * against the fit's nonlinearity, large against its convergence).
 */
const PROBE_DRIFT_PER_S = 1e-6;

/** The held indices' step in the offset fit's σ, as a fraction of their σ. */
const HELD_STEP = 0.25;

/**
 * `driftPerS`: the layers' gain drifting so from the chip's first layer start (the bare reading's time).
 * `heldSigma`: whether the thin layers' held indices carry their σ into the offset's (below).
 */
function fitOne(
  design: Design, trace: TraceData, order: readonly DesignLayer[], samplesByLayer: ReadonlyMap<number, LayerSamples>, start: ChipStart, driftPerS = 0,
  heldSigma = true,
): OffsetFit | null {
  const cal = start.calibration;
  const own = order.filter((l) => samplesByLayer.get(l.layer)!.chip === cal.chip && samplesByLayer.get(l.layer)!.tauS.length >= 20).slice(0, OFFSET_FIT_LAYERS[start.mode]);
  if (own.length === 0 || cal.bareLevel === null) return null;
  const profileAt = (shift: ReadonlyMap<string, number>, startOffset: number): OffsetFit => {
    const layers = own.map((dl) => {
      const s = samplesByLayer.get(dl.layer)!;
      const data = offsetFitData(design, trace, dl, s, shift.get(dl.material) ?? 0);
      return driftPerS !== 0 ? { ...data, chipTimeS: s.startTimeS - start.startS, gainDriftPerS: driftPerS } : data;
    });
    // The gain free under the bare reading's prior (σ_B = gainSigma·M₀): where the layers pin the
    // gain down, the offset takes up the bare reading's own error, and the profile's σ carries it.
    return fitChipOffset({
      layers, bareLevel: cal.bareLevel!, modelledBare: start.modelledBare, startOffset,
      rateGuess: own.map((dl, j) => dl.thicknessNm / Math.max(layers[j].durationS, 1e-9)), bareSigma: cal.gainSigma * start.modelledBare,
    });
  };
  const fit = profileAt(new Map(), cal.offset);
  if (!heldSigma || !Number.isFinite(fit.sigma)) return fit;
  // A thin layer's index is held at its material's nominal, which no layer of the run has yet
  // told (σ NOMINAL_INDEX_SIGMA about it, as the analysis holds one where no layer tells:
  // stats/indexDrift.ts); where the chip's layers trade the offset against the indices, the
  // profile's σ leaves that out: the white-noise BBAR (H 0.01 below its nominal, its 0.22-QWOT
  // layer 1 held) took +1.0 ± 0.16 % of full scale where the simulator has none, its indices then
  // 0.004–0.006 off. Each material's held indices moved together by their σ (a material's index
  // is off alike in its layers), the offset profiled again from the one found with them a quarter
  // σ off (a whole σ ran the profile to its search's edge), and four times the move carried into
  // its σ to first order, the materials taken as independent.
  const materials = [...new Set(own.filter((dl) => isThin(design, dl)).map((dl) => dl.material))];
  let variance = 0;
  for (const m of materials) {
    const moved = profileAt(new Map([[m, HELD_STEP * NOMINAL_INDEX_SIGMA]]), fit.offset);
    variance += Number.isFinite(moved.sigma) ? ((moved.offset - fit.offset) / HELD_STEP) ** 2 : Infinity;
  }
  // (the gain moves with the offset along the profile: its σ takes the same share)
  const held = Math.sqrt(variance);
  return { ...fit, sigma: Math.hypot(fit.sigma, held), gainSigma: Math.hypot(fit.gainSigma, fit.gainSlope * held) };
}

/** Below half a quarter-wave at the monitor wavelength: the offset fit holds its index. */
function isThin(design: Design, dl: DesignLayer): boolean {
  const wl = dl.monitor.wavelengthNm;
  return (4 * indexAt(design.materials[dl.material], wl).re * dl.thicknessNm) / wl < 0.5;
}

const fmt = (x: number) => (100 * x).toFixed(2);

/**
 * One layer's samples (at most OFFSET_FIT_POINTS) for the offset fit: index free above half a
 * quarter-wave, below it held at the nominal plus `heldShift`; no rate drift.
 */
function offsetFitData(design: Design, trace: TraceData, dl: DesignLayer, s: LayerSamples, heldShift: number): FitLayerData {
  const wl = dl.monitor.wavelengthNm;
  const model = design.materials[dl.material];
  const nominal = indexAt(model, wl);
  const n = s.tauS.length;
  const sub = subsampleUniform(s.tauS, 0, n, OFFSET_FIT_POINTS);
  const thin = isThin(design, dl);
  return {
    optics: { ambient: indexAt(design.ambient, wl), substrate: indexAt(design.substrate, wl), backside: design.substrateBackside, wavelengthNm: wl, mode: dl.monitor.mode },
    nominalAt: (w) => indexAt(model, w), tauS: Float64Array.from(sub, (k) => s.tauS[k]), y: Float64Array.from(sub, (k) => trace.signal[s.indices[k]]),
    durationS: s.tauS[n - 1], extinction: -nominal.im, heldIndex: thin ? nominal.re + heldShift : null, fitDrift: false, weight: undefined, heldGain: null, chipTimeS: 0,
    // the keys and order of analyzeRun's layers: one object shape in the model's hot code
    gainDriftPerS: undefined, wander: undefined, indexGradient: undefined,
  };
}

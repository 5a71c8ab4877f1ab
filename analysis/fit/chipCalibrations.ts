import { type Design, type DesignLayer } from '../design';
import { indexAt } from '../materials';
import { fromNK, growingLayerSignal } from '../optics';
import { linearTrend } from '../stats';
import { type TraceData } from '../trace';
import { calibrateChip, type ChipCalibration } from './calibrateChip';
import { type LayerSamples } from './layerSamples';

export interface ChipStart {
  calibration: ChipCalibration;
  /** Start of the chip's first layer, s: the chip's time reference. */
  startS: number;
  /** Monitor wavelength and mode of that layer (the detector's gain depends on both). */
  wavelengthNm: number;
  mode: 'R' | 'T';
}

/**
 * Calibrates every chip at its first layer (layers in deposition order): the idle samples between
 * the previous layer of any chip and this one, against the modelled bare chip.
 */
export function calibrateChips(
  design: Design, trace: TraceData, order: readonly DesignLayer[], samplesByLayer: ReadonlyMap<number, LayerSamples>, warnings: string[],
): Map<number, ChipStart> {
  const chips = new Map<number, ChipStart>();
  const ends = [...samplesByLayer.values()].map((s) => s.indices[s.indices.length - 1]).sort((a, b) => a - b);
  let lastOffset: number | undefined;
  for (const dl of order) {
    const samples = samplesByLayer.get(dl.layer)!;
    if (chips.has(samples.chip)) continue;
    const first = samples.indices[0];
    let idleFrom = 0;
    for (const e of ends) if (e < first) idleFrom = e + 1;
    const wl = dl.monitor.wavelengthNm;
    const modelledBare = growingLayerSignal({
      ambient: indexAt(design.ambient, wl), substrate: indexAt(design.substrate, wl), below: [], growing: fromNK(1),
      wavelengthNm: wl, mode: dl.monitor.mode, backside: design.substrateBackside, pol: 's',
    }, [0])[0];
    const firstCount = Math.min(samples.indices.length, 20);
    const calibration = calibrateChip({
      chip: samples.chip, modelledBare, knownOffset: lastOffset,
      idleSignal: trace.signal.subarray(idleFrom, first),
      firstLayerSignal: Float64Array.from({ length: firstCount }, (_, i) => trace.signal[samples.indices[i]]),
    });
    if (calibration.source === 'first-layer') warnings.push(`chip ${samples.chip}: no bare-chip stretch before layer ${dl.layer}; gain taken from the layer's first samples`);
    lastOffset = calibration.offset;
    chips.set(samples.chip, { calibration, startS: samples.startTimeS, wavelengthNm: wl, mode: dl.monitor.mode });
  }
  return chips;
}

/**
 * The detector's gain drift from the bare-chip calibrations of successive chips (every fresh
 * chip reads the same bare substrate): a linear trend of gain against time, as a fraction per
 * second of the mean gain. Null with fewer than two bare-chip calibrations, or when they were
 * taken at different monitor wavelengths or modes (the gains are then not comparable).
 */
export function gainDriftFromChips(chips: ReadonlyMap<number, ChipStart>): { driftPerS: number; sigmaPerS: number; chips: number } | null {
  const bare = [...chips.values()].filter((c) => c.calibration.source === 'bare-chip');
  if (bare.length < 2) return null;
  if (bare.some((c) => c.wavelengthNm !== bare[0].wavelengthNm || c.mode !== bare[0].mode)) return null;
  const gains = bare.map((c) => c.calibration.gain);
  const mean = gains.reduce((a, b) => a + b, 0) / gains.length;
  const times = bare.map((c) => c.startS);
  const trend = linearTrend(times, gains);
  // σ of the slope from the calibrations' own σ (the scatter about the line needs > 2 chips).
  const tMean = times.reduce((a, b) => a + b, 0) / times.length;
  const sxx = times.reduce((a, t) => a + (t - tMean) ** 2, 0);
  const fromNoise = Math.sqrt(bare.reduce((a, c, i) => a + ((times[i] - tMean) / sxx) ** 2 * c.calibration.gainSigma ** 2, 0));
  const sigma = Number.isFinite(trend.slopeSigma) ? Math.max(trend.slopeSigma, fromNoise) : fromNoise;
  return { driftPerS: trend.slope / mean, sigmaPerS: sigma / mean, chips: bare.length };
}

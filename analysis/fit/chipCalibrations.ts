import { type Design, type DesignLayer } from '../design';
import { indexAt } from '../materials';
import { fromNK, growingLayerSignal } from '../optics';
import { linearTrend } from '../stats';
import { loggedIntervalS, type TraceData } from '../trace';
import { calibrateChip, type ChipCalibration } from './calibrateChip';
import { fitOffsets, pool } from './fittedOffsets';
import { type LayerSamples } from './layerSamples';

export interface ChipStart {
  calibration: ChipCalibration;
  /** Start of the chip's first layer, s: the chip's time reference. */
  startS: number;
  /** Monitor wavelength and mode of that layer (the detector's gain depends on both). */
  wavelengthNm: number;
  mode: 'R' | 'T';
  /** The modelled bare-chip signal M₀ at that wavelength (gain = (bare reading − offset)/M₀). */
  modelledBare: number;
  /**
   * The random part of the offset's σ, where the calibration's offsetSigma adds a systematic
   * one (a fitted offset): what the layers' σ take up (see carryOffsetSigma).
   */
  offsetSigmaRandom?: number;
  /** A fitted offset: how the chip's gain moves with it, dG/do (−1/M₀ where the bare reading ties it). */
  offsetGainSlope?: number;
  /**
   * Where the chip's layers set its gain (reflectance, a fitted offset's profile): how that gain (at
   * the chip's first layer start) and the offset taken move per unit of a lamp drift (per second),
   * from the same fit under a small drift (fit/fittedOffsets.ts), made when first called; null where that fit fails.
   */
  gainDrift?: () => { offsetPerDrift: number; gainPerDrift: number } | null;
}

/**
 * Calibrates every chip at its first layer (layers in deposition order) from the idle samples
 * between the previous layer of any chip and this one, read as levels (calibrateChip): the
 * previous chip's last level is told from a dark reading by the reading its finished design
 * stack should give. A chip with no dark samples gets its offset (stray light) fitted from its
 * first layers (fitChipOffset), with σ and a warning when the data do not pin it down.
 */
export function calibrateChips(
  design: Design, trace: TraceData, order: readonly DesignLayer[], samplesByLayer: ReadonlyMap<number, LayerSamples>, warnings: string[],
  fitOffset = true, offsetAdoptionSigma = 3, offsetAveraging = true, unmeasuredOffsetSigma = 0,
): Map<number, ChipStart> {
  const chips = new Map<number, ChipStart>();
  const ends = [...samplesByLayer.values()].map((s) => s.indices[s.indices.length - 1]).sort((a, b) => a - b);
  let lastOffset: number | undefined;
  let previous: DesignLayer | null = null;
  const sampleS = loggedIntervalS(trace.timeS);
  for (const dl of order) {
    const samples = samplesByLayer.get(dl.layer)!;
    const before = previous;
    previous = dl;
    if (chips.has(samples.chip)) continue;
    const first = samples.indices[0];
    let idleFrom = 0;
    for (const e of ends) if (e < first) idleFrom = e + 1;
    const modelledBare = chipSignal(design, dl, []);
    const prevChip = before ? samplesByLayer.get(before.layer)!.chip : null;
    const prevCal = prevChip !== null ? chips.get(prevChip)?.calibration : undefined;
    const previousChipLevel = before && prevCal
      ? prevCal.gain * chipSignal(design, before, design.layers.filter((l) => l.monitor.chip === before.monitor.chip && l.layer <= before.layer)) + prevCal.offset
      : undefined;
    const firstCount = Math.min(samples.indices.length, 20);
    const { lowLevelNotDark, ...calibration } = calibrateChip({
      chip: samples.chip, modelledBare, knownOffset: lastOffset, previousChipLevel, sampleS,
      idleSignal: trace.signal.subarray(idleFrom, first),
      firstLayerSignal: Float64Array.from({ length: firstCount }, (_, i) => trace.signal[samples.indices[i]]),
    });
    if (lowLevelNotDark !== undefined && calibration.bareLevel !== null) {
      const pct = Math.round((100 * lowLevelNotDark) / calibration.bareLevel);
      warnings.push(`chip ${samples.chip}: a steady reading of ${lowLevelNotDark.toPrecision(4)} before its bare chip's ${calibration.bareLevel.toPrecision(4)} (${pct} % of it) was not taken as the dark reading, which lies under 30 % of the bare chip's: `
        + `if the beam was blocked then, the detector's offset is ${lowLevelNotDark.toPrecision(4)}, not the ${Number(calibration.offset.toPrecision(3))} taken, and this chip's figures are off`);
    }
    if (calibration.source === 'first-layer') warnings.push(`chip ${samples.chip}: no bare-chip stretch before layer ${dl.layer}; gain taken from the layer's first samples`);
    lastOffset = calibration.offset;
    chips.set(samples.chip, { calibration, startS: samples.startTimeS, wavelengthNm: dl.monitor.wavelengthNm, mode: dl.monitor.mode, modelledBare });
  }
  shareDarkReadings(chips, warnings);
  // Only where no chip of the run saw a dark reading is the offset fitted from the layers.
  if (fitOffset) fitOffsets(design, trace, order, samplesByLayer, chips, warnings, offsetAdoptionSigma, offsetAveraging, unmeasuredOffsetSigma);
  return chips;
}

/**
 * The dark reading (with the stray light while the beam is blocked) belongs to the detector,
 * not the chip: the median of the chips' dark readings serves the chips that had none (or only
 * an assumed or inherited one), with its σ, and replaces a reading that disagrees with it by
 * more than 5σ and 0.1 % of full scale (a dip caught on its slope or a spike), with a warning.
 * When the remaining readings agree (each within 3σ of their weighted mean), every chip takes
 * that mean: a dip of half a second under noise correlated over a second is a poor reading on
 * its own (σ about the noise's), and the chip's gain (bare reading − offset)/M₀ carries its error.
 */
export function shareDarkReadings(chips: Map<number, ChipStart>, warnings: string[]): void {
  const dark = [...chips.values()].map((c) => c.calibration).filter((c) => c.offsetSource === 'dark');
  if (dark.length === 0) return;
  const offsets = dark.map((c) => c.offset).sort((a, b) => a - b);
  const mid = offsets.length >> 1;
  const med = offsets.length % 2 ? offsets[mid] : 0.5 * (offsets[mid - 1] + offsets[mid]);
  const spread = Math.sqrt(dark.reduce((a, c) => a + c.offsetSigma ** 2, 0) / dark.length) / Math.sqrt(dark.length);
  const odd = (c: ChipCalibration) => c.offsetSource === 'dark' && Math.abs(c.offset - med) > 5 * Math.hypot(c.offsetSigma, spread) + 0.001 * c.gain;
  const agreed = pool(dark.filter((c) => !odd(c) && c.offsetSigma > 0).map((c) => ({ offset: c.offset, sigma: c.offsetSigma })));
  const shared = agreed ?? { offset: med, sigma: spread };
  for (const [chip, start] of chips) {
    const c = start.calibration;
    if (c.offsetSource === 'fitted' || c.bareLevel === null) continue;
    const isOdd = odd(c);
    if (c.offsetSource === 'dark' && !isOdd && !agreed) continue;
    if (isOdd) warnings.push(`chip ${chip}: its dark reading ${c.offset.toFixed(4)} disagrees with the other chips' (median ${med.toFixed(4)}); ${agreed ? 'their mean' : 'the median'} used`);
    const m0 = (c.bareLevel - c.offset) / c.gain;
    const source = c.offsetSource === 'dark' && !isOdd ? 'dark' : 'other-chips';
    chips.set(chip, { ...start, calibration: { ...c, offset: shared.offset, offsetSigma: shared.sigma, offsetSource: source, gain: (c.bareLevel - shared.offset) / m0 } });
  }
}

/** The modelled signal (fraction) of a chip carrying `stack` (design thicknesses, nominal indices) at dl's monitor wavelength. */
function chipSignal(design: Design, dl: DesignLayer, stack: readonly DesignLayer[]): number {
  const wl = dl.monitor.wavelengthNm;
  return growingLayerSignal({
    ambient: indexAt(design.ambient, wl), substrate: indexAt(design.substrate, wl), growing: fromNK(1),
    below: stack.map((l) => ({ n: indexAt(design.materials[l.material], wl), thicknessNm: l.thicknessNm })),
    wavelengthNm: wl, mode: dl.monitor.mode, backside: design.substrateBackside, pol: 's',
  }, [0])[0];
}

/**
 * The detector's gain drift from the bare-chip calibrations of successive chips (every fresh
 * chip reads the same bare substrate): a linear trend of gain against time, as a fraction per
 * second of the mean gain. Only where the data can carry it: three or more bare-chip
 * calibrations at one monitor wavelength and mode (two chips cannot tell a drift from a
 * difference between the chips, so the scatter about the line must be seen), each gain's σ
 * including its offset's (σ_g² + (σ_o/M₀)², M₀ = (B − o)/g) unless one offset serves every
 * chip. The caller applies it only where it is significant. Null otherwise.
 */
export function gainDriftFromChips(chips: ReadonlyMap<number, ChipStart>): { driftPerS: number; sigmaPerS: number; chips: number } | null {
  const bare = [...chips.values()].filter((c) => c.calibration.source === 'bare-chip');
  if (bare.length < 3) return null;
  if (bare.some((c) => c.wavelengthNm !== bare[0].wavelengthNm || c.mode !== bare[0].mode)) return null;
  const gains = bare.map((c) => c.calibration.gain);
  const mean = gains.reduce((a, b) => a + b, 0) / gains.length;
  const times = bare.map((c) => c.startS);
  const trend = linearTrend(times, gains);
  // One offset shared by every chip (pooled dark readings, a pooled fit, or one assumed) moves
  // all their gains alike and tells nothing about a drift: its σ is left out then.
  const common = bare.every((c) => c.calibration.offset === bare[0].calibration.offset);
  const gainVar = (c: ChipCalibration) => {
    const m0 = ((c.bareLevel ?? c.offset) - c.offset) / c.gain;
    return c.gainSigma ** 2 + (m0 > 0 && !common ? (c.offsetSigma / m0) ** 2 : 0);
  };
  // σ of the slope: the larger of the scatter about the line and the calibrations' own σ.
  const tMean = times.reduce((a, t) => a + t, 0) / times.length;
  const sxx = times.reduce((a, t) => a + (t - tMean) ** 2, 0);
  const fromNoise = Math.sqrt(bare.reduce((a, c, i) => a + ((times[i] - tMean) / sxx) ** 2 * gainVar(c.calibration), 0));
  const sigma = Number.isFinite(trend.slopeSigma) ? Math.max(trend.slopeSigma, fromNoise) : fromNoise;
  return { driftPerS: trend.slope / mean, sigmaPerS: sigma / mean, chips: bare.length };
}

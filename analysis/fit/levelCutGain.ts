import { type ChipCalibration } from './calibrateChip';

/**
 * Gain mode 'per-layer' (sequential): whether a layer cut on level takes the chip's calibrated
 * gain (with the held drift, as gain mode 'chip' does) instead of a gain of its own. Where the
 * bare chip read the gain at least CALIBRATION_MARGIN times better than the per-layer gain's
 * prior admits (a transmittance chip reads about 90 % of full scale: 0.01–0.02 % on the chamber
 * simulator), a gain of the layer's own trades against its index and against the stack below as
 * estimated: on the four-layer AR in transmittance cut on level, sequential, the last layer's
 * index came out 0.011 off with its own gain and 0.0025 with the calibrated one (white noise
 * 0.1 %, refit 0.0015). A reflectance chip reads a few % of full scale, its gain to about
 * ±0.5 %: there the layer's own gain stays (held at such a calibration, the thin level-cut layers
 * in reflectance came out 22 % off against 5 %). Turning-point cuts keep their own gain: it
 * takes up part of the stack below's error (held, the 18-layer mirror's thickness went 0.22 → 0.31 %).
 */
export function holdsLevelCutGain(cut: 'level' | 'turning-point', calibration: Pick<ChipCalibration, 'gain' | 'gainSigma' | 'source'>, priorFraction: number): boolean {
  if (cut !== 'level' || calibration.source !== 'bare-chip' || !(priorFraction > 0)) return false;
  return CALIBRATION_MARGIN * (calibration.gainSigma / Math.abs(calibration.gain)) <= priorFraction;
}

/** How much better than the prior's σ the calibration must tell the gain. */
export const CALIBRATION_MARGIN = 5;

/**
 * Option reflectanceChipGain: whether every layer of a reflectance chip holds the chip's gain
 * (sequential and refit) instead of a gain of its own (sequential, under the prior) or a chip-wide
 * gain freed in the joint fit (refit): where its fitted offset's profile told the gain from all
 * its layers (ChipCalibration.layerGainSigma) better than the per-layer gain's prior. A layer's own
 * gain in reflectance trades against its index: on the 8-layer R run (seeds 51–60) per-layer gains
 * anchored on the true gain left thickness 9.4 % and index 0.14 off (seeds 51–56), the true gain held
 * 0.96 % and 0.0066; the refit's freed gain wandered up to 0.75 % from the profile's, index 0.025 against 0.0075.
 */
export function holdsChipGain(mode: 'R' | 'T', calibration: Pick<ChipCalibration, 'gain' | 'layerGainSigma'>, priorFraction: number): boolean {
  const s = calibration.layerGainSigma;
  return mode === 'R' && s !== undefined && priorFraction > 0 && s / Math.abs(calibration.gain) < priorFraction;
}

import { type Complex } from '../optics/complex';
import { type LayerAt } from '../optics/assembly';
import { growingLayerSignal, type GrowingLayer } from '../optics/growingLayer';
import { type Polarization } from '../optics/tilt';
import { namedIndexAt } from './designStackAt';
import { type Design } from './parseDesign';
import { designLayer, layersOnChipBelow } from './layersOnChipBelow';

export interface MonitorCurveOptions {
  /** The chip's stack below the layer, at the monitor wavelength (e.g. as fitted). @default the design layers on the chip */
  belowOverride?: readonly LayerAt[];
  /** Index of the growing layer at the monitor wavelength. @default the design material's */
  growingIndex?: Complex;
  /** Monitor beam angle in the ambient, degrees. @default 0 */
  angleDeg?: number;
  /** @default 'mean' */
  pol?: Polarization | 'mean';
}

/** The growing-layer problem of one design layer on its witness chip (shared by curve and plan). */
export function monitorSpec(design: Design, layerNo: number, options: MonitorCurveOptions = {}): GrowingLayer {
  const layer = designLayer(design, layerNo);
  const wavelengthNm = layer.monitor.wavelengthNm;
  const below =
    options.belowOverride ??
    layersOnChipBelow(design, layerNo).map((l) => ({ n: namedIndexAt(design.materials[l.material], wavelengthNm, `material "${l.material}"`), thicknessNm: l.thicknessNm }));
  return {
    ambient: namedIndexAt(design.ambient, wavelengthNm, 'ambient'),
    substrate: namedIndexAt(design.substrate, wavelengthNm, 'substrate'),
    below,
    growing: options.growingIndex ?? namedIndexAt(design.materials[layer.material], wavelengthNm, `material "${layer.material}"`),
    wavelengthNm,
    mode: layer.monitor.mode,
    backside: design.substrateBackside,
    angleDeg: options.angleDeg ?? 0,
    pol: options.pol ?? 'mean',
  };
}

/**
 * Modelled monitor signal (fraction 0–1) of layer `layerNo` against its deposited physical
 * thickness, at its monitor wavelength and mode, on its witness chip (the design substrate with
 * the design's backside treatment, carrying the chip's earlier layers).
 */
export function monitorCurve(design: Design, layerNo: number, thicknessNm: ArrayLike<number>, options: MonitorCurveOptions = {}): Float64Array {
  return growingLayerSignal(monitorSpec(design, layerNo, options), thicknessNm);
}

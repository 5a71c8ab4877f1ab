import { fromNK, growingLayerSignal, type Complex, type LayerAt } from '../optics';

/** What the monitor sees apart from the layers: media, wavelength, R or T. */
export interface MonitorOptics {
  ambient: Complex;
  substrate: Complex;
  backside: boolean;
  wavelengthNm: number;
  mode: 'R' | 'T';
}

/** One layer's samples prepared for fitting, with which of its parameters are free. */
export interface FitLayerData {
  optics: MonitorOptics;
  /** The material's nominal index at a wavelength (the fitted index shifts it by a constant). */
  nominalAt: (wavelengthNm: number) => Complex;
  /** Time since the layer's start, s (the points used in the iterations). */
  tauS: Float64Array;
  y: Float64Array;
  /** Time from the layer's start to its last sample, s. */
  durationS: number;
  /** Extinction coefficient k of the growing material at the monitor wavelength (held). */
  extinction: number;
  /** The index, held (not fitted) when set. */
  heldIndex: number | null;
  /** Fit the rate drift a in d = r·τ + a·τ²/2. */
  fitDrift: boolean;
  /** The gain, held (not fitted) when set. */
  heldGain: number | null;
}

/** The physical parameters of one layer. */
export interface LayerParams {
  index: number;
  rateNmPerS: number;
  rateDriftNmPerS2: number;
  gain: number;
}

/** d(τ) = r·τ + a·τ²/2. */
export const thicknessAt = (tauS: number, rateNmPerS: number, rateDriftNmPerS2: number): number =>
  rateNmPerS * tauS + 0.5 * rateDriftNmPerS2 * tauS * tauS;

/** Where each layer's parameters sit in the joint parameter vector: [n?, r, a?, g?] per layer. */
export interface ParamLayout {
  offsets: number[];
  count: number;
}

export function paramLayout(layers: readonly FitLayerData[]): ParamLayout {
  const offsets: number[] = [];
  let count = 0;
  for (const l of layers) {
    offsets.push(count);
    count += (l.heldIndex === null ? 1 : 0) + 1 + (l.fitDrift ? 1 : 0) + (l.heldGain === null ? 1 : 0);
  }
  return { offsets, count };
}

export function decodeLayer(layer: FitLayerData, p: ArrayLike<number>, offset: number): LayerParams {
  let i = offset;
  const index = layer.heldIndex === null ? p[i++] : layer.heldIndex;
  const rateNmPerS = p[i++];
  const rateDriftNmPerS2 = layer.fitDrift ? p[i++] : 0;
  const gain = layer.heldGain === null ? p[i] : layer.heldGain;
  return { index, rateNmPerS, rateDriftNmPerS2, gain };
}

export function encodeLayer(layer: FitLayerData, v: LayerParams, out: number[]): void {
  if (layer.heldIndex === null) out.push(v.index);
  out.push(v.rateNmPerS);
  if (layer.fitDrift) out.push(v.rateDriftNmPerS2);
  if (layer.heldGain === null) out.push(v.gain);
}

/**
 * The modelled signal of consecutive layers on one chip, concatenated: layer j grows on
 * fixedBelow plus layers 0..j−1 at their end thicknesses. S = gain·M(d(τ)) + offset.
 */
export function evaluateLayers(
  fixedBelow: readonly LayerAt[],
  layers: readonly FitLayerData[],
  layout: ParamLayout,
  p: ArrayLike<number>,
  offsetSignal: number,
  out: Float64Array,
  fromLayer = 0,
): void {
  const values = layers.map((l, j) => decodeLayer(l, p, layout.offsets[j]));
  let pos = 0;
  for (let j = 0; j < fromLayer; j++) pos += layers[j].tauS.length;
  for (let j = fromLayer; j < layers.length; j++) {
    const layer = layers[j];
    const v = values[j];
    const below: LayerAt[] = fixedBelow.slice();
    for (let i = 0; i < j; i++) below.push(layerAtWavelength(layers[i], values[i], layer.optics.wavelengthNm));
    const growing = fromNK(v.index, layer.extinction);
    const n = layer.tauS.length;
    const view = out.subarray(pos, pos + n);
    for (let i = 0; i < n; i++) view[i] = thicknessAt(layer.tauS[i], v.rateNmPerS, v.rateDriftNmPerS2);
    // Normal incidence: s and p coincide, so one polarization suffices.
    growingLayerSignal({ ...layer.optics, below, growing, pol: 's' }, view, view);
    for (let i = 0; i < n; i++) view[i] = v.gain * view[i] + offsetSignal;
    pos += n;
  }
}

/**
 * A fitted layer as seen at another wavelength: the material's nominal index there, shifted by
 * the deviation fitted at the layer's own monitor wavelength.
 */
export function layerAtWavelength(layer: FitLayerData, v: LayerParams, wavelengthNm: number): LayerAt {
  const thicknessNm = thicknessAt(layer.durationS, v.rateNmPerS, v.rateDriftNmPerS2);
  if (wavelengthNm === layer.optics.wavelengthNm) return { n: fromNK(v.index, layer.extinction), thicknessNm };
  const own = layer.nominalAt(layer.optics.wavelengthNm).re;
  const there = layer.nominalAt(wavelengthNm);
  return { n: { re: there.re + (v.index - own), im: there.im }, thicknessNm };
}

/**
 * ∂model/∂p for evaluateLayers, using its structure: a layer's index, rate and drift change its
 * own segment and (through the stack) the later ones only, so each forward difference
 * re-evaluates those; a gain's derivative is exact and confined to its own segment.
 */
export function jacobianLayers(
  fixedBelow: readonly LayerAt[],
  layers: readonly FitLayerData[],
  layout: ParamLayout,
  p: Float64Array,
  offsetSignal: number,
  modelAtP: Float64Array,
  steps: Float64Array,
  out: Float64Array,
): void {
  const total = modelAtP.length;
  out.fill(0);
  const scratch = new Float64Array(total);
  const q = new Float64Array(p);
  let pos = 0;
  for (let i = 0; i < layers.length; i++) {
    const layer = layers[i];
    const n = layer.tauS.length;
    const first = layout.offsets[i];
    const last = i + 1 < layers.length ? layout.offsets[i + 1] : layout.count;
    const gainParam = layer.heldGain === null ? last - 1 : -1;
    for (let j = first; j < last; j++) {
      const row = j * total;
      if (j === gainParam) {
        const g = p[j];
        for (let x = pos; x < pos + n; x++) out[row + x] = (modelAtP[x] - offsetSignal) / g;
        continue;
      }
      const h = steps[j];
      q[j] = p[j] + h;
      evaluateLayers(fixedBelow, layers, layout, q, offsetSignal, scratch, i);
      q[j] = p[j];
      for (let x = pos; x < total; x++) out[row + x] = (scratch[x] - modelAtP[x]) / h;
    }
    pos += n;
  }
}

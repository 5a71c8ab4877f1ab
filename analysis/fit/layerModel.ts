import { fromNK, gradedGrowingSignal, growingLayerSignal, type Complex, type LayerAt } from '../optics';
import { oneShapeFrom } from './oneShape';
import { lawThickness, lawThicknessSeries, rateWander, wanderBasis, wanderCount, type RateWander } from './rateWander';

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
  /** The layer's start, s after the chip's reference time (for a chip-wide gain with drift). */
  chipTimeS: number;
  /**
   * Weight of the layer's residuals in a joint fit (1/(residual σ / noise σ) for a layer the
   * smooth model does not follow, so a rate spike does not pull its neighbours). @default 1
   */
  weight?: number;
  /** A known gain drift (fraction per second), applied when the drift is not fitted. @default 0 */
  gainDriftPerS?: number;
  /** A rate wandering within the layer, fitted as knots under its prior (fit/rateWander.ts). @default none */
  wander?: RateWander;
  /**
   * A linear index gradient through the layer, Δn from its bottom to its top (the index is then
   * the mean; fit/indexGradient.ts): 'fit' frees it, a number holds it. @default 0 (uniform)
   */
  indexGradient?: 'fit' | number;
}

/**
 * A layer's fit data with every field present (undefined when absent) and in one order. Hot code
 * (evaluateLayers, jacobianLayers) reads these objects; V8 compiles it for the object shapes it
 * has seen, and each further shape (a field missing, or in another order) deoptimises it and
 * costs a recompile. evaluateLayers and jacobianLayers pass every layer through here: a copy made
 * by spreading (`{ ...layer, heldGain }`) has a shape of its own even with the same fields. The
 * fields' kinds are made general first (oneShapeFrom).
 */
export function fitLayerData(f: FitLayerData): FitLayerData {
  return {
    optics: f.optics, nominalAt: f.nominalAt, tauS: f.tauS, y: f.y, durationS: f.durationS, extinction: f.extinction,
    heldIndex: f.heldIndex, fitDrift: f.fitDrift, weight: f.weight, heldGain: f.heldGain, chipTimeS: f.chipTimeS,
    gainDriftPerS: f.gainDriftPerS, wander: f.wander ? rateWander(f.wander) : f.wander, indexGradient: f.indexGradient,
  };
}

const FIT_LAYER_FIELDS: readonly (keyof FitLayerData)[] = [
  'optics', 'nominalAt', 'tauS', 'y', 'durationS', 'extinction', 'heldIndex', 'fitDrift', 'weight', 'heldGain', 'chipTimeS',
  'gainDriftPerS', 'wander', 'indexGradient',
];
oneShapeFrom(fitLayerData, FIT_LAYER_FIELDS);

/** The layers as fitLayerData gives them (one shape), in a new array. */
function oneShape(layers: readonly FitLayerData[]): FitLayerData[] {
  const out: FitLayerData[] = [];
  for (let j = 0; j < layers.length; j++) out.push(fitLayerData(layers[j]));
  return out;
}

/** The physical parameters of one layer. */
export interface LayerParams {
  index: number;
  rateNmPerS: number;
  rateDriftNmPerS2: number;
  gain: number;
  /** The wander's non-centred knot parameters v (fit/rateWander.ts), with FitLayerData.wander. */
  wander?: Float64Array;
  /** Δn from the layer's bottom to its top (`index` is the mean), with FitLayerData.indexGradient. */
  indexGradient?: number;
}

/** d(τ) = r·τ + a·τ²/2. */
export const thicknessAt = (tauS: number, rateNmPerS: number, rateDriftNmPerS2: number): number =>
  rateNmPerS * tauS + 0.5 * rateDriftNmPerS2 * tauS * tauS;

/**
 * Where each layer's parameters sit in the joint parameter vector: [n?, r, a?, v…, Δn?, g?] per layer,
 * then, with a chip-wide gain, [G, γ] last: gain(t) = G·(1 + γ·t), t from the chip's reference.
 */
export interface ParamLayout {
  offsets: number[];
  count: number;
  /** Index of G, or −1 without a chip-wide gain. */
  shared: number;
  /** Index of γ, or −1 when the gain drift is not fitted (γ = 0). */
  sharedDrift: number;
}

/** With sharedGain every layer's own gain is absent (its heldGain is ignored). */
export function paramLayout(layers: readonly FitLayerData[], sharedGain = false, sharedDrift = false): ParamLayout {
  const offsets: number[] = [];
  let count = 0;
  for (const l of layers) {
    offsets.push(count);
    count += (l.heldIndex === null ? 1 : 0) + 1 + (l.fitDrift ? 1 : 0) + wanderCount(l.wander) + (l.indexGradient === 'fit' ? 1 : 0) + (!sharedGain && l.heldGain === null ? 1 : 0);
  }
  const drift = sharedGain && sharedDrift;
  return { offsets, count: count + (sharedGain ? 1 : 0) + (drift ? 1 : 0), shared: sharedGain ? count : -1, sharedDrift: drift ? count + 1 : -1 };
}

/** The gain at a time t after the chip's reference, under a chip-wide gain. */
export const sharedGainAt = (p: ArrayLike<number>, layout: ParamLayout, t: number, knownDriftPerS = 0): number =>
  p[layout.shared] * (1 + (layout.sharedDrift < 0 ? knownDriftPerS : p[layout.sharedDrift]) * t);

/** A layer's parameters; under a chip-wide gain, `gain` is the gain at the layer's start. */
export function decodeLayer(layer: FitLayerData, p: ArrayLike<number>, offset: number, layout?: ParamLayout): LayerParams {
  let i = offset;
  const index = layer.heldIndex === null ? p[i++] : layer.heldIndex;
  const rateNmPerS = p[i++];
  const rateDriftNmPerS2 = layer.fitDrift ? p[i++] : 0;
  const k = wanderCount(layer.wander);
  const wander = k > 0 ? knotParams(p, i, k) : layer.wander?.fixed;
  i += k;
  const indexGradient = layer.indexGradient === 'fit' ? p[i++] : layer.indexGradient;
  const gain = layout && layout.shared >= 0 ? sharedGainAt(p, layout, layer.chipTimeS, layer.gainDriftPerS) : layer.heldGain === null ? p[i] : layer.heldGain;
  return layerParams(index, rateNmPerS, rateDriftNmPerS2, gain, wander, indexGradient);
}

/**
 * p[from … from + k − 1] in a new array. A loop, not Float64Array.from with a map function, which
 * took the generic path over an array-like object (an iterator's step and a call per knot) for
 * every layer with a wander in every model evaluation of the refit pass.
 */
function knotParams(p: ArrayLike<number>, from: number, k: number): Float64Array {
  const out = new Float64Array(k);
  for (let j = 0; j < k; j++) out[j] = p[from + j];
  return out;
}

/**
 * One shape for every layer's parameters (absent fields undefined, not missing): the model's hot
 * loops read these objects, and a second shape there costs V8 a deoptimisation and a recompile.
 */
function layerParams(
  index: number, rateNmPerS: number, rateDriftNmPerS2: number, gain: number, wander: Float64Array | undefined, indexGradient: number | undefined,
): LayerParams {
  return { index, rateNmPerS, rateDriftNmPerS2, gain, wander, indexGradient };
}
oneShapeFrom((v: LayerParams) => layerParams(v.index, v.rateNmPerS, v.rateDriftNmPerS2, v.gain, v.wander, v.indexGradient), [
  'index', 'rateNmPerS', 'rateDriftNmPerS2', 'gain', 'wander', 'indexGradient',
]);

export function encodeLayer(layer: FitLayerData, v: LayerParams, out: number[], sharedGain = false): void {
  if (layer.heldIndex === null) out.push(v.index);
  out.push(v.rateNmPerS);
  if (layer.fitDrift) out.push(v.rateDriftNmPerS2);
  for (let j = 0; j < wanderCount(layer.wander); j++) out.push(v.wander?.[j] ?? 0);
  if (layer.indexGradient === 'fit') out.push(v.indexGradient ?? 0);
  if (!sharedGain && layer.heldGain === null) out.push(v.gain);
}

/**
 * The modelled signal of consecutive layers on one chip, concatenated: layer j grows on
 * fixedBelow plus layers 0..j−1 at their end thicknesses. S = gain·M(d(τ)) + offset, the gain
 * per layer (times 1 + γ·τ for a known drift γ) or chip-wide, G·(1 + γ·t).
 */
export function evaluateLayers(
  fixedBelow: readonly LayerAt[],
  layers: readonly FitLayerData[],
  layout: ParamLayout,
  p: ArrayLike<number>,
  offsetSignal: number,
  out: Float64Array,
  fromLayer = 0,
  /** Adds deltaNm to the thickness of layer `layer` throughout (for thickness derivatives). */
  shift?: { layer: number; deltaNm: number },
): void {
  evaluateSameShape(fixedBelow, oneShape(layers), layout, p, offsetSignal, out, fromLayer, shift);
}

/** evaluateLayers on layers of fitLayerData's one shape. */
function evaluateSameShape(
  fixedBelow: readonly LayerAt[],
  layers: readonly FitLayerData[],
  layout: ParamLayout,
  p: ArrayLike<number>,
  offsetSignal: number,
  out: Float64Array,
  fromLayer = 0,
  shift?: { layer: number; deltaNm: number },
  /**
   * The growing layers' phase terms over the whole output (PhaseCache): `fill` writes them; else
   * each layer after `after` reads them (its own index and thicknesses as when they were written).
   */
  phase?: { cos: Float64Array; sin: Float64Array; fill: boolean; after: number },
): void {
  // Arrays built by a loop rather than map()/slice(): their element kind then stays the same in
  // V8's interpreter and optimised code (map() there makes another, and every switch deoptimises).
  const values: LayerParams[] = [];
  for (let j = 0; j < layers.length; j++) values.push(decodeLayer(layers[j], p, layout.offsets[j], layout));
  let pos = 0;
  for (let j = 0; j < fromLayer; j++) pos += layers[j].tauS.length;
  // layerAt of the layers below at one wavelength, kept while the next layers are monitored at it
  // (read only), and the stepped layer's entry likewise (made once a wavelength, not once for
  // every layer above it: the same figures)
  const at: LayerAt[] = [];
  let stepped: LayerAt | null = null;
  let atWavelength = NaN;
  // the stack under layer j, refilled for each (the optics read it during the call only)
  const below: LayerAt[] = [];
  for (let j = fromLayer; j < layers.length; j++) {
    const layer = layers[j];
    const v = values[j];
    below.length = 0;
    for (let i = 0; i < fixedBelow.length; i++) below.push(fixedBelow[i]);
    const wavelengthNm = layer.optics.wavelengthNm;
    if (wavelengthNm !== atWavelength) {
      at.length = 0;
      stepped = null;
      atWavelength = wavelengthNm;
    }
    for (let i = 0; i < j; i++) {
      if (i === at.length) at.push(layerAt(layers[i], values[i], wavelengthNm));
      if (shift && shift.layer === i) {
        if (!stepped) {
          stepped = layerAt(layers[i], values[i], wavelengthNm);
          stepped.thicknessNm += shift.deltaNm;
        }
        below.push(stepped);
      } else below.push(at[i]);
    }
    const growing = fromNK(v.index, layer.extinction);
    // The layer's fields read once, not per sample (the layers' objects differ in shape).
    const tauS = layer.tauS;
    const n = tauS.length;
    const view = out.subarray(pos, pos + n);
    const dd = shift && shift.layer === j ? shift.deltaNm : 0;
    if (layer.wander) {
      lawThicknessSeries(v, layer.wander, tauS, view);
      if (dd !== 0) for (let i = 0; i < n; i++) view[i] += dd;
    } else thicknessSeries(tauS, v.rateNmPerS, v.rateDriftNmPerS2, dd, view);
    // Normal incidence: s and p coincide, so one polarization suffices.
    const dn = v.indexGradient ?? 0;
    if (dn !== 0) {
      // graded: the profile spans the layer's end thickness, its mean the fitted index
      const end = Math.max(lawThickness(v, layer.wander, layer.durationS), 1e-9);
      gradedGrowingSignal({ ...layer.optics, below, growing: fromNK(v.index - dn / 2, layer.extinction), pol: 's' }, dn / end, view, view);
    } else {
      // a later layer's own phase terms do not depend on the parameter being stepped: reuse them
      const cache = phase && (phase.fill || j > phase.after) ? { cos: phase.cos.subarray(pos, pos + n), sin: phase.sin.subarray(pos, pos + n), fill: phase.fill } : undefined;
      growingLayerSignal({ ...layer.optics, below, growing, pol: 's' }, view, view, cache);
    }
    const w = layer.weight ?? 1;
    const known = layer.gainDriftPerS ?? 0;
    if (layout.shared >= 0) {
      // sharedGainAt(p, layout, t, known) with its two parameters read once
      const G = p[layout.shared], gamma = layout.sharedDrift < 0 ? known : p[layout.sharedDrift];
      scaleSeries(view, tauS, G, gamma, layer.chipTimeS, w, offsetSignal);
    } else if (known !== 0) {
      for (let i = 0; i < n; i++) view[i] = w * (v.gain * (1 + known * tauS[i]) * view[i] + offsetSignal);
    } else for (let i = 0; i < n; i++) view[i] = w * (v.gain * view[i] + offsetSignal);
    pos += n;
  }
}

/**
 * The rate and drift columns from one thickness difference (jacobianLayers, no wander): over the
 * layer's own samples (from pos) τ, beyond them τ = T. rowA < 0: no drift column.
 */
function rateColumns(
  scratch: Float64Array, modelAtP: Float64Array, h: number, tauS: Float64Array, T: number, pos: number,
  out: Float64Array, rowR: number, rowA: number,
): void {
  const total = modelAtP.length, own = pos + tauS.length;
  for (let x = pos; x < total; x++) {
    const dSdd = (scratch[x] - modelAtP[x]) / h;
    const tau = x < own ? tauS[x - pos] : T;
    out[rowR + x] = dSdd * tau;
    if (rowA >= 0) out[rowA + x] = 0.5 * dSdd * tau * tau;
  }
}

/** d(τ) + dd at each τ, into out (thicknessAt per sample). */
function thicknessSeries(tauS: Float64Array, rate: number, drift: number, dd: number, out: Float64Array): void {
  for (let i = 0; i < tauS.length; i++) out[i] = thicknessAt(tauS[i], rate, drift) + dd;
}

/** w·(G·(1 + γ·(t₀ + τ))·M + offset) in place of M at each τ (sharedGainAt per sample). */
function scaleSeries(view: Float64Array, tauS: Float64Array, G: number, gamma: number, t0: number, w: number, offsetSignal: number): void {
  for (let i = 0; i < view.length; i++) view[i] = w * (G * (1 + gamma * (t0 + tauS[i])) * view[i] + offsetSignal);
}

/**
 * A fitted layer as seen at another wavelength: the material's nominal index there, shifted by
 * the deviation fitted at the layer's own monitor wavelength.
 */
export function layerAtWavelength(layer: FitLayerData, v: LayerParams, wavelengthNm: number): LayerAt {
  return layerAt(fitLayerData(layer), layerParams(v.index, v.rateNmPerS, v.rateDriftNmPerS2, v.gain, v.wander, v.indexGradient), wavelengthNm);
}

/** layerAtWavelength on objects of fitLayerData's and layerParams's one shape. */
function layerAt(layer: FitLayerData, v: LayerParams, wavelengthNm: number): LayerAt {
  const thicknessNm = lawThickness(v, layer.wander, layer.durationS);
  if (wavelengthNm === layer.optics.wavelengthNm) return entry(fromNK(v.index, layer.extinction), thicknessNm, v.indexGradient);
  const own = layer.nominalAt(layer.optics.wavelengthNm).re;
  const there = layer.nominalAt(wavelengthNm);
  return entry({ re: there.re + (v.index - own), im: there.im }, thicknessNm, v.indexGradient);
}

/**
 * A stack entry; a graded layer keeps its Δn at every wavelength (the gradient's dispersion is
 * not known). Written out, not spread from an object made for the purpose: the entries of the
 * layers below are made for every model evaluation.
 */
function entry(n: Complex, thicknessNm: number, indexGradient: number | undefined): LayerAt {
  return indexGradient ? { n, thicknessNm, indexChange: indexGradient } : { n, thicknessNm };
}

/**
 * ∂model/∂p for evaluateLayers, using its structure: a layer's index and thickness change its
 * own segment and (through the stack) the later ones only, so each forward difference
 * re-evaluates those. Rate and drift act only through the thickness, so one difference in
 * thickness gives both: ∂S/∂r = ∂S/∂d·τ and ∂S/∂a = ∂S/∂d·τ²/2 (τ = T on later layers). A
 * gain's derivative is exact and confined to its own segment.
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
  /** Where each parameter's row starts in out, a multiple of this (the data's columns, then any a caller adds: priors' rows); out is zeroed whole. @default the samples' count */
  rowStride = modelAtP.length,
): void {
  layers = oneShape(layers);
  const total = modelAtP.length;
  out.fill(0);
  // every value of scratch read below is written first (the first evaluation writes all of it,
  // each later one from layer i on, where it is then read)
  const scratch = spare(SCRATCH, total);
  const q = new Float64Array(p);
  // A difference in layer i leaves every later layer's own phase thickness as it is: with more
  // than one layer, those are computed once here and read back (the same values).
  const phase = layers.length > 1 ? { cos: spare(COS, total), sin: spare(SIN, total), fill: true, after: -1 } : undefined;
  if (phase) {
    evaluateSameShape(fixedBelow, layers, layout, p, offsetSignal, scratch, 0, undefined, phase);
    phase.fill = false;
  }
  let pos = 0;
  for (let i = 0; i < layers.length; i++) {
    const layer = layers[i];
    const n = layer.tauS.length;
    const first = layout.offsets[i];
    const last = i + 1 < layers.length ? layout.offsets[i + 1] : layout.shared >= 0 ? layout.shared : layout.count;
    const gainParam = layout.shared < 0 && layer.heldGain === null ? last - 1 : -1;
    const indexParam = layer.heldIndex === null ? first : -1;
    const rateParam = layer.heldIndex === null ? first + 1 : first;
    const driftParam = layer.fitDrift ? rateParam + 1 : -1;
    const wanderParam = rateParam + (layer.fitDrift ? 2 : 1), wk = wanderCount(layer.wander);
    const gradientParam = layer.indexGradient === 'fit' ? wanderParam + wk : -1;
    const basis = new Float64Array(wk);
    for (let j = first; j < last; j++) {
      const row = j * rowStride;
      if (j === gainParam) {
        const g = p[j];
        const wOff = (layer.weight ?? 1) * offsetSignal;
        for (let x = pos; x < pos + n; x++) out[row + x] = (modelAtP[x] - wOff) / g;
      } else if (j === indexParam || j === gradientParam) {
        const h = steps[j];
        q[j] = p[j] + h;
        evaluateSameShape(fixedBelow, layers, layout, q, offsetSignal, scratch, i, undefined, phase && { ...phase, after: i });
        q[j] = p[j];
        for (let x = pos; x < total; x++) out[row + x] = (scratch[x] - modelAtP[x]) / h;
      }
    }
    // One thickness difference for rate and drift.
    const T = layer.durationS;
    const h = Math.max(steps[rateParam] * T, 1e-9);
    evaluateSameShape(fixedBelow, layers, layout, p, offsetSignal, scratch, i, { layer: i, deltaNm: h }, phase && { ...phase, after: i });
    const rowR = rateParam * rowStride, rowA = driftParam * rowStride;
    if (wk === 0) rateColumns(scratch, modelAtP, h, layer.tauS, T, pos, out, rowR, driftParam >= 0 ? rowA : -1);
    else {
      for (let x = pos; x < total; x++) {
        const dSdd = (scratch[x] - modelAtP[x]) / h;
        const tau = x < pos + n ? layer.tauS[x - pos] : T;
        out[rowR + x] = dSdd * tau;
        if (driftParam >= 0) out[rowA + x] = 0.5 * dSdd * tau * tau;
        // ∂d/∂v_j = Ψ_j(τ): constant over the later layers (τ = T)
        if (x < pos + n || x === pos + n) wanderBasis(layer.wander!, tau, basis);
        for (let j = 0; j < wk; j++) out[(wanderParam + j) * rowStride + x] = dSdd * basis[j];
      }
    }
    pos += n;
  }
  if (layout.shared < 0) return;
  const G = p[layout.shared];
  const rowG = layout.shared * rowStride, rowGamma = layout.sharedDrift * rowStride;
  pos = 0;
  for (const layer of layers) {
    const gamma = layout.sharedDrift < 0 ? (layer.gainDriftPerS ?? 0) : p[layout.sharedDrift];
    gainColumns(modelAtP, (layer.weight ?? 1) * offsetSignal, layer.tauS, layer.chipTimeS, G, gamma, pos, out, rowG, layout.sharedDrift >= 0 ? rowGamma : -1);
    pos += layer.tauS.length;
  }
}

/**
 * Working arrays of jacobianLayers, kept between its calls (it is not re-entered; one set per
 * thread): the bench's run makes about 1400 Jacobians (both threads), each of which allocated,
 * zeroed and left to the collector three arrays of its rows.
 */
const SCRATCH = 0, COS = 1, SIN = 2;
const spares: Float64Array[] = [new Float64Array(0), new Float64Array(0), new Float64Array(0)];
function spare(which: number, n: number): Float64Array {
  if (spares[which].length < n) spares[which] = new Float64Array(n);
  return spares[which].subarray(0, n);
}

/** The chip-wide gain's columns over one layer's samples (from pos): ∂/∂G and, rowGamma ≥ 0, ∂/∂γ. */
function gainColumns(
  modelAtP: Float64Array, wOffset: number, tauS: Float64Array, t0: number, G: number, gamma: number, pos: number,
  out: Float64Array, rowG: number, rowGamma: number,
): void {
  for (let i = 0; i < tauS.length; i++) {
    const x = pos + i;
    const t = t0 + tauS[i];
    const gm = modelAtP[x] - wOffset;
    out[rowG + x] = gm / G;
    if (rowGamma >= 0) out[rowGamma + x] = (gm * t) / (1 + gamma * t);
  }
}

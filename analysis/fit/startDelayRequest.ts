import { indexAt, type MaterialModel } from '../materials';
import { type Complex } from '../optics';
import { type FitLayerData } from './layerModel';
import { indexRange } from './layerSampleWork';
import { binsOnExposureClocks } from './profileBins';
import { PROFILE_POINTS, startDelayProfile, type StartDelayProfile, type StartDelayProfileInput } from './startDelay';
import { exposureTime } from './startTransient';

/**
 * One layer's start-delay profile (fit/startDelay.ts) as plain data, so another thread can
 * compute it (AnalyzeOptions.startDelayProfileOf) while this one fits the next layers: the
 * profile is only read once the pass is over. The layer's fit data less its samples and its
 * nominal index function (rebuilt from the material's model), and its samples on the real clock.
 */
export interface StartDelayProfileRequest extends Omit<StartDelayProfileInput, 'dataAt'> {
  layer: Omit<FitLayerData, 'nominalAt' | 'tauS' | 'y'>;
  material: MaterialModel;
  /** The layer's samples: time since its start, s (real clock, no delay), and readings. */
  tauS: Float64Array;
  y: Float64Array;
}

/** The request for a layer's profile; `fit` the layer's fit data (its bins are not sent: the samples are). */
export function startDelayRequest(
  input: Omit<StartDelayProfileInput, 'dataAt'>, fit: FitLayerData, material: MaterialModel, tauS: Float64Array, y: Float64Array,
): StartDelayProfileRequest {
  const { nominalAt: _n, tauS: _t, y: _y, ...layer } = fit;
  return { ...input, layer, material, tauS, y };
}

/** startDelayProfile of a request: the same figures wherever it runs (the same functions on the same values). */
export function profileFromRequest(r: StartDelayProfileRequest): StartDelayProfile | null {
  const memo = new Map<number, Complex>();
  const nominalAt = (w: number) => {
    let v = memo.get(w);
    if (!v) memo.set(w, (v = indexAt(r.material, w)));
    return v;
  };
  const own = indexRange(r.y.length);
  const bins = binsOnExposureClocks(r.tauS, own, r.y, PROFILE_POINTS);
  const { layer, material: _m, tauS: _t, y: _y, ...input } = r;
  return startDelayProfile({
    ...input,
    dataAt: (delayS) => {
      const b = bins(delayS);
      return { ...layer, nominalAt, tauS: b.tauS, y: b.y, durationS: exposureTime(layer.durationS, delayS) };
    },
  });
}

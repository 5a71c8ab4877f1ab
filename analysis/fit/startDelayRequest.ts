import { indexAtMemo, type MaterialModel } from '../materials';
import { type LayerAt } from '../optics';
import { fitLayerData, type FitLayerData, type LayerParams } from './layerModel';
import { indexRange } from './layerSampleWork';
import { binsOnExposureClocks } from './profileBins';
import { PROFILE_POINTS, type StartDelayProfile } from './startDelay';
import { chainedStartDelayProfiles } from './startDelayChain';
import { exposureTime } from './startTransient';

/** One layer of a chip's request: its fit data less its samples and nominal index function, and its samples on the real clock. */
export interface StartDelayLayerRequest {
  layer: Omit<FitLayerData, 'nominalAt' | 'tauS' | 'y'>;
  material: MaterialModel;
  /** The layer's samples: time since its start, s (real clock, no delay), and readings. */
  tauS: Float64Array;
  y: Float64Array;
  /** Its samples go on δ's exposure clock (a turning-point cut), else stay on real time. */
  onClock: boolean;
  start: LayerParams;
  below: LayerAt[];
  offsetSignal: number;
  gainPrior?: { fraction: number; noiseSigma: number };
  profiled: boolean;
  growthBelow?: { heldNm: number; rateNmPerS: number };
}

/**
 * A chip's layers for the start delay's profiles (fit/startDelayChain.ts) as plain data, so
 * another thread can compute them (AnalyzeOptions.startDelayProfileOf) while this one fits the
 * next chips: the profiles are only read once the pass is over.
 */
export interface StartDelayProfileRequest {
  layers: StartDelayLayerRequest[];
}

/** One layer's part of a chip's request; `fit` the layer's fit data (its bins are not sent: the samples are), its durationS the logged end in real time. */
export function startDelayLayerRequest(
  input: Omit<StartDelayLayerRequest, 'layer' | 'material' | 'tauS' | 'y'>, fit: FitLayerData, material: MaterialModel, tauS: Float64Array, y: Float64Array,
): StartDelayLayerRequest {
  const { nominalAt: _n, tauS: _t, y: _y, ...layer } = fit;
  return { ...input, layer, material, tauS, y };
}

/** The profiles of a chip's request, one per layer (null for a layer not profiled or whose fits failed): the same figures wherever it runs. */
export function profileFromRequest(r: StartDelayProfileRequest): (StartDelayProfile | null)[] {
  return chainedStartDelayProfiles(r.layers.map((l) => {
    const nominalAt = indexAtMemo(l.material);
    const own = indexRange(l.y.length);
    const bins = binsOnExposureClocks(l.tauS, own, l.y, PROFILE_POINTS);
    return {
      start: l.start, loggedS: l.layer.durationS, below: l.below, offsetSignal: l.offsetSignal, profiled: l.profiled,
      ...(l.gainPrior ? { gainPrior: l.gainPrior } : {}), ...(l.growthBelow ? { growthBelow: l.growthBelow } : {}),
      dataAt: (delayS: number) => {
        const b = bins(l.onClock ? delayS : 0);
        return fitLayerData({ ...l.layer, nominalAt, tauS: b.tauS, y: b.y, durationS: l.onClock ? exposureTime(l.layer.durationS, delayS) : l.layer.durationS });
      },
    };
  }));
}

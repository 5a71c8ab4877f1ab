import { describe, expect, it } from 'vitest';
import { decodeLayer, fitLayerData, paramLayout, type FitLayerData } from '../layerModel';

// The model's hot code (evaluateLayers, jacobianLayers) reads these objects in every iteration;
// V8 compiles it for the object shapes it has met, so a layer whose object has other keys, or the
// same keys in another order, costs a deoptimisation and a recompile. The keys, in order, are what
// decides the shape here.

const optics = { ambient: { re: 1, im: 0 }, substrate: { re: 1.52, im: 0 }, backside: false, wavelengthNm: 600, mode: 'T' as const };
const tauS = Float64Array.from({ length: 20 }, (_, i) => i);
const plain: FitLayerData = {
  optics, nominalAt: () => ({ re: 2.3, im: 0 }), tauS, y: new Float64Array(20), durationS: 19, extinction: 0,
  heldIndex: null, fitDrift: true, heldGain: null, chipTimeS: 0,
};
const wander = { knotsS: Float64Array.of(0, 10, 19), sigmaNmPerS: 0.01, correlationS: 5, pointSigma: 0.001 };

describe('one object shape for the layers in a fit', () => {
  it('decodeLayer gives the same keys in the same order with and without a wander, a held wander, or a gradient', () => {
    const layers: FitLayerData[] = [
      plain,
      { ...plain, wander },
      { ...plain, wander: { ...wander, fixed: Float64Array.of(0.1, 0.2, 0.3) } },
      { ...plain, indexGradient: 'fit' },
      { ...plain, indexGradient: 0.01, heldIndex: 2.3, fitDrift: false },
    ];
    const layout = paramLayout(layers);
    const p = Float64Array.from({ length: layout.count }, (_, i) => 1 + i / 10);
    const keys = layers.map((l, j) => Object.keys(decodeLayer(l, p, layout.offsets[j], layout)).join(','));
    expect(new Set(keys).size).toBe(1);
    expect(keys[0]).toBe('index,rateNmPerS,rateDriftNmPerS2,gain,wander,indexGradient');
    // the absent fields read as before: undefined
    const first = decodeLayer(plain, p, layout.offsets[0], layout);
    expect(first.wander).toBeUndefined();
    expect(first.indexGradient).toBeUndefined();
    expect(decodeLayer(layers[3], p, layout.offsets[3], layout).indexGradient).toBe(p[layout.offsets[3] + 3]);
  });

  it('fitLayerData gives every layer the same keys in the same order, whatever the order or gaps of its input', () => {
    const { optics: o, nominalAt, ...rest } = plain;
    const reordered = { ...rest, wander, nominalAt, optics: o, weight: 0.5 } as FitLayerData;
    const a = fitLayerData(plain), b = fitLayerData(reordered), c = fitLayerData({ ...plain, gainDriftPerS: 1e-4, indexGradient: 'fit' });
    expect(Object.keys(a)).toEqual(Object.keys(b));
    expect(Object.keys(a)).toEqual(Object.keys(c));
    // and changes no value
    expect(b.weight).toBe(0.5);
    expect(b.wander).toBe(wander);
    expect(b.nominalAt).toBe(nominalAt);
    expect(c.gainDriftPerS).toBe(1e-4);
    expect(a.wander).toBeUndefined();
  });
});

import v8 from 'node:v8';
import { describe, expect, it } from 'vitest';
import { decodeLayer, fitLayerData, paramLayout, type FitLayerData } from '../layerModel';
import { rateWander } from '../rateWander';

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
    // the wander copied with its own one shape (rateWander), the same values
    expect(b.wander).not.toBe(wander);
    expect(b.wander).toEqual(wander);
    expect(b.wander!.knotsS).toBe(wander.knotsS);
    expect(b.nominalAt).toBe(nominalAt);
    expect(c.gainDriftPerS).toBe(1e-4);
    expect(a.wander).toBeUndefined();
  });
});

// V8's own answer to "do these two objects have one hidden class": its %HaveSameMap, reached by
// allowing its natives syntax in a function compiled after the flag is set.
v8.setFlagsFromString('--allow-natives-syntax');
const sameMap = new Function('a', 'b', 'return %HaveSameMap(a, b)') as (a: object, b: object) => boolean;

describe('one hidden class for the layers, whatever their values', () => {
  it('fitLayerData: a layer with integer, null and absent fields built first shares its class with a later one holding doubles, a held gain and a wander', () => {
    // built in this order, the first one's fields (weight 1, chipTimeS 0, heldGain null) would be
    // stored as small integers and references, and the second's doubles would move later objects
    // to a new class
    const first = fitLayerData({ ...plain, weight: 1, chipTimeS: 0, heldGain: null });
    const later = fitLayerData({ ...plain, weight: 0.48, chipTimeS: 12.5, heldGain: 0.93, heldIndex: 2.31, gainDriftPerS: 1e-4, wander, indexGradient: 'fit' });
    const third = fitLayerData({ ...plain, weight: undefined, indexGradient: 0.01 });
    expect(sameMap(first, later)).toBe(true);
    expect(sameMap(first, third)).toBe(true);
  });

  it('rateWander: a σ of 1 first and of 0.01 after, a held wander too, one class', () => {
    const a = rateWander({ knotsS: Float64Array.of(0, 10), sigmaNmPerS: 1, correlationS: 20, pointSigma: 1 });
    const b = rateWander({ ...wander, fixed: Float64Array.of(0.1, 0.2, 0.3) });
    expect(sameMap(a, b)).toBe(true);
    expect(a.fixed).toBeUndefined();
  });
});
